//! The JSON every command prints: it parses, and it says what the human output says.

use serde_json::Value;
use std::process::Command;

/// Run the binary; (exit code, standard output, standard error).
fn run(args: &[&str]) -> (i32, String, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .output()
        .expect("runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into(),
        String::from_utf8_lossy(&o.stderr).into(),
    )
}

/// `rules show --json` is JSON (it printed the YAML text before), and it is the same table as
/// the YAML `rules show` prints: every rule with its id, defect, likelihood, mechanism, each
/// condition's feature and thresholds, and each correction, in table order; every feature a
/// condition names is one `rules features` lists.
#[test]
fn rules_show_json_is_the_default_table_as_json() {
    let (code, text, err) = run(&["rules", "show", "--json"]);
    assert_eq!(code, 0, "{err}");
    let j: Value = serde_json::from_str(&text).expect("rules show --json prints JSON");
    let (code, yaml, err) = run(&["rules", "show"]);
    assert_eq!(code, 0, "{err}");
    let y: Value = serde_saphyr::from_str(&yaml).expect("rules show prints YAML");
    let (code, feats, err) = run(&["rules", "features", "--json"]);
    assert_eq!(code, 0, "{err}");
    let feats: Value = serde_json::from_str(&feats).unwrap();
    let known: Vec<&str> = (feats["features"].as_array().unwrap().iter())
        .map(|f| f["feature"].as_str().unwrap())
        .collect();
    assert_eq!(j["format"], y["format"]);
    let (jr, yr) = (
        j["rules"].as_array().unwrap(),
        y["rules"].as_array().unwrap(),
    );
    assert!(yr.len() >= 20, "the default table has its rules");
    assert_eq!(jr.len(), yr.len(), "every rule of the default table");
    for (a, b) in jr.iter().zip(yr) {
        let id = b["id"].as_str().unwrap();
        for k in ["id", "defect", "likelihood", "mechanism"] {
            assert_eq!(a[k], b[k], "rule {id}: {k}");
        }
        let (aw, bw) = (a["when"].as_array().unwrap(), b["when"].as_array().unwrap());
        assert_eq!(aw.len(), bw.len(), "rule {id}: conditions");
        for (c, d) in aw.iter().zip(bw) {
            assert_eq!(c["feature"], d["feature"], "rule {id}");
            assert!(known.contains(&c["feature"].as_str().unwrap()), "rule {id}");
            for k in ["above", "below"] {
                let want = d.get(k).and_then(Value::as_f64);
                assert_eq!(c[k].as_f64(), want, "rule {id}: {k}");
            }
        }
        let (ac, bc) = (
            a["corrections"].as_array().unwrap(),
            b["corrections"].as_array().unwrap(),
        );
        assert_eq!(ac.len(), bc.len(), "rule {id}: corrections");
        for (c, d) in ac.iter().zip(bc) {
            for k in ["action", "text", "why"] {
                assert_eq!(c[k], d[k], "rule {id}: correction {k}");
            }
            assert_eq!(
                c["factor"].as_f64(),
                d.get("factor").and_then(Value::as_f64)
            );
        }
    }
}

/// The endings a JSON number's name may carry (DEVELOPERS.md, "JSON field names"): a unit, SI
/// or SI-prefixed (`_m`, `_pa`, `_kpa`, `_mm_per_m` for a strain in mm per m, `_m_per_m` for a
/// strain as a plain fraction), percent (`_pct`), the case's hardness scale (`_hardness_units`),
/// the measurement noise (`_noise_units`: a residual over its one-sigma noise), a natural log
/// (`_ln`); or for a dimensionless number what it is: `_ratio` (one quantity over another of
/// its kind), `_fraction` (a part of a whole), `_per_mille`, `_scale` or `_factor` (a multiplier
/// on a reference value), `_count`, `_dimensionless` (a published law's pure-number constant:
/// Pfeiffer's K2, the GAB C and K).
const SUFFIXES: &[&str] = &[
    "m",
    "mm",
    "m_s",
    "m2_s",
    "s",
    "k",
    "pa",
    "kpa",
    "mpa",
    "n_per_m",
    "kg_m3",
    "j_mol",
    "pct",
    "per_pct",
    "per_mille",
    "mm_per_m",
    "m_per_m",
    "hardness_units",
    "noise_units",
    "ln",
    "ratio",
    "fraction",
    "scale",
    "factor",
    "count",
    "dimensionless",
];

/// Endings after the unit that say which statistic of the quantity a number is
/// (`excess_mm_per_m_p05`, `md_creep_scale_high`).
const QUALIFIERS: &[&str] = &["_p05", "_p95", "_sd", "_low", "_high"];

/// Whole names that need no ending: a multiplier (`factor`), and a count per count.
const WHOLE: &[&str] = &["factor", "layers_per_node"];

/// Feature words (the rule table's vocabulary, so not renamed) whose numbers are dimensionless
/// without an ending: shares 0..1, a correlation coefficient -1..1, a count of lanes, a 0/1 flag
/// (`rollsleuth rules features` gives each one's meaning and range).
const FEATURE_WORDS: &[&str] = &[
    "caliper_correlation",
    "creep_share",
    "moisture_share",
    "web_length_share",
    "slack_lanes",
    "paper_grade",
];

