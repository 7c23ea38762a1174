//! Property tests over the inputs a user controls: any `--set` value on any field of the case
//! tree, any edit of the case text, any quantity text, any rule table text. The property is the
//! contract of bad input: a loaded case or a clear error, never a panic, and an error that names
//! where the problem is. (Fuzzing of the same entry points with cargo-fuzz lives in `fuzz/`.)

use proptest::prelude::*;
use rollsleuth::case::{self, CaseError, DEMO_YAML};

/// Field paths of the demo case tree, leaves and sections (the `--set` targets a user reaches).
const PATHS: &[&str] = &[
    "case",
    "material.grade",
    "material.caliper",
    "material.density",
    "material.md_modulus",
    "material.stack.k1",
    "material.stack.k2",
    "material.friction",
    "material.moisture",
    "roll.width",
    "roll.diameter",
    "roll.core_diameter",
    "roll.core.modulus",
    "roll.core.wall",
    "winding.tension",
    "winding.nip",
    "winding.speed",
    "storage[0].duration",
    "storage[0].temperature",
    "storage[0].rh",
    "storage[1].barrel_wrap",
    "storage",
    "profiles[0].values",
    "profiles[0].positions",
    "profiles[1].unit",
    "profiles",
    "lanes",
    "lanes.count",
    "hardness.calibration.b",
    "nonexistent.field",
];

/// Values: quantities with and without units, words, lists, maps, junk.
fn value() -> impl Strategy<Value = String> {
    prop_oneof![
        (
            -1e12f64..1e12,
            prop::sample::select(vec![
                "",
                " pli",
                " N/m",
                " mm",
                " mil",
                " um",
                " psi",
                " kPa",
                " GPa",
                " %",
                " C",
                " F",
                " d",
                " y",
                " m/s",
                " fpm",
                " lb/3000 ft2",
                " PLI",
                " furlong"
            ])
        )
            .prop_map(|(v, u)| format!("{v}{u}")),
        prop::sample::select(vec![
            "nan",
            ".inf",
            "-.inf",
            "1e308 pli",
            "-0",
            "[]",
            "{}",
            "[1, 2]",
            "~",
            "null",
            "true",
            "paper",
            "on_side",
            "\"\"",
            "[{duration: 1 d}]"
        ])
        .prop_map(String::from),
        "[ -~]{0,40}",
    ]
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 400, failure_persistence: None, ..ProptestConfig::default() })]

    /// Any `--set` on any field: a case or an error that names the `--set`, the file or a field.
    #[test]
    fn any_set_loads_or_names_its_problem(path in prop::sample::select(PATHS), v in value()) {
        let arg = format!("{path}={v}");
        match case::load_demo(std::slice::from_ref(&arg)) {
            Ok(c) => {
                prop_assert!(c.roll.width_m > 0.0 && c.roll.diameter_m > c.roll.core_diameter_m);
                prop_assert!(c.material.caliper_m > 0.0);
            }
            Err(e) => {
                let m = e.to_string();
                prop_assert!(!m.is_empty());
                match &e {
                    CaseError::Set { .. } => prop_assert!(m.contains("--set")),
                    CaseError::Invalid { problems, .. } => {
                        prop_assert!(!problems.is_empty());
                        // a problem under the set path blames the --set; others keep a line
                        for p in problems {
                            prop_assert!(p.set.is_some() || p.line.is_some() || !p.field.is_empty(), "{m}");
                        }
                    }
                    _ => {}
                }
                for jargon in ["DuplicateKeyPolicy", "from_str_multiple", "budget breached", "invalid u32"] {
                    prop_assert!(!m.contains(jargon), "{m}");
                }
            }
        }
    }

    /// Any single edit of the case text (a cut, a doubled span, a replaced byte run): never a
    /// panic; an error always names the file.
    #[test]
    fn any_text_edit_loads_or_names_the_file(at in 0usize..DEMO_YAML.len(), len in 0usize..40, kind in 0u8..3, junk in "[ -~\n]{0,12}") {
        let b = DEMO_YAML.as_bytes();
        let end = (at + len).min(b.len());
        let mut t = b[..at].to_vec();
        match kind {
            0 => {}
            1 => { t.extend_from_slice(&b[at..end]); t.extend_from_slice(&b[at..end]); }
            _ => t.extend_from_slice(junk.as_bytes()),
        }
        t.extend_from_slice(&b[end..]);
        let text = String::from_utf8_lossy(&t);
        if let Err(e) = case::load_str(&text, "edited.yaml", None, &[]) {
            prop_assert!(e.to_string().contains("edited.yaml"), "{e}");
        }
    }

    /// Any quantity text: a finite SI value or an error, for every kind.
    #[test]
    fn any_quantity_text_is_finite_or_refused(text in "[ -~]{0,24}", k in 0usize..6) {
        use rollsleuth::units::{parse, Kind};
        let kind = [Kind::Length, Kind::LineForce, Kind::Pressure, Kind::Duration, Kind::Temperature, Kind::Grammage][k];
        if let Ok(v) = parse(&text, kind) {
            prop_assert!(v.is_finite(), "{text} -> {v}");
        }
    }

    /// Any rule table text: a table or an error naming the file.
    #[test]
    fn any_rule_text_parses_or_names_the_file(at in 0usize..2000, junk in "[ -~\n]{0,16}") {
        let base = rollsleuth::rules::DEFAULT_RULES;
        let at = at.min(base.len());
        let at = (0..=at).rev().find(|&i| base.is_char_boundary(i)).unwrap_or(0);
        let text = format!("{}{junk}{}", &base[..at], &base[at..]);
        if let Err(e) = rollsleuth::rules::parse(&text, "r.yaml") {
            prop_assert!(e.to_string().contains("r.yaml"), "{e}");
        }
    }
}
