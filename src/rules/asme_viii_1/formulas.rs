//! Every formula of the ASME BPVC Section VIII Division 1 rule set, each
//! defined once. The symbols (all SI base units inside):
//!
//! | symbol | meaning |
//! |---|---|
//! | P_d | design pressure at the vessel top |
//! | P_s | static head at the component's lowest point |
//! | P | design pressure at the component |
//! | S | allowable stress; E joint efficiency; E_c circumferential joint efficiency |
//! | c | corrosion allowance; t_th thinning allowance; t_f UG-16(b) floor |
//! | D, R | inside diameter and radius (corroded); D_o, R_o outside |
//! | L, r | inside crown and knuckle radius (corroded) |
//! | a | ellipsoidal ratio D/2h; K, M stress factors of Appendix 1, 1-4 |
//! | alpha | cone half-apex angle |
//! | t | thickness available for the MAWP being computed |

use crate::calc::Formula;
use crate::units::Kind::*;

macro_rules! formula {
    ($name:ident, $id:literal, $sym:literal, $clause:literal, $text:literal, $kind:expr) => {
        #[doc = concat!("`", $sym, " = ", $text, "` (", $clause, ")")]
        pub const $name: Formula = Formula { id: $id, symbol: $sym, clause: $clause, text: $text, result: $kind };
    };
}

// Loads.
formula!(STATIC_HEAD, "static-head", "P_s", "UG-22", "rho*g*h", Pressure);
formula!(PRESSURE_AT_COMPONENT, "pressure-at-component", "P", "UG-21, UG-22", "P_d + P_s", Pressure);

// Corroded dimensions (the corrosion allowance is removed from the inside).
formula!(CORRODED_DIAMETER, "corroded-inside-diameter", "D", "UG-25", "D_n + 2*c", Length);
formula!(INSIDE_RADIUS, "inside-radius", "R", "UG-27", "D/2", Length);
formula!(OUTSIDE_RADIUS, "outside-radius", "R_o", "Appendix 1, 1-1", "D_o/2", Length);
formula!(CORRODED_CROWN, "corroded-crown-radius", "L", "UG-25", "L_n + c", Length);
formula!(CORRODED_KNUCKLE, "corroded-knuckle-radius", "r", "UG-25", "r_n + c", Length);

// Thickness allowances.
formula!(MINIMUM_THICKNESS, "minimum-thickness", "t_m", "UG-16(b), UG-25, UG-81", "max(t_r, t_f) + c + t_th", Length);
formula!(AVAILABLE_THICKNESS, "available-thickness", "t", "UG-25", "t_n - c - t_th", Length);
formula!(NEW_THICKNESS, "new-thickness", "t", "UG-81", "t_n - t_th", Length);

// Cylinder, circumferential stress (longitudinal joints).
formula!(CYL_CIRC_LIMIT, "cyl-circ-pressure-limit", "P_lim", "UG-27(c)(1)", "0.385*S*E", Pressure);
formula!(CYL_CIRC_T, "ug27-c1-thickness", "t_1", "UG-27(c)(1)", "P*R/(S*E - 0.6*P)", Length);
formula!(CYL_CIRC_P, "ug27-c1-mawp", "P_1", "UG-27(c)(1)", "S*E*t/(R + 0.6*t)", Pressure);
formula!(CYL_CIRC_T_OUT, "app1-1-cyl-circ-thickness", "t_1", "Appendix 1, 1-1", "P*R_o/(S*E + 0.4*P)", Length);
formula!(CYL_CIRC_P_OUT, "app1-1-cyl-circ-mawp", "P_1", "Appendix 1, 1-1", "S*E*t/(R_o - 0.4*t)", Pressure);
formula!(CYL_CIRC_Z_T, "app1-2-cyl-circ-z-from-p", "Z", "Appendix 1, 1-2", "(S*E + P)/(S*E - P)", Dimensionless);
formula!(CYL_CIRC_THICK_T, "app1-2-cyl-circ-thickness", "t_1", "Appendix 1, 1-2", "R*(sqrt(Z) - 1)", Length);
formula!(
    CYL_CIRC_THICK_T_OUT,
    "app1-2-cyl-circ-thickness-outside",
    "t_1",
    "Appendix 1, 1-2",
    "R_o*(sqrt(Z) - 1)/sqrt(Z)",
    Length
);
formula!(CYL_Z_FROM_T, "app1-2-cyl-z-from-t", "Z", "Appendix 1, 1-2", "((R + t)/R)^2", Dimensionless);
formula!(CYL_Z_FROM_T_OUT, "app1-2-cyl-z-from-t-outside", "Z", "Appendix 1, 1-2", "(R_o/(R_o - t))^2", Dimensionless);
formula!(CYL_CIRC_THICK_P, "app1-2-cyl-circ-mawp", "P_1", "Appendix 1, 1-2", "S*E*(Z - 1)/(Z + 1)", Pressure);

