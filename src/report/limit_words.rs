//! Words for the physical limits a stage passed ([`crate::note::Limit`]), split from `words` to
//! keep each file short. Quantities are in the chosen unit system: SI as the warnings have always
//! said them, US units as [`crate::units::show`] writes them ([`super::said`]).

use super::{pos, said};
use crate::units::{self, Kind, System};

/// What a passed limit means for the results, in the limits' sentences.
pub const SO: &str = "results that depend on it are not physical; check the inputs";

/// A strength's state, its limit (with what passing it does) and the case field it comes from.
fn strength_words(which: crate::note::Strength) -> (&'static str, &'static str, &'static str) {
    use crate::note::Strength;
    match which {
        Strength::ZdCrush => (
            "interlayer pressure",
            "the stack's crush limit",
            "material.strength.zd_crush",
        ),
        Strength::MdCompression => (
            "MD compression",
            "the web's MD compressive strength: layers can buckle (starring)",
            "material.strength.md_compressive",
        ),
        Strength::MdTension => (
            "MD tension",
            "the web's MD tensile strength: wraps can split",
            "material.strength.md_tensile",
        ),
        Strength::CoreCollapse => (
            "pressure on the core",
            "the core's collapse pressure (its rating, else thin-ring buckling)",
            "roll.core",
        ),
    }
}

/// A strength's state and its limit, as [`crate::note::Note::LimitOnNoise`] says them:
/// ("pressure on the core", "the core's collapse pressure (...)").
pub fn strength_limit(which: crate::note::Strength) -> (&'static str, &'static str) {
    let (what, limit, _) = strength_words(which);
    (what, limit.split(':').next().unwrap_or(limit))
}

/// A physical limit passed, as a sentence that says what it means for the findings.
pub fn limit(l: &crate::note::Limit, sys: System) -> String {
    use crate::note::Limit;
    match *l {
        Limit::AboveLiftOff {
            speed_m_s,
            lift_off_m_s,
        } => format!(
            "the winding speed {} is above the lift-off speed {} at the winder's least stress over the build (web tension and nip part): outer layers could not stay on the roll as modelled; {SO}",
            said(sys, format!("{speed_m_s:.1} m/s"), speed_m_s, Kind::Speed, false),
            said(sys, format!("{} m/s", units::sig(lift_off_m_s, 3)), lift_off_m_s, Kind::Speed, false)
        ),
        Limit::Condensation(c) => condensation(&c, sys),
        Limit::FlatContact { .. }
        | Limit::AirFloats { .. }
        | Limit::UnwindTension { .. }
        | Limit::CorePressure { .. } => {
            super::note_words::unwind_limit(l, sys)
        }
        Limit::Strength {
            which,
            lanes,
            position_m,
            value_pa,
            limit_pa,
        } => {
            let (what, limit, field) = strength_words(which);
            let mpa = |p: f64| said(sys, format!("{} MPa", units::sig(p / 1e6, 4)), p, Kind::Pressure, false);
            format!(
                "{}: {what} of {} is {:.2} times {limit} ({}); check {field} and the winding, or treat the roll with care",
                at(lanes, position_m, sys),
                mpa(value_pa),
                value_pa / limit_pa,
                mpa(limit_pa)
            )
        }
        Limit::StackCrushed {
            lanes,
            position_m,
            pressure_pa,
            strain,
        } => format!(
            "{}: the stack law compresses the stack by {:.0} % at {}, more than the sheet's void content allows ({:.0} %); {SO} (material.stack)",
            at(lanes, position_m, sys),
            strain * 100.0,
            said(sys, format!("{:.2} MPa", pressure_pa / 1e6), pressure_pa, Kind::Pressure, false),
            crate::limits::MAX_STACK_STRAIN * 100.0
        ),
        Limit::DiameterInsideCore {
            lanes,
            position_m,
            diameter_m,
            core_diameter_m,
        } => format!(
            "{}: the diameter falls to {}, at or inside the {} core; {SO}",
            at(lanes, position_m, sys),
            said(sys, format!("{:.1} mm", diameter_m * 1e3), diameter_m, Kind::Length, false),
            said(sys, format!("{:.1} mm", core_diameter_m * 1e3), core_diameter_m, Kind::Length, false)
        ),
        Limit::MoistureAboveSaturation {
            lanes,
            position_m,
            moisture_pct,
            saturation_pct,
        } => format!(
            "{}: moisture reaches {moisture_pct:.2} %, above the isotherm's saturation {saturation_pct:.2} %; {SO} (material.sorption, storage)",
            at(lanes, position_m, sys)
        ),
        Limit::HardnessBelowScale { .. } | Limit::HardnessNotFinite { .. } => {
            hardness_limit(l, sys)
        }
        Limit::LooseOuterWraps { .. } => loose_wraps(l, sys),
    }
}

