//! A caliper wedge across the width winds a conical roll: the thick side builds a larger radius,
//! takes more wound-in tension and unwinds long (the lane mechanism of a caliper band, spread
//! over one side; common practice). The rule fires on a wedge, names the long side, and stays
//! silent on a control roll with the same mean caliper and no wedge.

mod common;

use rollsleuth::case::{self, Case, Measure, Profile};
use rollsleuth::diagnose::Diagnosis;
use rollsleuth::vocab::Defect;

/// The demo roll with its measurements replaced by one caliper profile at winding.
fn roll(caliper_um: impl Fn(f64) -> f64) -> Case {
    let mut c =
        case::load_demo(&["profiles=[]".to_string(), "lanes.count=12".to_string()]).unwrap();
    c.complaint = None;
    let w = c.roll.width_m;
    let positions_m: Vec<f64> = (0..16).map(|i| w * (i as f64 + 0.5) / 16.0).collect();
    let values = positions_m
        .iter()
        .map(|&x| caliper_um(x / w) * 1e-6)
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

fn run(c: &Case) -> Diagnosis {
    common::diagnose_at(c, 121, false)
}

#[test]
fn a_caliper_wedge_gives_a_conical_roll_on_its_thick_side() {
    // 72 um +/- 1.5 % from the front edge to the back edge
    let d = run(&roll(|u| 72.0 * (1.0 + 0.03 * (u - 0.5))));
    let f = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::ConicalRoll)
        .unwrap_or_else(|| {
            panic!(
                "{:?}",
                d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
            )
        });
    let half = 0.8; // the demo roll is 1600 mm wide
    assert!(!f.lanes.is_empty());
    for l in &f.lanes {
        assert!(
            l.position_m > half,
            "lane {} is not on the thick (back) side",
            l.index
        );
    }
}

#[test]
fn a_level_roll_is_not_conical() {
    let d = run(&roll(|_| 72.0));
    assert!(
        d.findings.iter().all(|f| f.defect != Defect::ConicalRoll),
        "{:?}",
        d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
    );
}