/// Whether a number's name says its unit.
fn carries_unit(name: &str) -> bool {
    let mut n = name;
    while let Some(q) = QUALIFIERS.iter().find(|q| n.ends_with(*q)) {
        n = &n[..n.len() - q.len()];
    }
    WHOLE.contains(&n) || SUFFIXES.iter().any(|s| n.ends_with(&format!("_{s}")))
}

/// Whether a feature's or quantity's word says the unit of the numbers beside it.
fn word_carries_unit(word: &str) -> bool {
    carries_unit(word) || FEATURE_WORDS.contains(&word)
}

/// A float, or an array (of arrays) holding one.
fn has_float(v: &Value) -> bool {
    match v {
        Value::Number(n) => n.is_f64(),
        Value::Array(a) => a.iter().any(has_float),
        _ => false,
    }
}

/// Every float whose name does not carry its unit, with its path. Numbers in an object that
/// names a feature or quantity (`feature`, `quantity`, whose word carries the unit) are in that
/// unit (`value`, `above`, `p05`, `before`, `after`, ...); so are the values of the `features`
/// map, each named by its feature's word.
fn unitless(v: &Value, path: &str, scoped: bool, bad: &mut Vec<String>) {
    match v {
        Value::Object(m) => {
            let word = ["feature", "quantity"]
                .iter()
                .find_map(|k| m.get(*k).and_then(Value::as_str));
            if let Some(w) = word.filter(|w| !word_carries_unit(w)) {
                bad.push(format!("{path}: the word {w} does not carry its unit"));
            }
            let scoped = scoped || word.is_some();
            let features = path.ends_with(".features");
            for (k, x) in m {
                let ok = if features {
                    word_carries_unit(k)
                } else {
                    scoped || carries_unit(k)
                };
                if has_float(x) && !ok {
                    bad.push(format!("{path}.{k}"));
                }
                unitless(x, &format!("{path}.{k}"), scoped, bad);
            }
        }
        Value::Array(a) => a
            .iter()
            .for_each(|x| unitless(x, &format!("{path}[]"), scoped, bad)),
        _ => {}
    }
}

/// The JSON of `args` (exit 0, or 1 for findings).
fn json_of(args: &[&str]) -> Value {
    let (code, out, err) = run(args);
    assert!(code == 0 || code == 1, "{args:?}: exit {code}: {err}");
    serde_json::from_str(&out).unwrap_or_else(|e| panic!("{args:?}: not JSON: {e}"))
}

const FIELD_CASES: [&str; 3] = [
    "field_cases/harrowgate_board_dry_store.yaml",
    "field_cases/kestrel_coated_cold_to_humid.yaml",
    "field_cases/nordvik_pm3_caliper_band.yaml",
];

/// Every float in the JSON of diagnose, stress, fit, age and triage (and check, lanes, whatif
/// and rules show) names its unit, on the demo and the field cases, and on a case with a taper
/// table, a hardness calibration and a lab creep curve (fields the others leave empty).
#[test]
fn every_json_float_names_its_unit() {
    let mut runs: Vec<Vec<&str>> = vec![
        vec!["triage", "--json", "field_cases"],
        vec!["whatif", "--json", "--set", "winding.tension=1.5 kN/m"],
        vec!["rules", "show", "--json"],
        vec![
            "check",
            "--json",
            "--set",
            "winding.tension=null",
            "--set",
            r#"winding.taper=[{diameter: "150 mm", tension: "2.4 pli"}, {diameter: "1000 mm", tension: "1.6 pli"}]"#,
            "--set",
            r#"hardness.calibration={a: 20, b: 7, pressure_ref: "1 kPa"}"#,
            "--set",
            r#"lab_creep=[{direction: md, stress: "8 MPa", temperature: "23 C", rh: "50 %", time_unit: h, times: [0.1, 1, 10, 100], strains: [0.0015, 0.00165, 0.0019, 0.00215]}]"#,
        ],
    ];
    for cmd in ["check", "lanes", "stress", "age", "fit", "diagnose"] {
        runs.push(vec![cmd, "--json"]);
        for f in FIELD_CASES {
            runs.push(vec![cmd, "--json", f]);
        }
    }
    let mut bad = Vec::new();
    for args in &runs {
        let v = json_of(args);
        let mut found = Vec::new();
        unitless(&v, "", false, &mut found);
        bad.extend(
            found
                .into_iter()
                .map(|p| format!("{}: {p}", args.join(" "))),
        );
    }
    bad.sort();
    bad.dedup();
    assert!(
        bad.is_empty(),
        "floats without a unit in their name:\n{}",
        bad.join("\n")
    );
}

/// The walk itself finds what it is for: a unitless name, a qualifier after no unit, and a
/// feature word without a unit; and passes a scoped value and a whole name.
#[test]
fn the_unit_walk_finds_unitless_names() {
    let v: Value = serde_json::json!({
        "rh": 0.5,
        "ok_m": [[0.1, 0.2]],
        "x_p05": 0.1,
        "runs": 3,
        "factor": 0.85,
        "features": { "peak_width_mm": 1.0, "wobble": 2.0 },
        "evidence": [{ "feature": "peak_width_mm", "value": 1.0 }],
        "attribution": { "quantity": "lane_excess", "value": 1.0 },
    });
    let mut bad = Vec::new();
    unitless(&v, "", false, &mut bad);
    assert_eq!(
        bad,
        [
            ".attribution: the word lane_excess does not carry its unit",
            ".features.wobble",
            ".rh",
            ".x_p05",
        ]
    );
}
