//! Less data never makes a diagnosis surer. A roll measured only at winding (caliper, no later
//! hardness or diameter survey) cannot identify its creep: the fit keeps every lane at the roll's
//! value, and that value is then only as sure as the grade prior. The prior's width must reach
//! the lanes' lengths at unwind and the findings' probabilities.

mod common;

use rollsleuth::case::{self, Case, Measure};
use rollsleuth::diagnose::confidence::LaneSpread;
use rollsleuth::fit::POOLED_PRIOR_SD_LN;

/// The Nordvik field case (caliper band near 650 mm) at `lanes_n` lanes, with or without its
/// later surveys (everything but the caliper at winding removed).
fn nordvik(lanes_n: u32, surveys: bool) -> Case {
    let file = std::path::Path::new("field_cases/nordvik_pm3_caliper_band.yaml");
    let mut c = case::load_file(file, &[format!("lanes.count={lanes_n}")]).unwrap();
    if !surveys {
        c.profiles
            .retain(|p| p.what == Measure::Caliper && p.age_s == 0.0);
    }
    c
}

/// With no survey the pooled scales' posterior is the grade prior, a normal density in the
/// log-scale with sd ln 10 about 0: its 15.87 % and 84.13 % quantiles lie at -1 and +1 sd
/// (Abramowitz and Stegun 1964, Table 26.1: Phi(1) = 0.84134). The grid quadrature integrates to
/// a few per cent; 10 % of the sd is allowed.
#[test]
fn without_surveys_the_roll_value_carries_the_prior() {
    let f = common::fit_case(&nordvik(12, false));
    assert!(f
        .lanes
        .iter()
        .all(|l| !l.md_identifiable && !l.radial_identifiable));
    for (low, high) in [
        (f.pooled_md_creep_scale_low, f.pooled_md_creep_scale_high),
        (
            f.pooled_radial_creep_scale_low,
            f.pooled_radial_creep_scale_high,
        ),
    ] {
        let (lo, hi) = (
            low.ln() / POOLED_PRIOR_SD_LN,
            high.ln() / POOLED_PRIOR_SD_LN,
        );
        assert!((lo + 1.0).abs() < 0.1, "low at {lo} sd, not -1");
        assert!((hi - 1.0).abs() < 0.1, "high at {hi} sd, not +1");
    }
}

/// The same roll with its surveys removed: the band lane (the longest) gets an interval that
/// spans the prior's width, not a point. All lanes then move with the roll's one value, so the
/// band's excess over the mean lane scales with it; with surveys, each lane's own posterior
/// also spreads the lanes apart, so a lane that is not the band may be wider with surveys.
#[test]
fn without_surveys_the_band_lane_interval_is_not_a_point() {
    let with = common::diagnose_at(&nordvik(12, true), 101, false);
    let without = common::diagnose_at(&nordvik(12, false), 101, false);
    let width = |l: &LaneSpread| l.excess_mm_per_m_p95 - l.excess_mm_per_m_p05;
    let band = |v: &[LaneSpread]| {
        (v.iter())
            .max_by(|p, q| p.excess_mm_per_m.total_cmp(&q.excess_mm_per_m))
            .cloned()
            .unwrap()
    };
    let (a, b) = (
        band(&with.confidence.lanes),
        band(&without.confidence.lanes),
    );
    eprintln!("with {a:?}\nwithout {b:?}");
    assert!(width(&b) > 0.25 * b.excess_mm_per_m.abs(), "{b:?}");
    assert!(width(&b) >= width(&a), "{a:?} {b:?}");
}

/// Without surveys no lane's creep is identified. A finding judged on the roll at unwind rests
/// on that creep and its note says so; a finding judged on the wound roll at winding (a diameter
/// ridge, a gauge band, pressures, MD stress at the core) does not, and its note does not claim
/// it.
#[test]
fn only_findings_after_storage_rest_on_unidentified_creep() {
    use rollsleuth::diagnose::quantity::quantity_of;
    use rollsleuth::note::Note;
    // 16 lanes, one caliper reading each: the band's reading is held whole, so its gauge band
    // stands on the band alone (at 12 lanes the band is averaged with a level reading)
    let d = common::diagnose_at(&nordvik(16, false), 101, false);
    let mut seen = (false, false);
    for f in &d.findings {
        let unidentified = d.notes.iter().any(|n| {
            matches!(n, Note::FindingOnWeakLanes { defect, unidentified, .. }
                if *defect == f.defect && *unidentified > 0)
        });
        let at_winding = quantity_of(f.defect).at_winding();
        assert_eq!(unidentified, !at_winding, "{:?}", f.defect);
        if at_winding {
            seen.0 = true;
        } else {
            seen.1 = true;
        }
    }
    assert!(seen.0 && seen.1, "{:?}", common::defects(&d));
}
