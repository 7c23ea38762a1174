//! Confidence of a diagnosis on invented rolls whose truth is known by construction: rolls that
//! differ only by measurement noise give no finding (a noise floor works when noise alone fires
//! at most the share its level allows), and a real caliper band of 4 % (a few % makes
//! bands, common practice) still gives a baggy lane with a probability above 0.9. Readings are
//! synthesised with the forward model and seeded noise of the sizes the case states (caliper
//! 1 um, hardness 1.5 units, diameter 0.1 mm), then diagnosed through the same code path as the
//! command line, at 61 winding nodes and without the what-if re-runs to run in seconds.

use rollsleuth::case::{self, Case, Measure, Profile};
use rollsleuth::diagnose::{diagnose, DiagnoseOptions, Diagnosis};
use rollsleuth::fit::{self, synth};
use rollsleuth::lanes;
use rollsleuth::rules;
use rollsleuth::storage::LaneCreep;
use rollsleuth::units::DAY_S;
use rollsleuth::vocab::{Defect, Feature, Likelihood};
use rollsleuth::winding::{wind, Options, WindInput};

const POSITIONS: [f64; 9] = [0.1, 0.275, 0.45, 0.625, 0.8, 0.975, 1.15, 1.325, 1.5];

/// A uniform roll stored at moisture equilibrium (30 d), low converting tension (1.1 pli), with a
/// caliper profile of `calipers` (m) plus 0.5 um gauge noise (the default repeatability) and hardness and diameter readings at
/// winding and at 30 d made with the grade's creep in every lane plus reading noise.
fn roll(calipers: &[f64], seed: u64) -> Case {
    let c0 = case::load_demo(&["lanes.count=9".into()]).unwrap();
    let rh = rollsleuth::diagnose::actions::rh_for_moisture(&c0, c0.material.moisture_pct);
    let storage = format!("storage=[{{duration: \"30 d\", temperature: \"23 C\", rh: \"{:.2} %\", barrel_wrap: paper, end_wrap: paper}}]", rh * 100.0);
    let mut c = case::load_demo(&[
        "lanes.count=9".into(),
        storage,
        "converting.tension=1.1 pli".into(),
    ])
    .unwrap();
    c.profiles.clear();
    c.complaint = None;
    let mut rng = synth::Rng::new(seed);
    c.profiles.push(Profile {
        what: Measure::Caliper,
        age_s: 0.0,
        positions_m: POSITIONS.to_vec(),
        values: calipers.iter().map(|v| v + 0.5e-6 * rng.normal()).collect(),
        origin: "test".into(),
    });
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options::default(),
    )
    .unwrap();
    let creep: Vec<LaneCreep> = vec![fit::creep_from(&c.material, &[0.0, 0.0]); l.lanes.len()];
    let truth = synth::Truth {
        creep: &creep,
        ages_s: &[0.0, 30.0 * DAY_S],
        hardness_sd: 1.5,
        diameter_sd_m: 1e-4,
        seed: seed + 7919,
    };
    c.profiles
        .extend(synth::profiles(&c, &l, &w, &truth).unwrap());
    c.hardness.repeatability = 1.5;
    c
}

fn run(c: &Case) -> Diagnosis {
    let opt = DiagnoseOptions {
        nodes: 61,
        what_if: false,
    };
    diagnose(c, &rules::load_default().unwrap(), &opt).unwrap()
}

/// Twenty rolls that differ only by seeded caliper, hardness and diameter noise: none gives a
/// finding with high likelihood, and at most one gives any. The noise test holds the chance that
/// noise alone puts up any finding to 1 % (Bonferroni over the one-sided tests; Dunn 1961), so
/// two or more of twenty happen with probability 0.017 (binomial, n = 20, p = 0.01). The seeds
/// are fixed, so the count is too.
#[test]
fn rolls_differing_only_by_noise_give_no_finding() {
    let flat = [72e-6; 9];
    let mut fired = Vec::new();
    for seed in 1..=20u64 {
        let d = run(&roll(&flat, seed));
        for f in &d.findings {
            assert_ne!(f.likelihood, Likelihood::High, "seed {seed}: {f:?}");
        }
        if !d.findings.is_empty() {
            fired.push((seed, d.findings[0].rule.clone(), d.findings[0].probability));
        }
        // every lane carries an interval that contains its value
        for l in &d.confidence.lanes {
            assert!(l.excess_mm_per_m_p05 <= l.excess_mm_per_m_p95, "{l:?}");
        }
    }
    eprintln!("noise-only rolls with a finding: {fired:?}");
    assert!(fired.len() <= 1, "{fired:?}");
}