// Cylinder, longitudinal stress (circumferential joints).
formula!(CYL_LONG_LIMIT, "cyl-long-pressure-limit", "P_lim", "UG-27(c)(2)", "1.25*S*E_c", Pressure);
formula!(CYL_LONG_T, "ug27-c2-thickness", "t_2", "UG-27(c)(2)", "P*R/(2*S*E_c + 0.4*P)", Length);
formula!(CYL_LONG_P, "ug27-c2-mawp", "P_2", "UG-27(c)(2)", "2*S*E_c*t/(R - 0.4*t)", Pressure);
formula!(CYL_LONG_T_OUT, "app1-1-cyl-long-thickness", "t_2", "Appendix 1, 1-1", "P*R_o/(2*S*E_c + 1.4*P)", Length);
formula!(CYL_LONG_P_OUT, "app1-1-cyl-long-mawp", "P_2", "Appendix 1, 1-1", "2*S*E_c*t/(R_o - 1.4*t)", Pressure);
formula!(CYL_LONG_Z_T, "app1-2-cyl-long-z-from-p", "Z", "Appendix 1, 1-2", "P/(S*E_c) + 1", Dimensionless);
formula!(CYL_LONG_THICK_T, "app1-2-cyl-long-thickness", "t_2", "Appendix 1, 1-2", "R*(sqrt(Z) - 1)", Length);
formula!(
    CYL_LONG_THICK_T_OUT,
    "app1-2-cyl-long-thickness-outside",
    "t_2",
    "Appendix 1, 1-2",
    "R_o*(sqrt(Z) - 1)/sqrt(Z)",
    Length
);
formula!(CYL_LONG_THICK_P, "app1-2-cyl-long-mawp", "P_2", "Appendix 1, 1-2", "S*E_c*(Z - 1)", Pressure);
formula!(GOVERNING_T, "governing-thickness", "t_r", "UG-27(c)", "max(t_1, t_2)", Length);
formula!(GOVERNING_P, "governing-mawp", "P_a", "UG-27(c)", "min(P_1, P_2)", Pressure);

// Sphere and hemispherical head.
formula!(SPH_LIMIT, "sph-pressure-limit", "P_lim", "UG-27(d)", "0.665*S*E", Pressure);
formula!(SPH_T, "ug27-d-thickness", "t_r", "UG-27(d), UG-32", "P*R/(2*S*E - 0.2*P)", Length);
formula!(SPH_P, "ug27-d-mawp", "P_a", "UG-27(d), UG-32", "2*S*E*t/(R + 0.2*t)", Pressure);
formula!(SPH_T_OUT, "app1-1-sph-thickness", "t_r", "Appendix 1, 1-1", "P*R_o/(2*S*E + 0.8*P)", Length);
formula!(SPH_P_OUT, "app1-1-sph-mawp", "P_a", "Appendix 1, 1-1", "2*S*E*t/(R_o - 0.8*t)", Pressure);
formula!(SPH_Y_T, "app1-2-sph-y-from-p", "Y", "Appendix 1, 1-2", "2*(S*E + P)/(2*S*E - P)", Dimensionless);
formula!(SPH_THICK_T, "app1-2-sph-thickness", "t_r", "Appendix 1, 1-2", "R*(cbrt(Y) - 1)", Length);
formula!(
    SPH_THICK_T_OUT,
    "app1-2-sph-thickness-outside",
    "t_r",
    "Appendix 1, 1-2",
    "R_o*(cbrt(Y) - 1)/cbrt(Y)",
    Length
);
formula!(SPH_Y_FROM_T, "app1-2-sph-y-from-t", "Y", "Appendix 1, 1-2", "((R + t)/R)^3", Dimensionless);
formula!(SPH_Y_FROM_T_OUT, "app1-2-sph-y-from-t-outside", "Y", "Appendix 1, 1-2", "(R_o/(R_o - t))^3", Dimensionless);
formula!(SPH_THICK_P, "app1-2-sph-mawp", "P_a", "Appendix 1, 1-2", "2*S*E*(Y - 1)/(Y + 2)", Pressure);

