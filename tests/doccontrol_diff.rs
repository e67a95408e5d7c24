//! Revision comparison on the SI example and a modified copy of it.

mod doccontrol_support;

use doccontrol_support::*;
use knuckle::diff::{diff_cases, diff_markdown, diff_snapshots, diff_text, Snapshot, Value};
use knuckle::pipeline::{evaluate, Evaluated};

const EXAMPLE: &str = include_str!("../examples/v310-receiver-si.toml");

/// Revision C of the example: higher design pressure, a thinner shell, a
/// lower allowable stress and a flatter top head.
fn revision_c() -> String {
    let s = EXAMPLE
        .replace("revision = \"B\"\ndate", "revision = \"C\"\ndate")
        .replace("internal_pressure = \"1.0 MPa\"", "internal_pressure = \"1.1 MPa\"")
        .replacen("nominal_thickness = \"12 mm\"", "nominal_thickness = \"10 mm\"", 1)
        .replace("allowable_stress = \"138 MPa\"\ntest", "allowable_stress = \"130 MPa\"\ntest")
        .replace("aspect_ratio = 2.0", "aspect_ratio = 2.2");
    assert_ne!(s, EXAMPLE);
    s
}

fn eval(name: &str, src: &str) -> Evaluated {
    evaluate(name, src).unwrap()
}

#[test]
fn names_every_changed_input() {
    let d = diff_cases(&eval("b.toml", EXAMPLE), &eval("c.toml", &revision_c()));
    assert_eq!((d.old_revision.as_str(), d.new_revision.as_str()), ("B", "C"));
    let keys: Vec<&str> = d.inputs.iter().map(|c| c.key.as_str()).collect();
    assert_eq!(
        keys,
        [
            "design pressure",
            "material plate: allowable stress",
            "shell: nominal thickness",
            "top-head: aspect ratio D/2h",
        ]
    );
    let text = diff_text(&d);
    assert!(text.contains("design pressure: 1 MPa -> 1.1 MPa"), "{text}");
    assert!(text.contains("shell: nominal thickness: 12 mm -> 10 mm"));
    assert!(text.contains("material plate: allowable stress: 138 MPa -> 130 MPa"));
    assert!(text.contains("top-head: aspect ratio D/2h: 2 -> 2.2"));
}

#[test]
fn names_every_changed_result_with_its_relative_change() {
    let old = eval("b.toml", EXAMPLE);
    let new = eval("c.toml", &revision_c());
    let d = diff_cases(&old, &new);
    // Independent oracle: the step lists keep their shape between these two
    // revisions, so comparing step by step by position finds every change.
    let mut expected = Vec::new();
    let parts = old
        .calculation
        .components
        .iter()
        .map(|c| (c.id.as_str(), &c.steps))
        .chain([("vessel", &old.calculation.vessel.steps)]);
    let new_parts: Vec<_> =
        new.calculation.components.iter().map(|c| &c.steps).chain([&new.calculation.vessel.steps]).collect();
    for ((id, os), ns) in parts.zip(new_parts) {
        assert_eq!(os.len(), ns.len());
        for (o, n) in os.iter().zip(ns.iter()) {
            if o.clause != "input" && o.quantity.value != n.quantity.value {
                expected.push((id.to_string(), n.symbol.clone(), n.quantity.value));
            }
        }
    }
    let got: Vec<(String, String, f64)> =
        d.steps.iter().map(|s| (s.part.clone(), s.symbol.clone(), s.new.unwrap().value)).collect();
    assert_eq!(got, expected);
    assert!(got.len() > 20);

    // Pressure at the shell: P = Pd + ρ·g·h with ρ = 1000 kg/m³,
    // g = 9.80665 m/s², h = 2.4 m (UG-22 static head, common practice),
    // so Ps = 0.02353596 MPa and the change is 0.1/1.02353596.
    let p = d.steps.iter().find(|s| s.part == "shell" && s.symbol == "P").unwrap();
    assert!((p.relative().unwrap() - 0.1 / 1.02353596).abs() < 1e-9);
    assert!(diff_text(&d).contains("1.02354 MPa -> 1.12354 MPa (+9.77 %)"));
}

