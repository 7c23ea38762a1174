//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

pub use super::cause_words::{contribution, improves, no_source_cause, share, why, SHARES_METHOD};
use crate::case::Measure;
use crate::diagnose::Diagnosis;
use crate::note::Note;
use crate::units::{self, Kind, System};
use crate::vocab::{Amplifier, Cause, Defect, Feature, Quantity};

/// Plain words for a defect ("baggy_center" -> "baggy centre").
pub fn defect(d: Defect) -> &'static str {
    match d {
        Defect::BaggyLane => "baggy lane",
        Defect::BaggyCenter => "baggy centre",
        Defect::BaggyEdges => "baggy edges",
        Defect::BaggyOneEdge => "baggy edge (one side)",
        Defect::Puckers => "puckers",
        Defect::Ridges => "ridges",
        Defect::Corrugations => "corrugations",
        Defect::GaugeBands => "gauge bands",
        Defect::Starring => "starring",
        Defect::CrepeWrinkles => "crepe wrinkles",
        Defect::Telescoping => "telescoping",
        Defect::Bursts => "bursts",
        Defect::CoreCollapse => "core collapse",
        Defect::CrushedLayers => "crushed layers",
        Defect::ConicalRoll => "conical roll (one side long)",
        Defect::OutOfRound => "out-of-round roll (flat from storage on the side)",
        Defect::LooseOuterWraps => "loose outer wraps (air wound in)",
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
        Cause::WebProfile => {
            "the web's own profile at winding (born baggy, not made so by the roll)"
        }
    }
}

/// How a source is removed to measure its share.
pub fn removed(c: Cause) -> &'static str {
    match c {
        Cause::CaliperProfile => "caliper made uniform across the width",
        Cause::StorageMoisture => "storage at the humidity in equilibrium with the paper",
        Cause::LaneToLaneCreep => "every lane given the roll's mean creep",
        Cause::WebProfile => "the tension and moisture profiles at winding made flat",
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

/// A quantity's name, to follow "the" (its unit goes with each value, see [`quantity_value`]).
pub fn quantity(q: Quantity) -> &'static str {
    match q {
        Quantity::LaneExcessMmPerM => {
            "largest excess length of the finding's lanes over the mean lane"
        }
        Quantity::LocalPeakMmPerM => "excess length of the finding's lane over the web around it",
        Quantity::CentreMinusEdgesMmPerM => "centre-minus-edges length difference",
        Quantity::EdgesMinusCentreMmPerM => "edges-minus-centre length difference",
        Quantity::CoreMdCompressionMpa => "MD compressive stress near the core",
        Quantity::SurfacePressureKpa => "interlayer pressure at the surface after storage",
        Quantity::OuterMdStressMpa => "MD stress in the outer wrap after storage",
        Quantity::DiameterRidgePerMille => "diameter ridge over the web around it",
        Quantity::BandDiameterPerMille => "diameter of the thick band over the web beside it",
        Quantity::SpreadMmPerM => "length spread across the width",
        Quantity::PeakPressureMpa => {
            "highest interlayer pressure in the finding's lanes at winding"
        }
        Quantity::CorePressureMpa => "interlayer pressure on the core at winding",
        Quantity::SideToSideMmPerM => {
            "front-to-back length difference (robust straight line across the width)"
        }
        Quantity::LongEdgeMmPerM => "excess length of the long edge over the web inward of it",
        Quantity::UnwindStressSwingMpa => "once-per-turn swing of web stress at unwind",
        Quantity::OuterZonePressureKpa => {
            "lowest interlayer pressure of the outer wraps at winding"
        }
    }
}

/// A quantity's value in its unit (`Quantity::unit`) as SI for [`units`], or None when it is a
/// strain or a ratio shown as it is.
fn quantity_si(q: Quantity, v: f64) -> Option<f64> {
    match q {
        Quantity::CoreMdCompressionMpa
        | Quantity::OuterMdStressMpa
        | Quantity::PeakPressureMpa
        | Quantity::CorePressureMpa
        | Quantity::UnwindStressSwingMpa => Some(v * 1e6),
        Quantity::SurfacePressureKpa | Quantity::OuterZonePressureKpa => Some(v * 1e3),
        _ => None,
    }
}

