//! Notes: what a stage noticed that the reader should know (an extrapolated lane, an assumption
//! the data forced). Stages return these as data; `report::words` turns them into sentences.
//!
//! **Invariant:** no prose here; times in s, positions in m, moduli in Pa.

use crate::case::Measure;
use crate::vocab::{Defect, Feature};
use serde::Serialize;

/// Something a stage noticed, with the numbers behind it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "note", rename_all = "snake_case")]
pub enum Note {
    /// A profile does not reach every lane: lanes outside `from_m..to_m` were extrapolated.
    Extrapolated {
        what: Measure,
        /// Age of the profile, s.
        age_s: f64,
        /// Positions covered by the profile, m from the front edge.
        from_m: f64,
        to_m: f64,
    },
    /// A dense profile and no `lanes:` given: neighbouring positions were merged into fewer lanes.
    LanesMerged {
        what: Measure,
        /// Positions in the profile.
        positions: usize,
        /// Lanes made.
        lanes: usize,
    },
    /// `lanes.count` asked for fewer lanes than were made: an edge strip was split off an edge
    /// lane wider than two strips.
    LanesCount {
        /// Lanes asked for.
        asked: usize,
        /// Lanes made.
        lanes: usize,
    },
    /// Lanes asked for (`lanes.count` or `lanes.edges`) are wider than the caliper readings'
    /// spacing: a band narrower than a lane can fall between lane centres.
    LanesCoarse {
        /// Widest inner lane, m.
        lane_m: f64,
        /// Median spacing of the densest caliper profile's readings, m.
        spacing_m: f64,
        /// Lanes over the width that are no wider than the spacing.
        enough: usize,
    },
    /// No caliper profile: lane calipers were inferred from the earliest diameter profile.
    CaliperFromDiameter,
    /// Lab creep curves set a direction's Burgers parameters.
    LabCreep {
        /// `md` or `radial`.
        direction: &'static str,
        curves: usize,
        delayed: f64,
        /// Retardation time, s.
        retardation_s: f64,
        /// Viscous time, s.
        viscous_time_s: f64,
        /// Elastic modulus, Pa.
        modulus_pa: f64,
        converged: bool,
    },
    /// Every measurement is at one age: creep cannot be identified and stays at the prior.
    OneAge,
    /// The posterior of `lanes` lanes still held mass at an edge of its grid when the grid had
    /// grown as far as it may: the tails beyond are left out, so their spread is understated.
    /// `position_m`: the first such lane's centre, m from the front edge.
    PosteriorCut { lanes: usize, position_m: f64 },
    /// A diameter profile has no winding-time diameter to compare with and is not fitted.
    DiameterWithoutReference {
        /// Age of the profile, s.
        age_s: f64,
    },
    /// Measurements reach beyond the storage history, which was extended.
    StorageExtended {
        /// Age of the last measurement, s.
        last_age_s: f64,
        /// Duration the history covers, s.
        covered_s: f64,
        /// Duration added, s.
        added_s: f64,
        /// No history was given: the added time is at the standard atmosphere, unwrapped.
        standard: bool,
    },
    /// A stage result beyond a physical limit: shown as a warning in every output.
    Limit(Limit),
    /// A rule's deciding feature does not stand above what measurement noise alone makes: no
    /// finding ([`crate::diagnose::confidence`]).
    BelowNoiseFloor {
        defect: Defect,
        feature: Feature,
        /// The feature's value, its value on the noise-free uniform roll, and the smallest
        /// |value - uniform| that stands above noise, all in the feature's own unit.
        value: f64,
        uniform: f64,
        threshold: f64,
        /// One-sided chance that measurement noise alone moves the feature this far, and the
        /// level a finding needs (5 % over the features tested).
        noise_chance: f64,
        level: f64,
        /// Which test gave the chance: the feature's own noise rolls (whose bound `threshold`
        /// is), or a test of the profile readings themselves.
        basis: NoiseBasis,
    },
    /// A finding that comes from the lanes' caliper (and tension or moisture) profiles alone,
    /// while those profiles do not stand above what measurement noise alone makes: no finding
    /// ([`crate::diagnose::confidence`]).
    OnProfileNoise {
        defect: Defect,
        feature: Feature,
        /// The deciding feature's value, and its value with the lanes' calipers and web profiles
        /// made uniform (each lane's fitted creep kept), in the feature's own unit.
        value: f64,
        flattened: f64,
        /// Chance that noise alone makes profiles as uneven as the measured ones (the smaller of
        /// the caliper readings' unevenness test and the web-profile test), and the level a
        /// profile needs to stand.
        profile_chance: f64,
        level: f64,
        /// Caliper readings kept as measured, the bands that stand out (0 where every caliper
        /// reading was made uniform), and the positions of the first and last of them, m.
        kept_readings: usize,
        kept_span_m: (f64, f64),
    },
    /// A finding stands on the caliper readings' crown, and the crown alone (every lane's creep
    /// made the lanes' mean) fires its rule (`diagnose::crown`).
    OnCaliperCrown {
        defect: Defect,
        /// The readings' parabola, centre over the outermost readings, m (negative: edges
        /// thick), and its component over the repeatability (positive: centre thick).
        crown_m: f64,
        sigmas: f64,
        /// Readings left out of the parabola as a band.
        left_out: usize,
        /// One-sided chance that noise alone crowns level readings this far, and the level the
        /// crown test must meet.
        noise_chance: f64,
        level: f64,
        /// The deciding feature, and its value with every lane's creep made the lanes' mean
        /// (feature's own unit).
        feature: Feature,
        uniform_creep: f64,
        /// The deciding feature on the noise-free uniform roll (what storage makes of a level
        /// roll), taken out of `uniform_creep` for the crown's own part.
        storage_part: f64,
    },
    /// A strength limit (`Note::Limit`) passed only as the calipers (and web profiles) read,
    /// while the finding of the same state was dropped as within measurement noise
    /// ([`crate::diagnose::limit_noise`]): the readings cannot tell whether the roll is beyond
    /// it. Shown as a warning next to the limit's own.
    LimitOnNoise {
        which: Strength,
        /// The state over its limit as measured, and on the roll with level calipers (the
        /// noise-free uniform roll, or the profiles made uniform), dimensionless.
        ratio: f64,
        level_ratio: f64,
        /// Chance that measurement noise alone moves the state this far (the dropped finding's).
        noise_chance: f64,
    },
    /// A changed roll (`whatif`) passes a strength limit that the measured roll passes only on
    /// its calipers' noise ([`Note::LimitOnNoise`]): it rests on the same readings, so they
    /// cannot tell whether the changed roll is beyond it either.
    LimitOnSameReadings { which: Strength },
    /// A rule that fired on the fitted roll holds in fewer than half of the plausible states.
    Unlikely {
        defect: Defect,
        /// Share of the posterior states in which the rule holds.
        probability: f64,
    },
    /// What the measurement noise lets the diagnosis resolve.
    Resolution {
        /// One-sigma caliper repeatability, m.
        caliper_repeatability_m: f64,
        /// Smallest caliper band (lane range) that stands above the noise, m.
        band_m: f64,
        /// Smallest lane excess over the web around it (`diagnose::local::baseline`) that
        /// stands above the noise, mm per m of web.
        lane_excess_mm_per_m: f64,
        /// Smallest centre-minus-edges length difference that does, mm/m.
        centre_edges_mm_per_m: f64,
        /// Smallest crown of the caliper readings (centre over the outermost readings, either
        /// sign) that stands above noise, m; `None` when no rule rides on it
        /// (`diagnose::crown`).
        crown_m: Option<f64>,
    },
    /// A lane's fit misfit is above 3 noise units: the model does not explain its readings.
    LaneNotExplained {
        /// Lane centre, m.
        position_m: f64,
        /// Root-mean-square residual, noise units.
        misfit: f64,
    },
    /// The roll's pooled misfit is above 3 noise units.
    RollNotExplained {
        /// Root-mean-square residual over every reading, noise units.
        misfit: f64,
    },
    /// A finding rests on lanes the model does not explain or whose creep the data do not
    /// identify (kept at the pooled value).
    FindingOnWeakLanes {
        defect: Defect,
        /// Lanes the finding names, of which not explained (misfit over 3 noise units, or a
        /// later survey contradicts the model there), of which with a scale not identified.
        lanes: usize,
        unexplained: usize,
        unidentified: usize,
    },
    /// The wound state's diameter profile disagrees with the winding-time diameter profile
    /// beyond the readings' repeatability: shown as a warning (the winding model, its lanes or
    /// its inputs do not describe this roll as wound).
    WindingDiameter(DiameterMismatch),
    /// A later survey contradicts the model with pooled creep at `lanes` lanes (`fit::contradict`):
    /// the lane's change since the first survey lies clearly on the other side of the roll's
    /// change from the prediction. The worst lane is named.
    SurveyContradicts {
        what: crate::case::Measure,
        /// Age of the survey, s.
        age_s: f64,
        lanes: usize,
        /// Worst lane's centre, m; its predicted and measured change against the roll's, and
        /// the change's one-sigma noise (hardness units, or m of diameter).
        position_m: f64,
        predicted: f64,
        measured: f64,
        sigma: f64,
    },
}

