//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

use crate::diagnose::{CauseShare, Diagnosis};
use crate::vocab::{Cause, Defect};

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

/// A cause's name.
pub fn cause(c: Cause) -> &'static str {
    match c {
        Cause::CaliperProfile => "caliper profile",
        Cause::StorageMoisture => "storage moisture",
        Cause::WoundInTensionProfile => "wound-in tension profile",
        Cause::Nip => "nip",
        Cause::LaneToLaneCreep => "lane-to-lane creep",
        Cause::NotAttributable => "not attributable",
    }
}

/// How a cause was removed to measure its share.
pub fn removed(c: Cause) -> &'static str {
    match c {
        Cause::CaliperProfile => "caliper made uniform across the width",
        Cause::StorageMoisture => "storage at humidity in equilibrium with the paper",
        Cause::WoundInTensionProfile => "lane tensions made equal (fully levelled)",
        Cause::Nip => "nip removed",
        Cause::LaneToLaneCreep => "every lane given the roll's mean creep",
        Cause::NotAttributable => "no single cause removal reduced the spread",
    }
}

/// How cause shares are normalised, said whenever shares were attributed.
const SHARES_NOTE: &str = "cause shares: each cause's reduction of the spread when removed alone, normalised to add to 1 (causes interact, so removals need not add up)";

/// Whether the causes carry attributed shares (some removal reduced the spread).
fn attributed(causes: &[CauseShare]) -> bool {
    !causes.is_empty() && causes.iter().all(|c| c.cause != Cause::NotAttributable)
}

/// The diagnosis's notes with the notes its results imply, sorted, each once.
pub fn notes(d: &Diagnosis) -> Vec<String> {
    let mut n = d.notes.clone();
    if attributed(&d.causes) {
        n.push(SHARES_NOTE.to_string());
    }
    n.sort();
    n.dedup();
    n
}
