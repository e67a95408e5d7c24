//! ASME VIII-1 internal-pressure rules against independent values. The
//! source of every check value is named beside it.

use knuckle::calc::Sheet;
use knuckle::pipeline::evaluate;
use knuckle::rules::asme_viii_1::formulas;
use knuckle::rules::ComponentResult;
use knuckle::units::{Quantity, UnitSystem};

/// A one-component case in the given units.
fn case(units: &str, pressure: &str, stress: &str, ca: &str, component: &str) -> String {
    format!(
        r#"[document]
number = "REF"
revision = "0"
date = "2026-01-01"
units = "{units}"
[design]
internal_pressure = "{pressure}"
temperature = "100 degC"
corrosion_allowance = "{ca}"
[materials.m]
name = "test plate"
allowable_stress = "{stress}"
[[component]]
id = "c"
material = "m"
{component}
"#
    )
}

fn run(text: &str) -> ComponentResult {
    let ev = evaluate("ref.toml", text).unwrap_or_else(|e| panic!("{}", e.render()));
    ev.calculation.components[0].clone()
}

fn mm(q: Option<knuckle::units::Quantity>) -> f64 {
    q.unwrap().value * 1e3
}
fn inch(q: Option<knuckle::units::Quantity>) -> f64 {
    q.unwrap().value / 0.0254
}

#[test]
fn handbook_cylinder_example_100_psi_48_in_radius() {
    // Published pressure-vessel handbook worked example, from memory: P = 100 psi,
    // inside radius 48 in, S = 17,500 psi, E = 0.85, corrosion allowance 0.125 in
    // gives t = 0.325 in before the corrosion allowance is added.
    let c = run(&case(
        "US",
        "100 psi",
        "17500 psi",
        "0.125 in",
        "type = \"cylinder\"\ninside_diameter = \"96 in\"\njoint_efficiency = 0.85",
    ));
    assert!((inch(c.required_thickness) - 0.325).abs() < 0.001, "{}", inch(c.required_thickness));
    assert!((inch(c.minimum_thickness) - 0.450).abs() < 0.001);
}

#[test]
fn cylinder_mawp_by_hand_from_ug27() {
    // Hand arithmetic from the printed UG-27(c)(1) formula P = S·E·t/(R + 0.6·t):
    // S = 138 MPa, E = 1, t = 12 − 2 = 10 mm, R = 500 + 2 = 502 mm
    // → P = 1380/508 = 2.716535 MPa. The longitudinal formula gives more.
    let c = run(&case(
        "SI",
        "1 MPa",
        "138 MPa",
        "2 mm",
        "type = \"cylinder\"\ninside_diameter = \"1000 mm\"\nnominal_thickness = \"12 mm\"\njoint_efficiency = 1.0",
    ));
    assert!((c.mawp.unwrap().value / 1e6 - 1380.0 / 508.0).abs() < 1e-9);
    // MAP new and cold: t = 12, R = 500 → 1656/507.2.
    assert!((c.map.unwrap().value / 1e6 - 1656.0 / 507.2).abs() < 1e-9);
}

#[test]
fn outside_radius_cylinder_matches_appendix_1_1() {
    // Appendix 1, 1-1: t = P·Ro/(S·E + 0.4·P). Ro = 508 mm, P = 2 MPa, S·E = 120 MPa:
    // t = 1016/120.8 = 8.410596 mm (hand arithmetic). Same as the inside-radius
    // formula with R = Ro − t (algebraic identity).
    let c = run(&case(
        "SI",
        "2 MPa",
        "120 MPa",
        "0 mm",
        "type = \"cylinder\"\noutside_diameter = \"1016 mm\"\njoint_efficiency = 1.0",
    ));
    let t = mm(c.required_thickness);
    assert!((t - 1016.0 / 120.8).abs() < 1e-9, "{t}");
    let r = 508.0 - t;
    assert!((2.0 * r / (120.0 - 1.2) - t).abs() < 1e-9);
}

