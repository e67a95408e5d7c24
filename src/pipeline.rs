//! The pipeline from case-file text to results, as one call for the CLI,
//! the report compiler and the tests. No I/O here: callers read the file.

use crate::calc::CalcError;
use crate::diag::{Diagnostic, InputErrors};
use crate::model::Design;
use crate::rules::{self, Calculation};

/// A validated design with its calculation.
#[derive(Debug, Clone, PartialEq)]
pub struct Evaluated {
    /// The validated design.
    pub design: Design,
    /// The rule set's results.
    pub calculation: Calculation,
}

/// Parses, validates and evaluates case-file text. `file` names the file in messages.
pub fn evaluate(file: &str, source: &str) -> Result<Evaluated, InputErrors> {
    let design = Design::from_source(file, source)?;
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

/// Runs the design's rule set.
pub fn calculate(design: &Design) -> Result<Calculation, CalcError> {
    let rules = rules::rule_set(&design.document.rules).ok_or_else(|| CalcError::OutOfRange {
        component: String::new(),
        message: format!("unknown rule set `{}`", design.document.rules),
    })?;
    rules.evaluate(design)
}
