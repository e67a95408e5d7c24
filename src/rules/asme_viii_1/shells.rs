//! Cylindrical and spherical shells (and hemispherical heads): UG-27 with
//! the outside-radius forms of Appendix 1, 1-1 and the thick-wall forms of
//! Appendix 1, 1-2.
//!
//! The thin-wall formula is used while it is valid (pressure below the
//! paragraph's limit and thickness below the radius limit); otherwise the
//! thick-wall formula. Required thickness and MAWP apply the same test, so
//! the MAWP at the required thickness returns the design pressure.

use super::formulas as f;
use super::Condition;
use crate::calc::{CalcError, Formula, Sheet};
use crate::model::{Component, Diameter};
use crate::units::Quantity;

fn outside(c: &Component) -> bool {
    matches!(c.diameter, Diameter::Outside(_))
}

fn get(s: &Sheet, sym: &str) -> Result<Quantity, CalcError> {
    s.get(sym).ok_or(CalcError::Formula { id: "sheet", message: format!("symbol `{sym}` is not bound") })
}

/// Inside radius implied by the bound radius and a thickness.
fn inside_radius(s: &Sheet, c: &Component, t: f64) -> Result<f64, CalcError> {
    Ok(if outside(c) { get(s, "R_o")?.value - t } else { get(s, "R")?.value })
}

/// One thin/thick pair of thickness formulas for one stress direction.
struct ThicknessForms {
    limit: &'static Formula,
    thin: &'static Formula,
    thin_out: &'static Formula,
    z: &'static Formula,
    thick: &'static Formula,
    thick_out: &'static Formula,
    /// t ≤ ratio·R for the thin-wall formula.
    radius_ratio: f64,
    words: &'static str,
}

/// One thin/thick pair of MAWP formulas for one stress direction.
struct PressureForms {
    limit: &'static Formula,
    thin: &'static Formula,
    thin_out: &'static Formula,
    z: &'static Formula,
    z_out: &'static Formula,
    thick: &'static Formula,
    radius_ratio: f64,
    words: &'static str,
}

fn thickness(s: &mut Sheet, c: &Component, forms: &ThicknessForms) -> Result<Quantity, CalcError> {
    let p = get(s, "P")?;
    let limit = s.step(forms.limit, &format!("pressure limit of the thin-wall formula, {}", forms.words))?;
    let thin = if outside(c) { forms.thin_out } else { forms.thin };
    let t = s.step(thin, &format!("required thickness, {} (thin-wall formula)", forms.words))?;
    let r_in = inside_radius(s, c, t.value)?;
    let thin_valid = p.value <= limit.value && t.value <= forms.radius_ratio * r_in && t.value > 0.0;
    if thin_valid {
        return Ok(t);
    }
    // Outside the thin-wall limits the exact elastic (Lamé) forms of 1-2 apply.
    s.step(forms.z, "thick-wall factor")?;
    let thick = if outside(c) { forms.thick_out } else { forms.thick };
    let why = format!(
        "required thickness, {} (thick-wall formula: P > P_lim or t > {}·R with the thin-wall formula)",
        forms.words, forms.radius_ratio
    );
    s.step(thick, &why)
}

fn pressure(s: &mut Sheet, c: &Component, forms: &PressureForms, condition: Condition) -> Result<Quantity, CalcError> {
    let t = get(s, "t")?;
    let limit = s.step(forms.limit, &format!("pressure limit of the thin-wall formula, {}", forms.words))?;
    let thin = if outside(c) { forms.thin_out } else { forms.thin };
    let p = s.step(thin, &format!("MAWP, {}, {} (thin-wall formula)", forms.words, condition.words()))?;
    let r_in = inside_radius(s, c, t.value)?;
    if p.value <= limit.value && t.value <= forms.radius_ratio * r_in {
        return Ok(p);
    }
    let z = if outside(c) { forms.z_out } else { forms.z };
    s.step(z, "thick-wall factor from the thickness")?;
    let why = format!(
        "MAWP, {}, {} (thick-wall formula: t > {}·R or P > P_lim)",
        forms.words,
        condition.words(),
        forms.radius_ratio
    );
    s.step(forms.thick, &why)
}

