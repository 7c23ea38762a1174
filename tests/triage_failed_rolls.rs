//! A roll triage could not diagnose: no numbers that look like a perfect roll (JSON null, empty
//! CSV cells), its whole error message in the CSV on one line, and the table saying so in the
//! roll's own row.

mod common;

use std::path::{Path, PathBuf};

const DEMO: &str = "field_cases/nordvik_pm3_caliper_band.yaml";

fn batch(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-failed-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    let text = std::fs::read_to_string(DEMO).unwrap();
    std::fs::write(d.join("a_good.yaml"), &text).unwrap();
    let bad = text.replacen("tension: \"2.0 pli\"", "tension: \"25 kg\"", 1);
    std::fs::write(d.join("b_bad_unit.yaml"), bad).unwrap();
    d
}

fn triage(args: &[&str]) -> (i32, String) {
    let mut a = vec!["triage"];
    a.extend_from_slice(args);
    let (code, out, _) = common::run_bin(&a);
    (code, out)
}

#[test]
fn a_failed_roll_has_no_numbers_and_its_whole_message() {
    let d = batch("rows");
    let dir = d.to_str().unwrap();
    let (code, json) = triage(&["--json", dir]);
    assert_eq!(code, 2);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let bad = &v["rolls"][0];
    assert!(
        bad["file"].as_str().unwrap().ends_with("b_bad_unit.yaml"),
        "{v}"
    );
    assert!(bad["spread_mm_per_m"].is_null(), "{bad}");
    assert!(bad["top_likelihood"].is_null(), "{bad}");
    assert!(bad["top_probability_fraction"].is_null(), "{bad}");
    let error = bad["error"].as_str().unwrap();
    assert!(
        error.contains("winding.tension") && error.contains('\n'),
        "{error}"
    );
    let good = &v["rolls"][1];
    assert!(good["spread_mm_per_m"].as_f64().unwrap() > 0.0, "{good}");

    let (_, csv) = triage(&["--format", "csv", dir]);
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let col = |name: &str| h.iter().position(|x| x == name).unwrap();
    let rows: Vec<csv::StringRecord> = rdr.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 2, "{csv}");
    let bad = rows
        .iter()
        .find(|r| r[0].ends_with("b_bad_unit.yaml"))
        .unwrap();
    assert_eq!(&bad[col("spread_mm_per_m")], "", "{csv}");
    assert_eq!(&bad[col("top_likelihood")], "", "{csv}");
    assert_eq!(&bad[col("top_probability")], "", "{csv}");
    let e = &bad[col("error")];
    assert!(
        e.contains("1 problem in the case | ") && e.contains("winding.tension") && e.contains("kg"),
        "the whole message, its lines joined: {e}"
    );
    assert!(!e.contains('\n'), "{e}");

    let (_, table) = triage(&["--width", "200", dir]);
    let row = table
        .lines()
        .find(|l| l.contains("b_bad_unit.yaml") && l.contains('│'))
        .unwrap_or_else(|| panic!("a row of its own: {table}"));
    assert!(
        row.contains("n/a") && row.contains("could not diagnose"),
        "{row}"
    );
    let _ = std::fs::remove_dir_all(&d);
}
