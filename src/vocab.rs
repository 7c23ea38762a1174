//! The shared vocabulary: features of a predicted roll, corrections (model changes), the trade's
//! defects, rule likelihoods and the causes a diagnosis attributes. Each is an enum named in files
//! and JSON by its snake_case word; `rules`, `diagnose` and `report` refer to them by type, so a
//! new word is checked by the compiler wherever it must be handled.
//!
//! **Invariant:** imports nothing of the crate; no prose beyond the features' meanings (what a
//! rule author reads in `rollsleuth rules features`).

use serde::{Deserialize, Serialize, Serializer};
use std::fmt;
use std::ops::Index;

/// An enum whose variants are named by snake_case words (serde uses the same words).
macro_rules! words {
    ($(#[$m:meta])* pub enum $name:ident { $($(#[$vm:meta])* $var:ident = $word:literal,)* }) => {
        $(#[$m])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
        pub enum $name {
            $($(#[$vm])* #[serde(rename = $word)] $var,)*
        }

        impl $name {
            /// Every variant, in declaration order.
            pub const ALL: &'static [$name] = &[$($name::$var),*];

            /// The word naming this variant in files and JSON.
            pub const fn word(self) -> &'static str {
                match self {
                    $($name::$var => $word,)*
                }
            }

            /// The variant named by `word`, if any.
            pub fn from_word(word: &str) -> Option<Self> {
                Self::ALL.iter().copied().find(|v| v.word() == word)
            }
        }

        impl fmt::Display for $name {
            fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str(self.word())
            }
        }
    };
}

words! {
    /// Defects of the trade, named in case files (what the complainant saw) and rule tables.
    pub enum Defect {
        BaggyLane = "baggy_lane",
        BaggyCenter = "baggy_center",
        BaggyEdges = "baggy_edges",
        /// One edge long against the web inward of it (a thick edge on one side): that edge runs
        /// slack at unwind.
        BaggyOneEdge = "baggy_one_edge",
        Puckers = "puckers",
        Ridges = "ridges",
        Corrugations = "corrugations",
        GaugeBands = "gauge_bands",
        Starring = "starring",
        CrepeWrinkles = "crepe_wrinkles",
        Telescoping = "telescoping",
        Bursts = "bursts",
        /// The core crushed or went out of round under the wound roll's pressure.
        CoreCollapse = "core_collapse",
        /// Layers crushed (permanent caliper loss, blocking) by excessive interlayer pressure.
        CrushedLayers = "crushed_layers",
        /// One side of the roll wound longer than the other (a wedge across the width): the web
        /// runs slack on one side and walks at unwind.
        ConicalRoll = "conical_roll",
        /// A flat left by storage on the side: a once-per-turn swing of web tension at unwind
        /// (registration faults, breaks).
        OutOfRound = "out_of_round",
        /// Air wound in with the web bleeds out and leaves the outer wraps loose (telescoping,
        /// shifting layers).
        LooseOuterWraps = "loose_outer_wraps",
        /// The complainant saw no defect.
        NoDefect = "none",
    }
}

const DEFECT_COUNT: usize = Defect::ALL.len();

/// Defect words accepted in case files and rule tables, in [`Defect::ALL`] order.
pub const WORDS: &[&str] = &{
    let mut w = [""; DEFECT_COUNT];
    let mut i = 0;
    while i < DEFECT_COUNT {
        w[i] = Defect::ALL[i].word();
        i += 1;
    }
    w
};

words! {
    /// Model changes a correction may ask for; `diagnose::actions::apply` re-runs each.
    pub enum Action {
        FlattenCaliper = "flatten_caliper",
        /// Bring the finding's lanes to the caliper of the web beside them; the rest of the
        /// profile as it is.
        EvenCaliperLocally = "even_caliper_locally",
        ScaleTension = "scale_tension",
        TaperTension = "taper_tension",
        /// Raise the start of the winder's tension and taper it to `factor` of the start at full
        /// diameter, keeping the winder's mean tension over the web length.
        RaiseStartAndTaper = "raise_start_and_taper",
        ScaleNip = "scale_nip",
        FilmWrap = "film_wrap",
        StoreAtEquilibrium = "store_at_equilibrium",
        /// Make the paper at the moisture in equilibrium with the pressroom (the last storage
        /// stretch's humidity).
        MakeAtPressroomEquilibrium = "make_at_pressroom_equilibrium",
        KeepWrappedUntilUse = "keep_wrapped_until_use",
        ShortenStorage = "shorten_storage",
        SlitOut = "slit_out",
        /// Store the rolls on end (every stretch).
        StoreOnEnd = "store_on_end",
        /// Turn rolls stored on their side at regular intervals: `factor` is the share of the
        /// time one contact line bears the weight (0.25: quarter turns, four lines).
        TurnRolls = "turn_rolls",
        /// Scale the converter's unwind speed.
        ScaleUnwindSpeed = "scale_unwind_speed",
        /// Scale the winding speed.
        ScaleWindingSpeed = "scale_winding_speed",
        /// Wind with a nip (a lay-on roll) of `factor` times the web tension at mid-build, or
        /// keep the present nip when it is heavier.
        AddNip = "add_nip",
        /// Make the web even across the width before it is wound: the tension and moisture
        /// profiles at winding flat at their means.
        EvenWebProfile = "even_web_profile",
    }
}

impl Action {
    /// Whether the action scales something and so needs a `factor` in a rule table.
    pub const fn needs_factor(self) -> bool {
        match self {
            Action::ScaleTension
            | Action::TaperTension
            | Action::RaiseStartAndTaper
            | Action::ScaleNip
            | Action::ShortenStorage
            | Action::TurnRolls
            | Action::ScaleUnwindSpeed
            | Action::ScaleWindingSpeed
            | Action::AddNip => true,
            Action::FlattenCaliper
            | Action::EvenCaliperLocally
            | Action::FilmWrap
            | Action::StoreAtEquilibrium
            | Action::MakeAtPressroomEquilibrium
            | Action::KeepWrappedUntilUse
            | Action::SlitOut
            | Action::StoreOnEnd
            | Action::EvenWebProfile => false,
        }
    }
}

words! {
    /// How likely a rule's defect is when its conditions hold.
    pub enum Likelihood {
        High = "high",
        Medium = "medium",
        Low = "low",
    }
}

impl Likelihood {
    /// Rank of the grade, higher more likely: high 2, medium 1, low 0.
    pub const fn rank(self) -> u8 {
        match self {
            Likelihood::High => 2,
            Likelihood::Medium => 1,
            Likelihood::Low => 0,
        }
    }

    /// Weight of a rule's label, which breaks ties between findings of the same graded
    /// likelihood and probability (common practice: ordinal, high first).
    pub const fn weight(self) -> f64 {
        match self {
            Likelihood::High => 0.8,
            Likelihood::Medium => 0.5,
            Likelihood::Low => 0.25,
        }
    }
}

words! {
    /// Sources of non-uniformity across the width that attribution shares a finding's quantity
    /// among (Shapley values over their removals).
    pub enum Cause {
        CaliperProfile = "caliper_profile",
        /// Moisture gradients from the storage humidity and the wraps.
        StorageMoisture = "storage_moisture",
        /// Lane-to-lane creep differences that the measurements identify.
        LaneToLaneCreep = "lane_to_lane_creep",
        /// The web's own profile as it came to the winder (tension and moisture profiles
        /// measured at winding): a web born baggy, not made so by the roll.
        WebProfile = "web_profile",
    }
}

words! {
    /// Settings that amplify a non-uniformity without causing one; reported as sensitivities at
    /// a feasible alternative.
    pub enum Amplifier {
        WebTension = "web_tension",
        Nip = "nip",
        Speed = "speed",
        StorageTime = "storage_time",
    }
}

words! {
    /// The quantity a finding is judged on; each word carries its unit.
    pub enum Quantity {
        /// The finding's lane over the width-weighted mean lane at unwind.
        LaneExcessMmPerM = "lane_excess_mm_per_m",
        /// The finding's lane over the web 75-300 mm either side of it at unwind.
        LocalPeakMmPerM = "local_peak_mm_per_m",
        /// Centre half minus the outermost lanes at unwind.
        CentreMinusEdgesMmPerM = "centre_minus_edges_mm_per_m",
        /// Outermost lanes minus the centre half at unwind.
        EdgesMinusCentreMmPerM = "edges_minus_centre_mm_per_m",
        /// Largest MD compressive stress in the inner third of the wound roll.
        CoreMdCompressionMpa = "core_md_compression_mpa",
        /// Lowest interlayer pressure at the surface after storage.
        SurfacePressureKpa = "surface_pressure_kpa",
        /// Largest MD stress in the outer wrap after storage.
        OuterMdStressMpa = "outer_md_stress_mpa",
        /// The finding's lane diameter over the web's 75-300 mm either side of it, per mille.
        DiameterRidgePerMille = "diameter_ridge_per_mille",
        /// The gauge band's lanes' diameter over the web's 75-300 mm beside them (one side only
        /// at an edge), per mille: a band may lie at an edge, where no ridge is counted.
        BandDiameterPerMille = "band_diameter_per_mille",
        /// Largest minus smallest lane at unwind.
        SpreadMmPerM = "spread_mm_per_m",
        /// Largest interlayer pressure in the finding's lanes at winding.
        PeakPressureMpa = "peak_pressure_mpa",
        /// Largest interlayer pressure on the core at winding.
        CorePressureMpa = "core_pressure_mpa",
        /// Front-to-back difference of the robust straight line through the lanes at unwind.
        SideToSideMmPerM = "side_to_side_mm_per_m",
        /// The longer edge strip's excess over the web 75-300 mm inward of it at unwind, less the
        /// other's where that is long too.
        LongEdgeMmPerM = "long_edge_mm_per_m",
        /// Amplitude of the once-per-turn swing of web stress at unwind (tension over caliper).
        UnwindStressSwingMpa = "unwind_stress_swing_mpa",
        /// Lowest mean interlayer pressure of the outer 25 mm at winding (higher is better).
        OuterZonePressureKpa = "outer_zone_pressure_kpa",
    }
}

impl Quantity {
    /// Whether a lower value is better (all but the surface pressure).
    pub const fn lower_is_better(self) -> bool {
        !matches!(
            self,
            Quantity::SurfacePressureKpa | Quantity::OuterZonePressureKpa
        )
    }

    /// Whether the quantity is read off the wound roll at winding, before any creep in storage
    /// (so the lanes' creep scales do not enter it).
    pub const fn at_winding(self) -> bool {
        matches!(
            self,
            Quantity::DiameterRidgePerMille
                | Quantity::BandDiameterPerMille
                | Quantity::PeakPressureMpa
                | Quantity::CorePressureMpa
                | Quantity::CoreMdCompressionMpa
                | Quantity::OuterZonePressureKpa
        )
    }

    /// The quantity's unit as written in JSON fields.
    pub const fn unit(self) -> &'static str {
        match self {
            Quantity::LaneExcessMmPerM
            | Quantity::LocalPeakMmPerM
            | Quantity::CentreMinusEdgesMmPerM
            | Quantity::EdgesMinusCentreMmPerM
            | Quantity::SpreadMmPerM
            | Quantity::SideToSideMmPerM
            | Quantity::LongEdgeMmPerM => "mm_per_m",
            Quantity::CoreMdCompressionMpa
            | Quantity::OuterMdStressMpa
            | Quantity::PeakPressureMpa
            | Quantity::CorePressureMpa
            | Quantity::UnwindStressSwingMpa => "mpa",
            Quantity::SurfacePressureKpa | Quantity::OuterZonePressureKpa => "kpa",
            Quantity::DiameterRidgePerMille | Quantity::BandDiameterPerMille => "per_mille",
        }
    }
}

words! {
    /// Features of the predicted roll that rules may test.
    pub enum Feature {
        RunningStrainMmPerM = "running_strain_mm_per_m",
        LocalPeakRatio = "local_peak_ratio",
        CentreMinusEdgesRatio = "centre_minus_edges_ratio",
        LongestLaneRatio = "longest_lane_ratio",
        SpreadMmPerM = "spread_mm_per_m",
        LongestLaneExcessMmPerM = "longest_lane_excess_mm_per_m",
        LocalPeakMmPerM = "local_peak_mm_per_m",
        PeakWidthMm = "peak_width_mm",
        CentreMinusEdgesMmPerM = "centre_minus_edges_mm_per_m",
        SideToSideMmPerM = "side_to_side_mm_per_m",
        SideToSideRatio = "side_to_side_ratio",
        LongEdgeMmPerM = "long_edge_mm_per_m",
        LongEdgeRatio = "long_edge_ratio",
        BandCount = "band_count",
        CaliperCorrelation = "caliper_correlation",
        CaliperRangePct = "caliper_range_pct",
        MoistureShare = "moisture_share",
        CreepShare = "creep_share",
        CoreMdStressMpa = "core_md_stress_mpa",
        SurfacePressureEndKpa = "surface_pressure_end_kpa",
        SurfacePressureLossPct = "surface_pressure_loss_pct",
        OuterMdStressEndMpa = "outer_md_stress_end_mpa",
        EdgeMoistureChangePct = "edge_moisture_change_pct",
        MoistureChangePct = "moisture_change_pct",
        WoundTensionRatio = "wound_tension_ratio",
        DiameterRidgePerMille = "diameter_ridge_per_mille",
        NipToTensionRatio = "nip_to_tension_ratio",
        HardBandCount = "hard_band_count",
        SlackLanes = "slack_lanes",
        CorePressureRatio = "core_pressure_ratio",
        PeakPressureCrushRatio = "peak_pressure_crush_ratio",
        MdCompressionStrengthRatio = "md_compression_strength_ratio",
        MdTensionStrengthRatio = "md_tension_strength_ratio",
        OuterMoistureLossPct = "outer_moisture_loss_pct",
        PaperGrade = "paper_grade",
        RunOutMm = "run_out_mm",
        UnwindTensionSwingRatio = "unwind_tension_swing_ratio",
        UnwindStressStrengthRatio = "unwind_stress_strength_ratio",
        AirFilmRoughnessRatio = "air_film_roughness_ratio",
        AirTensionLossRatio = "air_tension_loss_ratio",
        WebLengthShare = "web_length_share",
    }
}

/// What a feature means and the range it can take (lint flags conditions outside it).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FeatureSpec {
    /// Unit and meaning, for rule authors.
    pub meaning: &'static str,
    pub min: f64,
    pub max: f64,
    /// Whether the value is a length difference in mm per m of web.
    pub is_length: bool,
}

