//! Allowable stress on the sheet: given in the case, or looked up in a
//! library table with the two bracketing rows shown and the interpolation
//! recorded as a step.

use super::Condition;
use crate::calc::{CalcError, Sheet};
use crate::materials::STRESS_INTERPOLATION;
use crate::model::Material;
use crate::units::Quantity;

/// Records the allowable stress of `m` for `condition` and binds it under
/// `symbol` (`S` on component sheets, `S` or `S_t` on the vessel sheet).
pub fn allowable(s: &mut Sheet, m: &Material, condition: Condition, symbol: &str) -> Result<Quantity, CalcError> {
    let (at, given) = match condition {
        Condition::HotCorroded => ("design temperature", m.allowable_stress),
        Condition::NewCold => ("test temperature", m.test_allowable_stress),
    };
    let Some(lib) = &m.library else {
        return Ok(s.input(symbol, &format!("allowable stress of {} at {at}", m.name), given));
    };
    let b = match condition {
        Condition::HotCorroded => lib.design,
        Condition::NewCold => lib.test,
    };
    let table = &lib.material.table;
    let whence = format!("table of `{}` in {} (source: {})", lib.material.key, lib.file, table.source);
    s.input("T", at, b.temperature);
    if b.exact() {
        return Ok(s.record(
            symbol,
            &format!("allowable stress of {} at {at}, a tabulated row", m.name),
            STRESS_INTERPOLATION.clause,
            &format!(
                "row {}: {} in the {whence}",
                table.show_temperature(b.lower.temperature),
                table.show_stress(b.lower.stress)
            ),
            b.lower.stress,
        ));
    }
    let row = |which: &str, what: &str, r: crate::materials::StressRow| {
        format!(
            "{which} bracketing row ({}, {}) of the `{}` table: {what}",
            table.show_temperature(r.temperature),
            table.show_stress(r.stress),
            lib.material.key
        )
    };
    s.input("T_1", &row("lower", "temperature", b.lower), b.lower.temperature);
    s.input("S_1", &row("lower", "allowable stress", b.lower), b.lower.stress);
    s.input("T_2", &row("upper", "temperature", b.upper), b.upper.temperature);
    s.input("S_2", &row("upper", "allowable stress", b.upper), b.upper.stress);
    s.step_as(
        &STRESS_INTERPOLATION,
        symbol,
        &format!(
            "allowable stress of {} at {at}, linear interpolation between the bracketing rows of the {whence}",
            m.name
        ),
    )
}