/// A quantity's value for tables, with its unit in the chosen system ("0.842 mm/m", "31.2 kPa").
pub fn quantity_value(q: Quantity, v: f64, sys: System) -> String {
    // a value that rounds to zero is shown without a sign
    let v = if v.abs() < 5e-4 { 0.0 } else { v };
    match (q, quantity_si(q, v)) {
        (_, Some(si)) => units::show(si, Kind::Pressure, sys, false),
        (Quantity::DiameterRidgePerMille | Quantity::BandDiameterPerMille, _) => {
            format!("{v:.2} per mille")
        }
        _ => format!("{v:.3} {}", units::strain_label(sys)),
    }
}

/// A change of a quantity for tables, signed, with its unit ("-0.120 mm/m", "+4.2 kPa").
pub fn quantity_change(q: Quantity, dv: f64, sys: System) -> String {
    // a pressure keeps its significant digits however small; a length or ratio its decimals
    let dv = if dv.abs() < 5e-4 && quantity_si(q, dv).is_none() {
        0.0
    } else {
        dv
    };
    match (q, quantity_si(q, dv)) {
        // as many significant digits as the values it is the change of ([`quantity_value`])
        (_, Some(si)) => {
            let s = units::show(si.abs(), Kind::Pressure, sys, false);
            match si.partial_cmp(&0.0) {
                Some(std::cmp::Ordering::Greater) => format!("+{s}"),
                Some(std::cmp::Ordering::Less) => format!("-{s}"),
                _ => s,
            }
        }
        (Quantity::DiameterRidgePerMille | Quantity::BandDiameterPerMille, _) => {
            format!("{dv:+.2} per mille")
        }
        _ => format!("{dv:+.3} {}", units::strain_label(sys)),
    }
}

/// The diagnosis's notes with the notes its results imply, sorted, each once (warnings are
/// apart: [`warnings`]); SI, as the JSON gives them ([`notes_in`]: in a unit system).
pub fn notes(d: &Diagnosis) -> Vec<String> {
    notes_in(d, System::Si)
}

/// [`notes`] with their quantities in `sys`.
pub fn notes_in(d: &Diagnosis, sys: System) -> Vec<String> {
    let mut n = note_text(&[], &d.notes, sys).0;
    if d.findings.iter().any(|f| f.attribution.is_some()) {
        n.push(format!("root cause: {SHARES_METHOD}"));
    }
    if d.lanes.iter().any(|l| l.extrapolated) {
        n.push("lanes marked * lie beyond the measured positions: their profile values are extrapolated".to_string());
    }
    n.sort();
    n.dedup();
    n
}

/// What a diagnosis without findings says: that no rule fired, or that those that fired did so
/// no more strongly than measurement noise alone (naming them), and, when the roll passes a
/// physical limit, that the warnings still stand.
pub fn no_finding(d: &Diagnosis) -> String {
    let below = &d.confidence.below_floor;
    let mut s = if below.is_empty() {
        "No finding: no rule fired. The roll is predicted to unwind within the rules' thresholds."
            .to_string()
    } else {
        let unlikely = d.notes.iter().any(|n| matches!(n, Note::Unlikely { .. }));
        super::note_words::dropped_headline(below, unlikely)
    };
    if !warnings(d).is_empty() {
        s.push_str(" The warnings (a physical limit passed, or a state the model can only bound) stand apart from the rules and the noise test: read them before releasing the roll.");
    }
    s
}

/// The diagnosis's warnings: the case's own, then every physical limit a stage passed; SI, as
/// the JSON gives them ([`warnings_in`]: in a unit system).
pub fn warnings(d: &Diagnosis) -> Vec<String> {
    warnings_in(d, System::Si)
}

