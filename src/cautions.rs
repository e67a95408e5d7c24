//! The cautions every output carries, and the statements of every failed
//! check and limit of applicability. One source, so the terminal, the JSON
//! and the package say the same thing.

use crate::model::Design;
use crate::rules::Calculation;

/// The standing cautions, in every package, the README and `check` output.
pub const STANDING: [&str; 4] = [
    "This calculation supports, and never replaces, the judgement of a qualified engineer who takes responsibility for the design.",
    "Every figure must be verified against the edition of the design code in force for the job and against the requirements of the jurisdiction where the vessel is installed.",
    "The calculation is subject to review by a licensed or otherwise authorised engineer or inspector before it is used for construction, repair or operation.",
    "Scope: internal pressure on shells and formed heads only. Openings and nozzle reinforcement, external pressure, flanges, supports, wind, seismic and other loads of UG-22 are not evaluated here.",
];

/// Every caution for one calculation: the standing ones, the clause note,
/// each limit of what was evaluated and each failed check in words.
pub fn all(_design: &Design, calc: &Calculation) -> Vec<String> {
    let mut out: Vec<String> = STANDING.iter().map(|s| s.to_string()).collect();
    out.push(calc.clause_note.clone());
    for c in &calc.components {
        out.extend(c.limits.iter().cloned());
    }
    for (id, k) in calc.failed_checks() {
        let kind = if k.applicability { "Limit of applicability not met" } else { "Check failed" };
        out.push(format!("{kind} for `{id}`: {} ({}): {}.", k.name, k.clause, k.note));
    }
    out
}