/// Predicted against measured diameter profile at winding ([`Note::WindingDiameter`]); both as
/// deviations from their own width-weighted mean, so the stated diameter does not enter.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct DiameterMismatch {
    /// Age of the measured profile, s.
    pub age_s: f64,
    /// Lanes beyond the tolerance (the worst is described).
    pub lanes: u32,
    /// Centre of the worst lane, m.
    pub position_m: f64,
    /// Predicted diameter deviation there, m.
    pub predicted_m: f64,
    /// Measured diameter deviation there, m.
    pub measured_m: f64,
    /// Tolerance on the difference, m.
    pub tolerance_m: f64,
}

/// A physical limit a stage result went beyond (checked by [`crate::limits`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "limit", rename_all = "snake_case")]
pub enum Limit {
    /// Wound faster than the speed at which a layer at the mean wound-in stress stops pressing
    /// on the roll: the wound-in state cannot hold.
    AboveLiftOff {
        /// Winding speed, m/s.
        speed_m_s: f64,
        /// Lift-off speed, m/s.
        lift_off_m_s: f64,
    },
    /// A cold roll brought into air whose dew point is above the roll's temperature: water
    /// condenses on the faces not wrapped in film until their surface warms.
    Condensation(Condensed),
    /// A wound state beyond the web's or the core's strength.
    Strength {
        which: Strength,
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// The state there (a magnitude), Pa.
        value_pa: f64,
        /// The limit, Pa.
        limit_pa: f64,
    },
    /// The pressure on the core, averaged over the core's load width
    /// ([`crate::limits::core_load`]), beyond the core's collapse pressure.
    CorePressure {
        /// The window of the highest mean, m from the front edge.
        from_m: f64,
        to_m: f64,
        /// Mean pressure on the core over it, Pa.
        pressure_pa: f64,
        /// The core's collapse pressure, Pa.
        limit_pa: f64,
    },
    /// The stack law puts a lane's stack at a compressive strain past any real void content.
    StackCrushed {
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// Highest interlayer pressure, Pa.
        pressure_pa: f64,
        /// Compressive radial strain there.
        strain: f64,
    },
    /// A lane's diameter fell to or inside the core during storage.
    DiameterInsideCore {
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// Smallest diameter, m.
        diameter_m: f64,
        /// Core outside diameter, m.
        core_diameter_m: f64,
    },
    /// A lane's moisture rose above the isotherm's saturation value.
    MoistureAboveSaturation {
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// Highest mean moisture, %.
        moisture_pct: f64,
        /// Saturation moisture (GAB at unit activity), %.
        saturation_pct: f64,
    },
    /// The outer wraps of a lane lose all interlayer pressure in storage: they are loose, and
    /// where they would lift off the model holds them on at zero pressure.
    LooseOuterWraps {
        /// Lanes with loose outer wraps (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// Depth below the barrel of the loose wraps, m (to the model's radial cells).
        depth_m: f64,
        /// When the loose zone was deepest, s since winding.
        time_s: f64,
        /// Deepest loose zone of any lane at the end of storage, m (0: all pressed on again).
        end_depth_m: f64,
    },
    /// The floor contact of a roll stored on its side is outside Hertz's small-contact theory
    /// (half-width over a quarter of the radius) or presses the stack past its crush limit.
    FlatContact {
        /// Contact half-width and roll radius, m.
        half_width_m: f64,
        radius_m: f64,
        /// Hertz peak contact pressure and the stack's ZD crush limit, Pa.
        peak_pressure_pa: f64,
        crush_pa: f64,
    },
    /// Entrained air takes away all the wound-in tension of the outer wraps: the model's
    /// wound-in tension is held at zero there (the layers float on air).
    AirFloats {
        /// Air film at full diameter and the combined roughness it must exceed, m.
        film_m: f64,
        roughness_m: f64,
    },
    /// The converting tension alone stresses the web at unwind to its MD tensile strength or
    /// beyond: the web breaks as it is pulled off the roll.
    UnwindTension {
        /// Running web stress (converting tension over caliper), Pa.
        stress_pa: f64,
        /// MD tensile strength, Pa.
        strength_pa: f64,
    },
    /// A lane's predicted hardness falls below zero, the bottom of any hardness scale: the
    /// surface zone has almost no interlayer pressure, where the log map from pressure to
    /// hardness no longer holds.
    HardnessBelowScale {
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
        /// The lowest predicted hardness, scale units.
        hardness: f64,
    },
    /// A lane's predicted hardness is not a finite number.
    HardnessNotFinite {
        /// Lanes past the limit (the worst is described).
        lanes: u32,
        /// Centre of the worst lane, m.
        position_m: f64,
    },
}