/// [`warnings`] with their quantities in `sys`.
pub fn warnings_in(d: &Diagnosis, sys: System) -> Vec<String> {
    note_text(&d.case_warnings, &d.notes, sys).1
}

/// A stage's notes as output lines, their quantities in `sys`: `warning: ...` for the case's
/// warnings and the physical limits passed, then `note: ...` for the rest.
pub fn note_lines(case_warnings: &[String], notes: &[Note], sys: System) -> Vec<String> {
    let (info, warn) = note_text(case_warnings, notes, sys);
    let warn = warn.into_iter().map(|w| format!("warning: {w}"));
    warn.chain(info.into_iter().map(|n| format!("note: {n}")))
        .collect()
}

/// A stage's notes in words for JSON (SI), apart: `(notes, warnings)`, the warnings with the
/// case's own first.
pub fn note_json(case_warnings: &[String], notes: &[Note]) -> (Vec<String>, Vec<String>) {
    note_text(case_warnings, notes, System::Si)
}

/// [`note_json`] with the quantities in `sys`.
pub fn note_text(
    case_warnings: &[String],
    notes: &[Note],
    sys: System,
) -> (Vec<String>, Vec<String>) {
    let mut w = case_warnings.to_vec();
    let warning = |n: &&Note| n.is_warning();
    w.extend(notes.iter().filter(warning).map(|n| note_in(n, sys)));
    let n = (notes.iter().filter(|n| !n.is_warning()))
        .map(|n| note_in(n, sys))
        .collect();
    (n, w)
}

/// The sentence of a [`Note::PosteriorCut`].
fn posterior_cut(lanes: usize, position_m: f64, sys: System) -> String {
    format!(
        "the creep posterior of {lanes} lane(s) (the first at {}) reaches past the widest grid it is integrated on: its tails are left out, so the spread of those lanes' creep scales, and of what rests on them, is understated",
        super::pos(position_m, sys)
    )
}

/// A profile extrapolated to lanes beyond its readings ([`Note::Extrapolated`]).
fn extrapolated(n: &Note, sys: System) -> String {
    let Note::Extrapolated {
        what,
        age_s,
        from_m,
        to_m,
    } = *n
    else {
        return String::new();
    };
    let span = match sys {
        System::Si => format!("{:.0}-{:.0} mm", from_m * 1e3, to_m * 1e3),
        System::Us => format!("{} to {}", super::pos(from_m, sys), super::pos(to_m, sys)),
    };
    format!(
        "{} profile at {:.0} d covers {span}; lanes outside that were extrapolated linearly",
        measure_capitalised(what),
        age_s / units::DAY_S,
    )
}

/// Surveys past the storage history ([`Note::StorageExtended`]).
fn storage_extended(n: &Note, sys: System) -> String {
    let Note::StorageExtended {
        last_age_s,
        covered_s,
        added_s,
        standard,
    } = *n
    else {
        return String::new();
    };
    let assumed = if standard {
        let k = crate::storage::STANDARD_TEMPERATURE_K;
        let t = super::said(sys, "23 C".into(), k, Kind::Temperature, false);
        format!("{t}, 50 % RH, unwrapped")
    } else {
        "the last stretch continued".into()
    };
    let d = units::DAY_S;
    format!(
        "measurements reach {:.1} d but storage history covers {:.1} d; the last {:.1} d assume {assumed}",
        last_age_s / d,
        covered_s / d,
        added_s / d,
    )
}

/// A stage's note as a sentence, SI (times in days, positions in mm, moduli in GPa).
pub fn note(n: &Note) -> String {
    note_in(n, System::Si)
}

