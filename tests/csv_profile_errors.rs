//! A profile CSV's faults are named with the CSV file, its line and the fix: rows in no order
//! (a back-edge scan, decreasing throughout, is still sorted with a note), rows of the wrong
//! length, a missing file, and values the case refuses.

mod common;

use std::path::PathBuf;

/// A case whose caliper profile is the CSV `csv`, both written to a scratch folder.
fn case_with_csv(name: &str, csv: &str) -> PathBuf {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-csv-{}-{name}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("scan.csv"), csv).unwrap();
    let demo = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    let start = demo.find("  - what: caliper").unwrap();
    let end = demo[start..].find("  - what: hardness").unwrap() + start;
    let text = format!(
        "{}  - what: caliper\n    age: \"0 d\"\n    unit: um\n    csv: scan.csv\n{}",
        &demo[..start],
        &demo[end..]
    );
    let p = dir.join("case.yaml");
    std::fs::write(&p, text).unwrap();
    p
}

fn check(p: &std::path::Path) -> (i32, String) {
    common::check_file(p)
}

#[test]
fn a_back_edge_scan_is_sorted_with_a_note() {
    let p = case_with_csv("rev", "position,value\n1550,72\n800,72.4\n50,71.9\n");
    let (code, err) = check(&p);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("sorted by position"), "{err}");
}

#[test]
fn shuffled_positions_are_an_error_naming_the_lines() {
    let p = case_with_csv(
        "shuf",
        "position,value\n50,72\n800,72.4\n300,71.9\n1550,72\n",
    );
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("scan.csv:4") && err.contains("(line 3)"),
        "{err}"
    );
    assert!(err.contains("Fix: sort the rows"), "{err}");
}

#[test]
fn a_row_of_the_wrong_length_names_its_line_and_a_fix() {
    let p = case_with_csv("extra", "position,value\n50,72\n800,72.4,9\n1550,72\n");
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("scan.csv:3: this row has 3 cells"), "{err}");
    assert!(err.contains("Fix:"), "{err}");
}

#[test]
fn a_missing_csv_says_its_path_starts_at_the_case_file() {
    let p = case_with_csv("missing", "position,value\n50,72\n1550,72\n");
    let text = std::fs::read_to_string(&p)
        .unwrap()
        .replace("csv: scan.csv", "csv: nope.csv");
    std::fs::write(&p, text).unwrap();
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("read from the case file's folder"), "{err}");
    assert!(!err.contains("current folder"), "{err}");
}

#[test]
fn a_refused_csv_value_names_the_csv_file_and_line() {
    let p = case_with_csv("neg", "position,value\n-50,72\n800,72.4\n1550,72\n");
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("outside the roll width"), "{err}");
    assert!(err.contains("scan.csv, line 2"), "{err}");
}

#[test]
fn a_wrong_unit_in_the_header_is_one_problem_naming_its_rows() {
    let p = case_with_csv("unit", "position (kPa),value\n50,72\n800,72.4\n1550,71.9\n");
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("1 problem in the case"), "{err}");
    assert!(
        err.contains("positions: 'kPa'") && err.contains("scan.csv, lines 2, 3, 4)"),
        "{err}"
    );
}

/// `rollsleuth check case.yaml` run inside the case's folder (the case path has no folder part,
/// so the CSV's folder is the current one): exit code and standard error.
#[cfg(unix)]
fn check_in_folder(case: &std::path::Path) -> (i32, String) {
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["check", "case.yaml"])
        .current_dir(case.parent().unwrap())
        .output()
        .expect("the binary runs");
    let (out, err) = (o.stdout, String::from_utf8_lossy(&o.stderr).into_owned());
    assert!(!err.contains("panicked"), "{err}");
    if o.status.code() == Some(2) {
        assert!(out.is_empty(), "no partial output: {err}");
    }
    (o.status.code().unwrap_or(-1), err)
}

