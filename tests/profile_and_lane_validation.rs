//! Profiles and lanes that contradict the case are refused at validation (exit 2, the file, the
//! line, the field and the fix), not passed on to the model: readings outside the hardness
//! scale, moisture beyond material.moisture's range, a lane count together with edges, edges
//! that leave part of the roll out, a lane under a millimetre wide, and two profiles of one kind
//! at one age.

mod common;

use std::path::PathBuf;

fn demo() -> String {
    std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap()
}

/// Write a case variant to a scratch file and return its path.
fn variant(name: &str, text: &str) -> PathBuf {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-profiles-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

/// `check` on a variant of the demo: exit code and standard error.
fn check(name: &str, text: &str) -> (i32, String) {
    common::check_file(&variant(name, text))
}

/// Assert a refusal whose message holds each needle.
fn refused(name: &str, text: &str, needles: &[&str]) {
    let (code, err) = check(name, text);
    assert_eq!(code, 2, "{name}: {err}");
    for n in needles {
        assert!(err.contains(n), "{name}: message lacks '{n}':\n{err}");
    }
}

const HARDNESS_0D: &str = "values: [58.2,";

#[test]
fn a_hardness_reading_above_the_scale_is_refused() {
    let text = demo().replacen(HARDNESS_0D, "values: [158.2,", 1);
    refused(
        "hardness_150.yaml",
        &text,
        &[
            "hardness_150.yaml:",
            "profiles[1].values[0]",
            "rebound 0-100",
            "Fix:",
        ],
    );
}

#[test]
fn a_negative_hardness_reading_is_refused() {
    let text = demo().replacen(HARDNESS_0D, "values: [-55,", 1);
    refused(
        "hardness_neg.yaml",
        &text,
        &["profiles[1].values[0]", "outside the hardness scale"],
    );
}

#[test]
fn a_scale_without_a_range_takes_any_reading() {
    let text = demo()
        .replace("scale: rebound 0-100", "scale: rebound")
        .replacen(HARDNESS_0D, "values: [158.2,", 1);
    let (code, err) = check("hardness_no_range.yaml", &text);
    assert_eq!(code, 0, "{err}");
}

#[test]
fn a_moisture_profile_value_beyond_material_moisture_range_is_refused() {
    let text = demo().replace(
        "storage:\n",
        "  - what: moisture\n    age: \"0 d\"\n    unit: \"%\"\n    positions: [50, 800, 1550]\n    values: [8, 80, 8]\nstorage:\n",
    );
    refused(
        "moisture_80.yaml",
        &text,
        &["profiles[5].values[1]", "80", "40", "%"],
    );
}

#[test]
fn lane_count_and_edges_together_are_refused() {
    let text = format!(
        "{}lanes: {{ count: 5, edges: [\"0 mm\", \"800 mm\", \"1600 mm\"] }}\n",
        demo()
    );
    refused(
        "count_and_edges.yaml",
        &text,
        &["lanes.count", "count or edges, not both"],
    );
}

#[test]
fn edges_that_leave_the_roll_ends_out_are_refused() {
    let text = format!(
        "{}lanes: {{ edges: [\"100 mm\", \"800 mm\", \"1500 mm\"] }}\n",
        demo()
    );
    refused(
        "edges_partial.yaml",
        &text,
        &["lanes.edges", "from 0 to its width", "start the edges at 0"],
    );
}

#[test]
fn edges_a_fraction_of_a_mm_from_the_ends_are_taken_as_the_ends() {
    let text = format!(
        "{}lanes: {{ edges: [\"0.2 mm\", \"800 mm\", \"1600.3 mm\"] }}\n",
        demo()
    );
    let (code, err) = check("edges_rounded.yaml", &text);
    assert_eq!(code, 0, "{err}");
}

#[test]
fn edges_out_of_order_name_the_pair() {
    let text = format!(
        "{}lanes: {{ edges: [\"0 mm\", \"800 mm\", \"400 mm\", \"1600 mm\"] }}\n",
        demo()
    );
    refused(
        "edges_overlap.yaml",
        &text,
        &["edges[2]", "edges[1]", "must increase"],
    );
}

/// A lane 0.1 mm wide (explicit edges) is narrower than any cross-width reading resolves: the
/// case is refused naming the two edges, not diagnosed (a sliver lane had made a conical roll).
#[test]
fn a_lane_narrower_than_a_millimetre_is_refused() {
    let text = format!(
        "{}lanes: {{ edges: [\"0 mm\", \"1599.9 mm\", \"1600 mm\"] }}\n",
        demo()
    );
    refused(
        "sliver_lane.yaml",
        &text,
        &[
            "lanes.edges",
            "edges[1]",
            "edges[2]",
            "narrower than",
            "Fix:",
        ],
    );
}

#[test]
fn two_profiles_of_one_kind_at_one_age_are_refused_naming_both() {
    let text = demo().replace(
        "storage:\n",
        "  - what: caliper\n    age: \"0 h\"\n    unit: um\n    positions: [50, 800, 1550]\n    values: [80, 81, 80]\nstorage:\n",
    );
    refused(
        "two_calipers.yaml",
        &text,
        &["profiles[5].what", "profiles[0]", "caliper", "Fix:"],
    );
}

#[test]
fn a_dimensionless_range_has_no_stray_space_and_a_percent_range_its_unit() {
    let text = demo().replace("poisson: 0.3", "poisson: 0.7");
    let (code, err) = check("poisson.yaml", &text);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("value 0.7000 is out of range"), "{err}");
    assert!(err.contains(" .. 0.5000)"), "{err}");
    assert!(!err.contains("0.7000  is") && !err.contains(" )"), "{err}");
    let text = demo().replace(
        "storage:\n",
        "  - what: tension\n    age: \"0 d\"\n    unit: \"%\"\n    positions: [50, 800, 1550]\n    values: [100, -50, 100]\nstorage:\n",
    );
    let (code, err) = check("tension_pct.yaml", &text);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("value -50.00 %"), "{err}");
    assert!(err.contains("(0 % .. no limit)"), "{err}");
}
