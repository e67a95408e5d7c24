//! The step engine: every computed quantity is a recorded [`Step`], every
//! judgement a recorded [`Check`].
//!
//! Architecture invariant: a number reaches a report only as the value of a
//! step or an input; the step's formula text, its substitution and its value
//! all come from one [`Formula`] definition evaluated by [`Sheet::step`].

use crate::expr::{self, Env, Expr};
use crate::units::{Kind, Quantity, UnitSystem};
use serde::Serialize;
use std::fmt;

/// One code formula, defined once: identity, clause, symbolic text and the
/// kind of its result. The text is parsed and evaluated; nothing else
/// computes the value.
#[derive(Debug)]
pub struct Formula {
    /// Stable identifier (`ug27-c1-thickness`).
    pub id: &'static str,
    /// Symbol of the result (`t`, `P_a`).
    pub symbol: &'static str,
    /// Code clause cited beside the step.
    pub clause: &'static str,
    /// The right-hand side in the expression language.
    pub text: &'static str,
    /// Kind of the result, checked at every evaluation.
    pub result: Kind,
}

impl Formula {
    /// The parsed right-hand side.
    pub fn expr(&self) -> Result<Expr, CalcError> {
        expr::parse(self.text).map_err(|e| CalcError::Formula { id: self.id, message: e.0 })
    }
}

/// A computed quantity with its full derivation.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Step {
    /// Symbol of the result as shown (`t`, `Pa`).
    pub symbol: String,
    /// Short description in words.
    pub description: String,
    /// Code clause, or "input" / "derived" for non-code steps.
    pub clause: String,
    /// Formula id, when computed by a formula.
    pub formula_id: Option<String>,
    /// The symbolic formula (`t = P·R/(S·E − 0.6·P)`), empty for inputs.
    pub formula: String,
    /// The formula with values and units substituted, empty for inputs.
    pub substituted: String,
    /// The result.
    pub quantity: Quantity,
}

/// A judgement: required against provided, with the margin.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Check {
    /// What is checked, in words.
    pub name: String,
    /// Code clause.
    pub clause: String,
    /// The limit (for a "provided ≥ required" check, the required value).
    pub required: Option<Quantity>,
    /// The value the design provides.
    pub provided: Option<Quantity>,
    /// Whether the check is satisfied.
    pub pass: bool,
    /// `provided − required` for "at least" checks, `required − provided` for
    /// "at most" checks: positive is spare capacity.
    pub margin: Option<Quantity>,
    /// How the comparison reads (`≥`, `≤`, or words for applicability checks).
    pub relation: String,
    /// The consequence in words, stated in the report when the check fails.
    pub note: String,
    /// Applicability checks state limits of the rules rather than strength.
    pub applicability: bool,
}

/// Errors of the calculation stage. They are programming errors in a rule
/// (a formula that does not parse or has the wrong dimension) or arithmetic
/// that left the real numbers (for example a negative denominator for an
/// extreme input); the CLI reports them as input errors naming the component.
#[derive(Debug, Clone, PartialEq)]
pub enum CalcError {
    /// A formula failed to parse or evaluate.
    Formula {
        /// The formula id.
        id: &'static str,
        /// What went wrong.
        message: String,
    },
    /// The arithmetic gave no finite positive result for these inputs.
    OutOfRange {
        /// The component id.
        component: String,
        /// What went wrong, in words.
        message: String,
    },
}

impl fmt::Display for CalcError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CalcError::Formula { id, message } => {
                write!(f, "internal error in formula `{id}`: {message}")
            }
            CalcError::OutOfRange { component, message } => {
                write!(f, "component `{component}`: {message}")
            }
        }
    }
}

impl std::error::Error for CalcError {}

/// Which side of its bound a checked value must lie on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Bound {
    /// provided ≥ bound.
    AtLeast,
    /// provided ≤ bound.
    AtMost,
}

/// A calculation sheet for one component: the symbols known so far and the
/// recorded steps and checks.
#[derive(Debug, Clone)]
pub struct Sheet {
    /// Component id, for error messages.
    pub component: String,
    units: UnitSystem,
    env: Env,
    /// The steps in the order they were made.
    pub steps: Vec<Step>,
    /// The checks in the order they were made.
    pub checks: Vec<Check>,
}