const INF: f64 = f64::INFINITY;

const fn spec(meaning: &'static str, min: f64, max: f64, is_length: bool) -> FeatureSpec {
    FeatureSpec {
        meaning,
        min,
        max,
        is_length,
    }
}

impl Feature {
    /// Number of features.
    pub const COUNT: usize = Feature::ALL.len();

    /// Meaning and range.
    pub const fn spec(self) -> FeatureSpec {
        use Feature as F;
        match self {
            F::RunningStrainMmPerM => spec("the web's running strain T/(E c) at the converting tension, mm/m (a lane longer than this runs slack)", 0.0, INF, true),
            F::LocalPeakRatio => spec("local_peak_mm_per_m over the running strain", -INF, INF, false),
            F::CentreMinusEdgesRatio => spec("centre_minus_edges_mm_per_m over the running strain (positive: baggy centre)", -INF, INF, false),
            F::LongestLaneRatio => spec("longest_lane_excess_mm_per_m over the running strain", 0.0, INF, false),
            F::SpreadMmPerM => spec("largest minus smallest lane length at unwind, mm per m of web", 0.0, INF, true),
            F::LongestLaneExcessMmPerM => spec("longest lane minus the width-weighted mean lane, mm/m", 0.0, INF, true),
            F::LocalPeakMmPerM => spec("largest excess of an inner lane (not an outermost lane) over the web 75-300 mm from its centre (the mean of the two sides, each width-weighted; one side at a roll end), mm/m", -INF, INF, true),
            F::PeakWidthMm => spec("width of the long band around the longest lane, mm", 0.0, INF, false),
            F::CentreMinusEdgesMmPerM => spec("centre half (its width-weighted median) minus the mean of the outermost lane each side where both lie on one side of it (0 where they lie on opposite sides), mm/m (positive: baggy centre)", -INF, INF, true),
            F::SideToSideRatio => spec("front-to-back difference of a robust straight line (Theil-Sen) over the web's running strain T/(E h)", 0.0, INF, false),
            F::SideToSideMmPerM => spec("front-to-back difference of a robust straight line (Theil-Sen), absolute, mm/m", 0.0, INF, true),
            F::LongEdgeMmPerM => spec("larger excess of an outermost lane (the 25 mm edge strip) over the web 75-300 mm inward of it, less the other's where that is long too (one edge long, the other not), mm/m (0 below five lanes)", -INF, INF, true),
            F::LongEdgeRatio => spec("long_edge_mm_per_m over the web's running strain T/(E h)", -INF, INF, false),
            F::BandCount => spec("number of long bands (local peaks over 0.3 mm/m prominent)", 0.0, INF, false),
            F::CaliperCorrelation => spec("correlation of lane caliper with lane length at unwind, each lane weighted by its width, -1..1", -1.0, 1.0, false),
            F::CaliperRangePct => spec("thickest minus thinnest lane caliper, % of mean", 0.0, INF, false),
            F::MoistureShare => spec("share of the lane-to-lane length differences made in the roll (integrated over the width; the web's own profile at winding taken out) from hygroexpansion, 0..1", 0.0, 1.0, false),
            F::CreepShare => spec("share of the lane-to-lane length differences made in the roll (integrated over the width; the web's own profile at winding taken out) from creep, 0..1", 0.0, 1.0, false),
            F::WebLengthShare => spec("share of the longest lane's excess over the mean lane that the web brought to the winder (its own length from the tension profile at winding), 0..1", 0.0, 1.0, false),
            F::CoreMdStressMpa => spec("most compressive MD stress in the inner third at winding, MPa (negative: compression)", -INF, INF, false),
            F::SurfacePressureEndKpa => spec("interlayer pressure in the outer 25 mm at the end of storage, width-weighted mean over the lanes (friction over the whole width resists axial slip), kPa", 0.0, INF, false),
            F::SurfacePressureLossPct => spec("loss over storage of the surface-zone pressure integrated over the width (friction over the whole face resists slip), %", -INF, 100.0, false),
            F::OuterMdStressEndMpa => spec("highest MD stress in the outer wraps at the end of storage, MPa", -INF, INF, false),
            F::EdgeMoistureChangePct => spec("moisture change of the edge lanes minus the centre lanes, points", -INF, INF, false),
            F::MoistureChangePct => spec("largest change of a lane's mean moisture over storage, points (absolute)", 0.0, INF, false),
            F::WoundTensionRatio => spec("highest over lowest lane wound-in tension", 1.0, INF, false),
            F::DiameterRidgePerMille => spec("largest diameter of an inner lane (not an outermost lane) at winding over the web 75-300 mm from its centre (the mean of the two sides, each width-weighted; one side at a roll end), per mille of diameter", 0.0, INF, false),
            F::NipToTensionRatio => spec("friction x nip load over web tension", 0.0, INF, false),
            F::HardBandCount => spec("number of hard rings wound in (lanes with a local peak of wound-in tension 10 % over the mean lane)", 0.0, INF, false),
            F::SlackLanes => spec("lanes longer than the mean lane by over 0.5 mm/m", 0.0, INF, false),
            F::CorePressureRatio => spec("highest mean interlayer pressure on the core over a window of the core's ring-load decay length pi/beta (Timoshenko and Woinowsky-Krieger 1959; the whole width for a rigid core) over the core's collapse pressure (maker's rating or thin-ring buckling); 0 for a rigid core without a rating", 0.0, INF, false),
            F::PeakPressureCrushRatio => spec("highest wound-in interlayer pressure over the stack's ZD crush limit", 0.0, INF, false),
            F::MdCompressionStrengthRatio => spec("most compressive MD stress at winding over the MD compressive strength (0: no compression)", 0.0, INF, false),
            F::MdTensionStrengthRatio => spec("highest MD stress in the outer wraps at the end of storage over the MD tensile strength", -INF, INF, false),
            F::OuterMoistureLossPct => spec("largest moisture loss of a lane's outer wraps (outer third of the web length) over storage, points (negative: gained moisture)", -INF, INF, false),
            F::RunOutMm => spec("radial run-out at unwind left by storage on the side (the flat's depth after recovery), mm; 0 for a roll stored on end", 0.0, INF, false),
            F::UnwindTensionSwingRatio => spec("amplitude of the once-per-turn tension swing at the converter's speed over the converting tension", 0.0, INF, false),
            F::UnwindStressStrengthRatio => spec("peak web stress at unwind (converting tension plus the swing, over caliper) over the MD tensile strength", 0.0, INF, false),
            F::AirFilmRoughnessRatio => spec("air film entrained at full diameter (Knox-Sweeney, squeezed by a nip) over the combined roughness of two faces", 0.0, INF, false),
            F::AirTensionLossRatio => spec("wound-in tension lost to entrained air at full diameter over the web tension there, 0..1", 0.0, INF, false),
            F::PaperGrade => spec("1 for a paper grade (newsprint, coated, board, or a custom grade with MD hygroexpansion), 0 for film", 0.0, 1.0, false),
        }
    }
}

