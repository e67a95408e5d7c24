//! Every bad-input class: exit status 2, a message naming the key and its
//! line, and nothing on stdout. Fixtures: tests/cases/bad/*.toml, each with
//! `# expect:` lines giving words the message must contain.

mod common;
use common::*;

#[test]
fn every_bad_input_fixture_is_refused_with_a_clear_message() {
    let cases = fixtures("bad");
    assert!(cases.len() >= 30, "expected the full set of bad-input fixtures");
    for case in cases {
        let rel = case.strip_prefix(root()).unwrap().to_string_lossy().into_owned();
        let out = knuckle(&["check", &rel]);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{rel}: exit status\n{stderr}");
        assert!(out.stdout.is_empty(), "{rel}: nothing may be printed on stdout");
        assert!(!stderr.contains("panicked"), "{rel}: panic\n{stderr}");
        assert!(stderr.contains(&format!("--> {rel}")), "{rel}: message must name the file\n{stderr}");
        assert!(stderr.contains("nothing was computed or written"), "{rel}\n{stderr}");
        for e in expectations(&case) {
            assert!(stderr.contains(&e), "{rel}: message lacks `{e}`\n{stderr}");
        }
    }
}

#[test]
fn messages_point_at_line_and_column_of_the_key() {
    let out = knuckle(&["check", "tests/cases/bad/joint-efficiency-above-one.toml"]);
    let stderr = String::from_utf8_lossy(&out.stderr);
    let text = std::fs::read_to_string(root().join("tests/cases/bad/joint-efficiency-above-one.toml")).unwrap();
    let line = text.lines().position(|l| l.starts_with("joint_efficiency = 1.2")).unwrap() + 1;
    assert!(stderr.contains(&format!("joint-efficiency-above-one.toml:{line}:20")), "{stderr}");
    assert!(stderr.contains("joint_efficiency = 1.2"), "the offending line is quoted\n{stderr}");
    assert!(stderr.contains("= expected: a number greater than 0 and at most 1"), "{stderr}");
    assert!(stderr.contains("= hint:"), "{stderr}");
}

#[test]
fn a_missing_file_is_an_input_error() {
    let out = knuckle(&["check", "tests/cases/does-not-exist.toml"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("cannot read case file"));
}

#[test]
fn usage_errors_exit_2() {
    assert_eq!(knuckle(&["check"]).status.code(), Some(2));
    assert_eq!(knuckle(&["frobnicate"]).status.code(), Some(2));
}

#[test]
fn several_errors_are_reported_together() {
    let src = std::fs::read_to_string(root().join("src/cli/starter.toml")).unwrap();
    let src = src.replace("joint_efficiency = 0.85", "joint_efficiency = 7").replace("\"0.8 MPa\"", "\"-1 MPa\"");
    let dir = scratch("several-errors");
    let p = dir.join("case.toml");
    std::fs::write(&p, src).unwrap();
    let out = knuckle(&["check", p.to_str().unwrap()]);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2));
    assert!(stderr.contains("2 input errors"), "{stderr}");
}