impl Limit {
    /// Whether the state is beyond what the web, the core or the model can hold (a strength,
    /// lift-off, an air film taking all the tension, a crushed stack, a diameter inside the
    /// core, moisture above saturation, a floor contact past Hertz or crush, a hardness off the
    /// scale, a converting tension past the web's strength): results resting on it are not
    /// physical. Not so for conditions real rolls meet
    /// and the model represents (condensation, loose outer wraps).
    pub fn beyond_physical(&self) -> bool {
        match self {
            Limit::AboveLiftOff { .. }
            | Limit::Strength { .. }
            | Limit::CorePressure { .. }
            | Limit::StackCrushed { .. }
            | Limit::DiameterInsideCore { .. }
            | Limit::MoistureAboveSaturation { .. }
            | Limit::FlatContact { .. }
            | Limit::AirFloats { .. }
            | Limit::HardnessBelowScale { .. }
            | Limit::HardnessNotFinite { .. }
            | Limit::UnwindTension { .. } => true,
            Limit::Condensation(_) | Limit::LooseOuterWraps { .. } => false,
        }
    }
}

/// Water condensed on a cold roll brought into warmer, humid air ([`Limit::Condensation`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Condensed {
    /// Index of the storage stretch the roll was brought into.
    pub stretch: u32,
    /// Roll temperature on arrival, K.
    pub roll_k: f64,
    /// Dew point of the new air, K.
    pub dew_point_k: f64,
    /// Time the surface stays below the dew point, s.
    pub wet_s: f64,
    /// Water condensed per unit area of exposed face, kg/m2.
    pub water_kg_m2: f64,
    /// Moisture rise of the outer 2 mm of wraps if they take it all up, percentage points.
    pub outer_rise_pct: f64,
    /// Whether the barrel and the end faces were exposed.
    pub barrel: bool,
    pub ends: bool,
}

