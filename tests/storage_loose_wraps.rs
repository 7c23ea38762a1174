//! Loose outer wraps in storage. A wrap presses on the roll beneath it only through its own hoop
//! tension (thin-ring equilibrium, p = sigma_t h / r; Timoshenko and Goodier 1951, from memory),
//! so a wrap whose hoop tension is lost, by swelling in MD or by creep relaxing it, loses its
//! interlayer pressure. A dry roll left unwrapped in humid air does that at the barrel, where
//! the moisture changes fastest and mechano-sorptive creep relaxes most; kept in its wrap it
//! does not (common practice: rolls stay in their wrap until they are used). The model cannot
//! let wound layers pull on one another; where they would, it holds them at zero pressure, and
//! every output must say so.

use serde_json::Value;

const KESTREL: &str = "field_cases/kestrel_coated_cold_to_humid.yaml";

/// `age --json` of the Kestrel case with `sets`.
fn age(sets: &[&str]) -> Value {
    age_of(KESTREL, sets)
}

/// `age --json` of case file `file` with `sets`.
fn age_of(file: &str, sets: &[&str]) -> Value {
    let mut args = vec!["--json", "age", file];
    for s in sets {
        args.extend(["--set", s]);
    }
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(&args)
        .output()
        .unwrap();
    assert!(o.status.code().is_some_and(|c| c < 2), "{o:?}");
    serde_json::from_slice(&o.stdout).unwrap()
}

fn loose_warning(v: &Value) -> Option<String> {
    v["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(Value::as_str)
        .find(|w| w.contains("lose all interlayer pressure"))
        .map(str::to_string)
}

/// Unwrapped at 78 % RH, the barrel of a roll wound at 5.2 % moisture takes up water: its wraps
/// are loose in every lane, to a depth within the outer few millimetres, during the humid
/// stretch (after day 20); the warning reaches the output.
#[test]
fn a_dry_roll_unwrapped_in_humid_air_gets_loose_outer_wraps() {
    let v = age(&[]);
    let w = loose_warning(&v).expect("a loose-wraps warning");
    assert!(w.contains("11 lanes"), "{w}");
    // the outer wraps take up the water and creep; by the end the model has them pressed on
    assert!(w.contains("loose for a time"), "{w}");
    for l in v["lanes"].as_array().unwrap() {
        let depth = l["loose_outer_depth_m"].as_f64().unwrap();
        assert!(depth > 0.0 && depth < 0.01, "{depth}");
        let day = l["loose_outer_time_s"].as_f64().unwrap() / 86_400.0;
        assert!(day > 20.0 && day < 32.0, "{day}");
    }
}

/// The same roll kept in its film wrap through the humid stretch keeps its outer wraps on.
#[test]
fn a_roll_kept_in_its_wrap_has_no_loose_wraps() {
    let v = age(&["storage[1].barrel_wrap=film", "storage[1].end_wrap=film"]);
    assert_eq!(loose_warning(&v), None);
    for l in v["lanes"].as_array().unwrap() {
        assert_eq!(l["loose_outer_depth_m"].as_f64(), Some(0.0));
    }
}

/// Harrowgate's edge lanes dry through their open ends in a dry store: the stack beneath the
/// outer wraps shrinks, and they are still loose at the end of storage.
#[test]
fn drying_edge_lanes_are_still_loose_at_the_end() {
    let v = age_of("field_cases/harrowgate_board_dry_store.yaml", &[]);
    let w = loose_warning(&v).expect("a loose-wraps warning");
    assert!(w.contains("at the end of storage: they are loose"), "{w}");
    let lanes = v["lanes"].as_array().unwrap();
    let edge = lanes.first().unwrap();
    assert!(edge["loose_outer_end_depth_m"].as_f64().unwrap() > 0.0);
    let centre = &lanes[lanes.len() / 2];
    assert_eq!(centre["loose_outer_depth_m"].as_f64(), Some(0.0));
}

/// A lane wound slack (a thin lane, no nip: its web tension fell to zero at winding) never had
/// interlayer pressure in its outer wraps, so storage does not loosen them: no storage warning,
/// even though the kernel holds its cells at zero. Kept in film, nothing else loosens a wrap.
#[test]
fn a_lane_wound_slack_is_not_called_loose_in_storage() {
    let tpl = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .arg("template")
        .output()
        .unwrap();
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("slack.yaml");
    std::fs::write(&file, &tpl.stdout).unwrap();
    let v = age_of(
        file.to_str().unwrap(),
        &[
            "profiles[0].values=[72.0,72.1,60.0,72.0,71.9]",
            "winding.nip=0 N/m",
            "storage[0].barrel_wrap=film",
            "storage[0].end_wrap=film",
            "storage[1].barrel_wrap=film",
            "storage[1].end_wrap=film",
        ],
    );
    assert_eq!(loose_warning(&v), None);
}