/// A real 4 % caliper band at 0.8 m gives a baggy lane there with probability above 0.9.
#[test]
fn a_four_percent_caliper_band_gives_a_baggy_lane() {
    let mut band = [72e-6; 9];
    band[4] = 72e-6 * 1.04;
    let d = run(&roll(&band, 3));
    let f = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::BaggyLane)
        .unwrap_or_else(|| panic!("{:?} {:?}", d.findings, d.notes));
    assert!(f.probability > 0.9, "{}", f.probability);
    assert!(
        f.lanes.iter().any(|l| (l.position_m - 0.8).abs() < 0.1),
        "{:?}",
        f.lanes
    );
}

/// A noise-only roll whose noisy calipers leave one lane slack at unwind (seed 8 of the family
/// above: 0.5 um of gauge noise on 72 um). The noisy lanes drive the MD compression ratio from
/// about 0.3 to 1.4, past starring's 1.0, a jump the noise rolls' smooth tail does not predict
/// (over 100 seeds of this roll it passes 1.0 in 2), and without the profile check starring
/// came out at probability 1.0. The finding comes from caliper differences the band test finds
/// within noise, so it is not reported, and the note says why.
#[test]
fn a_slack_lane_made_by_caliper_noise_gives_no_finding() {
    let d = run(&roll(&[72e-6; 9], 8));
    assert!(
        !d.features.slack.is_empty(),
        "no slack lane: {:?}",
        d.features.slack
    );
    let ratio = d.features.get(Feature::MdCompressionStrengthRatio);
    assert!(ratio > 1.0, "{ratio}");
    assert!(d.findings.is_empty(), "{:?}", d.findings);
    assert!(
        d.notes
            .iter()
            .any(|n| matches!(n, rollsleuth::note::Note::OnProfileNoise { .. })),
        "{:?}",
        d.notes
    );
}

/// The demo's band is one caliper reading 2.3 um over its neighbours. Read with a repeatability
/// of 4 um, that reading lies about half a sigma above the rest: no conventional test (one-sided
/// normal tail at 0.6 sigma: 27 %, Abramowitz and Stegun 1964, Table 26.1) calls it a band. The
/// diagnosis must run (its noise rolls, with 5.5 % caliper noise, are wound to the roll's
/// diameter), keep no finding, and say which rules fired below noise, not that none fired.
#[test]
fn a_band_within_the_caliper_noise_is_no_finding_and_says_so() {
    let c = case::load_demo(&["profiles[0].repeatability=4 um".into()]).unwrap();
    let d = run(&c);
    assert!(d.findings.is_empty(), "{:?}", d.findings);
    assert!(!d.confidence.below_floor.is_empty());
    let text = rollsleuth::report::words::no_finding(&d);
    assert!(
        text.contains("No finding stands above measurement noise"),
        "{text}"
    );
    assert!(text.contains(&d.confidence.below_floor[0]), "{text}");
}

/// Every number that decides a finding carries its uncertainty: each evidence value of the
/// demo's findings has its 5-95 % interval over the plausible states (the creep posterior's
/// draws), and a deciding condition tested on the noise rolls names where the feature stands
/// above measurement noise, which the value passes on the condition's side (a finding stands only
/// there). The demo's ridge is built at winding from the calipers, so the creep draws leave it
/// where it is and the noise rolls set its threshold.
#[test]
fn evidence_carries_its_spread_and_its_noise_threshold() {
    let d = run(&case::load_demo(&[]).unwrap());
    let mut thresholds = 0;
    for f in &d.findings {
        for e in &f.evidence {
            let (lo, hi) = (e.p05.unwrap(), e.p95.unwrap());
            assert!(
                lo.is_finite() && hi.is_finite() && lo <= hi,
                "{}: {e:?}",
                f.rule
            );
        }
        let e = &f.evidence[0];
        if let Some(x) = e.noise_threshold {
            thresholds += 1;
            if e.above.is_some() {
                assert!(e.value > x, "{}: {e:?}", f.rule);
            } else {
                assert!(e.value < x, "{}: {e:?}", f.rule);
            }
        }
    }
    let ridge = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::Ridges)
        .unwrap();
    let e = &ridge.evidence[0];
    assert_eq!(e.feature, Feature::DiameterRidgePerMille);
    assert!((e.p95.unwrap() - e.p05.unwrap()).abs() < 1e-9, "{e:?}");
    assert!(e.noise_threshold.is_some_and(|x| x < e.value), "{e:?}");
    assert!(thresholds >= 1);
}
