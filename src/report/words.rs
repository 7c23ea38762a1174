//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

use crate::diagnose::Diagnosis;
use crate::vocab::{Amplifier, Cause, Defect, Quantity};

/// Plain words for a defect ("baggy_center" -> "baggy centre").
pub fn defect(d: Defect) -> &'static str {
    match d {
        Defect::BaggyLane => "baggy lane",
        Defect::BaggyCenter => "baggy centre",
        Defect::BaggyEdges => "baggy edges",
        Defect::Puckers => "puckers",
        Defect::Ridges => "ridges",
        Defect::Corrugations => "corrugations",
        Defect::GaugeBands => "gauge bands",
        Defect::Starring => "starring",
        Defect::CrepeWrinkles => "crepe wrinkles",
        Defect::Telescoping => "telescoping",
        Defect::Bursts => "bursts",
        Defect::NoDefect => "none",
    }
}

/// Plain words for a complaint as the case names it (a defect word, see [`crate::vocab::WORDS`]);
/// a word outside the vocabulary is shown with its underscores as spaces.
pub fn complaint(word: &str) -> String {
    match Defect::from_word(word) {
        Some(d) => defect(d).to_string(),
        None => word.replace('_', " "),
    }
}

/// A source's name.
pub fn cause(c: Cause) -> &'static str {
    match c {
        Cause::CaliperProfile => "caliper profile",
        Cause::StorageMoisture => "moisture gradients from storage and wraps",
        Cause::LaneToLaneCreep => "lane-to-lane creep (as the measurements identify it)",
    }
}

/// How a source is removed to measure its share.
pub fn removed(c: Cause) -> &'static str {
    match c {
        Cause::CaliperProfile => "caliper made uniform across the width",
        Cause::StorageMoisture => "storage at the humidity in equilibrium with the paper",
        Cause::LaneToLaneCreep => "every lane given the roll's mean creep",
    }
}

/// An amplifier's name and its feasible alternative.
pub fn amplifier(a: Amplifier) -> (&'static str, &'static str) {
    match a {
        Amplifier::WebTension => ("web tension", "web tension 15 % lower"),
        Amplifier::Nip => ("nip", "nip load 40 % lighter"),
        Amplifier::Speed => ("winding speed", "winding 20 % slower"),
        Amplifier::StorageTime => ("storage time", "storage time halved"),
    }
}

/// A quantity's name with its unit.
pub fn quantity(q: Quantity) -> &'static str {
    match q {
        Quantity::LaneExcessMmPerM => "the lane's excess length over the mean lane, mm/m",
        Quantity::LocalPeakMmPerM => "the lane's excess length over its neighbours, mm/m",
        Quantity::CentreMinusEdgesMmPerM => "centre minus edges length, mm/m",
        Quantity::EdgesMinusCentreMmPerM => "edges minus centre length, mm/m",
        Quantity::CoreMdCompressionMpa => "MD compressive stress near the core, MPa",
        Quantity::SurfacePressureKpa => "interlayer pressure at the surface after storage, kPa",
        Quantity::OuterMdStressMpa => "MD stress in the outer wrap after storage, MPa",
        Quantity::DiameterRidgePerMille => "diameter ridge over the neighbouring lanes, per mille",
        Quantity::SpreadMmPerM => "length spread across the width, mm/m",
    }
}

/// How root causes are attributed, said whenever they were.
pub const SHARES_NOTE: &str = "root cause: each source's share is its Shapley value (Shapley 1953) over every subset of source removals, on the finding's own quantity: independent of the order of removal, interactions shared evenly, and the shares add up to the change with every source removed; web tension, nip, speed and storage time amplify a non-uniformity without making one, so they are shown as the quantity at a feasible alternative";

/// The diagnosis's notes with the notes its results imply, sorted, each once.
pub fn notes(d: &Diagnosis) -> Vec<String> {
    let mut n = d.notes.clone();
    if d.findings.iter().any(|f| f.attribution.is_some()) {
        n.push(SHARES_NOTE.to_string());
    }
    if d.lanes.iter().any(|l| l.extrapolated) {
        n.push("lanes marked * lie beyond the measured positions: their profile values are extrapolated".to_string());
    }
    n.sort();
    n.dedup();
    n
}
