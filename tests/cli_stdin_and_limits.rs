//! Command-line inputs outside the case file: `check -` reads standard input like the other
//! commands, standard input obeys the input size limit, a zero or non-numeric limit is refused,
//! `--nodes` has bounds and its error names the option, not the case file, and `--out` naming a
//! file says so. Each bad input: exit 2, a message with its fix, nothing on standard output.

use std::io::Write;
use std::process::{Command, Stdio};

const CASE: &str = "field_cases/nordvik_pm3_caliper_band.yaml";

/// Run the binary with `stdin` fed in; (exit code, stdout, stderr).
fn run(args: &[&str], env: &[(&str, &str)], stdin: &[u8]) -> (i32, String, String) {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_rollsleuth"));
    cmd.args(args)
        .env_remove("ROLLSLEUTH_MAX_INPUT_SIZE")
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped());
    for (k, v) in env {
        cmd.env(k, v);
    }
    let mut child = cmd.spawn().unwrap();
    let mut input = child.stdin.take().unwrap();
    // the binary may refuse before reading all of it: a broken pipe is fine
    let _ = input.write_all(stdin);
    drop(input);
    let o = child.wait_with_output().unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

fn refused(args: &[&str], env: &[(&str, &str)], stdin: &[u8], needles: &[&str]) {
    let (code, out, err) = run(args, env, stdin);
    assert_eq!(code, 2, "{args:?}: {err}");
    assert!(out.is_empty(), "{args:?}: nothing on stdout, got {out}");
    assert!(!err.contains("panicked"), "{err}");
    for n in needles {
        assert!(err.contains(n), "{args:?}: message lacks '{n}':\n{err}");
    }
}

#[test]
fn check_reads_the_case_from_standard_input() {
    let text = std::fs::read(CASE).unwrap();
    let (code, out, err) = run(&["check", "-"], &[], &text);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("NVP-PM3-24117-R06"), "{out}");
}

#[test]
fn standard_input_obeys_the_size_limit() {
    let text = std::fs::read(CASE).unwrap();
    for cmd in ["check", "lanes"] {
        refused(
            &[cmd, "-", "--max-input-size", "1000"],
            &[],
            &text,
            &[
                "standard input",
                "larger than the input limit of 1000 bytes",
                "Fix:",
            ],
        );
    }
    refused(
        &["lanes", "-"],
        &[("ROLLSLEUTH_MAX_INPUT_SIZE", "1000")],
        &text,
        &["larger than the input limit of 1000 bytes"],
    );
}

#[test]
fn a_zero_input_limit_is_refused() {
    refused(
        &["check", CASE, "--max-input-size", "0"],
        &[],
        b"",
        &["--max-input-size", "above zero", "Fix:"],
    );
}

#[test]
fn a_zero_or_non_numeric_limit_in_the_environment_is_refused() {
    for v in ["0", "abc", "8MiB"] {
        refused(
            &["check", CASE],
            &[("ROLLSLEUTH_MAX_INPUT_SIZE", v)],
            b"",
            &["ROLLSLEUTH_MAX_INPUT_SIZE", v, "Fix:"],
        );
    }
}

#[test]
fn grid_nodes_have_bounds_and_the_error_names_the_option() {
    for n in ["3", "20002", "100000000"] {
        let (code, out, err) = run(&["stress", CASE, "--nodes", n, "-q"], &[], b"");
        assert_eq!(code, 2, "{err}");
        assert!(out.is_empty());
        assert!(
            err.contains("--nodes") && err.contains("5 to 20001"),
            "{err}"
        );
        assert!(!err.contains(CASE), "the case file is not at fault: {err}");
    }
}

#[test]
fn out_naming_a_file_says_it_is_not_a_folder() {
    refused(
        &["diagnose", CASE, "--out", CASE, "-q"],
        &[],
        b"",
        &["is a file, not a folder", "Fix:"],
    );
}

#[test]
fn an_empty_case_file_gets_a_fix() {
    refused(&["check", "-"], &[], b"", &["standard input", "template"]);
}
