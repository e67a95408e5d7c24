//! Helpers shared by the integration tests: one helper per kind of check.
#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// The crate root.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Runs the built `knuckle` binary with arguments, from the crate root.
pub fn knuckle(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_knuckle")).args(args).current_dir(root()).output().expect("run knuckle")
}

/// Every `.toml` file in a fixture folder, sorted.
pub fn fixtures(area: &str) -> Vec<PathBuf> {
    let dir = root().join("tests/cases").join(area);
    let mut v: Vec<PathBuf> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.sort();
    v
}

/// The `# expect: ...` lines at the top of a fixture.
pub fn expectations(path: &Path) -> Vec<String> {
    std::fs::read_to_string(path)
        .unwrap()
        .lines()
        .filter_map(|l| l.strip_prefix("# expect: ").map(str::to_string))
        .collect()
}

/// A fresh empty directory under the target dir for one test.
pub fn scratch(name: &str) -> PathBuf {
    let d = root().join("target/test-scratch").join(name);
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}