// Ellipsoidal head.
formula!(ELL_K, "app1-4-c-k", "K", "Appendix 1, 1-4(c)", "(2 + a^2)/6", Dimensionless);
formula!(ELL_T, "app1-4-c-thickness", "t_r", "UG-32, Appendix 1, 1-4(c)", "P*D*K/(2*S*E - 0.2*P)", Length);
formula!(ELL_P, "app1-4-c-mawp", "P_a", "UG-32, Appendix 1, 1-4(c)", "2*S*E*t/(K*D + 0.2*t)", Pressure);
formula!(
    ELL_T_OUT,
    "app1-4-c-thickness-outside",
    "t_r",
    "Appendix 1, 1-4(c)",
    "P*D_o*K/(2*S*E + 2*P*(K - 0.1))",
    Length
);
formula!(ELL_P_OUT, "app1-4-c-mawp-outside", "P_a", "Appendix 1, 1-4(c)", "2*S*E*t/(K*D_o - 2*t*(K - 0.1))", Pressure);
formula!(ELL_EQUIV_CROWN, "ellipsoid-equivalent-crown", "L_e", "UG-32, Table UG-33.1", "K_1*D", Length);
formula!(INSIDE_FROM_OUTSIDE, "inside-from-outside-diameter", "D", "Appendix 1, 1-1", "D_o - 2*t", Length);
formula!(THIN_HEAD_RATIO, "head-thickness-ratio", "t_L", "Appendix 1, 1-4(f)", "t/L_e", Dimensionless);

// Torispherical head.
formula!(TORI_M, "app1-4-d-m", "M", "Appendix 1, 1-4(d)", "(3 + sqrt(L/r))/4", Dimensionless);
formula!(TORI_T, "app1-4-d-thickness", "t_r", "Appendix 1, 1-4(d)", "P*L*M/(2*S*E - 0.2*P)", Length);
formula!(TORI_P, "app1-4-d-mawp", "P_a", "Appendix 1, 1-4(d)", "2*S*E*t/(L*M + 0.2*t)", Pressure);
formula!(TORI6_T, "ug32-6pct-thickness", "t_r", "UG-32 (6 % knuckle head)", "0.885*P*L/(S*E - 0.1*P)", Length);
formula!(TORI6_P, "ug32-6pct-mawp", "P_a", "UG-32 (6 % knuckle head)", "S*E*t/(0.885*L + 0.1*t)", Pressure);
formula!(SKIRT_OD, "skirt-outside-diameter", "D_s", "UG-32", "D_n + 2*t_n", Length);
formula!(KNUCKLE_MIN_SKIRT, "knuckle-min-skirt", "r_min1", "UG-32", "0.06*D_s", Length);
formula!(KNUCKLE_MIN_T, "knuckle-min-thickness", "r_min2", "UG-32", "3*t_n", Length);
formula!(TORI_RATIO, "tori-thickness-ratio", "t_L", "Appendix 1, 1-4(f)", "t/L", Dimensionless);

