//! As-built inspection of a formed head and the head study command.

mod common;
use common::*;
use serde_json::Value;

const CASE: &str = "examples/v310-receiver-si.toml";

#[test]
fn synthetic_points_with_known_offsets_are_recovered() {
    // examples/v310-top-head-points.csv was generated from the true 2:1 ellipse
    // (a = 600 mm, b = 300 mm) with points moved along the normal by known
    // offsets, the largest +4.0 mm (outside) and −2.0 mm (inside).
    let dir = scratch("inspection-recover");
    let out = knuckle(&[
        "inspect-head",
        CASE,
        "--component",
        "top-head",
        "--points",
        "examples/v310-top-head-points.csv",
        "--out",
        dir.to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let json: Value =
        serde_json::from_slice(&std::fs::read(dir.join("DEMO-V310-CALC-001_revB_inspection_top-head.json")).unwrap())
            .unwrap();
    let rec = &json["record"];
    assert!((rec["max_outside"].as_f64().unwrap() - 4.0).abs() < 1e-3, "{}", rec["max_outside"]);
    assert!((rec["max_inside"].as_f64().unwrap() - 2.0).abs() < 1e-3);
    // UG-81: 1.25 % and 0.625 % of D = 1200 mm.
    assert!((rec["limits"][0].as_f64().unwrap() - 15.0).abs() < 1e-9);
    assert!((rec["limits"][1].as_f64().unwrap() - 7.5).abs() < 1e-9);
    assert_eq!(rec["pass"], true);
    let v = knuckle(&["verify", dir.to_str().unwrap()]);
    assert_eq!(v.status.code(), Some(0), "{}", String::from_utf8_lossy(&v.stdout));
    // A changed record fails verification.
    let md = dir.join("DEMO-V310-CALC-001_revB_inspection_top-head.md");
    let text = std::fs::read_to_string(&md).unwrap().replace("WITHIN TOLERANCE", "WITHIN  TOLERANCE");
    std::fs::write(&md, text).unwrap();
    assert_eq!(knuckle(&["verify", dir.to_str().unwrap()]).status.code(), Some(1));
}

#[test]
fn points_outside_the_tolerance_fail_with_exit_1() {
    let dir = scratch("inspection-fail");
    let src = std::fs::read_to_string(root().join("examples/v310-top-head-points.csv")).unwrap();
    // Move the point at 45° of the ellipse parameter 20 mm outward along the
    // ellipse normal: beyond the 15 mm allowed outside.
    let mut lines: Vec<String> = src.lines().map(str::to_string).collect();
    let (a, b, t) = (600.0f64, 300.0f64, std::f64::consts::FRAC_PI_4);
    let (x, z) = (a * t.sin(), b * t.cos());
    let (nx, nz) = (x / (a * a), z / (b * b));
    let n = nx.hypot(nz);
    lines.push(format!("P99,{:.3},{:.3}", x + 20.0 * nx / n, z + 20.0 * nz / n));
    let p = dir.join("points.csv");
    std::fs::write(&p, lines.join("\n")).unwrap();
    let out = knuckle(&[
        "inspect-head",
        CASE,
        "--component",
        "top-head",
        "--points",
        p.to_str().unwrap(),
        "--out",
        dir.join("out").to_str().unwrap(),
    ]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stdout).contains("NOT within the UG-81 tolerance"));
}

#[test]
fn bad_point_files_are_refused_with_the_line() {
    let cases = [
        ("missing-height-column.csv", "no `height` column", Some(":1:")),
        ("radius-without-unit.csv", "does not state its unit", Some(":1:")),
        ("non-numeric.csv", "`abc` is not a number", Some(":3:")),
        ("beyond-radius.csv", "beyond D/2", Some(":3:")),
        ("too-few.csv", "at least 3 points", None),
        ("unknown-unit.csv", "unknown unit", Some(":1:")),
    ];
    for (file, words, line) in cases {
        let path = format!("tests/cases/points/{file}");
        let dir = scratch(&format!("inspection-bad-{file}"));
        let out = knuckle(&[
            "inspect-head",
            CASE,
            "--component",
            "top-head",
            "--points",
            &path,
            "--out",
            dir.to_str().unwrap(),
        ]);
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{file}: {err}");
        assert!(err.contains(words), "{file}: {err}");
        if let Some(l) = line {
            assert!(err.contains(&format!("{path}{l}")), "{file}: line number\n{err}");
        }
        assert!(std::fs::read_dir(&dir).unwrap().next().is_none(), "{file}: nothing written");
    }
    let out = knuckle(&[
        "inspect-head",
        CASE,
        "--component",
        "shell",
        "--points",
        "examples/v310-top-head-points.csv",
        "--out",
        "target/test-scratch/x",
    ]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("not a formed head"));
}

#[test]
fn head_study_lists_every_shape_with_fluids_consistent_depths() {
    let out = knuckle(&["heads", "--diameter", "2500 mm", "--json"]);
    assert_eq!(out.status.code(), Some(0));
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    let rows = v["rows"].as_array().unwrap();
    let shapes: Vec<&str> = rows.iter().map(|r| r["shape"].as_str().unwrap()).collect();
    for s in ["2:1-ellipsoidal", "2:1-equivalent", "6%-knuckle", "80-10", "din-28011", "din-28013", "hemispherical"] {
        assert!(shapes.contains(&s), "{s} in {shapes:?}");
    }
    // Common practice, no source: 2:1 ellipsoidal depth D/4; hemisphere D/2.
    let depth = |s: &str| rows.iter().find(|r| r["shape"] == s).unwrap()["inside_depth"].as_f64().unwrap();
    assert!((depth("2:1-ellipsoidal") - 625.0).abs() < 1e-9);
    assert!((depth("hemispherical") - 1250.0).abs() < 1e-9);
    // fluids.geometry.a_torispherical(D=2500, f=0.9, k=0.17) = 622.1231 mm (value from the fluids cross-check tests).
    assert!((depth("2:1-equivalent") / 2500.0 - 0.24885).abs() < 1e-5);
    let text =
        knuckle(&["heads", "--diameter", "2500 mm", "--pressure", "1 MPa", "--stress", "138 MPa", "--efficiency", "1"]);
    assert_eq!(text.status.code(), Some(0));
    assert!(String::from_utf8_lossy(&text.stdout).contains("2:1-equivalent"));
}

#[test]
fn head_study_refuses_bad_inputs() {
    for args in [
        vec!["heads", "--diameter", "2500 psi"],
        vec!["heads", "--diameter", "-5 mm"],
        vec!["heads", "--diameter", "2500 mm", "--pressure", "1 MPa"],
        vec!["heads", "--diameter", "2500 mm", "--pressure", "1 MPa", "--stress", "138 MPa", "--efficiency", "1.5"],
    ] {
        let out = knuckle(&args);
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        assert!(String::from_utf8_lossy(&out.stderr).starts_with("error:"), "{args:?}");
    }
}

#[test]
fn errors_in_crlf_point_files_name_the_right_line_regression() {
    // Broke once: line offsets were summed from `lines()`, which drops the
    // "\r" of "\r\n", so a marker drifted one byte per line.
    let dir = scratch("inspection-crlf");
    let p = dir.join("points.csv");
    std::fs::write(&p, "radius [mm],height [mm]\r\n100,290\r\n200,abc\r\n300,260\r\n").unwrap();
    let out = knuckle(&[
        "inspect-head",
        CASE,
        "--component",
        "top-head",
        "--points",
        p.to_str().unwrap(),
        "--out",
        dir.join("out").to_str().unwrap(),
    ]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(err.contains("points.csv:3:1"), "{err}");
    assert!(err.contains("3 | 200,abc"), "{err}");
}