#[test]
fn thick_cylinder_meets_the_lame_bore_stress() {
    // Above P = 0.385·S·E, Appendix 1, 1-2 applies. Lamé (any elasticity handbook):
    // hoop stress at the bore = P·(Ro² + R²)/(Ro² − R²) must equal S·E at the
    // required thickness.
    let c = run(&case(
        "SI",
        "60 MPa",
        "138 MPa",
        "0 mm",
        "type = \"cylinder\"\ninside_diameter = \"400 mm\"\njoint_efficiency = 1.0",
    ));
    let t = mm(c.required_thickness);
    let (r, ro) = (200.0, 200.0 + t);
    let hoop = 60.0 * (ro * ro + r * r) / (ro * ro - r * r);
    assert!((hoop - 138.0).abs() < 1e-9, "{hoop}");
    assert!(c.steps.iter().any(|s| s.clause == "Appendix 1, 1-2"));
}

#[test]
fn sphere_and_hemispherical_head_by_hand() {
    // UG-27(d): t = P·R/(2·S·E − 0.2·P): P = 1 MPa, R = 1000 mm, S·E = 138 MPa
    // → 1000/275.8 = 3.625816 mm (hand arithmetic).
    for kind in ["sphere", "hemispherical-head"] {
        let c = run(&case(
            "SI",
            "1 MPa",
            "138 MPa",
            "0 mm",
            &format!("type = \"{kind}\"\ninside_diameter = \"2000 mm\"\njoint_efficiency = 1.0"),
        ));
        assert!((mm(c.required_thickness) - 1000.0 / 275.8).abs() < 1e-9);
    }
}

#[test]
fn thick_sphere_meets_the_lame_bore_stress() {
    // Thick sphere (Lamé, elasticity handbook): bore stress
    // P·(Ro³ + 2R³)/(2(Ro³ − R³)) = S·E at the 1-2 thickness.
    let c = run(&case(
        "SI",
        "100 MPa",
        "138 MPa",
        "0 mm",
        "type = \"sphere\"\ninside_diameter = \"400 mm\"\njoint_efficiency = 1.0",
    ));
    let t = mm(c.required_thickness);
    let (r3, ro3) = (200f64.powi(3), (200.0 + t).powi(3));
    let s = 100.0 * (ro3 + 2.0 * r3) / (2.0 * (ro3 - r3));
    assert!((s - 138.0).abs() < 1e-9, "{s}");
}

#[test]
fn two_to_one_head_needs_about_the_shell_thickness() {
    // Common practice, no source: a 2:1 ellipsoidal head needs close to the
    // thickness of its cylinder at the same P, S, E and D (within about 1 %).
    let shell = run(&case(
        "SI",
        "1 MPa",
        "138 MPa",
        "0 mm",
        "type = \"cylinder\"\ninside_diameter = \"2000 mm\"\njoint_efficiency = 1.0",
    ));
    let head = run(&case(
        "SI",
        "1 MPa",
        "138 MPa",
        "0 mm",
        "type = \"ellipsoidal-head\"\ninside_diameter = \"2000 mm\"\njoint_efficiency = 1.0",
    ));
    let ratio = mm(head.required_thickness) / mm(shell.required_thickness);
    assert!((ratio - 1.0).abs() < 0.01, "{ratio}");
}

#[test]
fn six_percent_head_uses_0_885_which_is_m_over_2() {
    // Common practice, no source: 0.885 of UG-32 equals M/2 at L/r = 16 2/3,
    // M = (3 + √(L/r))/4 from Appendix 1, 1-4(d).
    let m = (3.0 + (50.0f64 / 3.0).sqrt()) / 4.0;
    assert!((m / 2.0 - 0.885).abs() < 0.0005);
    let c = run(&case("SI", "1 MPa", "138 MPa", "0 mm", "type = \"torispherical-head\"\noutside_diameter = \"2000 mm\"\nnominal_thickness = \"20 mm\"\nshape = \"6%-knuckle\"\njoint_efficiency = 1.0"));
    // UG-32: t = 0.885·P·L/(S·E − 0.1·P), L = 2000 mm → 1770/137.9 (hand arithmetic).
    assert!((mm(c.required_thickness) - 1770.0 / 137.9).abs() < 1e-9);
    assert!(c.steps.iter().any(|s| s.formula.contains("0.885")));
}

