//! Output into a pipe whose reader has gone: the program ends quietly, as
//! command-line tools do, instead of panicking with a backtrace.

mod common;
use common::*;
use std::io::Read;
use std::process::{Command, Stdio};

/// Starts `knuckle args`, reads `keep` bytes of its output, closes the pipe
/// and returns what it wrote on stderr.
fn stderr_after_reader_leaves(args: &[&str], keep: usize) -> String {
    let mut child = Command::new(env!("CARGO_BIN_EXE_knuckle"))
        .args(args)
        .current_dir(root())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("start knuckle");
    let mut stdout = child.stdout.take().expect("stdout");
    let mut head = vec![0u8; keep];
    stdout.read_exact(&mut head).expect("first bytes of the output");
    drop(stdout);
    let out = child.wait_with_output().expect("wait for knuckle");
    String::from_utf8_lossy(&out.stderr).into_owned()
}

#[test]
fn check_json_into_a_closed_pipe_does_not_panic() {
    // The results JSON of the example is about 100 kB, more than a pipe holds,
    // so the program is still writing when the reader goes away.
    let stderr = stderr_after_reader_leaves(&["check", "examples/v310-receiver-si.toml", "--json"], 16);
    assert!(!stderr.contains("panicked"), "{stderr}");
    assert!(!stderr.contains("Broken pipe"), "{stderr}");
}

#[test]
fn heads_into_a_closed_pipe_does_not_panic() {
    let stderr = stderr_after_reader_leaves(&["heads", "--diameter", "2500 mm", "--json"], 8);
    assert!(!stderr.contains("panicked"), "{stderr}");
}
