//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

use crate::case::Measure;
use crate::diagnose::{CauseShare, Diagnosis};
use crate::note::Note;
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
    let mut n = note_texts(&d.notes);
    if attributed(&d.causes) {
        n.push(SHARES_NOTE.to_string());
    }
    n.sort();
    n.dedup();
    n
}

/// A stage's note as a sentence (times in days, positions in mm, moduli in GPa).
pub fn note(n: &Note) -> String {
    use crate::units::DAY_S;
    match *n {
        Note::Extrapolated {
            what,
            age_s,
            from_m,
            to_m,
        } => format!(
            "{} profile at {:.0} d covers {:.0}-{:.0} mm; lanes outside that were extrapolated linearly",
            measure(what),
            age_s / DAY_S,
            from_m * 1e3,
            to_m * 1e3
        ),
        Note::CaliperFromDiameter => {
            "no caliper profile: lane calipers inferred from the earliest diameter profile".into()
        }
        Note::LabCreep {
            direction,
            curves,
            delayed,
            retardation_s,
            viscous_time_s,
            modulus_pa,
            converged,
        } => format!(
            "{direction} creep from {curves} lab curve(s): delayed {delayed:.3}, retardation {:.2} d, viscous time {:.0} d, elastic modulus {:.3} GPa{}",
            retardation_s / DAY_S,
            viscous_time_s / DAY_S,
            modulus_pa / 1e9,
            if converged { "" } else { " (lab-curve fit hit its iteration limit)" }
        ),
        Note::OneAge => "all measurements are at one age: creep parameters cannot be identified and stay at the roll's prior (grade values)".into(),
        Note::DiameterWithoutReference { age_s } => format!(
            "diameter profile at {:.0} d has no winding-time diameter to compare with; not used in the fit",
            age_s / DAY_S
        ),
        Note::StorageExtended {
            last_age_s,
            covered_s,
            added_s,
            standard,
        } => format!(
            "measurements reach {:.1} d but storage history covers {:.1} d; the last {:.1} d assume {}",
            last_age_s / DAY_S,
            covered_s / DAY_S,
            added_s / DAY_S,
            if standard {
                "23 C, 50 % RH, unwrapped"
            } else {
                "the last stretch continued"
            }
        ),
    }
}

/// Notes as sentences, in the order given.
pub fn note_texts(notes: &[Note]) -> Vec<String> {
    notes.iter().map(note).collect()
}

/// A profile's quantity, capitalised, as notes name it.
fn measure(m: Measure) -> &'static str {
    match m {
        Measure::Hardness => "Hardness",
        Measure::Diameter => "Diameter",
        Measure::Caliper => "Caliper",
    }
}
