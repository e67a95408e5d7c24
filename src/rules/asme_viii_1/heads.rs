//! Formed heads: ellipsoidal (UG-32 and Appendix 1, 1-4(c)) and
//! torispherical (UG-32 and Appendix 1, 1-4(d)), with the shape limits of
//! UG-32 and the thin-head limit of Appendix 1, 1-4(f). Hemispherical heads
//! use the sphere formulas in [`super::shells`].

use super::formulas as f;
use super::Condition;
use crate::calc::{CalcError, Sheet};
use crate::model::{Component, ComponentKind, Diameter};
use crate::units::{Kind, Quantity};

/// Table UG-33.1: factor K1 for the equivalent spherical radius of an
/// ellipsoidal head, against D/2h (values from memory of the table; the
/// table itself says to interpolate between rows).
pub const K1_TABLE: [(f64, f64); 11] = [
    (1.0, 0.50),
    (1.2, 0.57),
    (1.4, 0.65),
    (1.6, 0.73),
    (1.8, 0.81),
    (2.0, 0.90),
    (2.2, 0.99),
    (2.4, 1.08),
    (2.6, 1.18),
    (2.8, 1.27),
    (3.0, 1.36),
];

/// K1 of Table UG-33.1 by linear interpolation; `a` must lie in 1.0..=3.0.
pub fn k1(a: f64) -> f64 {
    let a = a.clamp(1.0, 3.0);
    for w in K1_TABLE.windows(2) {
        let ((a0, k0), (a1, k1)) = (w[0], w[1]);
        if a <= a1 {
            return k0 + (k1 - k0) * (a - a0) / (a1 - a0);
        }
    }
    K1_TABLE[K1_TABLE.len() - 1].1
}

/// True when the 0.885 formula of UG-32 applies: knuckle 6 % of the crown radius.
pub fn is_six_percent(crown: Quantity, knuckle: Quantity) -> bool {
    (knuckle.value / crown.value - 0.06).abs() < 1e-9
}

/// Records the pressure range of the thin formula `limit` as an
/// applicability check: above it the head or cone formula is used outside
/// the range it was derived for, and the result is not demonstrated.
pub fn thin_formula_range(s: &mut Sheet, limit: &crate::calc::Formula, what: &str) -> Result<(), CalcError> {
    let p_lim = s.step(limit, &format!("upper pressure bound of the {what} formula"))?;
    let p = s.get("P").ok_or(CalcError::Formula { id: limit.id, message: "P is not bound".into() })?;
    s.check_at_most(
        &format!("design pressure within the range of the {what} formula"),
        limit.clause,
        p_lim,
        p,
        &format!(
            "the design pressure exceeds the range where the thin {what} formula applies (Knuckle bounds it by the \
             thin-wall limit of {}, the code gives no explicit bound); a thick-wall analysis is required and the \
             thickness and MAWP shown are not demonstrated",
            limit.clause.trim_end_matches(" bound")
        ),
        true,
    );
    Ok(())
}

/// Required thickness of an ellipsoidal head.
pub fn ellipsoidal_thickness(
    s: &mut Sheet,
    c: &Component,
    aspect_ratio: f64,
    _condition: Condition,
) -> Result<Quantity, CalcError> {
    s.input("a", "ratio of major to minor axis, D/2h", Quantity::new(aspect_ratio, Kind::Dimensionless));
    thin_formula_range(s, &f::HEAD_PRESSURE_LIMIT, "ellipsoidal head")?;
    s.step(&f::ELL_K, "stress factor K")?;
    match c.diameter {
        Diameter::Inside(_) => s.step(&f::ELL_T, "required thickness"),
        Diameter::Outside(_) => s.step(&f::ELL_T_OUT, "required thickness (outside diameter)"),
    }
}

/// MAWP of an ellipsoidal head for the bound thickness `t`.
pub fn ellipsoidal_mawp(s: &mut Sheet, c: &Component, condition: Condition) -> Result<Quantity, CalcError> {
    let words = format!("MAWP, {}", condition.words());
    match c.diameter {
        Diameter::Inside(_) => s.step(&f::ELL_P, &words),
        Diameter::Outside(_) => s.step(&f::ELL_P_OUT, &words),
    }
}

fn bind_radii(s: &mut Sheet, crown: Quantity, knuckle: Quantity, condition: Condition) -> Result<(), CalcError> {
    s.input("L_n", "inside crown radius, new", crown);
    s.input("r_n", "inside knuckle radius, new", knuckle);
    s.step(&f::CORRODED_CROWN, &format!("inside crown radius, {}", condition.words()))?;
    s.step(&f::CORRODED_KNUCKLE, &format!("inside knuckle radius, {}", condition.words()))?;
    Ok(())
}

