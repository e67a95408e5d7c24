//! Shared helpers of the document-control tests: package directories built
//! by hand (a few files, their hashes and a manifest), temporary folders and
//! a runner for the built binary.

#![allow(dead_code)]

use knuckle::package::manifest::{sha256_hex, DocumentId, FileEntry, Manifest, ToolId, MANIFEST_FORMAT};
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// A fresh, empty temporary folder unique to this test and process.
pub fn temp_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("knuckle-doc-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Writes a package for `number` revision `revision` into `dir`: report,
/// PDF stand-in, results JSON (with `extra` merged into it) and a figure,
/// then the manifest listing them. `body` varies the content. Returns the
/// manifest path.
pub fn write_package(
    dir: &Path,
    number: &str,
    revision: &str,
    body: &str,
    extra: Option<serde_json::Value>,
) -> PathBuf {
    std::fs::create_dir_all(dir.join("figures")).unwrap();
    let stem = format!("{number}_rev{revision}");
    let mut results = serde_json::json!({
        "format": "knuckle-results/1",
        "document": { "number": number, "revision": revision, "title": "Test vessel", "date": "2026-03-01" },
        "body": body,
    });
    if let (Some(obj), Some(serde_json::Value::Object(more))) = (results.as_object_mut(), extra) {
        for (k, v) in more {
            obj.insert(k, v);
        }
    }
    let files: Vec<(String, Vec<u8>)> = vec![
        (format!("{stem}.md"), format!("# {number} rev {revision}\n\n{body}\n").into_bytes()),
        (format!("{stem}.pdf"), format!("%PDF-1.3 stand-in {body}\n").into_bytes()),
        (format!("{stem}.json"), serde_json::to_string_pretty(&results).unwrap().into_bytes()),
        (format!("figures/{stem}-head.svg"), format!("<svg>{body}</svg>\n").into_bytes()),
    ];
    let mut entries = Vec::new();
    for (name, bytes) in &files {
        std::fs::write(dir.join(name), bytes).unwrap();
        entries.push(FileEntry { name: name.clone(), sha256: sha256_hex(bytes), bytes: bytes.len() as u64 });
    }
    entries.sort_by(|a, b| a.name.cmp(&b.name));
    // The real digest is defined by the package compiler; a hash over the
    // file hashes stands in for it here, as the document-control code only
    // carries it.
    let digest = sha256_hex(entries.iter().map(|e| e.sha256.as_str()).collect::<Vec<_>>().join("\n").as_bytes());
    let m = Manifest {
        format: MANIFEST_FORMAT.into(),
        tool: ToolId { name: "knuckle".into(), version: "test".into() },
        document: DocumentId {
            number: number.into(),
            revision: revision.into(),
            date: "2026-03-01".into(),
            title: "Test vessel".into(),
        },
        rules: "asme-viii-1".into(),
        edition: "2023".into(),
        digest,
        status: "acceptable".into(),
        files: entries,
        signatures: vec![],
    };
    let path = dir.join(format!("{stem}.manifest.json"));
    std::fs::write(&path, m.to_json()).unwrap();
    path
}

/// Reads a manifest.
pub fn read_manifest(path: &Path) -> Manifest {
    Manifest::from_json(&std::fs::read_to_string(path).unwrap()).unwrap()
}

/// Runs the built `knuckle` binary with arguments and extra environment.
pub fn knuckle(args: &[&str], env: &[(&str, &str)]) -> Output {
    let mut c = Command::new(env!("CARGO_BIN_EXE_knuckle"));
    c.args(args);
    c.env_remove("KNUCKLE_TEST_ABORT_AT");
    for (k, v) in env {
        c.env(k, v);
    }
    c.output().unwrap()
}

/// Standard output as text.
pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

/// Standard error as text.
pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// A path as `&str` (temporary paths are always UTF-8 here).
pub fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}