impl Sheet {
    /// An empty sheet that shows values in `units`.
    pub fn new(component: &str, units: UnitSystem) -> Sheet {
        Sheet { component: component.to_string(), units, env: Env::new(), steps: Vec::new(), checks: Vec::new() }
    }

    /// The unit system of the sheet.
    pub fn units(&self) -> UnitSystem {
        self.units
    }

    /// Records an input value under `symbol`.
    pub fn input(&mut self, symbol: &str, description: &str, q: Quantity) -> Quantity {
        self.env.insert(symbol.to_string(), q);
        self.steps.push(Step {
            symbol: expr::display_symbol(symbol),
            description: description.to_string(),
            clause: "input".to_string(),
            formula_id: None,
            formula: String::new(),
            substituted: String::new(),
            quantity: q,
        });
        q
    }

    /// Records a value taken from a table or decided by a rule rather than
    /// computed by a formula (a Table UW-12 look-up, the choice of a
    /// commercial thickness), with the clause and the reasoning in `formula`,
    /// and binds it under `symbol`.
    pub fn record(&mut self, symbol: &str, description: &str, clause: &str, formula: &str, q: Quantity) -> Quantity {
        self.env.insert(symbol.to_string(), q);
        self.steps.push(Step {
            symbol: expr::display_symbol(symbol),
            description: description.to_string(),
            clause: clause.to_string(),
            formula_id: None,
            formula: formula.to_string(),
            substituted: String::new(),
            quantity: q,
        });
        q
    }

    /// Records a value chosen from earlier results (a minimum over
    /// components, say) with the rule of choice written out in `formula` and
    /// the values compared in `substituted`.
    pub fn derived(
        &mut self,
        symbol: &str,
        description: &str,
        clause: &str,
        formula: &str,
        substituted: &str,
        q: Quantity,
    ) -> Quantity {
        self.env.insert(symbol.to_string(), q);
        let shown = expr::display_symbol(symbol);
        self.steps.push(Step {
            symbol: shown.clone(),
            description: description.to_string(),
            clause: clause.to_string(),
            formula_id: None,
            formula: format!("{shown} = {formula}"),
            substituted: format!("{shown} = {substituted}"),
            quantity: q,
        });
        q
    }

    /// Sets a symbol without recording a step (for a value already shown
    /// under another name on the same sheet).
    pub fn bind(&mut self, symbol: &str, q: Quantity) {
        self.env.insert(symbol.to_string(), q);
    }

    /// The current value of a symbol.
    pub fn get(&self, symbol: &str) -> Option<Quantity> {
        self.env.get(symbol).copied()
    }

    /// Evaluates a formula with the current symbols, records the step and
    /// binds the result to the formula's symbol (and to `bind_as` if given).
    pub fn step(&mut self, f: &Formula, description: &str) -> Result<Quantity, CalcError> {
        self.step_as(f, f.symbol, description)
    }

    /// Like [`step`](Self::step) but binds and shows the result under `symbol`.
    pub fn step_as(&mut self, f: &Formula, symbol: &str, description: &str) -> Result<Quantity, CalcError> {
        let e = f.expr()?;
        let v = e.eval(&self.env).map_err(|err| CalcError::Formula { id: f.id, message: err.0 })?;
        if v.dim != f.result.dim() {
            return Err(CalcError::Formula {
                id: f.id,
                message: format!("result has dimension {:?}, expected {:?}", v.dim, f.result),
            });
        }
        if !v.value.is_finite() {
            return Err(CalcError::OutOfRange {
                component: self.component.clone(),
                message: format!("{description} ({}) is not a finite number for these inputs", f.id),
            });
        }
        let q = Quantity::new(v.value, f.result);
        let shown = expr::display_symbol(symbol);
        let step = Step {
            symbol: shown.clone(),
            description: description.to_string(),
            clause: f.clause.to_string(),
            formula_id: Some(f.id.to_string()),
            formula: format!("{shown} = {}", e.symbolic()),
            substituted: format!("{shown} = {}", e.substituted(&self.env, self.units)),
            quantity: q,
        };
        self.steps.push(step);
        self.env.insert(symbol.to_string(), q);
        Ok(q)
    }

