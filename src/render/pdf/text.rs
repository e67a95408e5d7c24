//! Breaking styled text into lines using the real advance widths of the faces.
//!
//! Lines are broken greedily at spaces and set ragged right, which reads well
//! in narrow table cells and keeps word spacing even. A word wider than the
//! line is broken between characters, so no input can overflow a column.

use super::blocks::Span;
use super::fonts::{metrics, printable, Face, FaceMetrics};

/// Inline code is set a little smaller than the text around it, because the
/// monospaced face looks larger at the same nominal size.
pub const CODE_SCALE: f32 = 0.9;

/// The style a run of spans starts from (a heading is bold throughout, a
/// caption italic, body text neither).
#[derive(Debug, Clone, Copy)]
pub struct BaseStyle {
    /// Size in points.
    pub size: f32,
    /// Everything bold.
    pub bold: bool,
    /// Everything italic.
    pub italic: bool,
}

/// A piece of one line in one face and size, placed `dx` points from the
/// start of the line.
#[derive(Debug, Clone, PartialEq)]
pub struct Frag {
    /// Offset from the line start, pt.
    pub dx: f32,
    /// Face to draw with.
    pub face: Face,
    /// Size, pt.
    pub size: f32,
    /// The text (already reduced to characters the face can show).
    pub text: String,
}

/// One laid-out line.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct TextLine {
    /// The fragments, left to right.
    pub frags: Vec<Frag>,
    /// Total advance width, pt.
    pub width: f32,
}

impl TextLine {
    /// Appends text in a face, merging with the last fragment when the style
    /// matches so that a line is drawn with as few text operations as possible.
    fn push(&mut self, faces: &[FaceMetrics], face: Face, size: f32, text: &str) {
        let w = metrics(faces, face).width(text, size);
        match self.frags.last_mut() {
            Some(last) if last.face == face && last.size == size => last.text.push_str(text),
            _ => self.frags.push(Frag { dx: self.width, face, size, text: text.to_string() }),
        }
        self.width += w;
    }

    /// The face and size a word space before `next` is set in: the style of
    /// the text around it, never the monospaced face when the other side is
    /// running text (a code-wide space after inline code looks like a gap).
    fn space_style(&self, next: Option<&Piece>) -> Option<(Face, f32)> {
        let last = self.frags.last()?;
        match next {
            Some(n) if last.face == Face::Mono && n.face != Face::Mono => Some((n.face, n.size)),
            _ => Some((last.face, last.size)),
        }
    }

    fn is_empty(&self) -> bool {
        self.frags.is_empty()
    }
}

/// A piece of a word in one face.
#[derive(Debug, Clone)]
struct Piece {
    face: Face,
    size: f32,
    text: String,
    width: f32,
}

/// A word: text between spaces, possibly in several styles (`**t**_min`).
#[derive(Debug, Clone, Default)]
pub struct Word {
    pieces: Vec<Piece>,
    width: f32,
    space_before: bool,
    break_before: bool,
}

fn face_and_size(span: &Span, base: BaseStyle) -> (Face, f32) {
    if span.code {
        (Face::Mono, base.size * CODE_SCALE)
    } else {
        (Face::styled(base.bold || span.bold, base.italic || span.italic), base.size)
    }
}

/// Splits spans into words, remembering where spaces and hard breaks were.
/// Table cells are measured and then broken from the same words, so the
/// split is done once and handed to [`min_max_width_of`] and [`wrap_words`].
pub fn words(faces: &[FaceMetrics], spans: &[Span], base: BaseStyle) -> Vec<Word> {
    let mut out = Vec::new();
    let mut word = Word::default();
    let mut space = false;
    let mut hard = false;
    let flush = |word: &mut Word, out: &mut Vec<Word>| {
        if !word.pieces.is_empty() {
            out.push(std::mem::take(word));
        }
    };
    for span in spans {
        if span.is_break() {
            flush(&mut word, &mut out);
            hard = true;
            space = false;
            continue;
        }
        let (face, size) = face_and_size(span, base);
        let m = metrics(faces, face);
        for ch in printable(faces, face, &span.text).chars() {
            if ch == ' ' || (ch.is_whitespace() && ch != '\u{00A0}' && ch != '\u{202F}') {
                flush(&mut word, &mut out);
                space = true;
                continue;
            }
            if word.pieces.is_empty() {
                word.space_before = space;
                word.break_before = hard;
                space = false;
                hard = false;
            }
            let w = m.advance_em(ch) * size;
            match word.pieces.last_mut() {
                Some(p) if p.face == face && p.size == size => {
                    p.text.push(ch);
                    p.width += w;
                }
                _ => word.pieces.push(Piece { face, size, text: ch.to_string(), width: w }),
            }
            word.width += w;
        }
    }
    flush(&mut word, &mut out);
    out
}

/// Breaks styled spans into lines no wider than `width` points.
/// Always returns at least one line (empty for empty input), so every caller
/// can rely on a line height being taken.
pub fn wrap(faces: &[FaceMetrics], spans: &[Span], base: BaseStyle, width: f32) -> Vec<TextLine> {
    wrap_words(faces, &words(faces, spans, base), width)
}

