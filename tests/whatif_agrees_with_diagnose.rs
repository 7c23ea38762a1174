//! `whatif --set X` and `diagnose --set X` judge the same changed roll alike: the same roll gives
//! the same answer whatever the command (DEVELOPERS.md, "What a diagnosis owes its reader").
//!
//! The demo roll without its later surveys has nothing to fit: its creep is the grade's prior
//! either way, so `whatif` (the measured roll's creep carried to the changed roll) and `diagnose`
//! (the changed roll fitted afresh) run the same model, and the changed roll's likely defects
//! must be `diagnose`'s findings, defect for defect, in the same order. The changes cover each
//! stage: the storage history (a shorter last stretch used to panic in `whatif`, which read the
//! measured roll's storage runs on the changed roll's time grid; a drier one found a baggy centre
//! that `whatif` dropped as unlikely on the measured roll's states), the web tension (a level of
//! 1.5 kN/m that passes the core's and the web's limits) and the nip.

use std::path::Path;
use std::process::Command;

fn json(args: &[&str]) -> serde_json::Value {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .output()
        .unwrap();
    let code = o.status.code();
    assert!(
        matches!(code, Some(0 | 1)),
        "{args:?}: exit {code:?}: {}",
        String::from_utf8_lossy(&o.stderr)
    );
    serde_json::from_slice(&o.stdout).unwrap()
}

fn defects(v: &serde_json::Value) -> Vec<String> {
    (v.as_array().unwrap().iter())
        .map(|d| d.as_str().unwrap().to_string())
        .collect()
}

#[test]
fn whatif_finds_on_the_changed_roll_what_diagnose_finds() {
    let demo = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    // the 31-day surveys run up to the storage history
    let from = demo
        .find("  - what: hardness\n    age: \"31 d\"")
        .expect("the demo's 31-day survey");
    let to = demo.find("\nstorage:\n").expect("the storage history") + 1;
    assert!(from < to);
    let p = Path::new(env!("CARGO_TARGET_TMPDIR")).join(format!(
        "rollsleuth-whatif-prior-{}.yaml",
        std::process::id()
    ));
    std::fs::write(&p, format!("{}{}", &demo[..from], &demo[to..])).unwrap();
    let case = p.to_str().unwrap();
    for set in [
        "storage[2].duration=5 d",
        "storage[2].rh=45 %",
        "winding.tension=1.5 kN/m",
        "winding.nip=4 pli",
    ] {
        let w = json(&["whatif", case, "--set", set, "--json", "-q"]);
        let d = json(&["diagnose", case, "--set", set, "--json", "-q"]);
        let found: Vec<String> = (d["findings"].as_array().unwrap().iter())
            .map(|f| f["defect"].as_str().unwrap().to_string())
            .collect();
        assert_eq!(defects(&w["defects_after"]), found, "{set}");
        // the measured roll's side is diagnose's too
        let base = json(&["diagnose", case, "--json", "-q"]);
        let before: Vec<String> = (base["findings"].as_array().unwrap().iter())
            .map(|f| f["defect"].as_str().unwrap().to_string())
            .collect();
        assert_eq!(defects(&w["defects_before"]), before, "{set}");
    }
    let _ = std::fs::remove_file(&p);
}