#[test]
fn status_flips_come_first_and_the_summary_changes() {
    let d = diff_cases(&eval("b.toml", EXAMPLE), &eval("c.toml", &revision_c()));
    let flips = d.checks.iter().take_while(|c| c.flipped()).count();
    assert!(flips >= 1);
    assert!(d.checks[flips..].iter().all(|c| !c.flipped()));
    assert!(d.checks.iter().any(|c| c.part == "shell" && c.flipped() && c.new_pass == Some(false)));
    let items: Vec<&str> = d.summary.iter().map(|c| c.item.as_str()).collect();
    assert!(items.contains(&"vessel MAWP at the top"));
    let status = d.summary.iter().find(|c| c.item == "status").unwrap();
    assert_eq!(status.new, Value::Text("not acceptable".into()));
    let md = diff_markdown(&d);
    assert!(md.starts_with("## Changes since revision B\n"));
    assert!(md.contains("| design pressure | 1 MPa | 1.1 MPa |"), "{md}");
    assert!(md.contains(
        "| shell | nominal thickness covers the minimum thickness | UG-16, UG-25, UG-27/UG-32 | **pass** | **FAIL** |"
    ));
    assert!(md.contains("### Vessel summary"));
    // Same input, same bytes.
    let again = diff_cases(&eval("b.toml", EXAMPLE), &eval("c.toml", &revision_c()));
    assert_eq!(diff_markdown(&again), md);
}

#[test]
fn identical_revisions_have_no_changes() {
    let d = diff_cases(&eval("b.toml", EXAMPLE), &eval("b2.toml", EXAMPLE));
    assert!(d.is_empty());
    assert!(diff_text(&d).contains("no changes"));
    assert!(diff_markdown(&d).contains("No input, result or check changed."));
}

#[test]
fn packages_and_results_files_compare_like_case_files() {
    let root = temp_dir("diff-results");
    let old = eval("b.toml", EXAMPLE);
    let new = eval("c.toml", &revision_c());
    let to_json = |ev: &Evaluated| knuckle::results::results_json(&ev.design, &ev.calculation, &Default::default());
    let (oj, nj) = (to_json(&old), to_json(&new));
    // Through JSON text, as a package holds it.
    let parse = |v: &serde_json::Value| -> serde_json::Value {
        serde_json::from_str(&serde_json::to_string_pretty(v).unwrap()).unwrap()
    };
    let dj =
        diff_snapshots(&Snapshot::from_results(&parse(&oj)).unwrap(), &Snapshot::from_results(&parse(&nj)).unwrap());
    let dc = diff_cases(&old, &new);
    let steps = |d: &knuckle::diff::Diff| {
        d.steps.iter().map(|s| (s.part.clone(), s.symbol.clone(), s.clause.clone())).collect::<Vec<_>>()
    };
    assert_eq!(steps(&dj), steps(&dc));
    assert_eq!(dj.checks.len(), dc.checks.len());
    assert_eq!(dj.summary, dc.summary);
    assert!(dj.inputs.iter().any(|c| c.key == "design pressure"));
    assert!(dj.inputs.iter().any(|c| c.key.starts_with("shell: nominal thickness")));

    // The command: case file against a results file, with Markdown output.
    std::fs::write(root.join("c.toml"), revision_c()).unwrap();
    std::fs::write(root.join("old.json"), serde_json::to_string_pretty(&oj).unwrap()).unwrap();
    let md = root.join("changes.md");
    let o = knuckle(&["diff", s(&root.join("old.json")), s(&root.join("c.toml")), "--md", s(&md)], &[]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(stdout(&o).contains("changes: DEMO-V310-CALC-001 revision B -> revision C"));
    assert!(std::fs::read_to_string(&md).unwrap().starts_with("## Changes since revision B"));

    // A package directory with one package stands for its results file.
    let pkg = root.join("pkg");
    write_package(&pkg, "DEMO-V310-CALC-001", "B", "x", None);
    std::fs::write(pkg.join("DEMO-V310-CALC-001_revB.json"), serde_json::to_string_pretty(&oj).unwrap()).unwrap();
    let o = knuckle(&["diff", s(&pkg), s(&root.join("c.toml"))], &[]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(stdout(&o).contains("design pressure: 1 MPa -> 1.1 MPa"));
}

#[test]
fn bad_inputs_are_reported() {
    let root = temp_dir("diff-bad");
    let o = knuckle(&["diff", s(&root.join("missing.toml")), "examples/v310-receiver-si.toml"], &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("cannot read case file"), "{}", stderr(&o));
    std::fs::write(root.join("x.json"), "{\"format\": \"other\"}").unwrap();
    let o = knuckle(&["diff", s(&root.join("x.json")), "examples/v310-receiver-si.toml"], &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("not a results file"), "{}", stderr(&o));
    let pkg = root.join("two");
    write_package(&pkg, "D-1", "A", "a", None);
    write_package(&pkg, "D-1", "B", "b", None);
    let o = knuckle(&["diff", s(&pkg), "examples/v310-receiver-si.toml"], &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("name the package's results file"), "{}", stderr(&o));
}