    /// Records a "provided ≥ required" check.
    pub fn check_at_least(
        &mut self,
        name: &str,
        clause: &str,
        required: Quantity,
        provided: Quantity,
        note: &str,
    ) -> bool {
        self.compare(name, clause, required, provided, note, Bound::AtLeast, false)
    }

    /// Records a "provided ≤ limit" check.
    pub fn check_at_most(
        &mut self,
        name: &str,
        clause: &str,
        limit: Quantity,
        provided: Quantity,
        note: &str,
        applicability: bool,
    ) -> bool {
        self.compare(name, clause, limit, provided, note, Bound::AtMost, applicability)
    }

    /// Records an applicability check of "at least" form.
    pub fn check_at_least_limit(
        &mut self,
        name: &str,
        clause: &str,
        limit: Quantity,
        provided: Quantity,
        note: &str,
    ) -> bool {
        self.compare(name, clause, limit, provided, note, Bound::AtLeast, true)
    }

    /// The one comparison behind every numeric check: a relative tolerance of
    /// 1e-12 (plus 1e-15 absolute) absorbs binary noise at the limit itself, and
    /// the margin is positive when there is spare capacity.
    #[allow(clippy::too_many_arguments)]
    fn compare(
        &mut self,
        name: &str,
        clause: &str,
        bound: Quantity,
        provided: Quantity,
        note: &str,
        kind: Bound,
        applicability: bool,
    ) -> bool {
        let (pass, margin, relation) = match kind {
            Bound::AtLeast => {
                (provided.value >= bound.value * (1.0 - 1e-12) - 1e-15, provided.value - bound.value, "≥")
            }
            Bound::AtMost => (provided.value <= bound.value * (1.0 + 1e-12) + 1e-15, bound.value - provided.value, "≤"),
        };
        self.checks.push(Check {
            name: name.to_string(),
            clause: clause.to_string(),
            required: Some(bound),
            provided: Some(provided),
            pass,
            margin: Some(Quantity::new(margin, bound.kind)),
            relation: relation.to_string(),
            note: note.to_string(),
            applicability,
        });
        pass
    }

    /// Records a failed applicability statement with no numbers (a rule
    /// that Knuckle does not evaluate for this case).
    pub fn not_covered(&mut self, name: &str, clause: &str, note: &str) {
        self.checks.push(Check {
            name: name.to_string(),
            clause: clause.to_string(),
            required: None,
            provided: None,
            pass: false,
            margin: None,
            relation: "not evaluated".to_string(),
            note: note.to_string(),
            applicability: true,
        });
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const DOUBLE: Formula =
        Formula { id: "test-double", symbol: "y", clause: "test", text: "2*x", result: Kind::Length };
    const WRONG: Formula = Formula { id: "test-wrong", symbol: "y", clause: "test", text: "x*x", result: Kind::Length };

    #[test]
    fn step_records_formula_substitution_and_value() {
        let mut s = Sheet::new("c", UnitSystem::Si);
        s.input("x", "a length", Quantity::mm(4.0));
        let y = s.step(&DOUBLE, "twice x").unwrap();
        assert!((y.value - 0.008).abs() < 1e-15);
        let last = s.steps.last().unwrap();
        assert_eq!(last.formula, "y = 2·x");
        assert_eq!(last.substituted, "y = 2 · 4 mm");
        assert_eq!(s.get("y"), Some(y));
    }

    #[test]
    fn wrong_result_dimension_is_an_error() {
        let mut s = Sheet::new("c", UnitSystem::Si);
        s.input("x", "a length", Quantity::mm(4.0));
        assert!(matches!(s.step(&WRONG, "bad"), Err(CalcError::Formula { .. })));
    }

    #[test]
    fn checks_record_margins() {
        let mut s = Sheet::new("c", UnitSystem::Si);
        assert!(s.check_at_least("t", "UG-16", Quantity::mm(5.0), Quantity::mm(6.0), ""));
        assert!(!s.check_at_most("r", "x", Quantity::mm(5.0), Quantity::mm(6.0), "", true));
        assert!((s.checks[0].margin.unwrap().value - 0.001).abs() < 1e-15);
        assert!((s.checks[1].margin.unwrap().value + 0.001).abs() < 1e-15);
    }
}
