//! The template set of a package: the defaults embedded in the binary, with
//! any file of a user's template folder overriding the default of the same name.

use std::collections::BTreeMap;
use std::fmt;
use std::path::Path;
use std::sync::OnceLock;

/// The entry template that includes the others.
pub const ENTRY: &str = "package.md.tera";

/// The default templates, embedded so that the binary works alone.
pub const DEFAULTS: [(&str, &str); 8] = [
    ("package.md.tera", include_str!("../../report-templates/package.md.tera")),
    ("cover.md.tera", include_str!("../../report-templates/cover.md.tera")),
    ("sign-off.md.tera", include_str!("../../report-templates/sign-off.md.tera")),
    ("history.md.tera", include_str!("../../report-templates/history.md.tera")),
    ("summary.md.tera", include_str!("../../report-templates/summary.md.tera")),
    ("component.md.tera", include_str!("../../report-templates/component.md.tera")),
    ("cautions.md.tera", include_str!("../../report-templates/cautions.md.tera")),
    ("appendix.md.tera", include_str!("../../report-templates/appendix.md.tera")),
];

/// A complete set of templates by file name.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TemplateSet {
    /// Template text by file name (read-only after construction: the parsed
    /// templates and their hashes are cached on first use).
    files: BTreeMap<String, String>,
    /// Names that came from the user's folder.
    pub overridden: Vec<String>,
    cache: Cache,
}

/// Parsed templates and their hashes, made once per set: parsing dominated
/// the time of a compile before it was cached.
#[derive(Default)]
struct Cache {
    parsed: OnceLock<Result<tera::Tera, TemplateError>>,
    hashes: OnceLock<BTreeMap<String, String>>,
}

impl Clone for Cache {
    fn clone(&self) -> Self {
        Cache::default()
    }
}
impl PartialEq for Cache {
    fn eq(&self, _: &Cache) -> bool {
        true
    }
}
impl Eq for Cache {}
impl fmt::Debug for Cache {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("Cache")
    }
}

/// A template problem: which template, where, and what.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TemplateError {
    /// The template's file name.
    pub template: String,
    /// Line in the template, when known.
    pub line: Option<usize>,
    /// What went wrong.
    pub message: String,
}

impl fmt::Display for TemplateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.line {
            Some(l) => write!(f, "template `{}`, line {l}: {}", self.template, self.message),
            None => write!(f, "template `{}`: {}", self.template, self.message),
        }
    }
}

impl std::error::Error for TemplateError {}

impl Default for TemplateSet {
    fn default() -> Self {
        TemplateSet {
            files: DEFAULTS.iter().map(|(n, t)| (n.to_string(), t.to_string())).collect(),
            overridden: Vec::new(),
            cache: Cache::default(),
        }
    }
}

impl TemplateSet {
    /// The defaults with every `*.tera` file of `dir` laid over them.
    pub fn with_overrides(dir: &Path) -> Result<TemplateSet, TemplateError> {
        let mut set = TemplateSet::default();
        let entries = std::fs::read_dir(dir).map_err(|e| TemplateError {
            template: dir.display().to_string(),
            line: None,
            message: format!("cannot read the template folder: {e}"),
        })?;
        let mut names = Vec::new();
        for e in entries.filter_map(|e| e.ok()) {
            let name = e.file_name().to_string_lossy().into_owned();
            if name.ends_with(".tera") {
                names.push((name, e.path()));
            }
        }
        names.sort();
        for (name, path) in names {
            let text = std::fs::read_to_string(&path).map_err(|e| TemplateError {
                template: name.clone(),
                line: None,
                message: format!("cannot read: {e}"),
            })?;
            set.files.insert(name.clone(), text);
            set.overridden.push(name);
        }
        Ok(set)
    }

    /// SHA-256 of every template, by name (part of the package digest).
    pub fn hashes(&self) -> BTreeMap<String, String> {
        self.cache
            .hashes
            .get_or_init(|| {
                self.files
                    .iter()
                    .map(|(n, t)| (n.clone(), crate::package::manifest::sha256_hex(t.as_bytes())))
                    .collect()
            })
            .clone()
    }

    /// The template texts by file name.
    pub fn files(&self) -> &BTreeMap<String, String> {
        &self.files
    }

    /// Renders the entry template with a context.
    pub fn render(&self, context: &serde_json::Value) -> Result<String, TemplateError> {
        let tera = self
            .cache
            .parsed
            .get_or_init(|| {
                let mut tera = tera::Tera::default();
                // Templates are Markdown: no HTML escaping.
                tera.autoescape_on(vec![]);
                for (name, text) in &self.files {
                    tera.add_raw_template(name, text).map_err(|e| parse_error(name, text, &e))?;
                }
                Ok(tera)
            })
            .as_ref()
            .map_err(|e| e.clone())?;
        let ctx = tera::Context::from_value(context.clone()).map_err(|e| TemplateError {
            template: ENTRY.to_string(),
            line: None,
            message: format!("internal: context is not an object: {e}"),
        })?;
        tera.render(ENTRY, &ctx).map_err(|e| self.render_error(&e))
    }

    /// Turns a Tera render error into one that names the template, the line
    /// and the missing variable, searching the template texts for it.
    fn render_error(&self, e: &tera::Error) -> TemplateError {
        let chain = error_chain(e);
        // Tera names the innermost template in its messages as 'name'.
        let template = chain
            .iter()
            .rev()
            .find_map(|m| quoted(m, '\'').filter(|n| self.files.contains_key(n)))
            .unwrap_or_else(|| ENTRY.to_string());
        let variable = chain
            .iter()
            .find_map(|m| m.split_once("Variable `").and_then(|(_, r)| r.split_once('`')).map(|(v, _)| v.to_string()));
        let line = variable.as_ref().and_then(|v| {
            self.files.get(&template).and_then(|text| text.lines().position(|l| l.contains(v.as_str())).map(|i| i + 1))
        });
        let message = match &variable {
            Some(v) => format!("variable `{v}` is not defined for this template (see DEVELOPERS.md for the context)"),
            None => chain.join(": "),
        };
        TemplateError { template, line, message }
    }
}

fn error_chain(e: &tera::Error) -> Vec<String> {
    let mut out = vec![e.to_string()];
    let mut src = std::error::Error::source(e);
    while let Some(s) = src {
        out.push(s.to_string());
        src = s.source();
    }
    out
}

fn quoted(message: &str, q: char) -> Option<String> {
    let (_, rest) = message.split_once(q)?;
    let (inner, _) = rest.split_once(q)?;
    Some(inner.to_string())
}

fn parse_error(name: &str, _text: &str, e: &tera::Error) -> TemplateError {
    let chain = error_chain(e);
    let all = chain.join("\n");
    // Tera's parse errors carry "--> line:column" from its grammar.
    let line = all.split_once("--> ").and_then(|(_, r)| r.split(':').next()).and_then(|n| n.trim().parse().ok());
    let message = chain
        .last()
        .cloned()
        .unwrap_or_default()
        .lines()
        .rfind(|l| !l.trim().is_empty())
        .unwrap_or("syntax error")
        .trim()
        .to_string();
    TemplateError { template: name.to_string(), line, message: format!("syntax error: {message}") }
}
