//! A later survey that contradicts the model is reported before the per-lane fit absorbs it.
//! Readings are made with the forward model (the grade's creep in every lane, no noise), so the
//! model explains them: no lane is flagged (if the model is right, a lane's change lies 4 noise
//! sigma on the wrong side with a one-sided normal chance of 3e-5; Abramowitz and Stegun 1964,
//! 26.2.17). Mirroring one lane's change about the roll's change (harder where the model
//! predicts softer) is flagged at that lane, with a warning note.

mod common;

use rollsleuth::case::{self, Case, Measure};
use rollsleuth::fit::{self, synth};
use rollsleuth::lanes;
use rollsleuth::note::Note;
use rollsleuth::storage::LaneCreep;
use rollsleuth::units::DAY_S;
use rollsleuth::winding::Options;

/// Stated hardness repeatability of the synthetic readings, scale units (noise-free readings,
/// so any stated value is honest; small, so that the model's lane-to-lane pattern is resolved).
const REPEAT: f64 = 0.1;

/// A field case with its hardness and diameter surveys replaced by noise-free ones from the
/// forward model at winding and at the end of storage.
fn consistent(file: &str) -> Case {
    let mut c = case::load_file(std::path::Path::new(file), &["lanes.count=12".into()]).unwrap();
    c.profiles
        .retain(|p| !matches!(p.what, Measure::Hardness | Measure::Diameter));
    let l = lanes::build(&c);
    let w = common::wound(&c, &l, Options::default().nodes);
    let creep: Vec<LaneCreep> = vec![fit::creep_from(&c.material, &[0.0, 0.0]); l.lanes.len()];
    let end = c.storage.iter().map(|s| s.duration_s).sum::<f64>();
    let t = synth::Truth {
        creep: &creep,
        ages_s: &[0.0, (end / DAY_S).floor() * DAY_S],
        hardness_sd: 0.0,
        diameter_sd_m: 0.0,
        seed: 1,
    };
    let p = synth::profiles(&c, &l, &w, &t).unwrap();
    c.profiles.extend(p);
    c.hardness.repeatability = REPEAT;
    c
}

fn run(c: &Case) -> fit::RollFit {
    common::fit_case(c)
}

/// Mirror the hardness change of the lane whose change differs most from the roll's: returns its
/// position (m) and its change against the roll's before the mirror (units).
fn mirror_one_lane(c: &mut Case) -> (f64, f64) {
    let idx: Vec<usize> = (0..c.profiles.len())
        .filter(|&i| c.profiles[i].what == Measure::Hardness)
        .collect();
    let (first, later) = (idx[0], idx[idx.len() - 1]);
    assert!(c.profiles[first].age_s < c.profiles[later].age_s);
    let d: Vec<f64> = c.profiles[later]
        .values
        .iter()
        .zip(&c.profiles[first].values)
        .map(|(a, b)| a - b)
        .collect();
    // the roll's change: width-weighted over the lanes (the readings are at the lane centres)
    let w = lanes::build(c).widths();
    let mean = d.iter().zip(&w).map(|(a, b)| a * b).sum::<f64>() / w.iter().sum::<f64>();
    let k = (0..d.len())
        .max_by(|&i, &j| (d[i] - mean).abs().total_cmp(&(d[j] - mean).abs()))
        .unwrap();
    let dev = d[k] - mean;
    c.profiles[later].values[k] -= 2.0 * dev;
    (c.profiles[later].positions_m[k], dev)
}

#[test]
fn a_survey_the_model_explains_is_not_flagged_and_a_mirrored_lane_is() {
    for file in [
        "field_cases/harrowgate_board_dry_store.yaml",
        "field_cases/kestrel_coated_cold_to_humid.yaml",
    ] {
        let mut c = consistent(file);
        let f = run(&c);
        assert!(
            f.contradictions.is_empty(),
            "{file}: {:?}",
            f.contradictions
        );
        let (x, dev) = mirror_one_lane(&mut c);
        // the lane must be a clear claim of the model for the mirror to be one of the survey
        assert!(dev.abs() > 3.0 * REPEAT * 2f64.sqrt(), "{file}: {dev}");
        let f = run(&c);
        assert!(
            f.contradictions
                .iter()
                .any(|k| k.what == Measure::Hardness && (k.position_m - x).abs() < 1e-6),
            "{file}: {x} {dev} {:?}",
            f.contradictions
        );
        let note = f
            .notes
            .iter()
            .find(|n| matches!(n, Note::SurveyContradicts { .. }))
            .unwrap_or_else(|| panic!("{file}: {:?}", f.notes));
        assert!(note.is_warning());
        // diagnose carries the warning too
        let opt = rollsleuth::diagnose::DiagnoseOptions {
            nodes: 61,
            what_if: false,
        };
        let table = rollsleuth::rules::load_default().unwrap();
        let d = rollsleuth::diagnose::diagnose(&c, &table, &opt).unwrap();
        assert!(
            d.notes
                .iter()
                .any(|n| matches!(n, Note::SurveyContradicts { .. }) && n.is_warning()),
            "{file}: {:?}",
            d.notes
        );
    }
}