/// Required thickness of a torispherical head.
pub fn torispherical_thickness(
    s: &mut Sheet,
    crown: Quantity,
    knuckle: Quantity,
    condition: Condition,
) -> Result<Quantity, CalcError> {
    bind_radii(s, crown, knuckle, condition)?;
    thin_formula_range(s, &f::HEAD_PRESSURE_LIMIT, "torispherical head")?;
    if is_six_percent(crown, knuckle) {
        s.step(&f::TORI6_T, "required thickness (knuckle radius 6 % of the crown radius)")
    } else {
        s.step(&f::TORI_M, "stress factor M")?;
        s.step(&f::TORI_T, "required thickness")
    }
}

/// MAWP of a torispherical head for the bound thickness `t`.
pub fn torispherical_mawp(
    s: &mut Sheet,
    crown: Quantity,
    knuckle: Quantity,
    condition: Condition,
) -> Result<Quantity, CalcError> {
    if condition == Condition::NewCold {
        bind_radii(s, crown, knuckle, condition)?;
    }
    let words = format!("MAWP, {}", condition.words());
    if is_six_percent(crown, knuckle) {
        s.step(&f::TORI6_P, &words)
    } else {
        if condition == Condition::NewCold {
            s.step(&f::TORI_M, "stress factor M, new")?;
        }
        s.step(&f::TORI_P, &words)
    }
}

/// Shape limits of formed heads, evaluated with the nominal (or minimum)
/// thickness `t_n` and the available thickness `t` bound on the sheet.
pub fn shape_limits(s: &mut Sheet, c: &Component, nominal: Quantity) -> Result<(), CalcError> {
    let fail_note = "Appendix 1, 1-4(f) applies to heads this thin; Knuckle does not evaluate it, so the head is not \
                     demonstrated by this package";
    match &c.kind {
        ComponentKind::TorisphericalHead { crown_radius, knuckle_radius, .. } => {
            let skirt = match c.diameter {
                Diameter::Inside(_) => s.step(&f::SKIRT_OD, "outside diameter of the skirt")?,
                Diameter::Outside(d) => s.input("D_s", "outside diameter of the skirt", d),
            };
            s.check_at_most(
                "crown radius within the skirt outside diameter",
                "UG-32",
                skirt,
                *crown_radius,
                "UG-32 limits the inside crown radius to the outside diameter of the skirt",
                true,
            );
            let r1 = s.step(&f::KNUCKLE_MIN_SKIRT, "least knuckle radius: 6 % of the skirt outside diameter")?;
            s.check_at_least_limit(
                "knuckle radius at least 6 % of the skirt outside diameter",
                "UG-32",
                r1,
                *knuckle_radius,
                "UG-32 requires the knuckle radius to be at least 6 % of the skirt outside diameter",
            );
            let r2 = s.step(&f::KNUCKLE_MIN_T, "least knuckle radius: three times the head thickness")?;
            s.check_at_least_limit(
                "knuckle radius at least three times the head thickness",
                "UG-32",
                r2,
                *knuckle_radius,
                "UG-32 requires the knuckle radius to be at least three times the head thickness",
            );
            let _ = nominal;
            let ratio = s.step(&f::TORI_RATIO, "thickness to crown radius ratio, hot and corroded")?;
            s.check_at_least_limit(
                "t/L at least 0.002",
                "Appendix 1, 1-4(f)",
                Quantity::new(0.002, Kind::Dimensionless),
                ratio,
                fail_note,
            );
        }
        ComponentKind::EllipsoidalHead { aspect_ratio } => {
            s.input(
                "K_1",
                "factor K1 of Table UG-33.1 (interpolated)",
                Quantity::new(k1(*aspect_ratio), Kind::Dimensionless),
            );
            if let Diameter::Outside(_) = c.diameter {
                s.step(&f::INSIDE_FROM_OUTSIDE, "inside diameter, hot and corroded")?;
            }
            s.step(&f::ELL_EQUIV_CROWN, "equivalent crown radius of the ellipsoidal head")?;
            let ratio = s.step(&f::THIN_HEAD_RATIO, "thickness to equivalent crown radius ratio, hot and corroded")?;
            s.check_at_least_limit(
                "t/L at least 0.002",
                "UG-32, Appendix 1, 1-4(f)",
                Quantity::new(0.002, Kind::Dimensionless),
                ratio,
                fail_note,
            );
        }
        _ => {}
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn k1_interpolates_the_table() {
        // Table UG-33.1 (values from memory): 2.0 -> 0.90, 1.0 -> 0.50, 3.0 -> 1.36.
        assert!((k1(2.0) - 0.90).abs() < 1e-12);
        assert!((k1(1.0) - 0.50).abs() < 1e-12);
        assert!((k1(3.0) - 1.36).abs() < 1e-12);
        assert!((k1(2.1) - 0.945).abs() < 1e-12);
    }
}
