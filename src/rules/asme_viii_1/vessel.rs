//! Vessel-level results: the governing MAWP at the top and the test
//! pressures of UG-99(b) (hydrostatic) and UG-100 (pneumatic).

use super::formulas as f;
use crate::calc::{CalcError, Sheet};
use crate::model::Design;
use crate::rules::{ComponentResult, VesselResult};
use crate::units::{Kind, Quantity};

/// Evaluates the vessel from its component results.
pub fn evaluate(design: &Design, components: &[ComponentResult]) -> Result<VesselResult, CalcError> {
    let mut s = Sheet::new("vessel", design.units);
    s.input("P_d", "design pressure at the vessel top", design.conditions.pressure);

    // The lowest MAWP referred to the top governs; components without a MAWP
    // (rules not applicable) cannot govern but make the vessel not acceptable.
    let mut governing: Option<(&ComponentResult, Quantity)> = None;
    for c in components {
        if let Some(top) = c.mawp_top {
            if governing.is_none_or(|(_, g)| top.value < g.value) {
                governing = Some((c, top));
            }
        }
    }
    let missing: Vec<&str> = components.iter().filter(|c| c.mawp_top.is_none()).map(|c| c.id.as_str()).collect();
    let (gov_id, mawp) = match governing {
        Some((c, top)) => (c.id.clone(), top),
        None => (String::new(), Quantity::new(0.0, Kind::Pressure)),
    };
    let words = if gov_id.is_empty() {
        "vessel MAWP at the top: no component has a MAWP".to_string()
    } else {
        format!("vessel MAWP at the top: the lowest component MAWP referred to the top, governed by `{gov_id}`")
    };
    s.input("P_v", &words, mawp);
    s.check_at_least(
        "vessel MAWP covers the design pressure",
        "UG-98",
        design.conditions.pressure,
        mawp,
        "the vessel MAWP is below the design pressure",
    );
    if !missing.is_empty() {
        s.not_covered(
            "every component has a MAWP",
            "UG-98",
            &format!("no MAWP could be established for: {}; the vessel MAWP is not demonstrated", missing.join(", ")),
        );
    }

    // Lowest ratio of allowable stress at test temperature to that at design
    // temperature over the materials used (UG-99(b)).
    let mut used: Vec<&str> = design.components.iter().map(|c| c.material.as_str()).collect();
    used.sort();
    used.dedup();
    let mut lowest: Option<(f64, &str)> = None;
    for key in used {
        let Some(m) = design.materials.get(key) else {
            continue;
        };
        s.input("S_t", &format!("allowable stress of {} at test temperature", m.name), m.test_allowable_stress);
        s.input("S", &format!("allowable stress of {} at design temperature", m.name), m.allowable_stress);
        let r = s.step(&f::STRESS_RATIO, &format!("stress ratio of {}", m.name))?;
        if lowest.is_none_or(|(v, _)| r.value < v) {
            lowest = Some((r.value, key));
        }
    }
    let (ratio, _) = lowest.unwrap_or((1.0, ""));
    s.input("LSR", "lowest stress ratio of the materials used", Quantity::new(ratio, Kind::Dimensionless));
    let hydro = s.step(&f::HYDROTEST, "minimum hydrostatic test pressure at the top")?;
    let pneu = s.step(&f::PNEUMATIC, "minimum pneumatic test pressure at the top")?;
    let acceptable = s.checks.iter().all(|k| k.pass);
    Ok(VesselResult {
        steps: s.steps,
        checks: s.checks,
        mawp,
        governing_component: gov_id,
        stress_ratio: ratio,
        hydrotest_pressure: hydro,
        pneumatic_test_pressure: pneu,
        acceptable,
    })
}