/// A value for every feature, indexed by [`Feature`]. Serialized as a map from feature word to
/// value, in the words' alphabetical order.
#[derive(Debug, Clone, PartialEq)]
pub struct FeatureValues([f64; Feature::COUNT]);

impl FeatureValues {
    /// Values from a function of the feature (use an exhaustive `match` so that a new feature
    /// must be given a value).
    pub fn from_fn(mut value: impl FnMut(Feature) -> f64) -> Self {
        let mut v = [0.0; Feature::COUNT];
        for &f in Feature::ALL {
            v[f as usize] = value(f);
        }
        FeatureValues(v)
    }

    /// (feature, value) pairs in the alphabetical order of the feature words.
    pub fn by_word(&self) -> Vec<(Feature, f64)> {
        let mut all: Vec<(Feature, f64)> = Feature::ALL.iter().map(|&f| (f, self[f])).collect();
        all.sort_by_key(|(f, _)| f.word());
        all
    }
}

impl Index<Feature> for FeatureValues {
    type Output = f64;
    fn index(&self, f: Feature) -> &f64 {
        &self.0[f as usize]
    }
}

impl Serialize for FeatureValues {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_map(self.by_word().into_iter().map(|(f, v)| (f.word(), v)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The serde name of every variant is its word, and the words round-trip.
    #[test]
    fn serde_words_match_the_vocabulary() {
        fn check<T: Serialize + for<'de> Deserialize<'de> + PartialEq + fmt::Debug + Copy>(
            all: &[T],
            word: fn(T) -> &'static str,
        ) {
            for &v in all {
                let j = serde_json::to_string(&v).unwrap();
                assert_eq!(j, format!("\"{}\"", word(v)));
                let back: T = serde_json::from_str(&j).unwrap();
                assert_eq!(back, v);
            }
        }
        check(Defect::ALL, Defect::word);
        check(Action::ALL, Action::word);
        check(Likelihood::ALL, Likelihood::word);
        check(Cause::ALL, Cause::word);
        check(Amplifier::ALL, Amplifier::word);
        check(Quantity::ALL, Quantity::word);
        check(Feature::ALL, Feature::word);
        assert_eq!(WORDS.len(), Defect::ALL.len());
        assert_eq!(Defect::from_word("baggy_center"), Some(Defect::BaggyCenter));
        assert_eq!(Feature::from_word("lokal_peak"), None);
    }

    /// Indexing follows the declaration order of `Feature::ALL`.
    #[test]
    fn feature_values_index_by_feature() {
        let v = FeatureValues::from_fn(|f| f as usize as f64);
        for (k, &f) in Feature::ALL.iter().enumerate() {
            assert_eq!(v[f] as usize, k);
        }
    }
}