/// [`wrap`] for text already split by [`words`].
pub fn wrap_words(faces: &[FaceMetrics], words: &[Word], width: f32) -> Vec<TextLine> {
    // A non-positive width would break after every character; one character
    // per line is the most that can be done, so treat it as that.
    let width = width.max(1.0);
    let mut lines = Vec::new();
    let mut cur = TextLine::default();
    let slack = 0.01;
    for word in words {
        if word.break_before {
            lines.push(std::mem::take(&mut cur));
        }
        let space_style = if word.space_before { cur.space_style(word.pieces.first()) } else { None };
        let space = space_style.map_or(0.0, |(f, size)| metrics(faces, f).advance_em(' ') * size);
        if !cur.is_empty() && cur.width + space + word.width > width + slack {
            lines.push(std::mem::take(&mut cur));
        } else if let Some((face, size)) = space_style {
            cur.push(faces, face, size, " ");
        }
        if word.width <= width + slack {
            for p in &word.pieces {
                cur.push(faces, p.face, p.size, &p.text);
            }
            continue;
        }
        // An overlong word (a long path, a hash, a formula without spaces) is
        // broken between characters.
        for p in &word.pieces {
            let m = metrics(faces, p.face);
            let mut buf = [0u8; 4];
            for ch in p.text.chars() {
                let w = m.advance_em(ch) * p.size;
                if !cur.is_empty() && cur.width + w > width + slack {
                    lines.push(std::mem::take(&mut cur));
                }
                cur.push(faces, p.face, p.size, ch.encode_utf8(&mut buf));
            }
        }
    }
    if !cur.is_empty() || lines.is_empty() {
        lines.push(cur);
    }
    lines
}

/// The narrowest and the natural width of a run of text split by [`words`]
/// in style `base`: the widest word, and the whole text on one line (each
/// hard-broken line measured separately). Used to size table columns.
pub fn min_max_width_of(faces: &[FaceMetrics], words: &[Word], base: BaseStyle) -> (f32, f32) {
    let mut min: f32 = 0.0;
    let mut max: f32 = 0.0;
    let mut line: f32 = 0.0;
    let space = metrics(faces, Face::styled(base.bold, base.italic)).advance_em(' ') * base.size;
    let mut first = true;
    for word in words {
        if word.break_before {
            max = max.max(line);
            line = 0.0;
            first = true;
        }
        min = min.max(word.width);
        if !first && word.space_before {
            line += space;
        }
        line += word.width;
        first = false;
    }
    (min, max.max(line))
}

/// Breaks a code block into lines of at most `width` points, keeping every
/// space (indentation matters in code) and breaking long lines between
/// characters.
pub fn wrap_code(faces: &[FaceMetrics], code: &str, size: f32, width: f32) -> Vec<String> {
    let width = width.max(1.0);
    let m = metrics(faces, Face::Mono);
    let mut out = Vec::new();
    for source in code.split('\n') {
        let text = printable(faces, Face::Mono, source.trim_end_matches('\r'));
        let mut cur = String::new();
        let mut w = 0.0;
        for ch in text.chars() {
            let cw = m.advance_em(ch) * size;
            if !cur.is_empty() && w + cw > width + 0.01 {
                out.push(std::mem::take(&mut cur));
                w = 0.0;
            }
            cur.push(ch);
            w += cw;
        }
        out.push(cur);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::render::pdf::fonts::faces;

    fn span(text: &str) -> Span {
        Span { text: text.to_string(), bold: false, italic: false, code: false }
    }

    const BODY: BaseStyle = BaseStyle { size: 10.0, bold: false, italic: false };

    #[test]
    fn lines_never_exceed_the_width_and_keep_every_word() {
        let faces = faces().expect("faces");
        let text = "The required thickness of the cylindrical shell under internal pressure follows from the circumferential stress.";
        // Every word of the text is narrower than 90 pt at 10 pt, so none is broken.
        for width in [90.0, 150.0, 400.0] {
            let lines = wrap(faces, &[span(text)], BODY, width);
            for l in &lines {
                assert!(l.width <= width + 0.02, "{} > {width}", l.width);
            }
            let joined: Vec<String> = lines.iter().map(|l| l.frags.iter().map(|f| f.text.as_str()).collect()).collect();
            assert_eq!(joined.join(" "), text);
        }
    }

    #[test]
    fn overlong_words_are_broken_between_characters() {
        let faces = faces().expect("faces");
        let word = "a".repeat(300);
        let lines = wrap(faces, &[span(&word)], BODY, 50.0);
        assert!(lines.len() > 5);
        let total: usize = lines.iter().map(|l| l.frags[0].text.len()).sum();
        assert_eq!(total, 300);
        assert!(lines.iter().all(|l| l.width <= 50.02));
    }

    #[test]
    fn styles_change_the_face_and_code_is_smaller() {
        let faces = faces().expect("faces");
        let spans = [span("a "), Span { bold: true, ..span("b") }, Span { code: true, ..span("c") }];
        let lines = wrap(faces, &spans, BODY, 500.0);
        assert_eq!(lines.len(), 1);
        let faces_used: Vec<Face> = lines[0].frags.iter().map(|f| f.face).collect();
        assert_eq!(faces_used, vec![Face::Regular, Face::Bold, Face::Mono]);
        assert!((lines[0].frags[2].size - 9.0).abs() < 1e-6);
    }

    #[test]
    fn hard_breaks_start_new_lines_and_empty_input_gives_one_line() {
        let faces = faces().expect("faces");
        let lines = wrap(faces, &[span("one"), span("\n"), span("two")], BODY, 500.0);
        assert_eq!(lines.len(), 2);
        assert_eq!(wrap(faces, &[], BODY, 100.0).len(), 1);
        let (min, max) = min_max_width_of(faces, &words(faces, &[span("ab abcd")], BODY), BODY);
        assert!(min < max);
    }

    #[test]
    fn code_keeps_indentation_and_wraps_long_lines() {
        let faces = faces().expect("faces");
        let lines = wrap_code(faces, "  x = 1\n\ny", 8.0, 500.0);
        assert_eq!(lines, vec!["  x = 1", "", "y"]);
        let long = wrap_code(faces, &"x".repeat(200), 8.0, 100.0);
        assert!(long.len() > 3);
    }
}