#[test]
fn ellipsoidal_k_factor_matches_table_1_4_1() {
    // Appendix 1, Table 1-4.1 (values from memory; K = (2 + (D/2h)²)/6 is printed
    // in 1-4(c)); the table gives two decimals.
    let table = [
        (3.0, 1.83),
        (2.9, 1.73),
        (2.8, 1.64),
        (2.7, 1.55),
        (2.6, 1.46),
        (2.5, 1.37),
        (2.4, 1.29),
        (2.3, 1.21),
        (2.2, 1.14),
        (2.1, 1.07),
        (2.0, 1.00),
        (1.9, 0.93),
        (1.8, 0.87),
        (1.7, 0.81),
        (1.6, 0.76),
        (1.5, 0.71),
        (1.4, 0.66),
        (1.3, 0.61),
        (1.2, 0.57),
        (1.1, 0.53),
        (1.0, 0.50),
    ];
    for (a, k_table) in table {
        let c = run(&case("SI", "1 MPa", "138 MPa", "0 mm", &format!("type = \"ellipsoidal-head\"\ninside_diameter = \"2000 mm\"\naspect_ratio = {a}\njoint_efficiency = 1.0")));
        let k = c.steps.iter().find(|s| s.symbol == "K").unwrap().quantity.value;
        assert!((k - k_table).abs() <= 0.0051, "D/2h = {a}: K = {k}, table {k_table}");
    }
}

#[test]
fn torispherical_m_factor_matches_table_1_4_2() {
    // Appendix 1, Table 1-4.2 (values from memory; M = (3 + √(L/r))/4 is printed
    // in 1-4(d)); two decimals, some entries rounded up, hence 0.006.
    let table = [
        (1.0, 1.00),
        (1.25, 1.03),
        (1.5, 1.06),
        (1.75, 1.08),
        (2.0, 1.10),
        (2.25, 1.13),
        (2.5, 1.15),
        (2.75, 1.17),
        (3.0, 1.18),
        (3.25, 1.20),
        (3.5, 1.22),
        (4.0, 1.25),
        (4.5, 1.28),
        (5.0, 1.31),
        (5.5, 1.34),
        (6.0, 1.36),
        (6.5, 1.39),
        (7.0, 1.41),
        (7.5, 1.44),
        (8.0, 1.46),
        (8.5, 1.48),
        (9.0, 1.50),
        (9.5, 1.52),
        (10.0, 1.54),
        (10.5, 1.56),
        (11.0, 1.58),
        (11.5, 1.60),
        (12.0, 1.62),
        (13.0, 1.65),
        (14.0, 1.69),
        (15.0, 1.72),
        (16.0, 1.75),
        (50.0f64 / 3.0, 1.77),
    ];
    for (ratio, m_table) in table {
        // The formula definition itself, evaluated on a sheet as the rules do.
        let mut sheet = Sheet::new("t", UnitSystem::Si);
        sheet.input("L", "crown radius", Quantity::mm(1800.0));
        sheet.input("r", "knuckle radius", Quantity::mm(1800.0 / ratio));
        let m = sheet.step(&formulas::TORI_M, "M").unwrap().value;
        assert!((m - m_table).abs() <= 0.006, "L/r = {ratio}: M = {m}, table {m_table}");
    }
}

