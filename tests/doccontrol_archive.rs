//! The archive register: issue, supersede, refuse, detect tampering, survive
//! a killed process and concurrent writers. Driven through the built binary.

mod doccontrol_support;

use doccontrol_support::*;
use std::path::{Path, PathBuf};
use std::process::Command;

/// Writes revision `rev` of `doc` into its own folder under `root`.
fn package(root: &Path, doc: &str, rev: &str, body: &str) -> PathBuf {
    let dir = root.join(format!("pkg-{doc}-{rev}-{}", body.len()));
    write_package(&dir, doc, rev, body, None);
    dir
}

fn issue(pkg: &Path, archive: &Path, at: &str, env: &[(&str, &str)]) -> std::process::Output {
    knuckle(&["issue", s(pkg), "--archive", s(archive), "--by", "D. Control", "--at", at], env)
}

fn reg(args: &[&str], archive: &Path) -> std::process::Output {
    let mut a: Vec<&str> = vec!["register"];
    a.extend_from_slice(args);
    a.extend_from_slice(&["--archive", s(archive)]);
    knuckle(&a, &[])
}

fn history_json(archive: &Path, doc: &str) -> Vec<serde_json::Value> {
    let o = reg(&["history", doc, "--json"], archive);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    serde_json::from_str::<serde_json::Value>(&stdout(&o)).unwrap().as_array().unwrap().clone()
}

fn verify(archive: &Path) -> (i32, String) {
    let o = reg(&["verify"], archive);
    (o.status.code().unwrap_or(-1), stdout(&o))
}

#[test]
fn issuing_a_b_c_supersedes_in_turn() {
    let root = temp_dir("arch-abc");
    let archive = root.join("archive");
    let a = package(&root, "D-200", "A", "first issue");
    let b = package(&root, "D-200", "B", "second issue");
    let c = package(&root, "D-200", "C", "third issue, signed");
    let key = root.join("c.key");
    assert_eq!(knuckle(&["keygen", "--name", "C. Approver", "--out", s(&key)], &[]).status.code(), Some(0));
    assert_eq!(knuckle(&["sign", s(&c), "--role", "approved", "--key", s(&key)], &[]).status.code(), Some(0));
    let other = package(&root, "D-300", "0", "another document");
    for (p, at) in [(&a, "2026-03-01T09:00:00Z"), (&other, "2026-03-01T10:00:00Z"), (&b, "2026-03-02T09:00:00Z")] {
        let o = issue(p, &archive, at, &[]);
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    }
    let o = issue(&c, &archive, "2026-03-03T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(stdout(&o).contains("issued D-200 revision C"));
    assert!(stdout(&o).contains("revision B is now superseded"));

    let h = history_json(&archive, "D-200");
    let summary: Vec<(String, String, String)> = h
        .iter()
        .map(|r| {
            (
                r["revision"].as_str().unwrap().to_string(),
                r["status"].as_str().unwrap().to_string(),
                r["superseded_by"].as_str().unwrap_or("-").to_string(),
            )
        })
        .collect();
    assert_eq!(
        summary,
        [
            ("A".into(), "superseded".into(), "B".into()),
            ("B".into(), "superseded".into(), "C".into()),
            ("C".into(), "current".into(), "-".into()),
        ]
    );
    assert_eq!(h[2]["supersedes"], "B");
    assert_eq!(h[2]["issued_by"], "D. Control");
    assert_eq!(h[2]["issued_at"], "2026-03-03T09:00:00Z");
    assert_eq!(h[2]["signatures"][0]["signer"], "C. Approver");
    // Manifest, signature file and the four listed files are all stored.
    assert_eq!(h[2]["files"].as_array().unwrap().len(), 6);
    // Records of all documents form one chain.
    assert_eq!(h[0]["seq"], 1);
    assert_eq!(h[1]["seq"], 3);
    assert_eq!(h[1]["prev_hash"], history_json(&archive, "D-300")[0]["record_hash"]);

    let list = stdout(&reg(&["list"], &archive));
    let lines: Vec<&str> = list.lines().collect();
    assert_eq!(lines.len(), 2, "{list}");
    assert!(lines[0].starts_with("D-200  rev C  2026-03-01  current"));
    assert!(lines[0].contains("approved: C. Approver"));
    assert!(lines[1].starts_with("D-300  rev 0"));
    let show = stdout(&reg(&["show", "D-200", "--revision", "A"], &archive));
    assert!(show.contains("superseded by revision B"), "{show}");
    assert!(show.contains("D-200_revA.pdf"));
    let o = reg(&["show", "D-999"], &archive);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("document D-999 is not in the register"));

    let (code, text) = verify(&archive);
    assert_eq!(code, 0, "{text}");
    // 5 files for each of A, B and D-300 (four listed and the manifest), 6
    // for C (with its signature file).
    assert!(text.contains("4 records, 21 stored files re-hashed"), "{text}");
}

