//! The head study: shapes, required thicknesses, units and tables.

use knuckle::geometry::{head_study, study_table_markdown, study_table_text, StudyInput, StudyReport};

fn design_input() -> StudyInput {
    StudyInput {
        pressure: Some(1.0),
        stress: Some(138.0),
        efficiency: Some(1.0),
        corrosion_allowance: 3.0,
        straight_flange: 50.0,
        ..StudyInput::new(2500.0)
    }
}

#[test]
fn study_compares_seven_shapes_shallowest_first() {
    let rows = head_study(&StudyInput::new(2500.0)).unwrap();
    let names: Vec<&str> = rows.iter().map(|r| r.shape.as_str()).collect();
    assert_eq!(rows.len(), 7);
    for key in ["2:1-ellipsoidal", "2:1-equivalent", "6%-knuckle", "80-10", "din-28011", "din-28013", "hemispherical"] {
        assert!(names.contains(&key), "{key} missing from {names:?}");
    }
    assert!(rows.windows(2).all(|w| w[0].inside_depth <= w[1].inside_depth));
    assert_eq!(names.first(), Some(&"6%-knuckle"));
    assert_eq!(names.last(), Some(&"hemispherical"));
    // Without thickness there is no mass and the blank is the inside surface.
    assert!(rows.iter().all(|r| r.mass.is_none() && r.thickness.is_none()));
}

#[test]
fn rows_are_in_metres_for_volume_and_area() {
    // 2:1 ellipsoidal head of D = 2500 mm: V = π·D³/24 and
    // fluids 1.3.1 fluids.geometry.SA_ellipsoidal_head(D=2500, a=625) =
    // 6774908.361988322 mm².
    let rows = head_study(&StudyInput::new(2500.0)).unwrap();
    let e = rows.iter().find(|r| r.shape == "2:1-ellipsoidal").unwrap();
    assert!((e.volume - std::f64::consts::PI * 2.5f64.powi(3) / 24.0).abs() < 1e-12);
    assert!((e.inside_area - 6.774908361988322).abs() < 1e-9);
    assert!(e.deviation_from_2to1 < 1e-9);
    let json = serde_json::to_value(StudyReport::new(&StudyInput::new(2500.0)).unwrap()).unwrap();
    assert_eq!(json["diameter_mm"], 2500.0);
    let row = &json["rows"][0];
    for field in [
        "shape",
        "crown_radius",
        "knuckle_radius",
        "inside_depth",
        "volume",
        "inside_area",
        "blank_diameter",
        "required_thickness",
        "thickness",
        "mass",
        "deviation_from_2to1",
    ] {
        assert!(row.get(field).is_some(), "field {field} missing");
    }
}

#[test]
fn required_thicknesses_follow_the_division_1_formulas() {
    // Hand calculation, P = 1 MPa, S = 138 MPa, E = 1, CA = 3 mm, D = 2500 mm,
    // corroded: 2SE − 0.2P = 275.8 MPa.
    // Appendix 1-4(c): Dc = 2506, hc = 628, K = (2 + (2506/1256)²)/6 =
    //   0.9968190900, t = P·Dc·K/275.8 = 9.057391732 mm.
    // Appendix 1-4(d), 2:1-equivalent: L = 2253, r = 428,
    //   M = (3 + √(2253/428))/4 = 1.323586234, t = P·L·M/275.8 = 10.81232700 mm.
    // UG-32(f): R = 1253, t = P·R/275.8 = 4.543147208 mm.
    let rows = head_study(&design_input()).unwrap();
    let get = |k: &str| rows.iter().find(|r| r.shape == k).unwrap();
    let t = |k: &str| get(k).required_thickness.unwrap();
    assert!((t("2:1-ellipsoidal") - 9.057391732).abs() < 1e-8);
    assert!((t("2:1-equivalent") - 10.81232700).abs() < 1e-7);
    assert!((t("hemispherical") - 4.543147208).abs() < 1e-8);
    // Nominal = required + CA, and a mass is given.
    for r in &rows {
        let nominal = r.thickness.unwrap();
        assert!((nominal - r.required_thickness.unwrap() - 3.0).abs() < 1e-9, "{}", r.shape);
        assert!(r.mass.unwrap() > 0.0);
    }
    // The 6 %-knuckle head is defined on Do = D + 2·t, which the study solves
    // together with its own thickness: L = Do exactly.
    let six = get("6%-knuckle");
    let d_o = 2500.0 + 2.0 * six.thickness.unwrap();
    assert!((six.crown_radius.unwrap() - d_o).abs() < 1e-8);
    assert!((six.knuckle_radius.unwrap() - 0.06 * d_o).abs() < 1e-8);
}

#[test]
fn given_thickness_is_used_for_every_head() {
    let input = StudyInput { thickness: Some(14.0), ..design_input() };
    let rows = head_study(&input).unwrap();
    assert!(rows.iter().all(|r| r.thickness == Some(14.0)));
    let din = rows.iter().find(|r| r.shape == "din-28011").unwrap();
    assert_eq!(din.crown_radius, Some(2528.0));
}

#[test]
fn incomplete_or_bad_design_data_is_an_error() {
    let mut input = StudyInput::new(2500.0);
    input.pressure = Some(1.0);
    let err = head_study(&input).unwrap_err().to_string();
    assert!(err.contains("together"), "{err}");
    let input = StudyInput { efficiency: Some(1.2), ..design_input() };
    assert!(head_study(&input).unwrap_err().to_string().contains("joint efficiency"));
    let input = StudyInput { thickness: Some(2.0), ..design_input() };
    assert!(head_study(&input).unwrap_err().to_string().contains("corrosion allowance"));
    assert!(head_study(&StudyInput::new(f64::NAN)).is_err());
    assert!(head_study(&StudyInput::new(0.0)).is_err());
}

#[test]
fn tables_are_aligned_and_complete() {
    let rows = head_study(&design_input()).unwrap();
    let text = study_table_text(&rows);
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 2 + rows.len());
    assert!(lines[0].starts_with("shape"));
    // Right-aligned numbers: every body line ends at the same column as the
    // header's last column.
    let width = lines[0].chars().count();
    assert!(lines[2..].iter().all(|l| l.chars().count() == width), "{text}");
    for r in &rows {
        assert!(text.contains(&r.shape));
    }
    let md = study_table_markdown(&rows);
    assert_eq!(md.lines().count(), 2 + rows.len());
    assert!(md.lines().nth(1).unwrap().starts_with("| :--- | ---: |"));
    assert_eq!(text, study_table_text(&head_study(&design_input()).unwrap()));
}
