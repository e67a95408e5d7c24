//! The pipeline from case-file text to results, as one call for the CLI,
//! the report compiler and the tests. No I/O here: callers read the case
//! file, and library files named by a case come through a [`SourceLoader`]
//! the caller supplies ([`FsLoader`] on disk, [`MemoryLoader`] in tests).

use crate::calc::CalcError;
use crate::diag::{Diagnostic, InputErrors};
use crate::materials::parse_library;
use crate::model::{Design, Libraries};
use crate::rules::{self, Calculation};
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

/// A validated design with its calculation.
#[derive(Debug, Clone, PartialEq)]
pub struct Evaluated {
    /// The validated design.
    pub design: Design,
    /// The rule set's results.
    pub calculation: Calculation,
}

/// Reads the files a case refers to (materials libraries), by the path as
/// written in the case file.
pub trait SourceLoader {
    /// The text of the file at `path`, or why it cannot be read.
    fn load(&self, path: &Path) -> Result<String, String>;
    /// How the file is named in messages.
    fn name(&self, path: &Path) -> String {
        path.display().to_string()
    }
}

/// Loads files from disk, relative to a base folder (the case file's folder).
#[derive(Debug, Clone)]
pub struct FsLoader {
    /// The folder relative paths are resolved against.
    pub base: PathBuf,
}

impl FsLoader {
    /// A loader for files named relative to the folder of `case_file`.
    pub fn beside(case_file: &Path) -> FsLoader {
        let base = case_file.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new(".")).to_path_buf();
        FsLoader { base }
    }
}

impl SourceLoader for FsLoader {
    fn load(&self, path: &Path) -> Result<String, String> {
        std::fs::read_to_string(self.base.join(path))
            .map_err(|e| format!("{e} (looked for `{}`)", self.base.join(path).display()))
    }
    fn name(&self, path: &Path) -> String {
        self.base.join(path).display().to_string()
    }
}

/// Files held in memory, for tests and for callers that have the text already.
#[derive(Debug, Clone, Default)]
pub struct MemoryLoader {
    /// File text by path as written in the case.
    pub files: BTreeMap<PathBuf, String>,
}

impl MemoryLoader {
    /// Adds a file.
    pub fn with(mut self, path: &str, text: &str) -> MemoryLoader {
        self.files.insert(PathBuf::from(path), text.to_string());
        self
    }
}

impl SourceLoader for MemoryLoader {
    fn load(&self, path: &Path) -> Result<String, String> {
        self.files.get(path).cloned().ok_or_else(|| "no such file".to_string())
    }
}

/// A loader that reads nothing: for callers whose cases name no library.
#[derive(Debug, Clone, Copy, Default)]
pub struct NoFiles;

impl SourceLoader for NoFiles {
    fn load(&self, _path: &Path) -> Result<String, String> {
        Err("this caller reads no library files (use `pipeline::evaluate_with` with a loader)".into())
    }
}

/// Parses, validates and evaluates case-file text that names no library
/// file (a library named is reported as an input error). `file` names the
/// file in messages.
pub fn evaluate(file: &str, source: &str) -> Result<Evaluated, InputErrors> {
    evaluate_with(file, source, &NoFiles)
}

/// Parses, validates and evaluates case-file text, reading the libraries it
/// names through `loader`.
pub fn evaluate_with(file: &str, source: &str, loader: &dyn SourceLoader) -> Result<Evaluated, InputErrors> {
    let design = design_with(file, source, loader)?;
    let calculation = calculate(&design).map_err(|e| {
        InputErrors::one(
            file,
            source,
            Diagnostic::new("", None, e.to_string())
                .hint("the inputs lie outside the range where the code formulas give a result"),
        )
    })?;
    Ok(Evaluated { design, calculation })
}

/// Parses the case, loads and parses the libraries it names, and validates
/// the design. A library that does not parse is reported against the
/// library file itself.
pub fn design_with(file: &str, source: &str, loader: &dyn SourceLoader) -> Result<Design, InputErrors> {
    let case = crate::case::parse_case(file, source)?;
    let mut libraries = Libraries::new();
    for m in case.materials.values() {
        let Some(path) = &m.get_ref().library else {
            continue;
        };
        let written = path.get_ref();
        if libraries.contains_key(written) {
            continue;
        }
        let loaded = match loader.load(Path::new(written)) {
            Ok(text) => Ok(parse_library(&loader.name(Path::new(written)), &text)?),
            Err(why) => Err(why),
        };
        libraries.insert(written.clone(), loaded);
    }
    Design::from_case_with_libraries(&case, &libraries).map_err(|errors| InputErrors {
        file: file.to_string(),
        source: source.to_string(),
        errors,
    })
}

/// Runs the design's rule set.
pub fn calculate(design: &Design) -> Result<Calculation, CalcError> {
    let rules = rules::rule_set(&design.document.rules).ok_or_else(|| CalcError::OutOfRange {
        component: String::new(),
        message: format!("unknown rule set `{}`", design.document.rules),
    })?;
    rules.evaluate(design)
}