#[test]
fn re_issue_is_a_no_op_when_identical_and_refused_when_different() {
    let root = temp_dir("arch-reissue");
    let archive = root.join("archive");
    let a = package(&root, "D-201", "A", "content");
    assert_eq!(issue(&a, &archive, "2026-03-01T09:00:00Z", &[]).status.code(), Some(0));
    let o = issue(&a, &archive, "2026-03-05T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(0));
    assert!(stdout(&o).contains("issued already with the same files"), "{}", stdout(&o));

    let changed = package(&root, "D-201", "A", "other content");
    let objects_before = count_objects(&archive);
    let o = issue(&changed, &archive, "2026-03-05T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(2));
    let err = stderr(&o);
    assert!(err.contains("D-201 revision A is issued already with other content"), "{err}");
    assert!(err.contains("D-201_revA.md"));
    assert!(err.contains("never replaced"));
    // Nothing was written for the refused issue.
    assert_eq!(count_objects(&archive), objects_before);
    let h = history_json(&archive, "D-201");
    assert_eq!(h.len(), 1);
    assert_eq!(h[0]["issued_at"], "2026-03-01T09:00:00Z");

    // A package that does not match its manifest is not issued.
    let broken = package(&root, "D-201", "B", "to be broken");
    std::fs::write(broken.join("D-201_revB.md"), "edited").unwrap();
    let o = issue(&broken, &archive, "2026-03-06T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stderr(&o).contains("D-201_revB.md changed"));
    // Input errors write nothing, not even an empty archive.
    let fresh = archive.with_file_name("never-created");
    let o = issue(&broken, &fresh, "2026-03-06T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(1));
    let o = issue(&archive.with_file_name("no-such-package"), &fresh, "2026-03-06T09:00:00Z", &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("cannot read package directory"), "{}", stderr(&o));
    assert!(!fresh.exists());
    // A bad time is a usage error.
    let o = issue(&a, &archive, "yesterday", &[]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("not a time of the form"));
}

fn count_objects(archive: &Path) -> usize {
    let mut n = 0;
    for d in std::fs::read_dir(archive.join("objects")).unwrap() {
        n += std::fs::read_dir(d.unwrap().path()).unwrap().count();
    }
    n
}

/// An archive with A, B, C of one document.
fn three_revisions(name: &str) -> PathBuf {
    let root = temp_dir(name);
    let archive = root.join("archive");
    for (rev, at) in [("A", "2026-03-01T09:00:00Z"), ("B", "2026-03-02T09:00:00Z"), ("C", "2026-03-03T09:00:00Z")] {
        let p = package(&root, "D-202", rev, &format!("content of {rev}"));
        assert_eq!(issue(&p, &archive, at, &[]).status.code(), Some(0));
    }
    archive
}

fn sql(archive: &Path, statement: &str) {
    let conn = rusqlite::Connection::open(archive.join("register.sqlite")).unwrap();
    conn.execute_batch(statement).unwrap();
}

#[test]
fn a_tampered_stored_file_is_found() {
    let archive = three_revisions("arch-tamper-file");
    let h = history_json(&archive, "D-202");
    let file = h[1]["files"].as_array().unwrap().iter().find(|f| f["name"] == "D-202_revB.pdf").unwrap().clone();
    let sha = file["sha256"].as_str().unwrap();
    let path = archive.join("objects").join(&sha[..2]).join(sha);
    let mut bytes = std::fs::read(&path).unwrap();
    bytes[0] ^= 0x20;
    std::fs::write(&path, &bytes).unwrap();
    let (code, text) = verify(&archive);
    assert_eq!(code, 1);
    assert!(text.contains("record 2 (D-202 revision B): stored file D-202_revB.pdf was changed"), "{text}");
    assert!(text.contains("archive NOT intact"));
    std::fs::remove_file(&path).unwrap();
    let (_, text) = verify(&archive);
    assert!(text.contains("stored file D-202_revB.pdf is missing"), "{text}");
}

#[test]
fn an_edited_register_row_is_found() {
    let archive = three_revisions("arch-tamper-row");
    assert_eq!(verify(&archive).0, 0);
    sql(&archive, "UPDATE issued SET issued_by = 'Someone Else' WHERE seq = 1");
    let (code, text) = verify(&archive);
    assert_eq!(code, 1);
    assert!(text.contains("record 1 (D-202 revision A): the row was edited after issue"), "{text}");

    // Recomputing the edited row's own hash still breaks the next link.
    let archive = three_revisions("arch-tamper-rehash");
    let conn = rusqlite::Connection::open(archive.join("register.sqlite")).unwrap();
    conn.execute("UPDATE issued SET digest = 'ffff' WHERE seq = 2", []).unwrap();
    let rows = knuckle::archive::Archive::open(&archive).unwrap().records().unwrap();
    let forged = rows[1].compute_hash();
    conn.execute("UPDATE issued SET record_hash = ?1 WHERE seq = 2", [&forged]).unwrap();
    drop(conn);
    let (code, text) = verify(&archive);
    assert_eq!(code, 1);
    assert!(text.contains("record 3 (D-202 revision C): broken link"), "{text}");

    // A removed row and a changed status are found too.
    let archive = three_revisions("arch-tamper-delete");
    sql(&archive, "DELETE FROM issued WHERE seq = 2");
    let (_, text) = verify(&archive);
    assert!(text.contains("expected record 2 here; a record was removed"), "{text}");
    let archive = three_revisions("arch-tamper-status");
    sql(&archive, "UPDATE issued SET status = 'current', superseded_by = NULL WHERE seq = 2");
    let (_, text) = verify(&archive);
    assert!(
        text.contains("record 2 (D-202 revision B): marked `current`, but the chain says superseded by C"),
        "{text}"
    );
    let archive = three_revisions("arch-tamper-tail");
    sql(&archive, "DELETE FROM issued WHERE seq = 3");
    let (_, text) = verify(&archive);
    assert!(text.contains("head does not match its last record"), "{text}");
}

#[test]
fn a_process_killed_during_issue_leaves_a_consistent_archive() {
    for (point, recorded) in [
        ("after-first-object", false),
        ("after-objects", false),
        ("after-lock", false),
        ("before-commit", false),
        ("after-commit", true),
    ] {
        let root = temp_dir(&format!("arch-kill-{point}"));
        let archive = root.join("archive");
        let a = package(&root, "D-203", "A", "first");
        let b = package(&root, "D-203", "B", "second");
        assert_eq!(issue(&a, &archive, "2026-03-01T09:00:00Z", &[]).status.code(), Some(0));
        let o = issue(&b, &archive, "2026-03-02T09:00:00Z", &[("KNUCKLE_TEST_ABORT_AT", point)]);
        assert!(!o.status.success(), "{point}: the hook did not fire");
        assert!(stderr(&o).contains(&format!("aborting at {point}")));
        let (code, text) = verify(&archive);
        assert_eq!(code, 0, "{point}: {text}");
        let h = history_json(&archive, "D-203");
        assert_eq!(h.len(), if recorded { 2 } else { 1 }, "{point}");
        let current: Vec<&str> =
            h.iter().filter(|r| r["status"] == "current").map(|r| r["revision"].as_str().unwrap()).collect();
        assert_eq!(current, [if recorded { "B" } else { "A" }], "{point}");
        // Issuing again completes the revision (or finds it complete).
        let o = issue(&b, &archive, "2026-03-02T10:00:00Z", &[]);
        assert_eq!(o.status.code(), Some(0), "{point}: {}", stderr(&o));
        assert_eq!(verify(&archive).0, 0, "{point}");
        assert_eq!(history_json(&archive, "D-203").len(), 2);
    }
}

#[test]
fn concurrent_issues_from_several_processes_all_land() {
    let root = temp_dir("arch-concurrent");
    let archive = root.join("archive");
    let packages: Vec<PathBuf> =
        (0..4).map(|i| package(&root, &format!("D-30{i}"), "A", &format!("document {i}"))).collect();
    // Each writer holds the write lock for a while, so the others must wait.
    let children: Vec<_> = packages
        .iter()
        .map(|p| {
            Command::new(env!("CARGO_BIN_EXE_knuckle"))
                .args(["issue", s(p), "--archive", s(&archive), "--by", "D. Control"])
                .args(["--at", "2026-03-01T09:00:00Z"])
                .env("KNUCKLE_TEST_PAUSE_AT", "after-lock:300")
                .stdout(std::process::Stdio::piped())
                .stderr(std::process::Stdio::piped())
                .spawn()
                .unwrap()
        })
        .collect();
    for c in children {
        let o = c.wait_with_output().unwrap();
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    }
    let o = reg(&["list", "--json"], &archive);
    let list: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap();
    let mut seqs: Vec<i64> = list.as_array().unwrap().iter().map(|r| r["seq"].as_i64().unwrap()).collect();
    seqs.sort();
    assert_eq!(seqs, [1, 2, 3, 4]);
    assert_eq!(verify(&archive).0, 0);

    // The same revision issued twice at once is recorded once.
    let same = package(&root, "D-310", "A", "one revision");
    let children: Vec<_> = (0..2)
        .map(|_| {
            Command::new(env!("CARGO_BIN_EXE_knuckle"))
                .args(["issue", s(&same), "--archive", s(&archive), "--by", "D. Control"])
                .env("KNUCKLE_TEST_PAUSE_AT", "after-objects:200")
                .stdout(std::process::Stdio::piped())
                .stderr(std::process::Stdio::piped())
                .spawn()
                .unwrap()
        })
        .collect();
    for c in children {
        let o = c.wait_with_output().unwrap();
        assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    }
    assert_eq!(history_json(&archive, "D-310").len(), 1);
    assert_eq!(verify(&archive).0, 0);
}
