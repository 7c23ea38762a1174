//! `whatif` compares a roll before and after a change lane by lane, so a change of the lane
//! layout (`lanes.count`, `lanes.edges`), or one that moves the lanes (the width moving the
//! edge lane's centre), is refused before the run as bad input (exit 2), in text and in JSON,
//! naming the `--set` and the `diagnose` command that shows the roll at its own lanes.

mod common;

/// Exit code, standard output and standard error of `rollsleuth whatif ARGS`.
fn whatif(args: &[&str]) -> (i32, String, String) {
    let mut a = vec!["whatif"];
    a.extend_from_slice(args);
    common::run_bin(&a)
}

#[test]
fn a_lane_count_change_is_refused_as_bad_input_naming_diagnose() {
    let (code, out, err) = whatif(&["--set", "lanes.count=24"]);
    assert_eq!(code, 2, "{err}");
    assert!(out.is_empty(), "no comparison printed: {out}");
    assert!(
        err.starts_with("error: --set lanes.count=24: whatif compares the roll lane by lane"),
        "{err}"
    );
    assert!(
        err.contains("Fix:") && err.contains("`rollsleuth diagnose --set lanes.count=24`"),
        "{err}"
    );
    assert!(!err.contains("lengths before"), "no internal counts: {err}");
}

#[test]
fn a_lane_count_change_is_a_json_error_object_on_standard_error() {
    let (code, out, err) = whatif(&["--json", "--set", "lanes.count=24"]);
    assert_eq!(code, 2, "{err}");
    assert!(
        out.is_empty(),
        "no misaligned JSON on standard output: {out}"
    );
    let v: serde_json::Value = serde_json::from_str(err.trim()).expect("one JSON object");
    assert_eq!(v["error"]["kind"], "bad_input", "{v}");
    assert_eq!(v["error"]["exit_code"], 2, "{v}");
    let m = v["error"]["message"].as_str().unwrap();
    assert!(
        m.contains("lanes.count=24") && m.contains("rollsleuth diagnose --set lanes.count=24"),
        "{m}"
    );
}

#[test]
fn lane_edges_are_refused_and_diagnose_gets_the_case_and_every_set_quoted() {
    let case = "field_cases/kestrel_coated_cold_to_humid.yaml";
    let edges = "lanes.edges=[0 mm, 400 mm, 800 mm]";
    let (code, _, err) = whatif(&[case, "--set", "winding.tension=1.5 pli", "--set", edges]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains(&format!("--set {edges}:")), "{err}");
    assert!(
        err.contains(&format!(
            "`rollsleuth diagnose {case} --set 'winding.tension=1.5 pli' --set '{edges}'`"
        )),
        "{err}"
    );
}

#[test]
fn a_change_that_moves_the_lanes_is_refused_too() {
    // the edge lane is centred in the strip at the back edge: a wider roll moves its centre
    let (code, out, err) = whatif(&["--set", "roll.width=1590 mm"]);
    assert_eq!(code, 2, "{err}");
    assert!(out.is_empty(), "{out}");
    assert!(
        err.contains("the change moves the lanes (18 lanes, not all at the same centres)")
            && err.contains("`rollsleuth diagnose --set 'roll.width=1590 mm'`"),
        "{err}"
    );
}

#[test]
fn a_change_that_keeps_the_lanes_is_compared() {
    let (code, out, err) = whatif(&["--set", "winding.nip=4 pli"]);
    assert!(code <= 1, "{err}");
    assert!(out.contains("What if, case"), "{out}");
}

/// The library refuses it as well, before any fit: `diagnose::what_if` on a variant whose lanes
/// lie elsewhere is `LanesMoved`, with the lane counts.
#[test]
fn the_library_refuses_a_variant_whose_lanes_moved() {
    use rollsleuth::diagnose::{what_if, DiagnoseError};
    let base = rollsleuth::case::load_demo(&[]).unwrap();
    let variant = rollsleuth::case::load_demo(&["roll.width=1590 mm".into()]).unwrap();
    let table = rollsleuth::rules::load_default().unwrap();
    let set = ["roll.width=1590 mm".to_string()];
    let e = what_if(&base, &variant, &set, &table, &Default::default()).unwrap_err();
    assert_eq!(
        e,
        DiagnoseError::LanesMoved {
            before: 18,
            after: 18
        }
    );
}
