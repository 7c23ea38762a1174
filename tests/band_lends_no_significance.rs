//! A caliper band that stands above noise at one place lends no significance to a pattern at
//! another. A roll with one real band (4.6 repeatabilities over its neighbours, as the demo's) and
//! an end reading 1.7 repeatabilities thick gives no finding at that end: a reading 1.7 sigma
//! out is within noise (one-sided normal tail 4.5 %, Abramowitz and Stegun 1964, Table 26.1),
//! far above the 1 % the whole family of noise tests may spend. Nor is one band a repeating
//! pattern of hard rings: corrugations need several (common practice), and the other readings
//! are level.

mod common;

use rollsleuth::case::{Case, Measure, Profile};
use rollsleuth::diagnose::Diagnosis;
use rollsleuth::vocab::Defect;

/// The demo roll (newsprint, 1600 mm, 72 um read to 0.5 um) with one caliper profile of 16
/// readings: level at 72 um but for the band reading at 650 mm, `band_um` over, and the back end
/// reading `end_um` over; `lanes` lanes.
fn roll(band_um: f64, end_um: f64, lanes: usize) -> Case {
    let count = format!("lanes.count={lanes}");
    let mut c = common::demo_without_profiles(&[&count]);
    let w = c.roll.width_m;
    let positions_m: Vec<f64> = (0..16).map(|i| w * (i as f64 + 0.5) / 16.0).collect();
    let values = (0..16)
        .map(|i| match i {
            6 => 72.0 + band_um,
            15 => 72.0 + end_um,
            _ => 72.0,
        })
        .map(|um| um * 1e-6)
        .collect();
    c.profiles = vec![Profile {
        what: Measure::Caliper,
        age_s: 0.0,
        positions_m,
        values,
        origin: "test".into(),
    }];
    c
}

/// Findings that name a lane in the back end's outer 150 mm.
fn at_back_end(d: &Diagnosis, width_m: f64) -> Vec<Defect> {
    (d.findings.iter())
        .filter(|f| f.lanes.iter().any(|l| l.position_m > width_m - 0.15))
        .map(|f| f.defect)
        .collect()
}

#[test]
fn a_band_lends_nothing_to_a_noise_level_end_reading() {
    // the demo's repeatability is 0.5 um: 2.3 um is its band, 0.85 um is 1.7 sigma
    for lanes in [12, 17, 24] {
        let c = roll(2.3, 0.85, lanes);
        let d = common::diagnose_at(&c, 121, false);
        let defects = common::defects(&d);
        assert!(
            at_back_end(&d, c.roll.width_m).is_empty(),
            "{lanes} lanes: {defects:?}"
        );
        // the band itself stands: its ridge and long lane are found at 650 mm
        assert!(
            defects.contains(&Defect::Ridges) || defects.contains(&Defect::BaggyLane),
            "{lanes} lanes: {defects:?}"
        );
        assert!(
            !defects.contains(&Defect::Corrugations),
            "{lanes} lanes: {defects:?}"
        );
    }
}

#[test]
fn an_end_reading_that_stands_out_is_still_found() {
    // the control: the end reading as thick as the band (4.6 sigma) stands on its own
    let c = roll(2.3, 2.3, 17);
    let d = common::diagnose_at(&c, 121, false);
    assert!(
        !at_back_end(&d, c.roll.width_m).is_empty(),
        "{:?}",
        common::defects(&d)
    );
}
