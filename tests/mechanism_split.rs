//! A finding whose defect two rules find by the same deciding condition (a caliper band or
//! another cause of a long lane; drying or winding for a baggy centre) says how the plausible
//! states split between their mechanisms, in the JSON and the text.
//!
//! The defect's probability is the share of states in which either rule holds, a union, so it
//! lies between the largest rule's share and the sum of the shares (Boole's inequality; the
//! axioms of Kolmogorov 1933).

use std::process::Command;

fn run(args: &[&str]) -> String {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .env_remove("COLUMNS")
        .output()
        .unwrap();
    String::from_utf8_lossy(&o.stdout).into_owned()
}

#[test]
fn a_finding_says_how_its_states_split_between_mechanisms() {
    let v: serde_json::Value = serde_json::from_str(&run(&["diagnose", "--json", "-q"])).unwrap();
    let findings = v["findings"].as_array().unwrap();
    let mut split = 0;
    for f in findings {
        let m = f["mechanisms"].as_array().unwrap();
        if m.is_empty() {
            continue;
        }
        assert_eq!(m[0]["rule"], f["rule"], "the finding's own rule first: {f}");
        let p = f["probability_fraction"].as_f64().unwrap();
        let shares: Vec<f64> = m
            .iter()
            .map(|x| x["share_fraction"].as_f64().unwrap())
            .collect();
        let (max, sum) = (
            shares.iter().fold(0.0_f64, |a, &b| a.max(b)),
            shares.iter().sum::<f64>(),
        );
        assert!(
            max <= p + 1e-12 && p <= sum + 1e-12,
            "{shares:?} against {p}"
        );
        if shares[1..].iter().any(|&s| s > 0.0) {
            split += 1;
        }
    }
    assert!(
        split > 0,
        "the demo's baggy lane splits between two mechanisms: {v}"
    );
    let text = run(&["diagnose", "-q"]);
    let flat = text.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(
        flat.contains("Mechanism: this one holds in") && flat.contains("whichever the mechanism"),
        "{text}"
    );
}
