//! Conical sections under internal pressure: UG-32 and Appendix 1, 1-4(e),
//! valid for half-apex angles up to 30°.

use super::formulas as f;
use super::Condition;
use crate::calc::{CalcError, Sheet};
use crate::model::{Component, Diameter};
use crate::units::{Kind, Quantity, UnitSystem};

/// Largest half-apex angle the cone formula covers.
pub const MAX_HALF_APEX: f64 = std::f64::consts::PI / 6.0;

/// Required thickness at the large end, or `None` (with a failed
/// applicability check on the sheet) when the angle exceeds 30°.
pub fn thickness(
    s: &mut Sheet,
    c: &Component,
    alpha: Quantity,
    limits: &mut Vec<String>,
) -> Result<Option<Quantity>, CalcError> {
    s.input("alpha", "half-apex angle", alpha);
    limits.push(format!(
        "{}: reinforcement and discontinuity stresses at the cone-to-cylinder junctions (Appendix 1, 1-5) are not \
         evaluated; check them separately.",
        c.id
    ));
    if alpha.value > MAX_HALF_APEX * (1.0 + 1e-12) {
        s.not_covered(
            "half-apex angle within 30°",
            "UG-32, Appendix 1, 1-5(g)",
            &format!(
                "the half-apex angle is {}, above 30°: the cone formula of UG-32 does not apply; a special analysis \
                 per Appendix 1, 1-5(g) is required. No thickness or MAWP is reported for this component",
                UnitSystem::Si.display(alpha)
            ),
        );
        return Ok(None);
    }
    s.check_at_most(
        "half-apex angle within 30°",
        "UG-32",
        Quantity::new(MAX_HALF_APEX, Kind::Angle),
        alpha,
        "the cone formula of UG-32 is limited to half-apex angles of 30°",
        true,
    );
    super::heads::thin_formula_range(s, &f::CONE_PRESSURE_LIMIT, "conical section")?;
    let t = match c.diameter {
        Diameter::Inside(_) => s.step(&f::CONE_T, "required thickness at the large end")?,
        Diameter::Outside(_) => s.step(&f::CONE_T_OUT, "required thickness at the large end (outside diameter)")?,
    };
    Ok(Some(t))
}

/// MAWP of the cone for the bound thickness `t`.
pub fn mawp(s: &mut Sheet, c: &Component, condition: Condition) -> Result<Quantity, CalcError> {
    let words = format!("MAWP, {}", condition.words());
    match c.diameter {
        Diameter::Inside(_) => s.step(&f::CONE_P, &words),
        Diameter::Outside(_) => s.step(&f::CONE_P_OUT, &words),
    }
}
