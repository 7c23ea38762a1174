//! `triage --resume` runs again the rolls that failed before (a file fixed since gets its row)
//! and prints the whole CSV with one row per file; a folder's subfolders are not searched, and a
//! note on standard error names each.

mod common;

use std::path::{Path, PathBuf};
use std::process::Command;

const DEMO: &str = "field_cases/nordvik_pm3_caliper_band.yaml";

fn scratch(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-resume-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn triage(args: &[&str]) -> (i32, String, String) {
    let mut a = vec!["triage"];
    a.extend_from_slice(args);
    common::run_bin(&a)
}

/// (file, error) of each CSV row.
fn rows(csv: &str) -> Vec<(String, String)> {
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let e = h.iter().position(|x| x == "error").unwrap();
    rdr.records()
        .map(|r| {
            let r = r.unwrap();
            (r[0].to_string(), r[e].to_string())
        })
        .collect()
}

#[test]
fn resume_runs_failed_rolls_again_and_keeps_one_row_per_file() {
    let d = scratch("fixed");
    let text = std::fs::read_to_string(DEMO).unwrap();
    std::fs::write(d.join("a_good.yaml"), &text).unwrap();
    let bad = d.join("b_fixed_later.yaml");
    std::fs::write(
        &bad,
        text.replacen("tension: \"2.0 pli\"", "tension: \"25 kg\"", 1),
    )
    .unwrap();
    let dir = d.join("batch");
    std::fs::create_dir(&dir).unwrap();
    for f in ["a_good.yaml", "b_fixed_later.yaml"] {
        std::fs::rename(d.join(f), dir.join(f)).unwrap();
    }
    let (code, first, _) = triage(&["--format", "csv", dir.to_str().unwrap()]);
    assert_eq!(code, 2);
    let old = d.join("t1.csv");
    std::fs::write(&old, &first).unwrap();
    assert!(rows(&first)
        .iter()
        .any(|(f, e)| f.ends_with("b_fixed_later.yaml") && !e.is_empty()));
    // the file is fixed; the resumed run diagnoses it again
    std::fs::write(dir.join("b_fixed_later.yaml"), &text).unwrap();
    let (code, again, err) = triage(&[
        "--format",
        "csv",
        "--resume",
        old.to_str().unwrap(),
        dir.to_str().unwrap(),
    ]);
    assert_eq!(code, 1, "findings, no failure: {err}");
    let r = rows(&again);
    assert_eq!(r.len(), 2, "one row per file: {again}");
    assert!(r.iter().all(|(_, e)| e.is_empty()), "{again}");
    assert_eq!(
        r[0].0,
        rows(&first)[0].0,
        "the earlier good row stands first"
    );
    // appending onto the file being resumed is refused before anything is written
    let o = Command::new("sh")
        .args([
            "-c",
            "exec \"$0\" triage --format csv --resume \"$1\" \"$2\" >> \"$1\"",
            env!("CARGO_BIN_EXE_rollsleuth"),
            old.to_str().unwrap(),
            dir.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    assert_eq!(std::fs::read_to_string(&old).unwrap(), first);
    let _ = std::fs::remove_dir_all(&d);
}

#[test]
fn a_subfolder_is_named_in_a_note_not_searched() {
    let d = scratch("sub");
    std::fs::copy(DEMO, d.join("top.yaml")).unwrap();
    std::fs::create_dir(d.join("older")).unwrap();
    std::fs::copy(DEMO, d.join("older").join("inner.yaml")).unwrap();
    let (_, csv, err) = triage(&["--format", "csv", d.to_str().unwrap()]);
    assert_eq!(rows(&csv).len(), 1, "{csv}");
    let sub = d.join("older").display().to_string();
    assert!(
        err.contains(&format!("note: {sub}: a subfolder, not searched")),
        "{err}"
    );
    let (_, _, quiet) = triage(&["--format", "csv", "-q", d.to_str().unwrap()]);
    assert!(quiet.is_empty(), "{quiet}");
    let _ = std::fs::remove_dir_all(&d);
}
