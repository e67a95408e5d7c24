//! Document control on real compiled packages: signing, verification with a
//! trust list, signed copies and the "changes since" section.

mod common;
use common::*;
use serde_json::Value;
use std::path::Path;

const SI: &str = "examples/v310-receiver-si.toml";
const STEM: &str = "DEMO-V310-CALC-001_revB";

fn digest(dir: &Path, stem: &str) -> String {
    let m: Value = serde_json::from_slice(&std::fs::read(dir.join(format!("{stem}.manifest.json"))).unwrap()).unwrap();
    m["digest"].as_str().unwrap().to_string()
}

fn signed_package(name: &str) -> (std::path::PathBuf, Vec<String>) {
    let dir = scratch(name);
    let pkg = dir.join("pkg");
    assert_eq!(knuckle(&["compile", SI, "--out", pkg.to_str().unwrap()]).status.code(), Some(0));
    let mut pubs = Vec::new();
    for (role, who) in [("prepared", "A. Engineer"), ("checked", "B. Checker"), ("approved", "C. Approver")] {
        let key = dir.join(format!("{role}.key"));
        assert_eq!(knuckle(&["keygen", "--name", who, "--out", key.to_str().unwrap()]).status.code(), Some(0));
        let out = knuckle(&["sign", pkg.to_str().unwrap(), "--role", role, "--key", key.to_str().unwrap()]);
        assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
        pubs.push(format!("{}.pub", key.display()));
    }
    (dir, pubs)
}

#[test]
fn three_roles_sign_and_an_inspector_with_the_keys_confirms_the_sign_off() {
    let (dir, pubs) = signed_package("dc-three-roles");
    let pkg = dir.join("pkg");
    let mut args = vec!["verify", pkg.to_str().unwrap(), "--require-signoff", "--trust"];
    args.extend(pubs.iter().map(String::as_str));
    let out = knuckle(&args);
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{text}");
    assert!(text.contains("sign-off complete"), "{text}");
    assert!(text.contains("approved  valid signature: C. Approver"), "{text}");

    // Without the trust list the signatures are valid but prove no approval.
    let out = knuckle(&["verify", pkg.to_str().unwrap(), "--require-signoff"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stdout).contains("NOT in the trust list"));
    // Plain verification (integrity) still passes.
    assert_eq!(knuckle(&["verify", pkg.to_str().unwrap()]).status.code(), Some(0));

    // A changed byte in the PDF breaks the package and the signatures' claim.
    let pdf = pkg.join(format!("{STEM}.pdf"));
    let mut bytes = std::fs::read(&pdf).unwrap();
    let n = bytes.len() / 2;
    bytes[n] ^= 0x20;
    std::fs::write(&pdf, bytes).unwrap();
    let out = knuckle(&args);
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(1));
    assert!(text.contains("CHANGED") && text.contains("no longer match"), "{text}");
}

#[test]
fn a_signed_copy_shows_the_signers_and_keeps_the_digest() {
    let (dir, pubs) = signed_package("dc-signed-copy");
    let pkg = dir.join("pkg");
    let copy = dir.join("copy");
    let mut args =
        vec!["compile", SI, "--out", copy.to_str().unwrap(), "--signatures", pkg.to_str().unwrap(), "--trust"];
    args.extend(pubs.iter().map(String::as_str));
    let out = knuckle(&args);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    assert_eq!(digest(&pkg, STEM), digest(&copy, STEM));
    let md = std::fs::read_to_string(copy.join(format!("{STEM}.md"))).unwrap();
    assert!(md.contains("| Approved | C. Approver | 2026-11-20 | Ed25519, key "), "{md}");
    // Untrusted signatures are not rendered.
    let out =
        knuckle(&["compile", SI, "--out", dir.join("x").to_str().unwrap(), "--signatures", pkg.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("trusted key"));
    // Signatures of another calculation are refused.
    let other = dir.join("other.toml");
    std::fs::write(&other, std::fs::read_to_string(root().join(SI)).unwrap().replace("\"1.0 MPa\"", "\"0.95 MPa\""))
        .unwrap();
    let y = dir.join("y");
    let mut args = vec![
        "compile",
        other.to_str().unwrap(),
        "--out",
        y.to_str().unwrap(),
        "--signatures",
        pkg.to_str().unwrap(),
        "--trust",
    ];
    args.extend(pubs.iter().map(String::as_str));
    let out = knuckle(&args);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("another calculation"));
}

#[test]
fn compile_previous_adds_the_changes_section_and_verify_reproduces_it() {
    let dir = scratch("dc-previous");
    let rev_c = dir.join("rev-c.toml");
    let text = std::fs::read_to_string(root().join(SI))
        .unwrap()
        .replace("revision = \"B\"\ndate = \"2026-11-20\"\nrules", "revision = \"C\"\ndate = \"2026-11-30\"\nrules")
        .replace(
            "nominal_thickness = \"12 mm\"\njoint_efficiency = 0.85\nliquid_head",
            "nominal_thickness = \"14 mm\"\njoint_efficiency = 0.85\nliquid_head",
        );
    std::fs::write(&rev_c, text).unwrap();
    let out_dir = dir.join("out");
    let out = knuckle(&["compile", rev_c.to_str().unwrap(), "--out", out_dir.to_str().unwrap(), "--previous", SI]);
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    let md = std::fs::read_to_string(out_dir.join("DEMO-V310-CALC-001_revC.md")).unwrap();
    assert!(md.contains("## Changes since revision B"), "{md}");
    assert!(md.contains("nominal thickness") || md.contains("nominal_thickness"), "the changed input is named");
    let v = knuckle(&["verify", out_dir.to_str().unwrap(), "--case", rev_c.to_str().unwrap(), "--previous", SI]);
    assert_eq!(v.status.code(), Some(0), "{}", String::from_utf8_lossy(&v.stdout));
    let v = knuckle(&["verify", out_dir.to_str().unwrap(), "--case", rev_c.to_str().unwrap()]);
    assert_eq!(v.status.code(), Some(1), "without --previous the digest differs");
    let two = knuckle(&["compile", SI, rev_c.to_str().unwrap(), "--out", out_dir.to_str().unwrap(), "--previous", SI]);
    assert_eq!(two.status.code(), Some(2));
}