const CIRC_T: ThicknessForms = ThicknessForms {
    limit: &f::CYL_CIRC_LIMIT,
    thin: &f::CYL_CIRC_T,
    thin_out: &f::CYL_CIRC_T_OUT,
    z: &f::CYL_CIRC_Z_T,
    thick: &f::CYL_CIRC_THICK_T,
    thick_out: &f::CYL_CIRC_THICK_T_OUT,
    radius_ratio: 0.5,
    words: "circumferential stress",
};
const LONG_T: ThicknessForms = ThicknessForms {
    limit: &f::CYL_LONG_LIMIT,
    thin: &f::CYL_LONG_T,
    thin_out: &f::CYL_LONG_T_OUT,
    z: &f::CYL_LONG_Z_T,
    thick: &f::CYL_LONG_THICK_T,
    thick_out: &f::CYL_LONG_THICK_T_OUT,
    radius_ratio: 0.5,
    words: "longitudinal stress",
};
const CIRC_P: PressureForms = PressureForms {
    limit: &f::CYL_CIRC_LIMIT,
    thin: &f::CYL_CIRC_P,
    thin_out: &f::CYL_CIRC_P_OUT,
    z: &f::CYL_Z_FROM_T,
    z_out: &f::CYL_Z_FROM_T_OUT,
    thick: &f::CYL_CIRC_THICK_P,
    radius_ratio: 0.5,
    words: "circumferential stress",
};
const LONG_P: PressureForms = PressureForms {
    limit: &f::CYL_LONG_LIMIT,
    thin: &f::CYL_LONG_P,
    thin_out: &f::CYL_LONG_P_OUT,
    z: &f::CYL_Z_FROM_T,
    z_out: &f::CYL_Z_FROM_T_OUT,
    thick: &f::CYL_LONG_THICK_P,
    radius_ratio: 0.5,
    words: "longitudinal stress",
};
const SPHERE_T: ThicknessForms = ThicknessForms {
    limit: &f::SPH_LIMIT,
    thin: &f::SPH_T,
    thin_out: &f::SPH_T_OUT,
    z: &f::SPH_Y_T,
    thick: &f::SPH_THICK_T,
    thick_out: &f::SPH_THICK_T_OUT,
    radius_ratio: 0.356,
    words: "membrane stress",
};
const SPHERE_P: PressureForms = PressureForms {
    limit: &f::SPH_LIMIT,
    thin: &f::SPH_P,
    thin_out: &f::SPH_P_OUT,
    z: &f::SPH_Y_FROM_T,
    z_out: &f::SPH_Y_FROM_T_OUT,
    thick: &f::SPH_THICK_P,
    radius_ratio: 0.356,
    words: "membrane stress",
};

/// Required thickness of a cylinder: the larger of the circumferential and
/// longitudinal stress thicknesses.
pub fn cylinder_thickness(s: &mut Sheet, c: &Component) -> Result<Quantity, CalcError> {
    thickness(s, c, &CIRC_T)?;
    thickness(s, c, &LONG_T)?;
    s.step(&f::GOVERNING_T, "required thickness: the larger of the two")
}

/// MAWP of a cylinder for the bound thickness `t`: the smaller of the two.
pub fn cylinder_mawp(s: &mut Sheet, c: &Component, condition: Condition) -> Result<Quantity, CalcError> {
    pressure(s, c, &CIRC_P, condition)?;
    pressure(s, c, &LONG_P, condition)?;
    s.step(&f::GOVERNING_P, &format!("MAWP, {}: the smaller of the two", condition.words()))
}

/// Required thickness of a sphere or hemispherical head.
pub fn sphere_thickness(s: &mut Sheet, c: &Component) -> Result<Quantity, CalcError> {
    thickness(s, c, &SPHERE_T)
}

/// MAWP of a sphere or hemispherical head for the bound thickness `t`.
pub fn sphere_mawp(s: &mut Sheet, c: &Component, condition: Condition) -> Result<Quantity, CalcError> {
    pressure(s, c, &SPHERE_P, condition)
}
