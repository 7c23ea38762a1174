//! A roll whose predicted state passes a physical limit (here lift-off: wound far faster than a
//! layer can stay on the roll, with no nip) is marked in the triage table, carries a count in
//! its CSV and JSON rows, and is ranked ahead of clean rolls with a likelier finding.

use std::path::Path;
use std::process::Command;

const DEMO: &str = "field_cases/nordvik_pm3_caliper_band.yaml";

fn triage(args: &[&str]) -> String {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .arg("triage")
        .args(args)
        .output()
        .unwrap();
    String::from_utf8_lossy(&o.stdout).into()
}

#[test]
fn a_roll_beyond_a_limit_is_marked_counted_and_ranked_first() {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-limits-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    let text = std::fs::read_to_string(DEMO).unwrap();
    std::fs::write(d.join("a_clean.yaml"), &text).unwrap();
    let fast = text
        .replacen("case: NVP-PM3-24117-R06", "case: FAST-LIFTOFF", 1)
        .replacen("nip: \"10 pli\"", "nip: \"0 N/m\"", 1)
        .replacen("speed: \"1800 m/min\"", "speed: \"11000 m/min\"", 1);
    std::fs::write(d.join("b_fast.yaml"), fast).unwrap();
    let dir = d.to_str().unwrap();

    let v: serde_json::Value = serde_json::from_str(&triage(&["--json", dir])).unwrap();
    let rolls = v["rolls"].as_array().unwrap();
    assert_eq!(rolls[0]["case"], "FAST-LIFTOFF", "ranked first: {v}");
    assert!(rolls[0]["limits_exceeded"].as_u64().unwrap() >= 1, "{v}");
    assert_eq!(rolls[1]["limits_exceeded"], 0, "{v}");

    let csv = triage(&["--format", "csv", dir]);
    let mut rdr = csv::Reader::from_reader(csv.as_bytes());
    let h = rdr.headers().unwrap().clone();
    let col = h.iter().position(|x| x == "limits_exceeded").unwrap();
    let counts: Vec<String> = rdr.records().map(|r| r.unwrap()[col].to_string()).collect();
    assert_eq!(counts.len(), 2);
    assert!(counts.contains(&"0".to_string()), "{csv}");
    assert!(
        counts.iter().any(|c| c.parse::<u32>().unwrap() >= 1),
        "{csv}"
    );

    let table = triage(&["--width", "200", dir]);
    let rows: Vec<&str> = table.lines().filter(|l| l.contains(".yaml")).collect();
    assert!(
        rows[0].contains("FAST-LIFTOFF") && rows[0].contains("(see warnings)"),
        "{table}"
    );
    assert!(
        table.contains("beyond limits") && table.contains("Beyond limits:"),
        "{table}"
    );
    let _ = std::fs::remove_dir_all(&d);
}
