//! The report compiler: files, PDF content, determinism, tampering, templates
//! and verification.

mod common;
use common::*;
use serde_json::Value;
use std::path::Path;

const SI: &str = "examples/v310-receiver-si.toml";
const STEM: &str = "DEMO-V310-CALC-001_revB";

fn compile_into(dir: &Path, extra: &[&str]) -> std::process::Output {
    let mut args = vec!["compile", SI, "--out", dir.to_str().unwrap()];
    args.extend_from_slice(extra);
    knuckle(&args)
}

fn squash(s: &str) -> String {
    s.chars().filter(|c| !c.is_whitespace()).collect()
}

fn pdf_text(path: &Path) -> String {
    let doc = lopdf::Document::load(path).expect("PDF parses");
    let pages: Vec<u32> = doc.get_pages().keys().copied().collect();
    doc.extract_text(&pages).expect("text extracts")
}

#[test]
fn compile_writes_the_four_files_and_a_manifest_over_them() {
    let dir = scratch("package-four-files");
    let out = compile_into(&dir, &[]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    for ext in ["md", "pdf", "json", "manifest.json"] {
        assert!(dir.join(format!("{STEM}.{ext}")).is_file(), "{ext}");
    }
    let m: Value = serde_json::from_slice(&std::fs::read(dir.join(format!("{STEM}.manifest.json"))).unwrap()).unwrap();
    assert_eq!(m["format"], "knuckle-manifest/1");
    assert_eq!(m["tool"]["name"], "knuckle");
    let digest = m["digest"].as_str().unwrap();
    assert_eq!(digest.len(), 64);
    for f in m["files"].as_array().unwrap() {
        let bytes = std::fs::read(dir.join(f["name"].as_str().unwrap())).unwrap();
        use sha2::Digest;
        let h = sha2::Sha256::digest(&bytes);
        let hex: String = h.iter().map(|b| format!("{b:02x}")).collect();
        assert_eq!(f["sha256"], hex);
    }
    let md = std::fs::read_to_string(dir.join(format!("{STEM}.md"))).unwrap();
    assert!(md.contains(digest), "full digest on the cover");
    assert!(!dir.read_dir().unwrap().any(|e| e.unwrap().file_name().to_string_lossy().ends_with(".tmp")));
}

#[test]
fn the_pdf_holds_the_digest_the_ids_and_every_number_of_the_summary() {
    let dir = scratch("package-pdf-content");
    compile_into(&dir, &[]);
    let text = squash(&pdf_text(&dir.join(format!("{STEM}.pdf"))));
    let m: Value = serde_json::from_slice(&std::fs::read(dir.join(format!("{STEM}.manifest.json"))).unwrap()).unwrap();
    let digest = m["digest"].as_str().unwrap();
    assert!(text.contains(&digest[..12]), "short digest in the footer");
    assert!(text.contains(digest), "full digest on the cover");
    assert!(text.contains("DEMO-V310-CALC-001"));
    let results: Value = serde_json::from_slice(&std::fs::read(dir.join(format!("{STEM}.json"))).unwrap()).unwrap();
    for c in results["components"].as_array().unwrap() {
        assert!(text.contains(c["id"].as_str().unwrap()), "component id {}", c["id"]);
        // Every step value of the JSON appears in the PDF (in SI report units
        // the PDF shows mm and MPa, the JSON's own units), to six significant digits.
        for s in c["steps"].as_array().unwrap() {
            let v = s["value"].as_f64().unwrap();
            let unit = s["unit"].as_str().unwrap();
            if unit == "mm" || unit == "MPa" || unit == "1" {
                let shown = knuckle::units::format_number(v, 6);
                assert!(text.contains(&shown), "{}: step {} value {shown} not in the PDF", c["id"], s["symbol"]);
            }
        }
    }
    for caution in ["supports,andneverreplaces", "editionofthedesigncodeinforce", "licensedorotherwiseauthorised"] {
        assert!(text.contains(caution), "caution `{caution}`");
    }
}

#[test]
fn compiling_twice_gives_the_same_bytes() {
    let a = scratch("package-determinism-a");
    let b = scratch("package-determinism-b");
    compile_into(&a, &[]);
    compile_into(&b, &[]);
    for ext in ["md", "pdf", "json", "manifest.json"] {
        let name = format!("{STEM}.{ext}");
        assert_eq!(std::fs::read(a.join(&name)).unwrap(), std::fs::read(b.join(&name)).unwrap(), "{name}");
    }
}

#[test]
fn verify_passes_on_a_fresh_package_and_with_the_case() {
    let dir = scratch("package-verify-fresh");
    compile_into(&dir, &[]);
    let out = knuckle(&["verify", dir.to_str().unwrap()]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{text}");
    assert!(text.contains("VERIFIED") && !text.contains("NOT VERIFIED"));
    let out = knuckle(&["verify", dir.to_str().unwrap(), "--case", SI]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{text}");
    assert!(text.contains("digest matches"), "{text}");
}

#[test]
fn verify_with_a_changed_case_reports_the_digest_differs() {
    let dir = scratch("package-verify-changed-case");
    compile_into(&dir, &[]);
    let changed = dir.join("changed.toml");
    let src = std::fs::read_to_string(root().join(SI))
        .unwrap()
        .replace("internal_pressure = \"1.0 MPa\"", "internal_pressure = \"0.9 MPa\"");
    std::fs::write(&changed, src).unwrap();
    let out = knuckle(&["verify", dir.to_str().unwrap(), "--case", changed.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stdout).contains("DIFFERS"));
}

#[test]
fn changing_any_single_byte_of_any_file_fails_verification_naming_the_file() {
    let dir = scratch("package-tamper");
    compile_into(&dir, &[]);
    let names: Vec<String> = ["md", "pdf", "json"].iter().map(|e| format!("{STEM}.{e}")).collect();
    for name in &names {
        let path = dir.join(name);
        let original = std::fs::read(&path).unwrap();
        // Positions spread over the whole file, first and last byte included.
        let n = original.len();
        let positions: Vec<usize> = (0..12).map(|k| k * (n - 1) / 11).collect();
        for pos in positions {
            let mut bytes = original.clone();
            bytes[pos] ^= 0x01;
            std::fs::write(&path, &bytes).unwrap();
            let out = knuckle(&["verify", dir.to_str().unwrap()]);
            let text = String::from_utf8_lossy(&out.stdout);
            assert_eq!(out.status.code(), Some(1), "{name} byte {pos}");
            let line = text.lines().find(|l| l.contains(name.as_str())).unwrap();
            assert!(line.contains("CHANGED"), "{name} byte {pos}: {line}");
        }
        std::fs::write(&path, &original).unwrap();
    }
    std::fs::remove_file(dir.join(&names[0])).unwrap();
    let out = knuckle(&["verify", dir.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stdout).contains("MISSING"));
}

#[test]
fn an_override_template_is_used_and_changes_the_digest() {
    let dir = scratch("package-template-override");
    let tpl = dir.join("templates");
    std::fs::create_dir_all(&tpl).unwrap();
    let cover = std::fs::read_to_string(root().join("report-templates/cover.md.tera")).unwrap();
    std::fs::write(tpl.join("cover.md.tera"), format!("Issued by the demo office.\n\n{cover}")).unwrap();
    let out_dir = dir.join("out");
    let out = compile_into(&out_dir, &["--templates", tpl.to_str().unwrap(), "--format", "md"]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let md = std::fs::read_to_string(out_dir.join(format!("{STEM}.md"))).unwrap();
    assert!(md.starts_with("Issued by the demo office."));
    let plain = scratch("package-template-plain");
    compile_into(&plain, &["--format", "md"]);
    let digest = |d: &Path| -> String {
        let m: Value =
            serde_json::from_slice(&std::fs::read(d.join(format!("{STEM}.manifest.json"))).unwrap()).unwrap();
        m["digest"].as_str().unwrap().to_string()
    };
    assert_ne!(digest(&out_dir), digest(&plain), "the template set is part of the digest");
}

#[test]
fn a_broken_template_names_the_template_and_line() {
    let dir = scratch("package-template-broken");
    let tpl = dir.join("templates");
    std::fs::create_dir_all(&tpl).unwrap();
    std::fs::write(tpl.join("summary.md.tera"), "## Summary\n\nline two\n{{ vessel.no_such_field }}\n").unwrap();
    let out = compile_into(&dir.join("out"), &["--templates", tpl.to_str().unwrap()]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(err.contains("summary.md.tera"), "{err}");
    assert!(err.contains("line 4"), "{err}");
    assert!(err.contains("vessel.no_such_field"), "{err}");
    assert!(!dir.join("out").join(format!("{STEM}.manifest.json")).exists(), "nothing written");

    std::fs::write(tpl.join("summary.md.tera"), "## Summary\n{% if %}\n").unwrap();
    let out = compile_into(&dir.join("out"), &["--templates", tpl.to_str().unwrap()]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(err.contains("summary.md.tera") && err.contains("line 2"), "{err}");
}

#[test]
fn a_template_without_the_cautions_is_refused() {
    let dir = scratch("package-template-no-cautions");
    let tpl = dir.join("templates");
    std::fs::create_dir_all(&tpl).unwrap();
    std::fs::write(tpl.join("cautions.md.tera"), "## Notes\n\nNone.\n").unwrap();
    let out = compile_into(&dir.join("out"), &["--templates", tpl.to_str().unwrap()]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(err.contains("lacks the cautions section"), "{err}");
}

#[test]
fn one_bad_case_does_not_stop_the_others() {
    let dir = scratch("package-batch");
    let out = knuckle(&[
        "compile",
        SI,
        "tests/cases/bad/negative-pressure.toml",
        "tests/cases/good/thin-shell-fails.toml",
        "--out",
        dir.to_str().unwrap(),
        "--format",
        "md,json",
    ]);
    assert_eq!(out.status.code(), Some(2));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("v310-receiver-si.toml: acceptable"), "{text}");
    assert!(text.contains("negative-pressure.toml: input error, nothing written"), "{text}");
    assert!(text.contains("thin-shell-fails.toml: NOT ACCEPTABLE"), "{text}");
    assert!(dir.join(format!("{STEM}.md")).is_file());
    let not_ok = knuckle(&[
        "compile",
        "tests/cases/good/thin-shell-fails.toml",
        "--out",
        dir.to_str().unwrap(),
        "--format",
        "md",
    ]);
    assert_eq!(not_ok.status.code(), Some(1));
}

#[test]
fn a_failed_design_still_gets_a_package_marked_not_acceptable() {
    let dir = scratch("package-not-acceptable");
    knuckle(&["compile", "tests/cases/good/steep-cone.toml", "--out", dir.to_str().unwrap(), "--format", "md"]);
    let md = std::fs::read_to_string(dir.join("DEMO-V100-CALC-001_revA.md")).unwrap();
    assert!(md.contains("NOT ACCEPTABLE"));
    assert!(md.contains("Limit of applicability not met"));
    assert!(md.contains("1-5(g)"));
}

#[test]
fn letter_paper_and_format_options() {
    let dir = scratch("package-letter");
    let out = compile_into(&dir, &["--paper", "letter", "--format", "pdf"]);
    assert_eq!(out.status.code(), Some(0));
    assert!(dir.join(format!("{STEM}.pdf")).is_file());
    assert!(!dir.join(format!("{STEM}.md")).exists());
    let doc = lopdf::Document::load(dir.join(format!("{STEM}.pdf"))).unwrap();
    let page = *doc.get_pages().values().next().unwrap();
    let mb = doc.get_object(page).unwrap().as_dict().unwrap().get(b"MediaBox").unwrap().as_array().unwrap().clone();
    let w = mb[2].as_float().unwrap_or_else(|_| mb[2].as_i64().unwrap() as f32);
    assert!((w - 612.0).abs() < 1.0, "letter is 612 pt wide, got {w}");
    assert_eq!(compile_into(&dir, &["--paper", "a3"]).status.code(), Some(2));
    assert_eq!(compile_into(&dir, &["--format", "docx"]).status.code(), Some(2));
}

#[test]
fn digest_does_not_depend_on_the_working_folder_regression() {
    // Broke once: the materials library path was recorded as joined to the
    // folder the command ran in, so the same case gave two digests.
    let a = scratch("package-cwd-a");
    let b = scratch("package-cwd-b");
    let run = |cwd: &Path, case: &str, out: &Path| {
        std::process::Command::new(env!("CARGO_BIN_EXE_knuckle"))
            .args(["compile", case, "--out", out.to_str().unwrap(), "--format", "json"])
            .current_dir(cwd)
            .output()
            .unwrap()
    };
    assert_eq!(run(&root(), "examples/v420-solvent-tank-si.toml", &a).status.code(), Some(0));
    assert_eq!(run(&root().join("examples"), "v420-solvent-tank-si.toml", &b).status.code(), Some(0));
    let stem = "DEMO-V420-CALC-001_revA.manifest.json";
    let da: Value = serde_json::from_slice(&std::fs::read(a.join(stem)).unwrap()).unwrap();
    let db: Value = serde_json::from_slice(&std::fs::read(b.join(stem)).unwrap()).unwrap();
    assert_eq!(da["digest"], db["digest"]);
}
