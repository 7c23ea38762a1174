//! `rollsleuth rules lint` catches each kind of broken table with a clear message and exit 2.

use std::process::Command;

fn lint(name: &str, text: &str) -> (i32, String, String) {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-lint-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["rules", "lint", p.to_str().unwrap()])
        .output()
        .unwrap();
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into(),
        String::from_utf8_lossy(&o.stderr).into(),
    )
}

const GOOD: &str = r#"format: 1
rules:
  - id: a
    defect: baggy_lane
    likelihood: high
    when:
      - { feature: local_peak_ratio, above: 0.5, source: "common practice" }
    mechanism: "m"
    corrections:
      - { action: scale_tension, factor: 0.85, text: "t", why: "w" }
"#;

fn bad(name: &str, text: &str, needles: &[&str]) {
    let (code, out, err) = lint(name, text);
    assert_eq!(code, 2, "{name}: {err}");
    assert!(out.is_empty());
    assert!(!err.contains("panicked"));
    for n in needles {
        assert!(err.contains(n), "{name}: lacks '{n}' in\n{err}");
    }
}

#[test]
fn a_good_table_and_the_default_table_pass() {
    let (code, out, err) = lint("good.yaml", GOOD);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("ok, 1 rules"));
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["rules", "lint"])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(0));
}

#[test]
fn unknown_feature_is_named_with_the_known_ones() {
    bad(
        "feature.yaml",
        &GOOD.replace("local_peak_ratio", "lokal_peak"),
        &[
            "feature.yaml:7",
            "unknown feature 'lokal_peak'",
            "local_peak_ratio",
        ],
    );
}

#[test]
fn unknown_defect_action_and_likelihood_are_caught() {
    bad(
        "defect.yaml",
        &GOOD.replace("defect: baggy_lane", "defect: floppy"),
        &["unknown defect 'floppy'"],
    );
    bad(
        "action.yaml",
        &GOOD.replace("action: scale_tension", "action: pray"),
        &["unknown action 'pray'"],
    );
    bad(
        "likely.yaml",
        &GOOD.replace("likelihood: high", "likelihood: certain"),
        &["likelihood 'certain'"],
    );
    bad(
        "factor.yaml",
        &GOOD.replace("factor: 0.85, ", ""),
        &["needs a `factor`"],
    );
}

#[test]
fn missing_source_is_caught() {
    bad(
        "source.yaml",
        &GOOD.replace(", source: \"common practice\"", ""),
        &["no source", "common practice"],
    );
}

#[test]
fn unreachable_rules_are_caught() {
    bad(
        "empty.yaml",
        &GOOD.replace("above: 0.5,", "above: 0.5, below: 0.2,"),
        &["unreachable"],
    );
    bad(
        "range.yaml",
        &GOOD.replace(
            "{ feature: local_peak_ratio, above: 0.5,",
            "{ feature: caliper_correlation, above: 1.5,",
        ),
        &["can never hold", "unreachable"],
    );
}

#[test]
fn overlapping_rules_are_caught() {
    let two = format!(
        "{GOOD}{}",
        GOOD.lines()
            .skip(2)
            .collect::<Vec<_>>()
            .join("\n")
            .replace("id: a", "id: b")
    );
    bad("overlap.yaml", &two, &["rule 'b'", "overlaps rule 'a'"]);
}

#[test]
fn duplicate_ids_unknown_fields_and_bad_yaml_are_caught() {
    let two = format!(
        "{GOOD}{}",
        GOOD.lines()
            .skip(2)
            .collect::<Vec<_>>()
            .join("\n")
            .replace("above: 0.5", "below: 0.1")
    );
    bad("dup.yaml", &two, &["duplicate rule id"]);
    bad(
        "field.yaml",
        &GOOD.replace("mechanism:", "mechanizm:"),
        &["unknown field `mechanizm`"],
    );
    bad(
        "yaml.yaml",
        &GOOD.replace("when:", "when: [oops"),
        &["yaml.yaml", "line"],
    );
}
