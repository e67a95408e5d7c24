//! Materials library, joint efficiency from the joint, thickness selection,
//! mass and volume.
//!
//! Every case file in `tests/cases/materials/` states what it expects in its
//! header comments, with the source of each check value after `  # `:
//!
//! - `expect-exit: N`: the exit status of `knuckle check --json`;
//! - `expect: /json/pointer = number`: a number of the results JSON (its fixed units);
//! - `expect-null: /json/pointer`: a value that must be null;
//! - `expect-text: /json/pointer text`: a string that must contain `text`;
//! - `expect-step: /component/pointer SYMBOL text`: a step with that symbol
//!   whose description, clause, formula or formula id contains `text`;
//! - `expect-caution: text`: a caution containing `text`;
//! - `expect-error: text`: words that must appear in the error output.
//!
//! So a new case is a new file, not new code.

use knuckle::pipeline::{evaluate, evaluate_with, MemoryLoader};
use serde_json::Value;
use std::path::{Path, PathBuf};
use std::process::Command;

fn cases_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/materials")
}

/// Runs `knuckle check --json` on a case file from inside its folder, so
/// that messages name the file as the user would have typed it.
fn run_check(dir: &Path, file: &str) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_knuckle"))
        .current_dir(dir)
        .args(["check", "--json", file])
        .output()
        .expect("the knuckle binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// The expectation without its source note.
fn strip_note(s: &str) -> &str {
    s.split("  # ").next().unwrap_or(s).trim()
}

fn check_expectation(name: &str, line: &str, json: &Value, stderr: &str) -> Result<(), String> {
    let (kind, rest) = line.split_once(':').ok_or_else(|| format!("{name}: malformed expectation `{line}`"))?;
    let rest = strip_note(rest.trim());
    match kind {
        "expect" => {
            let (ptr, want) = rest.split_once(" = ").ok_or_else(|| format!("{name}: `{line}` needs ` = `"))?;
            let want: f64 = want.trim().parse().map_err(|_| format!("{name}: `{want}` is not a number"))?;
            let got = json
                .pointer(ptr.trim())
                .and_then(Value::as_f64)
                .ok_or_else(|| format!("{name}: no number at {ptr}"))?;
            let tol = 1e-9 * want.abs().max(1.0);
            if (got - want).abs() > tol {
                return Err(format!("{name}: {ptr} = {got}, expected {want}"));
            }
        }
        "expect-null" => {
            let v = json.pointer(rest);
            if !matches!(v, Some(Value::Null)) {
                return Err(format!("{name}: {rest} is {v:?}, expected null"));
            }
        }
        "expect-text" => {
            let (ptr, want) =
                rest.split_once(' ').ok_or_else(|| format!("{name}: `{line}` needs a pointer and text"))?;
            let got = json.pointer(ptr).and_then(Value::as_str).unwrap_or("");
            if !got.contains(want) {
                return Err(format!("{name}: {ptr} = `{got}` does not contain `{want}`"));
            }
        }
        "expect-step" => {
            let mut parts = rest.splitn(3, ' ');
            let (ptr, symbol, want) =
                (parts.next().unwrap_or(""), parts.next().unwrap_or(""), parts.next().unwrap_or(""));
            let steps = json
                .pointer(&format!("{ptr}/steps"))
                .and_then(Value::as_array)
                .ok_or_else(|| format!("{name}: no steps at {ptr}"))?;
            let found = steps.iter().any(|s| {
                s["symbol"] == symbol
                    && ["description", "clause", "formula", "formula_id"]
                        .iter()
                        .any(|f| s[*f].as_str().unwrap_or("").contains(want))
            });
            if !found {
                return Err(format!("{name}: no step `{symbol}` at {ptr} mentions `{want}`"));
            }
        }
        "expect-caution" => {
            let cautions = json["cautions"].as_array().cloned().unwrap_or_default();
            if !cautions.iter().any(|c| c.as_str().unwrap_or("").contains(rest)) {
                return Err(format!("{name}: no caution contains `{rest}`"));
            }
        }
        "expect-error" => {
            if !stderr.contains(rest) {
                return Err(format!("{name}: the error output lacks `{rest}`:\n{stderr}"));
            }
        }
        "expect-exit" => {}
        other => return Err(format!("{name}: unknown expectation `{other}`")),
    }
    Ok(())
}

#[test]
fn every_fixture_case_meets_its_expectations() {
    let dir = cases_dir();
    let mut files: Vec<PathBuf> = std::fs::read_dir(&dir)
        .expect("the fixture folder exists")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    files.sort();
    assert!(files.len() >= 20, "fixtures missing: {files:?}");
    let mut failures = Vec::new();
    for path in &files {
        let name = path.file_name().unwrap().to_string_lossy().into_owned();
        let text = std::fs::read_to_string(path).unwrap();
        let expectations: Vec<&str> = text
            .lines()
            .take_while(|l| l.starts_with('#'))
            .map(|l| l.trim_start_matches('#').trim())
            .filter(|l| l.starts_with("expect"))
            .collect();
        let exit: i32 = expectations
            .iter()
            .find_map(|l| l.strip_prefix("expect-exit:"))
            .map(|v| strip_note(v).parse().unwrap())
            .unwrap_or_else(|| panic!("{name}: no expect-exit"));
        let (code, stdout, stderr) = run_check(&dir, &name);
        if code != exit {
            failures.push(format!("{name}: exit {code}, expected {exit}\n{stderr}"));
            continue;
        }
        if exit == 2 {
            assert!(stdout.is_empty(), "{name}: an input error must write nothing");
            assert!(stderr.contains("nothing was computed or written"), "{name}: {stderr}");
            assert!(!stderr.contains("panicked"), "{name}: {stderr}");
        }
        let json: Value = if exit == 2 {
            Value::Null
        } else {
            serde_json::from_str(&stdout).unwrap_or_else(|e| panic!("{name}: {e}"))
        };
        for line in &expectations {
            if let Err(e) = check_expectation(&name, line, &json, &stderr) {
                failures.push(e);
            }
        }
    }
    assert!(failures.is_empty(), "\n{}", failures.join("\n"));
}

/// A minimal case around one component, for the programmatic tests.
fn case_with(component_keys: &str) -> String {
    format!(
        r#"[document]
number = "T-1"
revision = "A"
date = "2026-12-01"

[design]
internal_pressure = "1 MPa"
temperature = "100 degC"

[materials.plate]
name = "Test plate"
allowable_stress = "138 MPa"

[[component]]
id = "shell"
type = "cylinder"
material = "plate"
inside_diameter = "1000 mm"
nominal_thickness = "12 mm"
{component_keys}
"#
    )
}

#[test]
fn every_uw12_cell_reaches_the_sheet_and_refused_cells_are_input_errors() {
    // Table UW-12 of ASME BPVC VIII-1, from memory: types 1 and 2 for every
    // extent of radiography, types 3 to 6 only without radiography.
    let table: [(u8, [Option<f64>; 3]); 6] = [
        (1, [Some(1.00), Some(0.85), Some(0.70)]),
        (2, [Some(0.90), Some(0.80), Some(0.65)]),
        (3, [None, None, Some(0.60)]),
        (4, [None, None, Some(0.55)]),
        (5, [None, None, Some(0.50)]),
        (6, [None, None, Some(0.45)]),
    ];
    for (joint_type, cells) in table {
        for (extent, want) in ["full", "spot", "none"].iter().zip(cells) {
            let text = case_with(&format!("joint_type = {joint_type}\nradiography = \"{extent}\""));
            match (evaluate("t.toml", &text), want) {
                (Ok(ev), Some(e)) => {
                    assert_eq!(ev.design.components[0].joint_efficiency, e);
                    let step =
                        ev.calculation.components[0].steps.iter().find(|s| s.symbol == "E").expect("E is recorded");
                    assert!(step.clause.contains("UW-12") && step.clause.contains("UW-11"));
                }
                (Err(err), None) => {
                    let msg = err.render();
                    assert!(msg.contains("Table UW-12 gives no efficiency"), "{msg}");
                    assert!(msg.contains("t.toml:"), "{msg}");
                }
                (Ok(_), None) => panic!("type {joint_type} {extent} must be refused"),
                (Err(e), Some(_)) => panic!("type {joint_type} {extent}: {}", e.render()),
            }
        }
    }
    // UW-12(d), from memory: seamless 1.00 with spot radiography of the joining welds, 0.85 without.
    for (extent, e) in [("spot", 1.00), ("full", 1.00), ("none", 0.85)] {
        let text = case_with(&format!("seamless = true\nradiography = \"{extent}\""));
        let ev = evaluate("t.toml", &text).unwrap();
        assert_eq!(ev.design.components[0].joint_efficiency, e);
    }
}

#[test]
fn libraries_come_through_the_loader_and_results_do_not_depend_on_it() {
    // The same library text given in memory and read from disk gives the same results.
    let library =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("materials/example-library.toml")).unwrap();
    let text = case_with("joint_efficiency = 1.0").replace(
        "name = \"Test plate\"\nallowable_stress = \"138 MPa\"",
        "library = \"lib.toml\"\nentry = \"sa-516-70\"",
    );
    let loader = MemoryLoader::default().with("lib.toml", &library);
    let ev = evaluate_with("t.toml", &text, &loader).unwrap();
    // 100 degC = 212 degF lies between the 200 and 300 degF rows, both 20.0 ksi
    // (example library, from memory): S = 20 ksi = 137.895 MPa.
    let s = ev.design.materials["plate"].allowable_stress.value;
    assert!((s - 20_000.0 * 6_894.757_293_168_361).abs() < 1e-3, "{s}");
    // Without a loader the library is an input error that says why.
    let err = evaluate("t.toml", &text).unwrap_err().render();
    assert!(err.contains("reads no library files"), "{err}");
}

