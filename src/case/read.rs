//! Reading a case: the file, the embedded demo, `--set` overrides and YAML parsing into the raw
//! schema, then validation into SI.

use super::errors::CaseError;
use super::model::Case;
use super::overrides;
use super::raw::RawCase;
use super::validate::{LineSource, Validator};
use std::path::Path;

/// The demo case embedded in the binary.
pub const DEMO_YAML: &str = include_str!("../../field_cases/nordvik_pm3_caliper_band.yaml");
/// Name under which the demo case is reported.
pub const DEMO_NAME: &str = "<demo: field_cases/nordvik_pm3_caliper_band.yaml>";

/// Load the embedded demo case.
pub fn load_demo(sets: &[String]) -> Result<Case, CaseError> {
    load_str(DEMO_YAML, DEMO_NAME, None, sets)
}

/// Load and validate a case file, applying `--set path=value` overrides first.
pub fn load_file(path: &Path, sets: &[String]) -> Result<Case, CaseError> {
    let file = path.display().to_string();
    let text = crate::input::read_text(path).map_err(|e| CaseError::Read {
        file: file.clone(),
        message: e.to_string(),
    })?;
    load_str(&text, &file, path.parent(), sets)
}

/// Load and validate a case from text. `base` resolves relative CSV paths.
pub fn load_str(
    text: &str,
    file: &str,
    base: Option<&Path>,
    sets: &[String],
) -> Result<Case, CaseError> {
    let (raw, lines) = if sets.is_empty() {
        (parse_yaml(text, file)?, LineSource::Spans)
    } else {
        // the file as written must parse on its own: its errors keep their lines
        parse_yaml(text, file)?;
        let json = overrides::edited_text(text, file, sets)?;
        let raw = serde_saphyr::from_str(&json).map_err(|e| CaseError::Set {
            arg: sets.join(" "),
            message: format!(
                "the edited case no longer fits the case schema ({})",
                first_line(&e.to_string())
            ),
        })?;
        let sets = sets
            .iter()
            .map(|s| {
                let path = s.split_once('=').map_or(s.as_str(), |p| p.0).trim();
                (path.to_string(), s.clone())
            })
            .collect();
        let lines = super::lines::field_lines(text);
        (raw, LineSource::Edited { lines, sets })
    };
    let mut v = Validator::new(lines, base);
    match v.case(raw, file) {
        Some(c) if v.problems.is_empty() => Ok(c),
        _ => Err(CaseError::Invalid {
            file: file.to_string(),
            problems: v.problems,
        }),
    }
}

/// The first line of a parser message, without its `error: ` prefix and location.
fn first_line(message: &str) -> String {
    let plain = crate::input::plain_yaml_message(message);
    let l = plain.lines().next().unwrap_or("").trim();
    let l = l.strip_prefix("error: ").unwrap_or(l);
    // drop "line N column M: " that points into the re-serialised text
    match l.find(": ").filter(|_| l.starts_with("line ")) {
        Some(i) => l[i + 2..].to_string(),
        None => l.to_string(),
    }
}

/// Parse case text into the raw schema; syntax, missing and misspelt fields end here.
fn parse_yaml(text: &str, file: &str) -> Result<RawCase, CaseError> {
    serde_saphyr::from_str(text).map_err(|e| CaseError::Syntax {
        file: file.to_string(),
        message: e.to_string(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn demo_with(from: &str, to: &str) -> Result<Case, CaseError> {
        assert!(DEMO_YAML.contains(from), "demo lacks {from}");
        load_str(&DEMO_YAML.replacen(from, to, 1), "t.yaml", None, &[])
    }

    fn default_of<'a>(c: &'a Case, field: &str) -> &'a crate::case::DefaultUsed {
        c.defaults
            .iter()
            .find(|d| d.field == field)
            .unwrap_or_else(|| panic!("no default recorded for {field}"))
    }

    #[test]
    fn core_poisson_default_is_recorded() {
        let c = demo_with(", poisson: 0.3 }", " }").unwrap();
        assert_eq!(default_of(&c, "roll.core.poisson").value, "0.3");
        match c.roll.core {
            crate::case::Core::Tube { poisson, .. } => assert_relative_eq!(poisson, 0.3),
            crate::case::Core::Rigid => panic!("tube expected"),
        }
    }

    #[test]
    fn clipped_default_core_wall_is_recorded_as_used() {
        let text = DEMO_YAML
            .replacen(
                "  core: { modulus: \"3 GPa\", wall: \"13 mm\", poisson: 0.3 }\n",
                "",
                1,
            )
            .replacen("core_diameter: \"102 mm\"", "core_diameter: \"50 mm\"", 1);
        let c = load_str(&text, "t.yaml", None, &[]).unwrap();
        // 40 % of a 25 mm core radius is 10 mm, below the 13 mm default wall.
        assert_eq!(default_of(&c, "roll.core.wall").value, "10.00 mm");
        match c.roll.core {
            crate::case::Core::Tube { wall_m, .. } => assert_relative_eq!(wall_m, 0.010),
            crate::case::Core::Rigid => panic!("tube expected"),
        }
    }

    #[test]
    fn hardness_scale_and_slope_defaults_are_recorded() {
        let c = demo_with("  scale: rebound 0-100\n", "").unwrap();
        assert_eq!(default_of(&c, "hardness.scale").value, "hardness units");
        assert_eq!(c.hardness.scale, "hardness units");
        assert_eq!(default_of(&c, "hardness.calibration.b").value, "12");
    }

    #[test]
    fn lab_creep_reference_atmosphere_is_recorded() {
        let c = demo_with(
            "profiles:\n",
            "lab_creep:\n  - { direction: md, stress: \"8 MPa\", time_unit: h, times: [0.1, 1, 10, 100], strains: [0.0015, 0.00165, 0.0019, 0.00215] }\nprofiles:\n",
        )
        .unwrap();
        assert_eq!(default_of(&c, "lab_creep[0].temperature").value, "23 C");
        assert_eq!(default_of(&c, "lab_creep[0].rh").value, "50 %");
        assert_relative_eq!(c.lab_creep[0].temperature_k, 296.15);
        assert_relative_eq!(c.lab_creep[0].rh, 0.5);
        assert_eq!(c.lab_creep[0].direction, "md");
    }

    #[test]
    fn unknown_words_are_all_reported_with_line_and_allowed_words() {
        let text = DEMO_YAML
            .replacen("barrel_wrap: paper", "barrel_wrap: foil", 1)
            .replacen("stance: on_side", "stance: lying", 1)
            .replacen("- what: caliper", "- what: gloss", 1);
        let Err(CaseError::Invalid { problems, .. }) = load_str(&text, "t.yaml", None, &[]) else {
            panic!("invalid case expected");
        };
        let msg = |f: &str| {
            problems
                .iter()
                .find(|p| p.field == f)
                .unwrap_or_else(|| panic!("no problem for {f}: {problems:?}"))
        };
        assert_eq!(
            msg("storage[0].barrel_wrap").message,
            "'foil' is not one of: none, paper, film"
        );
        assert_eq!(
            msg("storage[1].stance").message,
            "'lying' is not one of: on_end, on_side"
        );
        assert_eq!(
            msg("profiles[0].what").message,
            "'gloss' is not one of: hardness, diameter, caliper, tension, moisture"
        );
        assert!(problems.iter().all(|p| p.line.is_some()));
    }
}
