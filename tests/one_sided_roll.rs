//! A caliper wedge across the width winds a conical roll: the thick side builds a larger radius,
//! takes more wound-in tension and unwinds long (the lane mechanism of a caliper band, spread
//! over one side; common practice). The rule fires on a wedge, names the long side, and stays
//! silent on a control roll with the same mean caliper and no wedge, on a dished roll (symmetric:
//! both sides alike) and on a single band near one edge (a long lane, not a tilted roll). The
//! side-to-side difference is the robust straight line across the lanes (Theil 1950; Sen 1968,
//! JASA 63:1379-1389): a band tilts a least-squares line, hardly the median of pairwise slopes.

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

/// The invented rolls of `tests/data/one_sided/` (made by its `make_cases.py`: 15 caliper
/// readings with noise at their 0.5 um repeatability, hardness and diameter surveys with noise),
/// diagnosed at `lanes` lanes.
fn surveyed(name: &str, lanes: usize) -> Vec<Defect> {
    let file = format!("tests/data/one_sided/{name}.yaml");
    let c = case::load_file(
        std::path::Path::new(&file),
        &[format!("lanes.count={lanes}")],
    )
    .unwrap();
    common::defects(&run(&c))
}

/// A wedge of 4 % and one of 6 % (front to back, about 6 and 9 standard deviations of the
/// readings' slope) are conical rolls although the creep the surveys leave unresolved puts local
/// peaks of a few tenths of the running strain on the lanes of each plausible state. Their thick
/// end is no gauge band: it stands over the readings' median and over its neighbours, all on its
/// thin side, but not over the straight line through the other readings (the band test's trend
/// leg; the deleted residual of Cook and Weisberg 1982, from memory).
#[test]
fn a_surveyed_caliper_wedge_is_a_conical_roll_at_every_lane_count() {
    for name in ["wedge_4pct", "wedge_6pct"] {
        for n in [8, 17, 40] {
            let found = surveyed(name, n);
            assert!(
                found.contains(&Defect::ConicalRoll),
                "{name}, {n} lanes: {found:?}"
            );
            assert!(
                !found.contains(&Defect::GaugeBands),
                "{name}, {n} lanes: {found:?}"
            );
        }
    }
}

/// Thick edges on both sides (a dish of 3 %) make both sides alike: no conical roll.
#[test]
fn a_dished_roll_is_not_conical() {
    for n in [8, 17, 40] {
        let found = surveyed("dish_3pct", n);
        assert!(
            !found.contains(&Defect::ConicalRoll),
            "{n} lanes: {found:?}"
        );
    }
}

/// A dish of 5 % (both edges 3.9 um, about 8 standard deviations of a reading, thicker than the
/// centre) winds baggy edges (thick edges take more wound-in tension and creep longer; common
/// practice) and is no gauge band, no one-sided edge and no conical roll: its edges stand over
/// their neighbours, all on their thin side, and over the straight line through the other
/// readings, but not over the parabola those readings bend along (the band test's trend leg:
/// the others' quadratic coefficient stands more than three standard errors from zero; the
/// deleted residual of Cook and Weisberg 1982, from memory). A smooth profile is not a band.
#[test]
fn a_dish_is_baggy_edges_and_no_band() {
    for n in [8, 17, 40] {
        let found = surveyed("dish_5pct", n);
        assert!(found.contains(&Defect::BaggyEdges), "{n} lanes: {found:?}");
        for not in [
            Defect::GaugeBands,
            Defect::BaggyOneEdge,
            Defect::ConicalRoll,
        ] {
            assert!(!found.contains(&not), "{n} lanes: {found:?}");
        }
    }
}

/// One band 5 % thick near the back edge is a long lane there, not a roll tilted from side to
/// side.
#[test]
fn a_band_near_one_edge_is_not_a_conical_roll() {
    for n in [17, 40] {
        let found = surveyed("back_band", n);
        assert!(
            !found.contains(&Defect::ConicalRoll),
            "{n} lanes: {found:?}"
        );
        assert!(found.contains(&Defect::BaggyLane), "{n} lanes: {found:?}");
    }
}

/// The back edge 4 % thick over its outer 250 mm (two readings, about 6 standard deviations) is a
/// gauge band and a baggy edge on that side at every lane count: the two readings together stand
/// over the straight line through the others (the band test's trend leg holds bands of up to
/// three readings out of the trend it judges them against, and the others are level, so it is
/// a line); the edge strip unwinds longer than the web
/// inward of it by about the running strain T/(E h), where a lane runs slack (common practice);
/// and the roll is not taken for a conical one, nor for one with baggy edges (both edges long
/// against the centre: `centre_minus_edges` is 0 where the edges lie on opposite sides of
/// it). A dish (both edges thick alike) is no one-sided edge. A complaint of baggy edges agrees with it (the complainant saw an edge baggy).
#[test]
fn a_thick_edge_is_a_gauge_band_and_a_baggy_edge_on_its_side() {
    for n in [8, 17, 40] {
        let c = case::load_file(
            std::path::Path::new("tests/data/one_sided/thick_back_edge.yaml"),
            &[format!("lanes.count={n}")],
        )
        .unwrap();
        let mut c = c;
        c.complaint = Some("baggy_edges".into());
        let d = run(&c);
        let found = common::defects(&d);
        assert!(found.contains(&Defect::GaugeBands), "{n} lanes: {found:?}");
        assert!(
            !found.contains(&Defect::ConicalRoll),
            "{n} lanes: {found:?}"
        );
        let edge = d.findings.iter().find(|f| f.defect == Defect::BaggyOneEdge);
        let edge = edge.unwrap_or_else(|| panic!("{n} lanes: {found:?}"));
        // the long edge is the back one (the roll is 1800 mm wide)
        assert!(!edge.lanes.is_empty(), "{n} lanes");
        assert!(edge.lanes.iter().all(|l| l.position_m > 1.5), "{n} lanes");
        assert!(d.agreement.as_ref().is_some_and(|a| a.agrees), "{n} lanes");
        // one long edge is not baggy edges: those stand on both edges
        assert!(!found.contains(&Defect::BaggyEdges), "{n} lanes: {found:?}");
        let dish = surveyed("dish_3pct", n);
        assert!(!dish.contains(&Defect::BaggyOneEdge), "{n} lanes: {dish:?}");
    }
}