#[test]
fn two_to_one_equivalent_torisphere_needs_about_the_ellipsoid_thickness() {
    // Common practice, no source: the 0.9 D / 0.17 D torisphere is the accepted
    // stand-in for a 2:1 ellipse; its M at L/r = 5.29 is 1.325, so it needs
    // 0.9·1.325/2 ≈ 0.596 of P·D/(2SE − 0.2P)·2, i.e. about 19 % more than the ellipse.
    let e = run(&case(
        "SI",
        "1 MPa",
        "138 MPa",
        "0 mm",
        "type = \"ellipsoidal-head\"\ninside_diameter = \"2000 mm\"\njoint_efficiency = 1.0",
    ));
    let t = run(&case("SI", "1 MPa", "138 MPa", "0 mm", "type = \"torispherical-head\"\ninside_diameter = \"2000 mm\"\nshape = \"2:1-equivalent\"\njoint_efficiency = 1.0"));
    let m = (3.0 + (0.9f64 / 0.17).sqrt()) / 4.0;
    let expected = 0.9 * m;
    let ratio = mm(t.required_thickness) / mm(e.required_thickness);
    assert!((ratio - expected).abs() < 1e-9, "{ratio} vs {expected}");
}

#[test]
fn cone_at_30_degrees_by_hand() {
    // UG-32 cone: t = P·D/(2·cos α·(S·E − 0.6·P)); P = 1, D = 1000, α = 30°, S·E = 138
    // → 1000/(2·0.8660254·137.4) = 4.2020 mm (hand arithmetic).
    let c = run(&case("SI", "1 MPa", "138 MPa", "0 mm", "type = \"conical-section\"\ninside_diameter = \"1000 mm\"\nsmall_inside_diameter = \"500 mm\"\nhalf_apex_angle = \"30 deg\"\njoint_efficiency = 1.0"));
    let expected = 1000.0 / (2.0 * (30f64).to_radians().cos() * 137.4);
    assert!((mm(c.required_thickness) - expected).abs() < 1e-9);
    assert!(c.acceptable);
}

#[test]
fn cone_angle_from_length() {
    // tan α = (D − d)/(2·L): D = 1000, d = 600, L = 200·√3 → α = 30°... here L = 346.41 mm.
    let c = run(&case("SI", "1 MPa", "138 MPa", "0 mm", "type = \"conical-section\"\ninside_diameter = \"1000 mm\"\nsmall_inside_diameter = \"600 mm\"\nlength = \"400 mm\"\njoint_efficiency = 1.0"));
    let alpha = c.steps.iter().find(|s| s.symbol == "α").unwrap().quantity.value;
    assert!((alpha - (200.0f64 / 400.0).atan()).abs() < 1e-12);
}

#[test]
fn static_head_is_rho_g_h_and_mawp_at_top_subtracts_it() {
    // ρ·g·h with g = 9.80665 m/s² (CGPM standard gravity): 1000·9.80665·10 = 98066.5 Pa.
    let text = case("SI", "1 MPa", "138 MPa", "0 mm", "type = \"cylinder\"\ninside_diameter = \"1000 mm\"\nnominal_thickness = \"10 mm\"\njoint_efficiency = 1.0\nliquid_head = \"10 m\"")
        .replace("temperature = \"100 degC\"", "temperature = \"100 degC\"\nliquid_density = \"1000 kg/m3\"");
    let c = run(&text);
    assert!((c.static_head.value - 98_066.5).abs() < 1e-6);
    assert!((c.mawp.unwrap().value - c.mawp_top.unwrap().value - 98_066.5).abs() < 1e-6);
    assert!((c.design_pressure.value - 1_098_066.5).abs() < 1e-6);
}

/// A thin, low-pressure cylinder whose minimum thickness is set by UG-16(b),
/// with extra `[design]` lines and extra material lines.
fn floor_case(units: &str, design: &str, material: &str) -> ComponentResult {
    let text = case(
        units,
        "0.01 MPa",
        "138 MPa",
        "1 mm",
        "type = \"cylinder\"\ninside_diameter = \"500 mm\"\njoint_efficiency = 1.0",
    )
    .replace("corrosion_allowance = \"1 mm\"", &format!("corrosion_allowance = \"1 mm\"\n{design}"))
    .replace("allowable_stress = \"138 MPa\"", &format!("allowable_stress = \"138 MPa\"\n{material}"));
    run(&text)
}

