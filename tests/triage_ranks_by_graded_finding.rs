//! Triage ranks rolls by their first finding as `diagnose` grades and orders it: the JSON and
//! CSV give that finding's graded likelihood (a word) and its probability (a number), not the
//! weight of its rule's label.

mod common;

use serde_json::Value;

fn json(args: &[&str]) -> Value {
    let (code, out, err) = common::run_bin(args);
    assert!(code <= 1, "{args:?}: {err}");
    serde_json::from_str(&out).expect("JSON")
}

#[test]
fn triage_top_finding_is_diagnose_s_first_graded_finding() {
    let t = json(&["triage", "--json", "field_cases"]);
    let rolls = t["rolls"].as_array().unwrap();
    assert_eq!(rolls.len(), 3, "{t}");
    for r in rolls {
        let d = json(&["diagnose", "--json", r["file"].as_str().unwrap()]);
        let first = &d["findings"][0];
        assert_eq!(r["top_likelihood"], first["likelihood"], "{r}");
        assert!(first["probability_fraction"].is_f64(), "{first}");
        assert_eq!(
            r["top_probability_fraction"], first["probability_fraction"],
            "{r}"
        );
        assert!(r["top_likelihood"].is_string(), "a graded word: {r}");
        // diagnose lists its findings by graded likelihood: never a medium before a high
        let grades: Vec<u8> = (d["findings"].as_array().unwrap().iter())
            .map(|f| match f["likelihood"].as_str().unwrap() {
                "high" => 2,
                "medium" => 1,
                _ => 0,
            })
            .collect();
        assert!(grades.windows(2).all(|w| w[0] >= w[1]), "{grades:?}");
    }
    // the Nordvik roll's medium baggy lane comes after its high ridge, and the complaint's
    // finding is named by its rank
    let nordvik = json(&["diagnose", "--json"]);
    assert_eq!(nordvik["findings"][0]["rule"], "ridge");
    assert_eq!(nordvik["findings"][0]["likelihood"], "high");
    assert_eq!(nordvik["findings"][1]["likelihood"], "medium");
    assert_eq!(nordvik["agreement"]["rank"], 2);
}

#[test]
fn triage_csv_has_the_graded_word_and_the_probability() {
    let (_, csv, err) = common::run_bin(&["triage", "--format", "csv", "field_cases"]);
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let col = |n: &str| {
        h.iter()
            .position(|x| x == n)
            .unwrap_or_else(|| panic!("{n}: {err}"))
    };
    let (l, p) = (col("top_likelihood"), col("top_probability"));
    for r in rdr.records() {
        let r = r.unwrap();
        assert!(["high", "medium", "low"].contains(&&r[l]), "{csv}");
        let prob: f64 = r[p].parse().unwrap();
        assert!((0.5..=1.0).contains(&prob), "{csv}");
    }
}

/// A CSV written before `top_probability` held the rule's weight under `top_likelihood`
/// ("0.80"): resumed, that number is not passed off as a graded likelihood.
#[test]
fn triage_resumed_from_a_csv_with_the_old_weight_column_leaves_the_likelihood_empty() {
    let (_, csv, _) = common::run_bin(&["triage", "--format", "csv", "field_cases"]);
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let keep: Vec<usize> = (0..h.len())
        .filter(|&i| &h[i] != "top_probability")
        .collect();
    let l = h.iter().position(|x| x == "top_likelihood").unwrap();
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(keep.iter().map(|&i| &h[i])).unwrap();
    for r in rdr.records() {
        let r = r.unwrap();
        let cells = keep.iter().map(|&i| if i == l { "0.80" } else { &r[i] });
        w.write_record(cells).unwrap();
    }
    let old = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-old-weight-{}.csv", std::process::id()));
    std::fs::write(&old, w.into_inner().unwrap()).unwrap();
    let args = [
        "triage",
        "-v",
        "--format",
        "csv",
        "--resume",
        old.to_str().unwrap(),
        "field_cases",
    ];
    let (code, again, err) = common::run_bin(&args);
    let _ = std::fs::remove_file(&old);
    assert_eq!(code, 1, "{err}");
    assert!(err.contains("3 rolls already listed, 0 to go"), "{err}");
    let mut rdr = csv::Reader::from_reader(again.as_bytes());
    let l = rdr
        .headers()
        .unwrap()
        .iter()
        .position(|x| x == "top_likelihood")
        .unwrap();
    for r in rdr.records() {
        assert_eq!(&r.unwrap()[l], "", "{again}");
    }
}
