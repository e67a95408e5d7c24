//! Input diagnostics that read like a good compiler's: file, line and column,
//! the offending line with a marker, what was expected and a hint.

use serde::Serialize;
use std::fmt;
use std::ops::Range;

/// One problem in an input file.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Diagnostic {
    /// What is wrong, in one sentence.
    pub message: String,
    /// The dotted key path (`component[2].joint_efficiency`), or empty.
    pub key: String,
    /// Byte range in the file, when known.
    pub span: Option<Range<usize>>,
    /// What would have been accepted.
    pub expected: Option<String>,
    /// A suggestion for the fix.
    pub hint: Option<String>,
}

impl Diagnostic {
    /// A diagnostic at a span for a key.
    pub fn new(key: impl Into<String>, span: Option<Range<usize>>, message: impl Into<String>) -> Diagnostic {
        Diagnostic { message: message.into(), key: key.into(), span, expected: None, hint: None }
    }
    /// Adds what was expected.
    pub fn expected(mut self, e: impl Into<String>) -> Diagnostic {
        self.expected = Some(e.into());
        self
    }
    /// Adds a hint.
    pub fn hint(mut self, h: impl Into<String>) -> Diagnostic {
        self.hint = Some(h.into());
        self
    }
}

/// All problems found in one input file; nothing is computed or written
/// while any remain.
#[derive(Debug, Clone, PartialEq)]
pub struct InputErrors {
    /// The file name as given by the user.
    pub file: String,
    /// The file's text, for quoting lines.
    pub source: String,
    /// The problems, in file order.
    pub errors: Vec<Diagnostic>,
}

impl InputErrors {
    /// A single problem.
    pub fn one(file: &str, source: &str, d: Diagnostic) -> InputErrors {
        InputErrors { file: file.to_string(), source: source.to_string(), errors: vec![d] }
    }

    /// Line and column (1-based, in characters) of a byte offset.
    pub fn line_col(&self, offset: usize) -> (usize, usize) {
        line_col(&self.source, offset)
    }

    /// The compiler-style text of every problem.
    pub fn render(&self) -> String {
        let mut out = String::new();
        for d in &self.errors {
            out.push_str(&format!("error: {}\n", d.message));
            match &d.span {
                Some(span) => {
                    let (line, col) = self.line_col(span.start);
                    out.push_str(&format!("  --> {}:{}:{}\n", self.file, line, col));
                    let text = self.source.lines().nth(line - 1).unwrap_or("");
                    let gutter = line.to_string().len();
                    let width = span_width(&self.source, span, text, col);
                    out.push_str(&format!("{:gutter$} |\n", ""));
                    out.push_str(&format!("{line} | {text}\n"));
                    out.push_str(&format!("{:gutter$} | {}{}\n", "", " ".repeat(col - 1), "^".repeat(width)));
                }
                None => out.push_str(&format!("  --> {}\n", self.file)),
            }
            if !d.key.is_empty() {
                out.push_str(&format!("  = key: {}\n", d.key));
            }
            if let Some(e) = &d.expected {
                out.push_str(&format!("  = expected: {e}\n"));
            }
            if let Some(h) = &d.hint {
                out.push_str(&format!("  = hint: {h}\n"));
            }
            out.push('\n');
        }
        let n = self.errors.len();
        out.push_str(&format!(
            "{n} input error{} in {}; nothing was computed or written\n",
            if n == 1 { "" } else { "s" },
            self.file
        ));
        out
    }
}

impl fmt::Display for InputErrors {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.render())
    }
}

impl std::error::Error for InputErrors {}

/// Line and column (1-based, column in characters) of a byte offset in `source`.
pub fn line_col(source: &str, offset: usize) -> (usize, usize) {
    let offset = offset.min(source.len());
    let mut line = 1;
    let mut start = 0;
    for (i, c) in source.char_indices() {
        if i >= offset {
            break;
        }
        if c == '\n' {
            line += 1;
            start = i + 1;
        }
    }
    let col = source.get(start..offset).map(|s| s.chars().count()).unwrap_or(0) + 1;
    (line, col)
}

/// Marker width: the span on its first line, at least one character.
fn span_width(source: &str, span: &Range<usize>, line_text: &str, col: usize) -> usize {
    let end = span.end.min(source.len());
    let covered = source.get(span.start..end).unwrap_or("");
    let first_line = covered.split('\n').next().unwrap_or("");
    let rest = line_text.chars().count().saturating_sub(col - 1);
    first_line.chars().count().clamp(1, rest.max(1))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn renders_line_column_marker_expected_and_hint() {
        let src = "[design]\ninternal_pressure = \"12 mm\"\n";
        let start = src.find("\"12").unwrap();
        let d = Diagnostic::new("design.internal_pressure", Some(start..start + 7), "`mm` is not a unit of pressure")
            .expected("a pressure")
            .hint("write e.g. \"1.0 MPa\"");
        let text = InputErrors::one("case.toml", src, d).render();
        assert!(text.contains("--> case.toml:2:21"), "{text}");
        assert!(text.contains("2 | internal_pressure = \"12 mm\""));
        assert!(text.contains("^^^^^^^"));
        assert!(text.contains("= expected: a pressure"));
        assert!(text.contains("= hint: write"));
    }

    #[test]
    fn line_col_counts_characters() {
        assert_eq!(line_col("ab\ncd", 4), (2, 2));
        assert_eq!(line_col("°C\nx", 4), (2, 1));
        assert_eq!(line_col("abc", 99), (1, 4));
    }
}