// Range of the thin formulas of formed heads and cones. The code states no
// pressure bound for the forms of Appendix 1, 1-4(c) to (e); Knuckle bounds
// each by the thin-wall limit of the shell form it rests on: the sphere of
// UG-27(d) for heads (their crowns are spherical or nearly so) and the
// cylinder of UG-27(c)(1) for cones.
formula!(HEAD_PRESSURE_LIMIT, "head-thin-pressure-limit", "P_lim", "UG-27(d) bound", "0.665*S*E", Pressure);
formula!(CONE_PRESSURE_LIMIT, "cone-thin-pressure-limit", "P_lim", "UG-27(c)(1) bound", "0.385*S*E", Pressure);

// Conical section.
formula!(CONE_T, "cone-thickness", "t_r", "UG-32, Appendix 1, 1-4(e)", "P*D/(2*cos(alpha)*(S*E - 0.6*P))", Length);
formula!(
    CONE_P,
    "cone-mawp",
    "P_a",
    "UG-32, Appendix 1, 1-4(e)",
    "2*S*E*t*cos(alpha)/(D + 1.2*t*cos(alpha))",
    Pressure
);
formula!(
    CONE_T_OUT,
    "cone-thickness-outside",
    "t_r",
    "Appendix 1, 1-4(e)",
    "P*D_o/(2*cos(alpha)*(S*E + 0.4*P))",
    Length
);
formula!(
    CONE_P_OUT,
    "cone-mawp-outside",
    "P_a",
    "Appendix 1, 1-4(e)",
    "2*S*E*t*cos(alpha)/(D_o - 0.8*t*cos(alpha))",
    Pressure
);

// Forming tolerance of formed heads.
formula!(UG81_OUTSIDE, "ug81-outside", "Delta_max_o", "UG-81", "0.0125*D_i", Length);
formula!(UG81_INSIDE, "ug81-inside", "Delta_max_i", "UG-81", "0.00625*D_i", Length);

// MAWP referred to the top, vessel and tests.
formula!(MAWP_TOP, "mawp-at-top", "P_top", "UG-98", "P_a - P_s", Pressure);
formula!(STRESS_RATIO, "test-stress-ratio", "LSR", "UG-99(b)", "S_t/S", Dimensionless);
formula!(HYDROTEST, "hydrostatic-test", "P_h", "UG-99(b)", "1.3*P_v*LSR", Pressure);
formula!(PNEUMATIC, "pneumatic-test", "P_pn", "UG-100", "1.1*P_v*LSR", Pressure);

// Allowable stress from a library table (defined beside the tables).
pub use crate::materials::STRESS_INTERPOLATION;

// Mill under-tolerance and the delivered thickness.
formula!(PLATE_UNDERTOL_FRACTION, "plate-undertolerance-from-fraction", "u", "UG-16(c)", "u_p*t_n", Length);
formula!(PLATE_UNDERTOL_LIMIT, "plate-undertolerance-allowance", "u_lim", "UG-16(c)", "min(u_c, 0.06*t_n)", Length);
formula!(PIPE_UNDERTOL, "pipe-undertolerance", "t_u", "UG-16(d)", "u_p*t_n", Length);
formula!(DELIVERED_THICKNESS, "delivered-thickness", "t_d", "UG-16(c), UG-16(d)", "t_n - t_u", Length);
formula!(
    AVAILABLE_THICKNESS_MILL,
    "available-thickness-less-undertolerance",
    "t",
    "UG-16(d), UG-25",
    "t_n - t_u - c - t_th",
    Length
);
formula!(NEW_THICKNESS_MILL, "new-thickness-less-undertolerance", "t", "UG-16(d), UG-81", "t_n - t_u - t_th", Length);