#[test]
fn ug16_floor_governs_thin_low_pressure_parts() {
    // UG-16(b): 1.5 mm (SI value) or 1/16 in (US value) exclusive of corrosion
    // allowance; here 1 mm of corrosion allowance is added.
    let c = floor_case("SI", "code_values = \"SI\"", "");
    assert!((mm(c.minimum_thickness) - 2.5).abs() < 1e-9);
    let c = floor_case("SI", "code_values = \"US\"", "");
    assert!((mm(c.minimum_thickness) - (1.5875 + 1.0)).abs() < 1e-9);
    let c = run(&case(
        "US",
        "1 psi",
        "20000 psi",
        "0 in",
        "type = \"cylinder\"\ninside_diameter = \"20 in\"\njoint_efficiency = 1.0",
    ));
    assert!((inch(c.minimum_thickness) - 0.0625).abs() < 1e-9);
}

#[test]
fn ug16_values_follow_the_code_values_key_not_the_report_units() {
    // Regression: the UG-16(b) floor used to follow the report units. Without
    // `code_values` the larger of 1/16 in (1.5875 mm) and 1.5 mm is taken in
    // both unit systems (UG-16(b), hand arithmetic: 25.4/16 = 1.5875).
    for units in ["SI", "US"] {
        let c = floor_case(units, "", "");
        assert!((mm(c.minimum_thickness) - 2.5875).abs() < 1e-9, "{units}: {}", mm(c.minimum_thickness));
        let floor = c.steps.iter().find(|s| s.symbol == "tf").expect("t_f step");
        assert!(floor.formula.contains("more conservative"), "{}", floor.formula);
        for values in ["SI", "US"] {
            let a = floor_case(units, &format!("code_values = \"{values}\""), "");
            let b = floor_case(if units == "SI" { "US" } else { "SI" }, &format!("code_values = \"{values}\""), "");
            assert_eq!(a.minimum_thickness, b.minimum_thickness, "{values} values in {units} and the other units");
        }
    }
}

#[test]
fn ug16b4_floor_for_air_steam_and_water_service_with_ucs_materials() {
    // UG-16(b)(4), from memory of the paragraph: 3/32 in (2.5 mm) exclusive of
    // corrosion allowance for shells and heads in compressed air, steam or water
    // service made of Part UCS materials; 1 mm corrosion allowance is added.
    for service in ["compressed-air", "steam", "water"] {
        let design = format!("service = \"{service}\"\ncode_values = \"SI\"");
        let c = floor_case("SI", &design, "part = \"UCS\"");
        assert!((mm(c.minimum_thickness) - 3.5).abs() < 1e-9, "{service}");
        let floor = c.steps.iter().find(|s| s.symbol == "tf").unwrap();
        assert_eq!(floor.clause, "UG-16(b)(4)");
        // A material whose part is not stated is taken as a carbon steel.
        let c = floor_case("SI", &design, "");
        assert!((mm(c.minimum_thickness) - 3.5).abs() < 1e-9, "{service}, part not stated");
        // US values: 3/32 in = 2.38125 mm (hand arithmetic).
        let c = floor_case("SI", &format!("service = \"{service}\"\ncode_values = \"US\""), "part = \"UCS\"");
        assert!((mm(c.minimum_thickness) - 3.38125).abs() < 1e-9, "{service}, US values");
        // A high-alloy material in the same service keeps the general floor.
        let c = floor_case("SI", &design, "part = \"UHA\"");
        assert!((mm(c.minimum_thickness) - 2.5).abs() < 1e-9, "{service}, Part UHA");
    }
    // Other service: the general floor.
    let c = floor_case("SI", "service = \"other\"\ncode_values = \"SI\"", "part = \"UCS\"");
    assert!((mm(c.minimum_thickness) - 2.5).abs() < 1e-9);
}

