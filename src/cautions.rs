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
/// those of the data it used (libraries, tables held from memory), each
/// limit of what was evaluated and each failed check in words.
pub fn all(design: &Design, calc: &Calculation) -> Vec<String> {
    let mut out: Vec<String> = STANDING.iter().map(|s| s.to_string()).collect();
    out.push(calc.clause_note.clone());
    out.extend(data(design, calc));
    for c in &calc.components {
        out.extend(c.limits.iter().cloned());
    }
    for (id, k) in calc.failed_checks() {
        let kind = if k.applicability { "Limit of applicability not met" } else { "Check failed" };
        out.push(format!("{kind} for `{id}`: {} ({}): {}.", k.name, k.clause, k.note));
    }
    out
}

/// The cautions of the data a calculation used: each materials library that
/// states one, the Table UW-12 and pipe schedule tables Knuckle holds from
/// memory, and totals that leave components out. Also printed by `check`.
pub fn data(design: &Design, calc: &Calculation) -> Vec<String> {
    let mut out = Vec::new();
    let mut libraries: Vec<(&str, &str, Vec<&str>)> = Vec::new();
    for m in design.materials.values() {
        let Some(l) = &m.library else { continue };
        let Some(caution) = &l.caution else { continue };
        match libraries.iter_mut().find(|(f, _, _)| *f == l.file) {
            Some(entry) => entry.2.push(&m.key),
            None => libraries.push((&l.file, caution, vec![&m.key])),
        }
    }
    for (file, caution, keys) in libraries {
        out.push(format!(
            "Materials library `{file}` (used for {}): {caution}.",
            keys.iter().map(|k| format!("`{k}`")).collect::<Vec<_>>().join(", ")
        ));
    }
    let described: Vec<&str> = design.components.iter().filter(|c| c.joint.is_some()).map(|c| c.id.as_str()).collect();
    if !described.is_empty() {
        out.push(format!(
            "Joint efficiencies of {} were looked up in Table UW-12 as Knuckle holds it, written from memory of the code; verify them against the edition in force.",
            described.join(", ")
        ));
    }
    let piped: Vec<&str> = calc
        .components
        .iter()
        .filter(|c| {
            c.selected_thickness.is_some()
                && design.components.iter().any(|d| d.id == c.id && d.is_pipe() && d.pipe_size.is_some())
        })
        .map(|c| c.id.as_str())
        .collect();
    if !piped.is_empty() {
        out.push(format!(
            "Pipe walls of {} were selected from a schedule table written from memory of ASME B36.10M; verify the wall against the standard before ordering.",
            piped.join(", ")
        ));
    }
    if !calc.vessel.totals_exclude.is_empty() && calc.vessel.empty_mass.is_some() {
        out.push(format!(
            "The vessel's empty mass and volume leave out {}: their mass or volume is not computed in this build.",
            calc.vessel.totals_exclude.join(", ")
        ));
    }
    out
}