// Mass, volume and blank sizes (new condition, nominal thickness).
formula!(MEAN_DIAMETER_IN, "mean-diameter-from-inside", "D_m", "derived", "D_n + t_n", Length);
formula!(MEAN_DIAMETER_OUT, "mean-diameter-from-outside", "D_m", "derived", "D_o - t_n", Length);
formula!(NEW_INSIDE_DIAMETER, "new-inside-diameter", "D_i", "derived", "D_o - 2*t_n", Length);
formula!(CYL_MASS, "cylinder-mass", "m", "derived", "rho_m*pi*D_m*t_n*L_s", Mass);
formula!(CYL_VOLUME, "cylinder-volume", "V", "derived", "pi*D_i^2*L_s/4", Volume);
formula!(DEVELOPED_LENGTH, "developed-length", "L_dev", "derived", "pi*D_m", Length);
formula!(SPH_MASS, "sphere-mass", "m", "derived", "rho_m*pi*((D_i + 2*t_n)^3 - D_i^3)/6", Mass);
formula!(SPH_VOLUME, "sphere-volume", "V", "derived", "pi*D_i^3/6", Volume);
formula!(CONE_NEW_INSIDE, "cone-new-inside-diameter", "D_i", "derived", "D_o - 2*t_n/cos(alpha)", Length);
formula!(CONE_NEW_INSIDE_SMALL, "cone-new-inside-diameter-small", "D_2i", "derived", "D_2o - 2*t_n/cos(alpha)", Length);
formula!(CONE_AXIAL_LENGTH, "cone-axial-length", "L_s", "derived", "(D_i - D_2i)/(2*tan(alpha))", Length);
formula!(CONE_MASS, "cone-mass", "m", "derived", "rho_m*pi*((D_i + D_2i)/2 + t_n/cos(alpha))*t_n*L_s/cos(alpha)", Mass);
formula!(CONE_VOLUME, "cone-volume", "V", "derived", "pi*L_s*(D_i^2 + D_i*D_2i + D_2i^2)/12", Volume);
formula!(HEAD_MASS, "head-mass", "m", "derived", "rho_m*V_m", Mass);
formula!(RUNNING_MASS, "vessel-empty-mass", "m_e", "derived", "m_0 + m_k", Mass);
formula!(RUNNING_VOLUME, "vessel-volume", "V_v", "derived", "V_0 + V_k", Volume);
formula!(LIQUID_MASS, "liquid-mass", "m_l", "derived", "rho*V_v", Mass);

/// Every formula above, for tests and the documentation.
pub static ALL: &[&Formula] = &[
    &HEAD_PRESSURE_LIMIT,
    &CONE_PRESSURE_LIMIT,
    &STATIC_HEAD,
    &PRESSURE_AT_COMPONENT,
    &CORRODED_DIAMETER,
    &INSIDE_RADIUS,
    &OUTSIDE_RADIUS,
    &CORRODED_CROWN,
    &CORRODED_KNUCKLE,
    &MINIMUM_THICKNESS,
    &AVAILABLE_THICKNESS,
    &NEW_THICKNESS,
    &CYL_CIRC_LIMIT,
    &CYL_CIRC_T,
    &CYL_CIRC_P,
    &CYL_CIRC_T_OUT,
    &CYL_CIRC_P_OUT,
    &CYL_CIRC_Z_T,
    &CYL_CIRC_THICK_T,
    &CYL_CIRC_THICK_T_OUT,
    &CYL_Z_FROM_T,
    &CYL_Z_FROM_T_OUT,
    &CYL_CIRC_THICK_P,
    &CYL_LONG_LIMIT,
    &CYL_LONG_T,
    &CYL_LONG_P,
    &CYL_LONG_T_OUT,
    &CYL_LONG_P_OUT,
    &CYL_LONG_Z_T,
    &CYL_LONG_THICK_T,
    &CYL_LONG_THICK_T_OUT,
    &CYL_LONG_THICK_P,
    &GOVERNING_T,
    &GOVERNING_P,
    &SPH_LIMIT,
    &SPH_T,
    &SPH_P,
    &SPH_T_OUT,
    &SPH_P_OUT,
    &SPH_Y_T,
    &SPH_THICK_T,
    &SPH_THICK_T_OUT,
    &SPH_Y_FROM_T,
    &SPH_Y_FROM_T_OUT,
    &SPH_THICK_P,
    &ELL_K,
    &ELL_T,
    &ELL_P,
    &ELL_T_OUT,
    &ELL_P_OUT,
    &ELL_EQUIV_CROWN,
    &INSIDE_FROM_OUTSIDE,
    &THIN_HEAD_RATIO,
    &TORI_M,
    &TORI_T,
    &TORI_P,
    &TORI6_T,
    &TORI6_P,
    &SKIRT_OD,
    &KNUCKLE_MIN_SKIRT,
    &KNUCKLE_MIN_T,
    &TORI_RATIO,
    &CONE_T,
    &CONE_P,
    &CONE_T_OUT,
    &CONE_P_OUT,
    &MAWP_TOP,
    &STRESS_RATIO,
    &HYDROTEST,
    &PNEUMATIC,
    &STRESS_INTERPOLATION,
    &PLATE_UNDERTOL_FRACTION,
    &PLATE_UNDERTOL_LIMIT,
    &PIPE_UNDERTOL,
    &DELIVERED_THICKNESS,
    &AVAILABLE_THICKNESS_MILL,
    &NEW_THICKNESS_MILL,
    &MEAN_DIAMETER_IN,
    &MEAN_DIAMETER_OUT,
    &NEW_INSIDE_DIAMETER,
    &CYL_MASS,
    &CYL_VOLUME,
    &DEVELOPED_LENGTH,
    &SPH_MASS,
    &SPH_VOLUME,
    &CONE_NEW_INSIDE,
    &CONE_NEW_INSIDE_SMALL,
    &CONE_AXIAL_LENGTH,
    &CONE_MASS,
    &CONE_VOLUME,
    &HEAD_MASS,
    &RUNNING_MASS,
    &RUNNING_VOLUME,
    &LIQUID_MASS,
];