#[test]
fn the_examples_still_pass_check() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples");
    let mut n = 0;
    for e in std::fs::read_dir(&dir).unwrap() {
        let p = e.unwrap().path();
        if p.extension().is_some_and(|x| x == "toml") {
            let name = p.file_name().unwrap().to_string_lossy().into_owned();
            let (code, _, stderr) = run_check(&dir, &name);
            assert_eq!(code, 0, "{name}: {stderr}");
            n += 1;
        }
    }
    assert!(n >= 3);
}

#[test]
fn the_library_example_selects_thicknesses_and_warns() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples");
    let (code, stdout, stderr) = run_check(&dir, "v420-solvent-tank-si.toml");
    assert_eq!(code, 0, "{stderr}");
    let json: Value = serde_json::from_str(&stdout).unwrap();
    for c in json["components"].as_array().unwrap() {
        assert!(c["nominal_thickness"].is_null());
        assert!(c["selected_thickness"].as_f64().is_some(), "{}", c["id"]);
    }
    assert_eq!(json["vessel"]["order_list"].as_array().unwrap().len(), 4);
    assert!(json["cautions"]
        .as_array()
        .unwrap()
        .iter()
        .any(|c| c.as_str().unwrap().contains("illustrative values from memory")));
    // The terminal summary carries the same warning.
    let out = Command::new(env!("CARGO_BIN_EXE_knuckle"))
        .current_dir(&dir)
        .args(["check", "v420-solvent-tank-si.toml"])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("illustrative values from memory"), "{text}");
    assert!(text.contains("order list:"), "{text}");
}

#[test]
fn materials_command_lists_and_shows() {
    let run = |args: &[&str]| {
        let out = Command::new(env!("CARGO_BIN_EXE_knuckle")).args(args).output().unwrap();
        (
            out.status.code().unwrap_or(-1),
            String::from_utf8_lossy(&out.stdout).into_owned(),
            String::from_utf8_lossy(&out.stderr).into_owned(),
        )
    };
    let (code, out, _) = run(&["materials"]);
    assert_eq!(code, 0);
    assert!(out.contains("sa-516-70") && out.contains("caution: illustrative values from memory"));
    let (code, out, _) = run(&["materials", "sa-516-70"]);
    assert_eq!(code, 0);
    assert!(out.contains("temperature (degF)") && out.contains("18.8"), "{out}");
    let (code, _, err) = run(&["materials", "no-such-key"]);
    assert_eq!(code, 2);
    assert!(err.contains("has no material `no-such-key`"), "{err}");
    let broken = cases_dir().join("lib/broken-library.toml");
    let (code, _, err) = run(&["materials", "--library", broken.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("broken-library.toml:13:"), "{err}");
}
