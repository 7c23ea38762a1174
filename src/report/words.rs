//! Words for the vocabulary: defects, causes and the notes a diagnosis implies. Every `match` is
//! exhaustive, so a new word does not compile until it has its text here.

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
    let dv = if dv.abs() < 5e-4 { 0.0 } else { dv };
    match (q, quantity_si(q, dv)) {
        (_, Some(si)) => units::signed(si, Kind::Pressure, sys, false, 1),
        (Quantity::DiameterRidgePerMille | Quantity::BandDiameterPerMille, _) => {
            format!("{dv:+.2} per mille")
        }
        _ => format!("{dv:+.3} {}", units::strain_label(sys)),
    }
}

/// A source's share as a percentage ("93 %"; "-" when there is no change to share; a share that
/// rounds to zero without a sign).
pub fn share(x: Option<f64>) -> String {
    match x {
        Some(x) if (x * 100.0).abs() < 0.5 => "0 %".into(),
        Some(x) => format!("{:.0} %", x * 100.0),
        None => "-".into(),
    }
}

/// Whether a correction improves its finding's quantity, in words.
pub fn improves(i: Option<bool>) -> &'static str {
    match i {
        Some(true) => "yes",
        Some(false) => "no: not recommended",
        None => "not run",
    }
}

/// How root causes are attributed, said whenever they were.
pub const SHARES_METHOD: &str = "each source's share is its Shapley value (Shapley 1953) over every subset of source removals, on the finding's own quantity: independent of the order of removal, interactions shared evenly, and the shares add up to the change with every source removed (a source that works against the finding has a negative share, and then the others' add up to more than 100 %); web tension, nip, speed and storage time amplify a non-uniformity without making one, so they are shown as the quantity at a feasible alternative";

/// The diagnosis's notes with the notes its results imply, sorted, each once (warnings are
/// apart: [`warnings`]).
pub fn notes(d: &Diagnosis) -> Vec<String> {
    let mut n = note_json(&[], &d.notes).0;
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

/// The diagnosis's warnings: the case's own, then every physical limit a stage passed.
pub fn warnings(d: &Diagnosis) -> Vec<String> {
    note_json(&d.case_warnings, &d.notes).1
}

/// A stage's notes as output lines: `warning: ...` for the case's warnings and the physical
/// limits passed, then `note: ...` for the rest.
pub fn note_lines(case_warnings: &[String], notes: &[Note]) -> Vec<String> {
    let (info, warn) = note_json(case_warnings, notes);
    let warn = warn.into_iter().map(|w| format!("warning: {w}"));
    warn.chain(info.into_iter().map(|n| format!("note: {n}")))
        .collect()
}

/// A stage's notes in words, apart: `(notes, warnings)`, the warnings with the case's own first.
pub fn note_json(case_warnings: &[String], notes: &[Note]) -> (Vec<String>, Vec<String>) {
    let mut w = case_warnings.to_vec();
    w.extend(notes.iter().filter(|n| n.is_warning()).map(note));
    let n = notes.iter().filter(|n| !n.is_warning()).map(note).collect();
    (n, w)
}

/// The sentence of a [`Note::PosteriorCut`].
fn posterior_cut(lanes: usize, position_m: f64) -> String {
    format!(
        "the creep posterior of {lanes} lane(s) (the first at {:.0} mm) reaches past the widest grid it is integrated on: its tails are left out, so the spread of those lanes' creep scales, and of what rests on them, is understated",
        position_m * 1e3
    )
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
        Note::LanesCount { asked, lanes } => format!(
            "lanes.count = {asked} gives {lanes} lanes: each edge lane is made 25 mm wide (a strip split off one wider than two strips, else the excess given to its neighbour), because moisture exchange through the ends and the edge tension act in the outer centimetres"
        ),
        Note::LanesCoarse { .. } => super::note_words::lanes_coarse(n),
        Note::BelowNoiseFloor { .. }
        | Note::OnProfileNoise { .. }
        | Note::Unlikely { .. }
        | Note::OnCaliperCrown { .. }
        | Note::Resolution { .. }
        | Note::LaneNotExplained { .. }
        | Note::RollNotExplained { .. }
        | Note::FindingOnWeakLanes { .. } => super::note_words::confidence_note(n),
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
        Note::PosteriorCut { lanes, position_m } => posterior_cut(lanes, position_m),
        Note::OneAge => format!("all measurements are at one age: creep parameters cannot be identified and stay at the roll's prior (grade values, within a factor of {:.0} at one sigma); the lanes' lengths at unwind and the findings' probabilities carry that width", crate::fit::POOLED_PRIOR_SD_LN.exp()),
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
        Note::Limit(l) => limit(&l),
        Note::WindingDiameter(m) => super::note_words::winding_diameter(&m),
        Note::SurveyContradicts { .. } => super::note_words::survey_contradicts(n),
    }
}

/// What a passed limit means for the results, in the limits' sentences.
pub(super) const SO: &str = "results that depend on it are not physical; check the inputs";