#[test]
fn hydro_and_pneumatic_tests_use_the_lowest_stress_ratio() {
    // UG-99(b): 1.3·MAWP·(S_test/S); UG-100: 1.1·MAWP·(S_test/S).
    let text = case(
        "SI",
        "1 MPa",
        "120 MPa",
        "0 mm",
        "type = \"cylinder\"\ninside_diameter = \"1000 mm\"\nnominal_thickness = \"10 mm\"\njoint_efficiency = 1.0",
    )
    .replace("allowable_stress = \"120 MPa\"", "allowable_stress = \"120 MPa\"\ntest_allowable_stress = \"138 MPa\"");
    let ev = evaluate("t.toml", &text).unwrap();
    let v = &ev.calculation.vessel;
    let ratio = 138.0 / 120.0;
    assert!((v.stress_ratio - ratio).abs() < 1e-12);
    assert!((v.hydrotest_pressure.value - 1.3 * v.mawp.value * ratio).abs() < 1e-6);
    assert!((v.pneumatic_test_pressure.value - 1.1 * v.mawp.value * ratio).abs() < 1e-6);
}

#[test]
fn thin_torisphere_reports_appendix_1_4_f_as_failed_applicability() {
    // t/L < 0.002 brings in Appendix 1, 1-4(f): reported as a failed limit, never a pass.
    let c = run(&case("SI", "0.05 MPa", "138 MPa", "0 mm", "type = \"torispherical-head\"\ninside_diameter = \"3000 mm\"\nnominal_thickness = \"5 mm\"\nshape = \"2:1-equivalent\"\njoint_efficiency = 1.0"));
    let k = c.checks.iter().find(|k| k.name == "t/L at least 0.002").unwrap();
    assert!(!k.pass && k.applicability);
    assert!(!c.acceptable);
}

#[test]
fn torisphere_shape_limits_are_checked() {
    // UG-32: r ≥ 0.06·Do, r ≥ 3t, L ≤ Do. Here r = 60 mm < 0.06·2020 = 121.2 mm.
    let c = run(&case("SI", "0.5 MPa", "138 MPa", "0 mm", "type = \"torispherical-head\"\ninside_diameter = \"2000 mm\"\nnominal_thickness = \"10 mm\"\ncrown_radius = \"2000 mm\"\nknuckle_radius = \"60 mm\"\njoint_efficiency = 1.0"));
    let k = c.checks.iter().find(|k| k.name.starts_with("knuckle radius at least 6 %")).unwrap();
    assert!(!k.pass);
    assert!(c.checks.iter().find(|k| k.name.starts_with("knuckle radius at least three")).unwrap().pass);
}

/// The applicability check named `name` of a component, if recorded.
fn check_named<'a>(c: &'a ComponentResult, name: &str) -> Option<&'a knuckle::calc::Check> {
    c.checks.iter().find(|k| k.name == name)
}

