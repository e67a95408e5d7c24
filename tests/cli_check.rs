//! `knuckle check` on the bundled examples: exit status, summary and the
//! JSON contract `knuckle-results/1`.

mod common;
use common::*;
use serde_json::Value;

fn json_of(case: &str) -> (i32, Value) {
    let out = knuckle(&["check", case, "--json"]);
    let v: Value = serde_json::from_slice(&out.stdout).expect("JSON on stdout");
    (out.status.code().unwrap_or(-1), v)
}

#[test]
fn examples_are_acceptable_and_print_a_summary() {
    for case in ["examples/v310-receiver-si.toml", "examples/k12-air-receiver-us.toml"] {
        let out = knuckle(&["check", case]);
        let text = String::from_utf8_lossy(&out.stdout);
        assert_eq!(out.status.code(), Some(0), "{case}\n{text}{}", String::from_utf8_lossy(&out.stderr));
        assert!(text.contains("vessel MAWP at the top"), "{text}");
        assert!(text.contains("hydrostatic test, UG-99(b)"));
        assert!(text.contains("status: ACCEPTABLE"));
        assert!(text.contains("never replaces, a qualified engineer"));
    }
}

#[test]
fn json_contract_fields_are_present() {
    let (code, v) = json_of("examples/v310-receiver-si.toml");
    assert_eq!(code, 0);
    assert_eq!(v["format"], "knuckle-results/1");
    assert_eq!(v["tool"]["name"], "knuckle");
    assert!(v["tool"]["version"].is_string());
    assert_eq!(v["document"]["number"], "DEMO-V310-CALC-001");
    assert_eq!(v["document"]["revision"], "B");
    assert_eq!(v["units"]["length"], "mm");
    assert_eq!(v["units"]["pressure"], "MPa");
    let comps = v["components"].as_array().unwrap();
    assert_eq!(comps.len(), 5);
    for c in comps {
        for key in [
            "id",
            "type",
            "required_thickness",
            "minimum_thickness",
            "nominal_thickness",
            "mawp",
            "map",
            "status",
            "steps",
            "checks",
        ] {
            assert!(c.get(key).is_some(), "component lacks {key}");
        }
        assert!(c["status"] == "acceptable" || c["status"] == "not-acceptable");
        for s in c["steps"].as_array().unwrap() {
            for key in ["symbol", "description", "clause", "formula", "substituted", "value", "unit"] {
                assert!(s.get(key).is_some(), "step lacks {key}");
            }
        }
        for k in c["checks"].as_array().unwrap() {
            for key in ["name", "clause", "required", "provided", "pass", "margin"] {
                assert!(k.get(key).is_some(), "check lacks {key}");
            }
        }
    }
    for key in ["mawp", "governing_component", "hydrotest_pressure", "pneumatic_test_pressure", "status"] {
        assert!(v["vessel"].get(key).is_some(), "vessel lacks {key}");
    }
}

#[test]
fn every_reported_number_is_the_value_of_a_step() {
    // Invariant: required/minimum thickness and MAWP come from recorded steps.
    let (_, v) = json_of("examples/v310-receiver-si.toml");
    for c in v["components"].as_array().unwrap() {
        let values: Vec<f64> = c["steps"].as_array().unwrap().iter().filter_map(|s| s["value"].as_f64()).collect();
        for key in ["required_thickness", "minimum_thickness", "mawp", "mawp_top", "map"] {
            let x = c[key].as_f64().unwrap();
            assert!(values.contains(&x), "{}: {key} = {x} is not a step value", c["id"]);
        }
    }
    let vessel_values: Vec<f64> =
        v["vessel"]["steps"].as_array().unwrap().iter().filter_map(|s| s["value"].as_f64()).collect();
    for key in ["mawp", "hydrotest_pressure", "pneumatic_test_pressure"] {
        let x = v["vessel"][key].as_f64().unwrap();
        assert!(vessel_values.contains(&x), "vessel {key}");
    }
}

#[test]
fn a_failing_design_exits_1_and_says_why() {
    let out = knuckle(&["check", "tests/cases/good/thin-shell-fails.toml"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1), "{text}");
    assert!(text.contains("NOT ACCEPTABLE"));
    assert!(text.contains("nominal thickness covers the minimum thickness"));
}

#[test]
fn a_steep_cone_reports_a_failed_applicability_check_and_no_thickness() {
    let (code, v) = json_of("tests/cases/good/steep-cone.toml");
    assert_eq!(code, 1);
    let cone = v["components"].as_array().unwrap().iter().find(|c| c["id"] == "cone").unwrap();
    assert!(cone["required_thickness"].is_null());
    assert!(cone["mawp"].is_null());
    let check = cone["checks"].as_array().unwrap().iter().find(|k| k["name"] == "half-apex angle within 30°").unwrap();
    assert_eq!(check["pass"], false);
    assert!(check["note"].as_str().unwrap().contains("Appendix 1, 1-5(g)"));
    assert!(v["cautions"]
        .as_array()
        .unwrap()
        .iter()
        .any(|c| c.as_str().unwrap().contains("half-apex angle within 30°")));
}

#[test]
fn new_writes_a_starter_that_checks_and_refuses_to_overwrite() {
    let dir = scratch("new-starter");
    let p = dir.join("case.toml");
    let p = p.to_str().unwrap();
    assert_eq!(knuckle(&["new", p]).status.code(), Some(0));
    assert_eq!(knuckle(&["check", p]).status.code(), Some(0));
    let again = knuckle(&["new", p]);
    assert_eq!(again.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&again.stderr).contains("already exists"));
}

#[test]
fn schema_is_json_schema_with_the_contract_keys() {
    let out = knuckle(&["schema"]);
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["$schema"], "https://json-schema.org/draft/2020-12/schema");
    let comp = &v["properties"]["component"]["items"]["properties"];
    for key in [
        "id",
        "type",
        "material",
        "inside_diameter",
        "outside_diameter",
        "nominal_thickness",
        "joint_efficiency",
        "liquid_head",
        "length",
        "aspect_ratio",
        "crown_radius",
        "knuckle_radius",
        "shape",
        "half_apex_angle",
    ] {
        assert!(comp.get(key).is_some(), "schema lacks {key}");
    }
}