/// The kind of every symbol the formulas use; tests evaluate each formula
/// with these kinds to prove its result has the declared dimension.
pub fn symbol_kind(symbol: &str) -> Option<crate::units::Kind> {
    Some(match symbol {
        "P_d" | "P_s" | "P" | "P_1" | "P_2" | "P_a" | "P_lim" | "P_v" | "P_top" => Pressure,
        "S" | "S_t" => Stress,
        "E" | "E_c" | "Z" | "Y" | "a" | "K" | "M" | "K_1" | "LSR" | "t_L" => Dimensionless,
        "rho" => Density,
        "g" => Acceleration,
        "h" | "c" | "t_th" | "t_f" | "t_r" | "t_m" | "t_n" | "t" | "t_1" | "t_2" | "D" | "D_n" | "D_o" | "R"
        | "R_o" | "L" | "L_n" | "L_e" | "r" | "r_n" | "D_s" => Length,
        "alpha" => Angle,
        "T" | "T_1" | "T_2" => Temperature,
        "S_1" | "S_2" => Stress,
        "u" | "u_c" | "u_lim" | "t_u" | "t_d" | "D_m" | "D_i" | "D_2i" | "D_2o" | "L_s" | "L_dev" => Length,
        "u_p" | "pi" => Dimensionless,
        "rho_m" => Density,
        "m" | "m_0" | "m_k" | "m_e" | "m_l" => Mass,
        "V" | "V_0" | "V_k" | "V_v" | "V_m" => Volume,
        _ => return None,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::expr::Env;
    use crate::units::Quantity;

    #[test]
    fn every_formula_parses_and_has_its_declared_dimension() {
        for f in ALL {
            let e = f.expr().unwrap_or_else(|e| panic!("{}: {e}", f.id));
            let mut env = Env::new();
            for s in e.symbols() {
                let kind = symbol_kind(&s).unwrap_or_else(|| panic!("{}: symbol `{s}` has no kind", f.id));
                // Values of a plausible size so that no root or division fails.
                let v = match kind {
                    Angle => 0.3,
                    Dimensionless => 2.0,
                    _ => 1.0,
                };
                env.insert(s, Quantity::new(v, kind));
            }
            let v = e.eval(&env).unwrap_or_else(|err| panic!("{}: {err}", f.id));
            assert_eq!(v.dim, f.result.dim(), "{}", f.id);
        }
    }

    #[test]
    fn formula_ids_are_unique() {
        let mut ids: Vec<&str> = ALL.iter().map(|f| f.id).collect();
        ids.sort();
        let n = ids.len();
        ids.dedup();
        assert_eq!(n, ids.len());
    }
}