#[test]
fn heads_and_cones_flag_pressures_beyond_their_thin_formulas() {
    // Regression: at P = 140 MPa and S = 138 MPa a head was reported acceptable
    // with a MAWP of 2.3 S. The code gives no explicit bound for Appendix 1,
    // 1-4(c) to (e); Knuckle bounds heads by the sphere limit of UG-27(d),
    // 0.665 S E, and cones by the cylinder limit of UG-27(c)(1), 0.385 S E
    // (hand arithmetic: 0.665 x 138 = 91.77 MPa, 0.385 x 138 = 53.13 MPa).
    let parts = [
        ("type = \"ellipsoidal-head\"\naspect_ratio = 2.0", "ellipsoidal head", 91.77),
        ("type = \"torispherical-head\"\nshape = \"2:1-equivalent\"", "torispherical head", 91.77),
        (
            "type = \"conical-section\"\nsmall_inside_diameter = \"500 mm\"\nhalf_apex_angle = \"20 deg\"",
            "conical section",
            53.13,
        ),
    ];
    for (kind, what, bound_mpa) in parts {
        let name = format!("design pressure within the range of the {what} formula");
        for (p, inside) in [(bound_mpa * 0.99, true), (bound_mpa * 1.01, false), (140.0, false)] {
            let c = run(&case(
                "SI",
                &format!("{p} MPa"),
                "138 MPa",
                "0 mm",
                &format!(
                    "{kind}\ninside_diameter = \"1000 mm\"\njoint_efficiency = 1.0\nnominal_thickness = \"900 mm\""
                ),
            ));
            let k = check_named(&c, &name).unwrap_or_else(|| panic!("{what}: no `{name}` check"));
            assert!(k.applicability, "{what}: a limit of applicability");
            assert!((k.required.unwrap().value - bound_mpa * 1e6).abs() < 1.0, "{what}: bound {:?}", k.required);
            assert_eq!(k.pass, inside, "{what} at {p} MPa");
            if !inside {
                assert!(!c.acceptable, "{what} at {p} MPa must not be acceptable");
                assert!(k.note.contains("not demonstrated"), "{}", k.note);
            }
        }
    }
}

#[test]
fn a_test_stress_below_the_design_stress_is_a_failed_check_not_silence() {
    // Regression: UG-99(b) takes LSR = S_test / S as it is; a ratio below 1
    // lowers the hydrostatic test pressure below 1.3 x MAWP, which used to pass
    // without a word. Hand arithmetic: LSR = 120/138 = 0.869565...
    let text = case(
        "SI",
        "1 MPa",
        "138 MPa",
        "0 mm",
        "type = \"cylinder\"\ninside_diameter = \"1000 mm\"\njoint_efficiency = 1.0\nnominal_thickness = \"10 mm\"",
    )
    .replace("allowable_stress = \"138 MPa\"", "allowable_stress = \"138 MPa\"\ntest_allowable_stress = \"120 MPa\"");
    let ev = evaluate("ref.toml", &text).unwrap();
    let v = &ev.calculation.vessel;
    assert!((v.stress_ratio - 120.0 / 138.0).abs() < 1e-12);
    let k = v.checks.iter().find(|k| k.name.starts_with("lowest stress ratio at least 1")).expect("the check");
    assert!(!k.pass);
    assert!(k.note.contains("below 1.3 × MAWP"), "{}", k.note);
    assert!(!ev.calculation.acceptable());
    // The same case with equal stresses passes the check.
    let text = text.replace("test_allowable_stress = \"120 MPa\"", "test_allowable_stress = \"138 MPa\"");
    let ev = evaluate("ref.toml", &text).unwrap();
    let k = ev.calculation.vessel.checks.iter().find(|k| k.name.starts_with("lowest stress ratio")).unwrap();
    assert!(k.pass);
}

#[test]
fn a_selected_thickness_at_the_outside_radius_is_called_too_large() {
    // Regression: a wall reaching the outside radius was said to be "too small
    // for the formulas". A 20 mm outside diameter at 137 MPa with S = 138 MPa
    // needs t_r = 10·(1 − 1/√275) = 9.40 mm (Appendix 1-2, hand arithmetic), so
    // the list's next plate is 10 mm, the whole outside radius.
    let text = case(
        "SI",
        "137 MPa",
        "138 MPa",
        "0 mm",
        "type = \"cylinder\"\noutside_diameter = \"20 mm\"\njoint_efficiency = 1.0",
    );
    let Err(err) = evaluate("ref.toml", &text) else { panic!("an error was expected") };
    let text = err.render();
    assert!(text.contains("too large"), "{text}");
    assert!(!text.contains("too small"), "{text}");
}
