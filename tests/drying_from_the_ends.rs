//! A uniform roll dried through its bare ends: the edges shrink and unwind short, so the centre
//! is long against them, a baggy centre (paper shrinks as it dries, hygroexpansion of the order
//! of 0.1 % per 1 % of moisture in MD, Niskanen 1998, "Paper Physics", ch. 7, from memory; drying
//! from the roll ends is the textbook cause of a baggy centre, common practice). No single lane
//! stands out: the lanes beside the short edges are level with the web inboard of them, which a
//! baggy-lane finding must not take for a long band.

mod common;

use rollsleuth::case;
use rollsleuth::vocab::Defect;

#[test]
fn a_uniform_roll_dried_from_its_ends_has_a_baggy_centre_and_no_baggy_lane() {
    let file = std::path::Path::new("tests/data/dried_ends/uniform_roll_bare_ends_hot_dry.yaml");
    for n in [12, 17, 40] {
        let c = case::load_file(file, &[format!("lanes.count={n}")]).unwrap();
        let d = common::diagnose_at(&c, 101, false);
        let found = common::defects(&d);
        assert!(found.contains(&Defect::BaggyCenter), "{n} lanes: {found:?}");
        assert!(!found.contains(&Defect::BaggyLane), "{n} lanes: {found:?}");
    }
}
