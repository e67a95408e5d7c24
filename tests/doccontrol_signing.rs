//! Signed sign-off: keygen, sign, verify, through the built binary and the
//! library function the `verify` command calls.

mod doccontrol_support;

use doccontrol_support::*;
use knuckle::package::manifest::sha256_hex;
use knuckle::signing::{format_signoff_text, signoff_report, verify_signatures, PublicKey, Role, SignatureState};
use std::path::{Path, PathBuf};

/// Makes a key for `name` in `dir` through `knuckle keygen`.
fn keygen(dir: &Path, file: &str, name: &str) -> (PathBuf, PublicKey) {
    let key = dir.join(file);
    let o = knuckle(&["keygen", "--name", name, "--out", s(&key)], &[]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let public = PublicKey::load(&dir.join(format!("{file}.pub"))).unwrap();
    (key, public)
}

fn sign(pkg: &Path, role: &str, key: &Path, extra: &[&str]) -> std::process::Output {
    let mut args = vec!["sign", s(pkg), "--role", role, "--key", s(key)];
    args.extend_from_slice(extra);
    knuckle(&args, &[])
}

#[test]
fn three_roles_sign_and_an_inspector_confirms_offline() {
    let root = temp_dir("sign-three");
    let pkg = root.join("pkg");
    let manifest_path = write_package(&pkg, "D-100", "A", "first", None);
    let before = read_manifest(&manifest_path);
    let (k1, p1) = keygen(&root, "a.key", "A. Engineer");
    let (k2, p2) = keygen(&root, "b.key", "B. Checker");
    let (k3, p3) = keygen(&root, "c.key", "C. Approver");
    for (role, key) in [("prepared", &k1), ("checked", &k2), ("approved", &k3)] {
        let o = sign(&pkg, role, key, &["--date", "2026-03-02"]);
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
        assert!(stdout(&o).contains(&format!("signed as {role}")));
    }
    let m = read_manifest(&manifest_path);
    // Signing never changes what the digest and the file list say.
    assert_eq!(m.digest, before.digest);
    assert_eq!(m.files, before.files);
    assert_eq!(m.signatures.iter().map(|s| s.role.as_str()).collect::<Vec<_>>(), ["prepared", "checked", "approved"]);
    assert!(pkg.join("signatures/D-100_revA.checked.json").is_file());

    let trusted = [p1.clone(), p2.clone(), p3.clone()];
    let reports = verify_signatures(&pkg, &m, &trusted);
    assert_eq!(reports.len(), 3);
    for (r, (name, key)) in reports.iter().zip([("A. Engineer", &p1), ("B. Checker", &p2), ("C. Approver", &p3)]) {
        assert_eq!(r.state, SignatureState::Valid, "{r:?}");
        assert_eq!(r.signer, name);
        assert_eq!(r.date, "2026-03-02");
        assert_eq!(r.fingerprint, key.fingerprint());
        assert!(r.trusted && r.approves());
    }
    let full = signoff_report(&pkg, &m, &trusted);
    assert!(full.missing_roles.is_empty());
    assert!(full.complete());
    let text = format_signoff_text(&full);
    assert!(text.contains("checked   valid signature: B. Checker on 2026-03-02"), "{text}");
    assert!(text.contains("sign-off complete"));
}

#[test]
fn a_changed_byte_invalidates_the_signature() {
    let root = temp_dir("sign-byte");
    let pkg = root.join("pkg");
    let manifest_path = write_package(&pkg, "D-101", "A", "body", None);
    let (k, p) = keygen(&root, "k.key", "B. Checker");
    assert_eq!(sign(&pkg, "checked", &k, &[]).status.code(), Some(0));

    // Change one byte of the report and leave the manifest alone: the files
    // no longer match what was signed.
    let md = pkg.join("D-101_revA.md");
    let mut bytes = std::fs::read(&md).unwrap();
    bytes[2] ^= 1;
    std::fs::write(&md, &bytes).unwrap();
    let m = read_manifest(&manifest_path);
    let r = &verify_signatures(&pkg, &m, std::slice::from_ref(&p))[0];
    assert!(!r.package_intact && !r.approves());
    assert!(format_signoff_text(&signoff_report(&pkg, &m, std::slice::from_ref(&p)))
        .contains("no longer match the manifest"));

    // Re-hash the manifest to hide the change: now the signature itself fails.
    let mut forged = m.clone();
    forged.files.iter_mut().for_each(|f| {
        if f.name == "D-101_revA.md" {
            f.sha256 = sha256_hex(&bytes);
        }
    });
    std::fs::write(&manifest_path, forged.to_json()).unwrap();
    let r = &verify_signatures(&pkg, &forged, std::slice::from_ref(&p))[0];
    assert_eq!(r.state, SignatureState::BadSignature);
    assert!(!r.approves());

    // A changed byte in the signature file is caught by its listed hash.
    std::fs::write(&manifest_path, m.to_json()).unwrap();
    std::fs::write(&md, {
        bytes[2] ^= 1;
        &bytes
    })
    .unwrap();
    let sig = pkg.join("signatures/D-101_revA.checked.json");
    let text = std::fs::read_to_string(&sig).unwrap().replace("B. Checker", "B. Chequer");
    std::fs::write(&sig, text).unwrap();
    let r = &verify_signatures(&pkg, &m, &[p])[0];
    assert_eq!(r.state, SignatureState::FileChanged);
}

#[test]
fn a_signature_moved_to_another_package_fails() {
    let root = temp_dir("sign-move");
    let one = root.join("one");
    let two = root.join("two");
    write_package(&one, "D-102", "A", "the reviewed content", None);
    let m2_path = write_package(&two, "D-102", "A", "different content", None);
    let (k, p) = keygen(&root, "k.key", "C. Approver");
    assert_eq!(sign(&one, "approved", &k, &[]).status.code(), Some(0));

    // Copy the signature file and its manifest entry into the other package.
    let m1 = read_manifest(&one.join("D-102_revA.manifest.json"));
    std::fs::create_dir_all(two.join("signatures")).unwrap();
    std::fs::copy(one.join("signatures/D-102_revA.approved.json"), two.join("signatures/D-102_revA.approved.json"))
        .unwrap();
    let mut m2 = read_manifest(&m2_path);
    m2.signatures = m1.signatures.clone();
    std::fs::write(&m2_path, m2.to_json()).unwrap();

    let r = &verify_signatures(&two, &m2, &[p])[0];
    assert!(matches!(r.state, SignatureState::OtherPackage(_)), "{:?}", r.state);
    assert!(!r.approves());
    let report = signoff_report(&two, &m2, &[]);
    assert!(report.missing_roles.contains(&Role::Approved));
}

#[test]
fn an_untrusted_key_is_reported_and_is_no_approval() {
    let root = temp_dir("sign-untrusted");
    let pkg = root.join("pkg");
    let mp = write_package(&pkg, "D-103", "A", "x", None);
    let (k, _) = keygen(&root, "k.key", "Z. Stranger");
    let (_, other) = keygen(&root, "o.key", "B. Checker");
    assert_eq!(sign(&pkg, "checked", &k, &[]).status.code(), Some(0));
    let m = read_manifest(&mp);
    let report = signoff_report(&pkg, &m, &[other]);
    let r = &report.signatures[0];
    assert_eq!(r.state, SignatureState::Valid);
    assert!(!r.trusted && !r.approves());
    // The date defaults to the document's date, never the clock.
    assert_eq!(r.date, "2026-03-01");
    let text = format_signoff_text(&report);
    assert!(text.contains("NOT in the trust list"), "{text}");
    assert!(text.contains("sign-off NOT complete"));
}

#[test]
fn missing_roles_are_reported() {
    let root = temp_dir("sign-missing");
    let all = root.join("all");
    let mp = write_package(&all, "D-104", "A", "x", None);
    let (k, p) = keygen(&root, "k.key", "A. Engineer");
    assert_eq!(sign(&all, "prepared", &k, &[]).status.code(), Some(0));
    let r = signoff_report(&all, &read_manifest(&mp), std::slice::from_ref(&p));
    assert_eq!(r.missing_roles, vec![Role::Checked, Role::Approved]);
    assert!(format_signoff_text(&r).contains("missing: no valid signature for checked, approved"));

    // When the package names only a preparer and a checker, approval is not expected.
    let named = root.join("named");
    let mp = write_package(
        &named,
        "D-105",
        "A",
        "x",
        Some(
            serde_json::json!({ "sign_off": { "prepared_by": "A. Engineer", "checked_by": "B. Checker", "approved_by": "" } }),
        ),
    );
    assert_eq!(sign(&named, "prepared", &k, &[]).status.code(), Some(0));
    let r = signoff_report(&named, &read_manifest(&mp), &[p]);
    assert_eq!(r.missing_roles, vec![Role::Checked]);
}

#[test]
fn second_signature_for_a_role_needs_replace() {
    let root = temp_dir("sign-replace");
    let pkg = root.join("pkg");
    let mp = write_package(&pkg, "D-106", "A", "x", None);
    let (k1, _) = keygen(&root, "a.key", "B. Checker");
    let (k2, p2) = keygen(&root, "b.key", "D. Deputy");
    assert_eq!(sign(&pkg, "checked", &k1, &[]).status.code(), Some(0));
    let o = sign(&pkg, "checked", &k2, &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("signed already (by B. Checker); give --replace"));
    let o = sign(&pkg, "checked", &k2, &["--replace", "--date", "2026-03-09"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let m = read_manifest(&mp);
    assert_eq!(m.signatures.len(), 1);
    let r = &verify_signatures(&pkg, &m, &[p2])[0];
    assert_eq!((r.signer.as_str(), r.state.clone()), ("D. Deputy", SignatureState::Valid));
}

#[test]
fn a_package_that_does_not_verify_is_not_signed() {
    let root = temp_dir("sign-refuse");
    let pkg = root.join("pkg");
    let mp = write_package(&pkg, "D-107", "A", "x", None);
    std::fs::write(pkg.join("D-107_revA.pdf"), b"edited").unwrap();
    let (k, _) = keygen(&root, "k.key", "B. Checker");
    let o = sign(&pkg, "checked", &k, &[]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("D-107_revA.pdf changed"), "{}", stderr(&o));
    assert!(read_manifest(&mp).signatures.is_empty());
    assert!(!pkg.join("signatures").exists());
}

#[test]
fn bad_dates_and_several_packages_are_usage_errors() {
    let root = temp_dir("sign-usage");
    let pkg = root.join("pkg");
    write_package(&pkg, "D-108", "A", "x", None);
    write_package(&pkg, "D-108", "B", "y", None);
    write_package(&pkg, "D-109", "A", "z", None);
    let (k, p) = keygen(&root, "k.key", "B. Checker");
    let o = sign(&pkg, "checked", &k, &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("holds several packages"), "{}", stderr(&o));
    let o = sign(&pkg, "checked", &k, &["--document", "D-108"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("several revisions of `D-108`"));
    let o = sign(&pkg, "checked", &k, &["--document", "D-108_revB", "--date", "2026-02-30"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("`2026-02-30` is not a date"));
    let o = sign(&pkg, "checked", &k, &["--document", "D-109"]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let m = read_manifest(&pkg.join("D-109_revA.manifest.json"));
    assert_eq!(verify_signatures(&pkg, &m, &[p])[0].state, SignatureState::Valid);
    // A public key file cannot sign.
    let o = sign(&pkg, "approved", &root.join("k.key.pub"), &["--document", "D-109"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("not a secret key file"));
}

#[test]
fn keygen_keeps_the_secret_private() {
    let root = temp_dir("keygen");
    let key = root.join("me.key");
    let o = knuckle(&["keygen", "--name", "A. Engineer", "--out", s(&key)], &[]);
    assert_eq!(o.status.code(), Some(0));
    let secret_text = std::fs::read_to_string(&key).unwrap();
    let v: serde_json::Value = serde_json::from_str(&secret_text).unwrap();
    let secret = v["secret_key"].as_str().unwrap();
    assert_eq!(secret.len(), 64);
    assert!(!stdout(&o).contains(secret) && !stderr(&o).contains(secret));
    let public = std::fs::read_to_string(root.join("me.key.pub")).unwrap();
    assert!(!public.contains("secret") && !public.contains(secret));
    let fp = PublicKey::from_json(&public).unwrap().fingerprint();
    assert!(stdout(&o).contains(&fp));
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        let mode = std::fs::metadata(&key).unwrap().permissions().mode();
        assert_eq!(mode & 0o777, 0o600);
    }
    // An existing key is never overwritten.
    let o = knuckle(&["keygen", "--name", "X", "--out", s(&key)], &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("already exists"));
    assert_eq!(std::fs::read_to_string(&key).unwrap(), secret_text);
}