/// A stage's note as a sentence, its quantities in `sys` (SI: as [`note`]).
pub fn note_in(n: &Note, sys: System) -> String {
    use super::{pos, said};
    use crate::units::DAY_S;
    match *n {
        Note::Extrapolated { .. } => extrapolated(n, sys),
        Note::LanesMerged {
            what,
            positions,
            lanes,
        } => format!(
            "the {} profile has {positions} positions and no `lanes:` were given; neighbouring positions were merged into {lanes} lanes (state `lanes:` to choose)",
            measure(what)
        ),
        Note::LanesCount { asked, lanes } => format!(
            "lanes.count = {asked} gives {lanes} lanes: each edge lane is made {} wide (a strip split off one wider than two strips, else the excess given to its neighbour), because moisture exchange through the ends and the edge tension act in the outer centimetres",
            pos(crate::lanes::EDGE_STRIP_M, sys)
        ),
        Note::LanesCoarse { .. } => super::note_words::lanes_coarse(n, sys),
        Note::BelowNoiseFloor { .. }
        | Note::OnProfileNoise { .. }
        | Note::Unlikely { .. }
        | Note::OnCaliperCrown { .. }
        | Note::Resolution { .. }
        | Note::LaneNotExplained { .. }
        | Note::RollNotExplained { .. }
        | Note::LimitOnNoise { .. }
        | Note::LimitOnSameReadings { .. }
        | Note::FindingOnWeakLanes { .. } => super::note_words::confidence_note(n, sys),
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
            "{direction} creep from {curves} lab curve(s): delayed {delayed:.3}, retardation {:.2} d, viscous time {:.0} d, elastic modulus {}{}",
            retardation_s / DAY_S,
            viscous_time_s / DAY_S,
            said(sys, format!("{:.3} GPa", modulus_pa / 1e9), modulus_pa, Kind::Pressure, false),
            if converged { "" } else { " (lab-curve fit hit its iteration limit)" }
        ),
        Note::PosteriorCut { lanes, position_m } => posterior_cut(lanes, position_m, sys),
        Note::OneAge => format!("all measurements are at one age: creep parameters cannot be identified and stay at the roll's prior (grade values, within a factor of {:.0} at one sigma); the lanes' lengths at unwind and the findings' probabilities carry that width", crate::fit::POOLED_PRIOR_SD_LN.exp()),
        Note::DiameterWithoutReference { age_s } => format!(
            "diameter profile at {:.0} d has no winding-time diameter to compare with; not used in the fit",
            age_s / DAY_S
        ),
        Note::StorageExtended { .. } => storage_extended(n, sys),
        Note::Limit(l) => super::limit_words::limit(&l, sys),
        Note::WindingDiameter(m) => super::note_words::winding_diameter(&m, sys),
        Note::SurveyContradicts { .. } => super::note_words::survey_contradicts(n, sys),
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
        Measure::Tension => "Web tension at winding",
        Measure::Moisture => "Web moisture at winding",
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
        F::LocalPeakMmPerM => "local peak over the web around it",
        F::PeakWidthMm => "width of the long band",
        F::CentreMinusEdgesMmPerM => "centre minus edges",
        F::SideToSideMmPerM => "front-to-back difference",
        F::LongEdgeMmPerM => "edge strip over the web inward of it",
        F::LongEdgeRatio => "long edge / running strain",
        F::SideToSideRatio => "front-to-back / running strain",
        F::BandCount => "number of long bands",
        F::CaliperCorrelation => "caliper / length correlation",
        F::CaliperRangePct => "caliper range",
        F::MoistureShare => "share from moisture",
        F::CreepShare => "share from creep",
        F::WebLengthShare => "share the web brought to the winder",
        F::CoreMdStressMpa => "MD stress near the core at winding",
        F::SurfacePressureEndKpa => "surface pressure after storage",
        F::SurfacePressureLossPct => "surface pressure lost in storage",
        F::OuterMdStressEndMpa => "MD stress in the outer wraps after storage",
        F::EdgeMoistureChangePct => "edge minus centre moisture change",
        F::MoistureChangePct => "largest moisture change",
        F::WoundTensionRatio => "highest / lowest wound-in tension",
        F::DiameterRidgePerMille => "diameter ridge",
        F::NipToTensionRatio => "nip-induced / web tension",
        F::HardBandCount => "number of hard rings wound in",
        F::SlackLanes => "slack lanes",
        F::CorePressureRatio => "core pressure / collapse pressure",
        F::PeakPressureCrushRatio => "peak pressure / crush limit",
        F::MdCompressionStrengthRatio => "MD compression / compressive strength",
        F::MdTensionStrengthRatio => "outer MD stress / tensile strength",
        F::OuterMoistureLossPct => "moisture lost by the outer wraps",
        F::PaperGrade => "paper grade (1) or film (0)",
        F::RunOutMm => "run-out at unwind from storage on the side",
        F::UnwindTensionSwingRatio => "once-per-turn tension swing / converting tension",
        F::UnwindStressStrengthRatio => "peak web stress at unwind / tensile strength",
        F::AirFilmRoughnessRatio => "entrained air film / roughness",
        F::AirTensionLossRatio => "wound-in tension lost to air / web tension",
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
        | F::SideToSideMmPerM
        | F::LongEdgeMmPerM => format!("{v:.3} {strain}"),
        F::PeakWidthMm | F::RunOutMm => units::show(v * 1e-3, Kind::Length, sys, false),
        F::CoreMdStressMpa | F::OuterMdStressEndMpa => {
            units::show(v * 1e6, Kind::Pressure, sys, false)
        }
        F::SurfacePressureEndKpa => units::show(v * 1e3, Kind::Pressure, sys, false),
        F::CaliperRangePct | F::SurfacePressureLossPct => format!("{v:.1} %"),
        F::EdgeMoistureChangePct | F::MoistureChangePct | F::OuterMoistureLossPct => {
            format!("{v:+.2} points")
        }
        F::MoistureShare | F::CreepShare | F::WebLengthShare => format!("{:.0} %", v * 100.0),
        F::DiameterRidgePerMille => format!("{v:.2} per mille"),
        F::BandCount | F::SlackLanes | F::PaperGrade | F::HardBandCount => {
            super::note_words::count(v)
        }
        F::LocalPeakRatio
        | F::CentreMinusEdgesRatio
        | F::LongestLaneRatio
        | F::SideToSideRatio
        | F::LongEdgeRatio
        | F::CaliperCorrelation
        | F::WoundTensionRatio
        | F::NipToTensionRatio
        | F::CorePressureRatio
        | F::PeakPressureCrushRatio
        | F::MdCompressionStrengthRatio
        | F::MdTensionStrengthRatio
        | F::UnwindTensionSwingRatio
        | F::UnwindStressStrengthRatio
        | F::AirFilmRoughnessRatio
        | F::AirTensionLossRatio => format!("{v:.3}"),
    }
}

/// What a profile measures, in words.
pub fn measure(m: crate::case::Measure) -> &'static str {
    match m {
        crate::case::Measure::Hardness => "hardness",
        crate::case::Measure::Diameter => "diameter",
        crate::case::Measure::Caliper => "caliper",
        crate::case::Measure::Tension => "web tension at winding",
        crate::case::Measure::Moisture => "web moisture at winding",
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

#[cfg(test)]
mod tests {
    use super::*;

    /// A pressure change keeps the significant digits of the values it is the difference of
    /// (a slack roll's 0.007779 -> 0.006878 kPa is a change of -0.0009014 kPa, not "-0.0 kPa").
    #[test]
    fn a_pressure_change_keeps_its_digits() {
        let q = Quantity::SurfacePressureKpa;
        assert_eq!(quantity_value(q, 0.007779, System::Si), "0.007779 kPa");
        assert_eq!(quantity_change(q, -0.0009014, System::Si), "-0.0009014 kPa");
        assert_eq!(quantity_change(q, 4.2, System::Si), "+4.200 kPa");
        assert_eq!(quantity_change(q, 0.0, System::Si), "0 kPa");
        assert_eq!(quantity_change(q, -0.0004, System::Si), "-0.0004000 kPa");
    }
}