/// The case of [`case_with_csv`] with its `csv:` pointed at `scan.csv` as a symbolic link to
/// `target`.
#[cfg(unix)]
fn case_with_linked_csv(name: &str, target: &std::path::Path) -> PathBuf {
    let p = case_with_csv(name, "position,value\n50,72\n800,72.4\n1550,72\n");
    let dir = p.parent().unwrap();
    std::fs::rename(dir.join("scan.csv"), dir.join("real.csv")).unwrap();
    let target = if target.is_relative() {
        dir.join(target)
    } else {
        target.to_path_buf()
    };
    std::os::unix::fs::symlink(target, dir.join("scan.csv")).unwrap();
    p
}

#[cfg(unix)]
#[test]
fn a_csv_linked_out_of_the_case_folder_is_refused_unread() {
    let outside = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-outside-{}.csv", std::process::id()));
    std::fs::write(&outside, "outside-secret-4711:x:0:0:nobody\n1,2\n").unwrap();
    let p = case_with_linked_csv("linkout", &outside);
    // the case named with its folder, and named from inside it (no folder in its path)
    for (code, err) in [check(&p), check_in_folder(&p)] {
        assert_eq!(code, 2, "{err}");
        assert!(err.contains("profiles[0].csv"), "{err}");
        assert!(err.contains("case.yaml"), "{err}");
        assert!(err.contains("leads out of the case file's folder"), "{err}");
        assert!(
            err.contains("Fix: put the CSV file in the case file's folder"),
            "{err}"
        );
        assert!(
            !err.contains("outside-secret"),
            "the outside file was read: {err}"
        );
    }
}

#[cfg(unix)]
#[test]
fn a_csv_linked_to_a_file_inside_the_case_folder_is_read() {
    // an absolute link and a relative one, both to `real.csv` beside the case
    let abs = case_with_linked_csv("linkin-abs", std::path::Path::new("real.csv"));
    let rel = case_with_csv("linkin-rel", "position,value\n50,72\n800,72.4\n1550,72\n");
    let dir = rel.parent().unwrap();
    std::fs::rename(dir.join("scan.csv"), dir.join("real.csv")).unwrap();
    std::os::unix::fs::symlink("real.csv", dir.join("scan.csv")).unwrap();
    for p in [&abs, &rel] {
        for (code, err) in [check(p), check_in_folder(p)] {
            assert_eq!(code, 0, "{err}");
            assert!(!err.contains("symbolic link"), "{err}");
        }
    }
}

#[test]
fn a_bad_header_is_echoed_only_as_a_short_printable_snippet() {
    let long = format!("secret\u{7}{}", "x".repeat(200));
    let p = case_with_csv("longhead", &format!("{long},other\n50,72\n1550,72\n"));
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("needs columns `position` and `value`"),
        "{err}"
    );
    assert!(err.contains("found: secret?xxx"), "{err}");
    assert!(!err.contains(&"x".repeat(41)), "more than a snippet: {err}");
    assert!(
        !err.contains('\u{7}'),
        "a control character was echoed: {err}"
    );
}

#[test]
fn a_header_unit_other_than_the_profiles_unit_is_an_error_naming_both() {
    // the case says `unit: um`; the header says mil
    let p = case_with_csv(
        "unitclash",
        "position (mm), value (mil)\n50,2.8\n1550,2.9\n",
    );
    let (code, err) = check(&p);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("case.yaml"), "{err}");
    assert!(
        err.contains("profiles[0].unit: `unit: um` disagrees"),
        "{err}"
    );
    assert!(err.contains("'mil' in the header of CSV file"), "{err}");
    assert!(err.contains("scan.csv"), "{err}");
    assert!(err.contains("Fix: correct the one that is wrong"), "{err}");
}

#[test]
fn a_header_unit_that_agrees_with_the_profiles_unit_is_read() {
    // the same unit in another spelling and case is no clash
    for (name, header) in [("unitsame", "value (um)"), ("unitmu", "Value (\u{b5}m)")] {
        let p = case_with_csv(
            name,
            &format!("position (mm),{header}\n50,72\n800,72.4\n1550,72\n"),
        );
        let (code, err) = check(&p);
        assert_eq!(code, 0, "{header}: {err}");
        assert!(!err.contains("disagrees"), "{err}");
    }
}
