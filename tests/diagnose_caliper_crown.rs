//! A baggy centre wound in from a crowned caliper profile stands on the caliper readings' crown,
//! and a gauge band near the centre is not taken for a crown.
//!
//! The trade's fact: a caliper profile thick in the middle winds the centre tighter, so the centre
//! lanes take more of the wound-in tension, creep longer in storage and unwind baggy (common
//! practice; the caliper-to-hardness link is the one hardness profiles are read for, Roisum 1994,
//! "The Mechanics of Winding", from memory). The statistics: a level profile's quadratic
//! component over its readings is normal with the repeatability as its standard deviation, so a
//! crown of 4 % read at 15 positions to 0.5 um (about 9 standard deviations) cannot be noise
//! (Neyman 1937, Skandinavisk Aktuarietidskrift 20:149-199, from memory), while one reading
//! 4.5 % thick among level ones is a band (its neighbours' parabola, with it left out, is within
//! two standard deviations: NumPy 2.4.6 least squares, as in `diagnose::crown`'s unit test).

mod common;

use rollsleuth::case;
use rollsleuth::note::{NoiseBasis, Note};
use rollsleuth::vocab::Defect;

fn crown_notes(d: &rollsleuth::diagnose::Diagnosis) -> usize {
    d.notes
        .iter()
        .filter(|n| matches!(n, Note::OnCaliperCrown { .. }))
        .count()
}

#[test]
fn a_crowned_caliper_profile_gives_a_baggy_centre_at_every_lane_count() {
    let file = std::path::Path::new("tests/data/caliper_crown/crowned_newsprint.yaml");
    for n in [8, 17, 40] {
        let c = case::load_file(file, &[format!("lanes.count={n}")]).unwrap();
        let d = common::diagnose_at(&c, 101, false);
        let found = common::defects(&d);
        assert!(found.contains(&Defect::BaggyCenter), "{n} lanes: {found:?}");
        assert!(!found.contains(&Defect::BaggyEdges), "{n} lanes: {found:?}");
        assert_eq!(crown_notes(&d), 1, "{n} lanes: {:?}", d.notes);
        let crown = d.notes.iter().find_map(|x| match x {
            Note::OnCaliperCrown {
                crown_m, sigmas, ..
            } => Some((*crown_m, *sigmas)),
            _ => None,
        });
        let (crown_m, sigmas) = crown.unwrap();
        // 77.9 .. 81.3 um: a crown of about 3.4 um, far above the 0.5 um repeatability
        assert!((crown_m * 1e6 - 3.4).abs() < 0.2, "{crown_m}");
        assert!(sigmas > 8.0, "{sigmas}");
    }
}

#[test]
fn a_gauge_band_near_the_centre_is_no_crown() {
    let file = std::path::Path::new("tests/data/caliper_crown/centre_band_film.yaml");
    for n in [17, 40] {
        let c = case::load_file(file, &[format!("lanes.count={n}")]).unwrap();
        let d = common::diagnose_at(&c, 101, false);
        let found = common::defects(&d);
        assert!(found.contains(&Defect::GaugeBands), "{n} lanes: {found:?}");
        assert!(
            !found.contains(&Defect::BaggyCenter),
            "{n} lanes: {found:?}"
        );
        assert_eq!(crown_notes(&d), 0, "{n} lanes: {:?}", d.notes);
        // the noise test of a crown-riding rule names the crown when it decided
        assert!(!d.notes.iter().any(|x| matches!(
            x,
            Note::BelowNoiseFloor {
                basis: NoiseBasis::CaliperCrown,
                ..
            }
        )));
    }
}

/// A note that says a finding stands on the crown is given only with that finding: a baggy
/// edges that stands on the 3 % dish of this roll's readings but holds in fewer than half of
/// the plausible states is dropped, and its crown note with it (a report must not say a finding
/// stands that it then does not report).
#[test]
fn a_crown_note_comes_only_with_its_finding() {
    let file = std::path::Path::new("tests/data/caliper_crown/thick_edges_3pct.yaml");
    let c = case::load_file(file, &[]).unwrap();
    let d = common::diagnose_at(&c, 101, false);
    for n in &d.notes {
        if let Note::OnCaliperCrown { defect, .. } = n {
            assert!(
                d.findings.iter().any(|f| f.defect == *defect),
                "{defect:?} note without its finding: {:?}",
                common::defects(&d)
            );
        }
    }
}

/// Thick edges wind tight edge rings, but two edges are not the repeating narrow pattern of hard
/// rings that corrugations are (corrugations: a CD pattern of narrow hard and soft bands under
/// the nip, common practice); and they give baggy edges whatever the lane count.
#[test]
fn thick_edges_are_no_corrugation_at_any_lane_count() {
    let file = std::path::Path::new("tests/data/caliper_crown/thick_edges_4pct.yaml");
    for n in [8, 17, 40] {
        let c = case::load_file(file, &[format!("lanes.count={n}")]).unwrap();
        let d = common::diagnose_at(&c, 101, false);
        let found = common::defects(&d);
        assert!(
            !found.contains(&Defect::Corrugations),
            "{n} lanes: {found:?}"
        );
        assert!(found.contains(&Defect::BaggyEdges), "{n} lanes: {found:?}");
    }
}

/// A crowned roll whose ends also dried: both push the centre long (drying shrinks the edges,
/// common practice; the crown winds the centre tight), and the moisture share sits near a half,
/// so the plausible states split between the drying and the winding rule of a baggy centre. The
/// defect holds in all of them and is reported, not dropped as unlikely under each rule apart.
#[test]
fn a_baggy_centre_split_between_two_mechanisms_is_still_found() {
    let file = std::path::Path::new("tests/data/caliper_crown/crowned_dry_ends.yaml");
    let c = case::load_file(file, &[]).unwrap();
    let d = common::diagnose_at(&c, 101, false);
    let f = d.findings.iter().find(|f| f.defect == Defect::BaggyCenter);
    let f = f.unwrap_or_else(|| panic!("{:?}", d.notes));
    assert!(f.probability > 0.9, "{}", f.probability);
}