/// The loose-outer-wraps limit as a sentence (the other limits: [`limit`]).
fn loose_wraps(l: &crate::note::Limit, sys: System) -> String {
    use crate::note::Limit;
    let Limit::LooseOuterWraps {
        lanes,
        position_m,
        depth_m,
        time_s,
        end_depth_m,
    } = *l
    else {
        return limit(l, sys);
    };
    let mm = |x: f64| said(sys, format!("{:.1} mm", x * 1e3), x, Kind::Length, false);
    let end = if end_depth_m > 0.0 {
        format!(
            ", and still to {} at the end of storage: they are loose",
            mm(end_depth_m)
        )
    } else {
        ": they were loose for a time (by the end of storage the model has them pressed on again)"
            .to_string()
    };
    format!(
        "{}: in storage the outer wraps lose all interlayer pressure, at most to {} below the barrel (on day {:.1}; depth to the model's radial cells){end}. Wound layers cannot pull on one another: where these wraps would lift off (they swell, the stack beneath them shrinks as it dries, or creep relaxes their hoop tension) the model holds them on at zero pressure, so there the diameter can be larger, and the surface read softer, than predicted",
        at(lanes, position_m, sys),
        mm(depth_m),
        time_s / crate::units::DAY_S
    )
}

/// Which lanes passed a limit: the one, or how many and the worst.
fn at(lanes: u32, position_m: f64, sys: System) -> String {
    match lanes {
        1 => format!("lane at {}", pos(position_m, sys)),
        n => format!("{n} lanes (worst at {})", pos(position_m, sys)),
    }
}

/// The predicted-hardness limits as sentences (the other limits: [`limit`]).
fn hardness_limit(l: &crate::note::Limit, sys: System) -> String {
    use crate::note::Limit;
    match *l {
        Limit::HardnessBelowScale {
            lanes,
            position_m,
            hardness,
        } => format!(
            "{}: the predicted hardness falls to {hardness:.1}, below the bottom of any hardness scale: the surface zone has almost no interlayer pressure, where the map H = a + b ln P no longer holds, so a reading there is judged against the scale's bottom (0): one well above it says the model misses there (hardness.calibration)",
            at(lanes, position_m, sys)
        ),
        Limit::HardnessNotFinite { lanes, position_m } => format!(
            "{}: the predicted hardness is not a finite number; {SO} (hardness.calibration)",
            at(lanes, position_m, sys)
        ),
        _ => limit(l, sys),
    }
}

/// A condensation warning as a sentence.
fn condensation(c: &crate::note::Condensed, sys: System) -> String {
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
    let t = |k: f64| {
        let si = format!("{:.1} C", k - units::ZERO_C_K);
        said(sys, si, k, Kind::Temperature, false)
    };
    let depth = crate::storage::condensation::UPTAKE_DEPTH_M;
    format!(
            "storage stretch {}: the roll came in at {}, below the air's dew point {}: water condenses on the {} for about {:.0} min ({}, up to {:+.1} points of moisture in the outer {} of wraps); the model puts it into the paper at the wet faces as the stretch begins (outer wraps and end cells), so the diagnosis includes it. Let rolls warm up wrapped in film before unwrapping (common practice)",
            stretch + 1,
            t(roll_k),
            t(dew_point_k),
            match (barrel, ends) {
                (true, true) => "barrel and end faces",
                (true, false) => "barrel",
                _ => "end faces",
            },
            wet_s / 60.0,
            said(sys, format!("{:.0} g/m2", water_kg_m2 * 1e3), water_kg_m2, Kind::Grammage, false),
            outer_rise_pct,
            said(sys, format!("{:.0} mm", depth * 1e3), depth, Kind::Length, false)
        )
}
