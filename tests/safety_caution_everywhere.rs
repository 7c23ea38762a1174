//! Every output that advises action carries the one safety note (`report::SAFETY`), in its text
//! (standard output, after the results) and in its JSON (`safety`, the field `diagnose` uses):
//! `stress`, `age` and `fit` whenever a warning tells the reader what to do about the roll (a
//! physical limit passed), and the triage CSV on each row that advises action. Output with no
//! such warning has `safety: null` and no note.

mod common;

use rollsleuth::report::SAFETY;

/// The demo wound at ten times its tension: its wound state passes the web's and the core's
/// strength, warned of with "treat the roll with care".
const OVERWOUND: &str = "winding.tension=20 pli";

/// A roll inside every limit (the Harrowgate field case): its wound state warns of nothing.
const HARROWGATE: &str = "field_cases/harrowgate_board_dry_store.yaml";

/// Stdout and stderr of a command, each with its whitespace made single spaces (the text is
/// wrapped to the table width), and its JSON.
fn outputs(args: &[&str]) -> (String, String, serde_json::Value) {
    let (code, out, err) = common::run_bin(args);
    assert!(code <= 1, "{args:?}: {err}");
    let mut json_args = vec!["--json"];
    json_args.extend_from_slice(args);
    let (code, json, err_json) = common::run_bin(&json_args);
    assert!(code <= 1, "{json_args:?}: {err_json}");
    let flat = |s: &str| s.split_whitespace().collect::<Vec<_>>().join(" ");
    let v = serde_json::from_str(&json).expect("JSON");
    (flat(&out), flat(&err), v)
}

/// The warning with its instruction is there, and so is the safety note, in text and JSON.
fn assert_caution(args: &[&str], instruction: &str) {
    let (out, err, v) = outputs(args);
    assert!(
        err.contains("warning:") && err.contains(instruction),
        "{args:?}: {err}"
    );
    assert!(
        out.contains(SAFETY),
        "{args:?} text lacks the safety note: {out}"
    );
    let w = v["warnings"].to_string();
    assert!(w.contains(instruction), "{args:?} JSON warnings: {w}");
    assert_eq!(v["safety"].as_str(), Some(SAFETY), "{args:?} JSON");
}

#[test]
fn stress_past_the_strength_of_web_and_core_carries_the_safety_note() {
    assert_caution(&["stress", "--set", OVERWOUND], "treat the roll with care");
}

#[test]
fn age_and_fit_that_advise_warming_a_cold_roll_carry_the_safety_note() {
    // the demo's cold roll brought into the humid pressroom: "Let rolls warm up wrapped in
    // film before unwrapping"
    for cmd in ["age", "fit"] {
        assert_caution(&[cmd], "Let rolls warm up wrapped in film");
    }
}

#[test]
fn age_and_fit_past_a_limit_carry_the_safety_note() {
    for cmd in ["age", "fit"] {
        assert_caution(&[cmd, "--set", OVERWOUND], "treat the roll with care");
    }
}

#[test]
fn output_that_advises_nothing_has_no_safety_note() {
    let (out, err, v) = outputs(&["stress", HARROWGATE]);
    assert!(!err.contains("warning:"), "{err}");
    assert!(!out.contains("Safety:"), "{out}");
    assert!(v["safety"].is_null(), "{}", v["safety"]);
}

#[test]
fn triage_csv_rows_that_advise_action_carry_the_safety_note() {
    let (code, csv, err) = common::run_bin(&["triage", "--format", "csv", "field_cases"]);
    assert_eq!(code, 1, "{err}");
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let safety = h
        .iter()
        .position(|x| x == "safety")
        .expect("a safety column");
    let defects = h.iter().position(|x| x == "defects").unwrap();
    let rows: Vec<csv::StringRecord> = rdr.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 3, "{csv}");
    for r in &rows {
        assert!(
            !r[defects].is_empty(),
            "every field case has findings: {csv}"
        );
        assert_eq!(&r[safety], SAFETY, "{csv}");
    }
}

/// A CSV written before the `safety` column, resumed: its rows with findings get the note.
#[test]
fn triage_resumed_from_a_csv_without_the_safety_column_gives_the_note() {
    let (_, csv, _) = common::run_bin(&["triage", "--format", "csv", "field_cases"]);
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let keep: Vec<usize> = (0..h.len()).filter(|&i| &h[i] != "safety").collect();
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(keep.iter().map(|&i| &h[i])).unwrap();
    for r in rdr.records() {
        let r = r.unwrap();
        w.write_record(keep.iter().map(|&i| &r[i])).unwrap();
    }
    let old = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-safety-{}.csv", std::process::id()));
    std::fs::write(&old, w.into_inner().unwrap()).unwrap();
    let old_s = old.to_str().unwrap();
    let (code, again, err) = common::run_bin(&[
        "triage",
        "-v",
        "--format",
        "csv",
        "--resume",
        old_s,
        "field_cases",
    ]);
    let _ = std::fs::remove_file(&old);
    assert_eq!(code, 1, "{err}");
    assert!(err.contains("3 rolls already listed, 0 to go"), "{err}");
    let mut rdr = csv::Reader::from_reader(again.as_bytes());
    let safety = rdr
        .headers()
        .unwrap()
        .iter()
        .position(|x| x == "safety")
        .unwrap();
    let rows: Vec<csv::StringRecord> = rdr.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 3, "{again}");
    assert!(rows.iter().all(|r| &r[safety] == SAFETY), "{again}");
}