/// A physical limit passed, as a sentence that says what it means for the findings.
pub fn limit(l: &crate::note::Limit) -> String {
    use crate::note::{Limit, Strength};
    match *l {
        Limit::AboveLiftOff {
            speed_m_s,
            lift_off_m_s,
        } => format!(
            "the winding speed {speed_m_s:.1} m/s is above the lift-off speed {} m/s at the winder's least stress over the build (web tension and nip part): outer layers could not stay on the roll as modelled; {SO}",
            crate::units::sig(lift_off_m_s, 3)
        ),
        Limit::Condensation(c) => condensation(&c),
        Limit::FlatContact { .. }
        | Limit::AirFloats { .. }
        | Limit::UnwindTension { .. }
        | Limit::CorePressure { .. } => {
            super::note_words::unwind_limit(l)
        }
        Limit::Strength {
            which,
            lanes,
            position_m,
            value_pa,
            limit_pa,
        } => {
            let (what, limit, field) = match which {
                Strength::ZdCrush => ("interlayer pressure", "the stack's crush limit", "material.strength.zd_crush"),
                Strength::MdCompression => ("MD compression", "the web's MD compressive strength: layers can buckle (starring)", "material.strength.md_compressive"),
                Strength::MdTension => ("MD tension", "the web's MD tensile strength: wraps can split", "material.strength.md_tensile"),
                Strength::CoreCollapse => ("pressure on the core", "the core's collapse pressure (its rating, else thin-ring buckling)", "roll.core"),
            };
            format!(
                "{}: {what} of {} MPa is {:.2} times {limit} ({} MPa); check {field} and the winding, or treat the roll with care",
                at(lanes, position_m),
                units::sig(value_pa / 1e6, 4),
                value_pa / limit_pa,
                units::sig(limit_pa / 1e6, 4)
            )
        }
        Limit::StackCrushed {
            lanes,
            position_m,
            pressure_pa,
            strain,
        } => format!(
            "{}: the stack law compresses the stack by {:.0} % at {:.2} MPa, more than the sheet's void content allows ({:.0} %); {SO} (material.stack)",
            at(lanes, position_m),
            strain * 100.0,
            pressure_pa / 1e6,
            crate::limits::MAX_STACK_STRAIN * 100.0
        ),
        Limit::DiameterInsideCore {
            lanes,
            position_m,
            diameter_m,
            core_diameter_m,
        } => format!(
            "{}: the diameter falls to {:.1} mm, at or inside the {:.1} mm core; {SO}",
            at(lanes, position_m),
            diameter_m * 1e3,
            core_diameter_m * 1e3
        ),
        Limit::MoistureAboveSaturation {
            lanes,
            position_m,
            moisture_pct,
            saturation_pct,
        } => format!(
            "{}: moisture reaches {moisture_pct:.2} %, above the isotherm's saturation {saturation_pct:.2} %; {SO} (material.sorption, storage)",
            at(lanes, position_m)
        ),
        Limit::HardnessBelowScale { .. } | Limit::HardnessNotFinite { .. } => {
            super::note_words::hardness_limit(l)
        }
        Limit::LooseOuterWraps { .. } => loose_wraps(l),
    }
}

/// The loose-outer-wraps limit as a sentence (the other limits: [`limit`]).
fn loose_wraps(l: &crate::note::Limit) -> String {
    use crate::note::Limit;
    let Limit::LooseOuterWraps {
        lanes,
        position_m,
        depth_m,
        time_s,
        end_depth_m,
    } = *l
    else {
        return limit(l);
    };
    let end = if end_depth_m > 0.0 {
        format!(
            ", and still to {:.1} mm at the end of storage: they are loose",
            end_depth_m * 1e3
        )
    } else {
        ": they were loose for a time (by the end of storage the model has them pressed on again)"
            .to_string()
    };
    format!(
        "{}: in storage the outer wraps lose all interlayer pressure, at most to {:.1} mm below the barrel (on day {:.1}; depth to the model's radial cells){end}. Wound layers cannot pull on one another: where these wraps would lift off (they swell, the stack beneath them shrinks as it dries, or creep relaxes their hoop tension) the model holds them on at zero pressure, so there the diameter can be larger, and the surface read softer, than predicted",
        at(lanes, position_m),
        depth_m * 1e3,
        time_s / crate::units::DAY_S
    )
}

/// Which lanes passed a limit: the one, or how many and the worst.
pub(super) fn at(lanes: u32, position_m: f64) -> String {
    match lanes {
        1 => format!("lane at {:.0} mm", position_m * 1e3),
        n => format!("{n} lanes (worst at {:.0} mm)", position_m * 1e3),
    }
}

/// A condensation warning as a sentence.
fn condensation(c: &crate::note::Condensed) -> String {
    let crate::note::Condensed {
        stretch,
        roll_k,
        dew_point_k,
        wet_s,
        water_kg_m2,
        outer_rise_pct,
        barrel,
        ends,
    } = *c;
    format!(
            "storage stretch {}: the roll came in at {:.1} C, below the air's dew point {:.1} C: water condenses on the {} for about {:.0} min ({:.0} g/m2, up to {:+.1} points of moisture in the outer 2 mm of wraps); the model puts it into the paper at the wet faces as the stretch begins (outer wraps and end cells), so the diagnosis includes it. Let rolls warm up wrapped in film before unwrapping (common practice)",
            stretch + 1,
            roll_k - crate::units::ZERO_C_K,
            dew_point_k - crate::units::ZERO_C_K,
            match (barrel, ends) {
                (true, true) => "barrel and end faces",
                (true, false) => "barrel",
                _ => "end faces",
            },
            wet_s / 60.0,
            water_kg_m2 * 1e3,
            outer_rise_pct
        )
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
