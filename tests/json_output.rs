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
