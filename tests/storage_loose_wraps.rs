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
    let mut args = vec!["--json", "age", KESTREL];
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