/// Which strength a wound state is compared with.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Strength {
    /// Peak interlayer pressure against the stack's ZD crush limit.
    ZdCrush,
    /// Most compressive MD stress against the MD compressive strength (starring).
    MdCompression,
    /// Highest MD tensile stress against the MD tensile strength.
    MdTension,
    /// Interlayer pressure on the core against the core's collapse pressure.
    CoreCollapse,
}

/// Which test decided whether a finding stands above measurement noise.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum NoiseBasis {
    /// The deciding feature over the noise-only rolls (Student-t prediction bound).
    NoiseRolls,
    /// The caliper readings themselves (the band test: the highest reading over the median).
    CaliperReadings,
    /// The web's tension or moisture profile at winding (the web-profile test).
    WebProfile,
    /// The caliper readings' crown across the width (`diagnose::crown`).
    CaliperCrown,
}

/// Append the notes of `more` that `notes` does not hold yet, in order.
pub fn push_new(notes: &mut Vec<Note>, more: impl IntoIterator<Item = Note>) {
    for n in more {
        if !notes.contains(&n) {
            notes.push(n);
        }
    }
}

impl Note {
    /// Whether this note advises action on the roll: a physical limit passed, each warned of
    /// with what to check or how to treat the roll. Output carrying one carries the safety note
    /// (`report::SAFETY`), as output with findings does.
    pub fn advises_action(&self) -> bool {
        matches!(self, Note::Limit(_))
    }

    /// Whether this note is a warning (a physical limit passed, measurements the model does not
    /// explain, the wound state against the winding-time diameters, surveys past the storage
    /// history, which the model fills with an assumed stretch), not information.
    pub fn is_warning(&self) -> bool {
        matches!(
            self,
            Note::Limit(_)
                | Note::LimitOnNoise { .. }
                | Note::LimitOnSameReadings { .. }
                | Note::LaneNotExplained { .. }
                | Note::RollNotExplained { .. }
                | Note::WindingDiameter(_)
                | Note::SurveyContradicts { .. }
                | Note::StorageExtended { .. }
        ) || matches!(self, Note::FindingOnWeakLanes { unexplained, .. } if *unexplained > 0)
    }
}
