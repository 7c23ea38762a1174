//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

use crate::case::Measure;
use crate::diagnose::{CauseShare, Diagnosis};
use crate::note::Note;
use crate::units::{self, Kind, System};
use crate::vocab::{Cause, Defect, Feature};

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
            measure_capitalised(what),
            age_s / DAY_S,
            from_m * 1e3,
            to_m * 1e3
        ),
        Note::LanesMerged {
            what,
            positions,
            lanes,
        } => format!(
            "the {} profile has {positions} positions and no `lanes:` were given; neighbouring positions were merged into {lanes} lanes (state `lanes:` to choose)",
            measure(what)
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
fn measure_capitalised(m: Measure) -> &'static str {
    match m {
        Measure::Hardness => "Hardness",
        Measure::Diameter => "Diameter",
        Measure::Caliper => "Caliper",
    }
}

/// A feature's label for tables (the identifier stays in JSON and rule tables).
pub fn feature(f: Feature) -> &'static str {
    use Feature as F;
    match f {
        F::RunningStrainMmPerM => "running strain at converting tension",
        F::LocalPeakRatio => "local peak / running strain",
        F::CentreMinusEdgesRatio => "centre minus edges / running strain",
        F::LongestLaneRatio => "longest lane / running strain",
        F::SpreadMmPerM => "length spread across the width",
        F::LongestLaneExcessMmPerM => "longest lane over the mean lane",
        F::LocalPeakMmPerM => "local peak over neighbours",
        F::PeakWidthMm => "width of the long band",
        F::CentreMinusEdgesMmPerM => "centre minus edges",
        F::SideToSideMmPerM => "front-to-back difference",
        F::BandCount => "number of long bands",
        F::CaliperCorrelation => "caliper / length correlation",
        F::CaliperRangePct => "caliper range",
        F::MoistureShare => "share from moisture",
        F::CreepShare => "share from creep",
        F::CoreMdStressMpa => "MD stress near the core at winding",
        F::SurfacePressureEndKpa => "surface pressure after storage",
        F::SurfacePressureLossPct => "surface pressure lost in storage",
        F::OuterMdStressEndMpa => "MD stress in the outer wraps after storage",
        F::EdgeMoistureChangePct => "edge minus centre moisture change",
        F::MoistureChangePct => "largest moisture change",
        F::WoundTensionRatio => "highest / lowest wound-in tension",
        F::DiameterRidgePerMille => "diameter ridge",
        F::NipToTensionRatio => "nip-induced / web tension",
        F::SlackLanes => "slack lanes",
    }
}

/// A feature's value for tables, with its unit in the chosen system ("0.84 mm/m", "+3.1 psi").
pub fn feature_value(f: Feature, v: f64, sys: System) -> String {
    use Feature as F;
    let strain = units::strain_label(sys);
    match f {
        F::RunningStrainMmPerM
        | F::SpreadMmPerM
        | F::LongestLaneExcessMmPerM
        | F::LocalPeakMmPerM
        | F::CentreMinusEdgesMmPerM
        | F::SideToSideMmPerM => format!("{v:.3} {strain}"),
        F::PeakWidthMm => units::show(v * 1e-3, Kind::Length, sys, false),
        F::CoreMdStressMpa | F::OuterMdStressEndMpa => {
            units::show(v * 1e6, Kind::Pressure, sys, false)
        }
        F::SurfacePressureEndKpa => units::show(v * 1e3, Kind::Pressure, sys, false),
        F::CaliperRangePct | F::SurfacePressureLossPct => format!("{v:.1} %"),
        F::EdgeMoistureChangePct | F::MoistureChangePct => format!("{v:+.2} points"),
        F::MoistureShare | F::CreepShare => format!("{:.0} %", v * 100.0),
        F::DiameterRidgePerMille => format!("{v:.2} per mille"),
        F::BandCount | F::SlackLanes => format!("{v:.0}"),
        F::LocalPeakRatio
        | F::CentreMinusEdgesRatio
        | F::LongestLaneRatio
        | F::CaliperCorrelation
        | F::WoundTensionRatio
        | F::NipToTensionRatio => format!("{v:.3}"),
    }
}

/// What a profile measures, in words.
pub fn measure(m: crate::case::Measure) -> &'static str {
    match m {
        crate::case::Measure::Hardness => "hardness",
        crate::case::Measure::Diameter => "diameter",
        crate::case::Measure::Caliper => "caliper",
    }
}

/// Where the lanes' caliper came from, in words.
pub fn caliper_source(s: crate::lanes::CaliperSource) -> &'static str {
    match s {
        crate::lanes::CaliperSource::Profile => "the measured caliper profile",
        crate::lanes::CaliperSource::Diameter => "the earliest diameter profile",
        crate::lanes::CaliperSource::Nominal => "the material's nominal caliper",
    }
}
