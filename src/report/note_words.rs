//! Words for the notes the confidence stage and the winding-time diameter check give (split from
//! `words` to keep each file short). Every `match` is exhaustive.

use super::limit_words::SO;
use super::words::{defect, feature};
use super::{pos, said};
use crate::note::{DiameterMismatch, Note};
use crate::units::{Kind, System, DAY_S};

fn defect_name(d: crate::vocab::Defect) -> &'static str {
    defect(d)
}

fn feature_name(f: crate::vocab::Feature) -> &'static str {
    feature(f)
}

/// `x` shown as 0 when it is rounding residue against `scale` (a difference of equal sums).
fn clean(x: f64, scale: f64) -> f64 {
    if x.abs() <= 1e-9 * scale {
        0.0
    } else {
        x
    }
}

/// What it takes to stand above noise, by the test that decided: the noise rolls' bound on the
/// feature (or that no value in the feature's range reaches it), or the profile test on the
/// readings themselves, whose chance is not a bound on this feature.
fn needs(
    feature: crate::vocab::Feature,
    (value, uniform, threshold): (f64, f64, f64),
    basis: crate::note::NoiseBasis,
) -> String {
    use crate::note::NoiseBasis;
    match basis {
        NoiseBasis::CaliperReadings => "; judged on the caliper readings themselves (a band of one to three readings against the trend through the others, a line or, where they bend along one, a parabola, and a reading against its eight nearest, by their repeatability), which do not stand above noise".into(),
        NoiseBasis::WebProfile => "; judged on the web's tension or moisture profile at winding, which does not stand above noise".into(),
        NoiseBasis::CaliperCrown => "; judged on the caliper readings' crown across the width, which does not stand above noise".into(),
        NoiseBasis::NoiseRolls => {
            let spec = feature.spec();
            let up = value >= uniform;
            let reach = if up { uniform + threshold } else { uniform - threshold };
            if reach < spec.min || reach > spec.max {
                "; no value in its range stands above noise there".into()
            } else {
                format!(
                    ", while standing above noise takes a difference of {}",
                    crate::units::sig(threshold, 2)
                )
            }
        }
    }
}

/// The `n` caliper readings a re-run without the profiles noise can make kept, from and to
/// `span` (m), in words: nothing where every reading was made uniform.
fn kept_words(n: usize, (a, b): (f64, f64)) -> String {
    match n {
        0 => String::new(),
        1 => format!(
            " but for the caliper reading that stands out, at {:.0} mm,",
            a * 1e3
        ),
        _ => format!(
            " but for the {n} caliper readings that stand out, from {:.0} to {:.0} mm,",
            a * 1e3,
            b * 1e3
        ),
    }
}

/// A strength limit that rests on the calipers' noise ([`Note::LimitOnNoise`],
/// [`Note::LimitOnSameReadings`]) as a sentence.
fn limit_noise_note(n: &Note) -> String {
    match *n {
        Note::LimitOnNoise {
            which,
            ratio,
            level_ratio,
            noise_chance,
        } => format!(
            "the {} passes {} only as the calipers read ({} times it; a roll with level calipers is at {}), and measurement noise alone moves it this far with a chance of {} %: the readings cannot tell whether this roll is beyond it; calipers read to a finer repeatability, or more of them, can (treat the roll with care until then)",
            super::limit_words::strength_limit(which).0,
            super::limit_words::strength_limit(which).1,
            crate::units::sig(ratio, 3),
            crate::units::sig(level_ratio, 3),
            crate::units::sig(noise_chance * 100.0, 2)
        ),
        Note::LimitOnSameReadings { which } => format!(
            "the {} rests on the same caliper readings as the roll as measured, whose limit is within measurement noise: the readings cannot tell whether this roll is beyond {} either",
            super::limit_words::strength_limit(which).0,
            super::limit_words::strength_limit(which).1
        ),
        _ => String::new(),
    }
}

/// A note of the diagnosis's confidence (noise floor, resolution, misfit) as a sentence.
pub(super) fn confidence_note(n: &Note, sys: System) -> String {
    match *n {
        Note::BelowNoiseFloor {
            defect,
            feature,
            value,
            uniform,
            threshold,
            noise_chance,
            level,
            basis,
        } => format!(
            "{} not reported: measurement noise alone moves {} this far with a chance of {} % (a finding needs {} % or less: {} % shared over the one-sided tests); {} against a uniform roll's {}{}",
            defect_name(defect),
            feature_name(feature),
            crate::units::sig(noise_chance * 100.0, 2),
            crate::units::sig(level * 100.0, 2),
            crate::units::sig(crate::diagnose::confidence::FAMILY_LEVEL * 100.0, 2),
            crate::units::sig(value, 3),
            crate::units::sig(clean(uniform, value.abs().max(threshold)), 3),
            needs(feature, (value, uniform, threshold), basis)
        ),
        Note::OnProfileNoise {
            defect,
            feature,
            value,
            flattened,
            profile_chance,
            level,
            kept_readings,
            kept_span_m,
        } => format!(
            "{} not reported: it comes from the differences between the lanes' calipers (and web profiles) alone ({} is {} as measured, {} with those made uniform{} and each lane's creep kept), and those differences are within what measurement noise alone makes (a chance of {} %; a profile must reach {} % or less to stand)",
            defect_name(defect),
            feature_name(feature),
            crate::units::sig(value, 3),
            crate::units::sig(flattened, 3),
            kept_words(kept_readings, kept_span_m),
            crate::units::sig(profile_chance * 100.0, 2),
            crate::units::sig(level * 100.0, 2)
        ),
        Note::OnCaliperCrown { .. } => crown_note(n, sys),
        Note::LimitOnNoise { .. } | Note::LimitOnSameReadings { .. } => limit_noise_note(n),
        Note::Unlikely { defect, probability } => format!(
            "{} not reported: its rule holds in only {:.0} % of the plausible states (posterior draws)",
            defect_name(defect),
            probability * 100.0
        ),
        Note::Resolution { .. } => resolution_note(n, sys),
        Note::LaneNotExplained { position_m, misfit } => format!(
            "the lane at {} is not explained by the model: its readings miss the fit by {} noise units (rms; over 3)",
            pos(position_m, sys),
            super::fit_words::misfit(misfit)
        ),
        Note::RollNotExplained { misfit } => format!(
            "the roll is not explained by the model: its readings miss the fit by {} noise units (rms over every reading; over 3), so its findings are graded medium at most",
            super::fit_words::misfit(misfit)
        ),
        Note::FindingOnWeakLanes {
            defect,
            lanes,
            unexplained,
            unidentified,
        } => format!(
            "{} rests on {lanes} lane(s): {unexplained} not explained by the model, {unidentified} with creep the data do not identify (kept at the pooled value){}",
            defect_name(defect),
            if unexplained > 0 {
                "; a finding resting on a lane the model does not explain is graded medium at most"
            } else {
                ""
            }
        ),
        _ => String::new(),
    }
}

/// What the measurements resolve ([`Note::Resolution`]) as a sentence.
fn resolution_note(n: &Note, sys: System) -> String {
    let Note::Resolution {
        caliper_repeatability_m,
        band_m,
        lane_excess_mm_per_m,
        centre_edges_mm_per_m,
        crown_m,
    } = *n
    else {
        return String::new();
    };
    let um = |x: f64| said(sys, format!("{:.1} um", x * 1e6), x, Kind::Length, true);
    // a floor that rounds to nil: noise alone hardly moves the length on this roll (no tension
    // left for the calipers to act on), so no floor is defined, not an unlimited resolution
    let pct = |mm_per_m: f64| match mm_per_m / 10.0 >= 0.0005 {
        true => format!("{:.3} %", mm_per_m / 10.0),
        false => "(no floor: noise alone does not move it on this roll)".into(),
    };
    format!(
        "resolution of these measurements (caliper read to {}, one sigma): a caliper band must exceed {}{}, a lane's excess length over the web around it {} and centre against edges {} of the web length to stand above noise (a {} % chance, shared over the one-sided tests, that noise alone does it)",
        um(caliper_repeatability_m),
        um(band_m),
        crown_m.map_or(String::new(), |c| format!(
            ", a crown of the caliper profile (centre against the outermost readings) {}",
            um(c)
        )),
        pct(lane_excess_mm_per_m),
        pct(centre_edges_mm_per_m),
        crate::units::sig(crate::diagnose::confidence::FAMILY_LEVEL * 100.0, 2)
    )
}

/// Lanes coarser than the caliper readings ([`Note::LanesCoarse`]) as a sentence.
pub(super) fn lanes_coarse(n: &Note, sys: System) -> String {
    let Note::LanesCoarse {
        lane_m,
        spacing_m,
        enough,
    } = *n
    else {
        return String::new();
    };
    format!(
        "lanes up to {} wide are wider than the caliper readings' spacing ({}): a lane takes the mean of the readings it holds, or the profile at its centre where it holds one, so a band narrower than a lane is averaged over it or falls between lane centres, weakened or missed; state lanes no wider than the spacing (lanes.count = {enough} or more) to resolve it",
        pos(lane_m, sys),
        pos(spacing_m, sys)
    )
}

/// A finding standing on the caliper crown ([`Note::OnCaliperCrown`]) as a sentence.
fn crown_note(n: &Note, sys: System) -> String {
    let Note::OnCaliperCrown {
        defect,
        crown_m,
        sigmas,
        left_out,
        noise_chance,
        level,
        feature,
        uniform_creep,
        storage_part,
    } = *n
    else {
        return String::new();
    };
    format!(
        "{} stands on the caliper profile's crown: the readings' parabola{} is {} {} at the centre than at the outermost readings ({:.1} times their repeatability; noise alone crowns level readings this far with a chance of {} %, a finding needs {} % or less), and the crown alone, with every lane's creep made the lanes' mean, gives {} {} ({} once what storage makes of a level roll is taken out), which still fires the rule",
        defect_name(defect),
        match left_out {
            0 => String::new(),
            1 => " (one reading of a band left out)".into(),
            k => format!(" ({k} readings of a band left out)"),
        },
        said(
            sys,
            format!("{} um", crate::units::sig(crown_m.abs() * 1e6, 2)),
            crown_m.abs(),
            Kind::Length,
            true
        ),
        if crown_m >= 0.0 { "higher" } else { "lower" },
        sigmas.abs(),
        crate::units::sig(noise_chance * 100.0, 2),
        crate::units::sig(level * 100.0, 2),
        feature_name(feature),
        crate::units::sig(uniform_creep, 3),
        crate::units::sig(uniform_creep - storage_part, 3)
    )
}

/// The wound state against the diameter profile at winding ([`Note::WindingDiameter`]).
pub(super) fn winding_diameter(m: &DiameterMismatch, sys: System) -> String {
    let mm = |x: f64, sign: bool| match sys {
        System::Si if sign => format!("{:+.2} mm", x * 1e3),
        System::Si => format!("{:.2} mm", x * 1e3),
        System::Us if sign => crate::units::signed(x, Kind::Length, sys, false, 3),
        System::Us => crate::units::show(x, Kind::Length, sys, false),
    };
    format!(
        "the wound state disagrees with the diameter profile at {:.0} d: at {} the predicted diameter is {} from the mean, the measured {} (tolerance {}, three times the repeatability of the difference; {} lanes beyond it); check the caliper profile, the lanes and the winder settings before trusting the findings (profiles, winding)",
        m.age_s / DAY_S,
        pos(m.position_m, sys),
        mm(m.predicted_m, true),
        mm(m.measured_m, true),
        mm(m.tolerance_m, false),
        m.lanes
    )
}

/// A later survey against the model with pooled creep ([`Note::SurveyContradicts`]).
pub(super) fn survey_contradicts(n: &Note, sys: System) -> String {
    let Note::SurveyContradicts {
        what,
        age_s,
        lanes,
        position_m,
        predicted,
        measured,
        sigma,
    } = *n
    else {
        return String::new();
    };
    let hardness = what == crate::case::Measure::Hardness;
    let (more, less) = if hardness {
        ("harder", "softer")
    } else {
        ("larger", "smaller")
    };
    // hardness in its scale's units; a diameter in mm (in, US)
    let by = |v: f64| match (hardness, sys) {
        (true, _) => format!("{v:.2} units"),
        (false, System::Si) => format!("{:.2} mm", v * 1e3),
        (false, System::Us) => crate::units::show(v, Kind::Length, sys, false),
    };
    let side = |v: f64| if v > 0.0 { more } else { less };
    format!(
        "the {} survey at {:.0} d contradicts the model at {lanes} lane(s): at {} the model (pooled creep) has the lane's change since the first survey {} than the roll's by {}, the survey {} by {} (noise {}, one sigma); the per-lane fit absorbs it with that lane's own creep, so findings on those lanes rest on creep the model does not explain: check those readings, and whether something outside the model acted there (a wet or damaged zone, a reading taken elsewhere)",
        super::words::measure(what),
        age_s / DAY_S,
        pos(position_m, sys),
        side(predicted),
        by(predicted.abs()),
        side(measured),
        by(measured.abs()),
        by(sigma),
    )
}

/// The out-of-round and air limits as sentences (the other limits: [`limit`]).
pub(super) fn unwind_limit(l: &crate::note::Limit, sys: System) -> String {
    use crate::note::Limit;
    let mpa = |p: f64, d: usize| {
        said(
            sys,
            format!("{:.d$} MPa", p / 1e6),
            p,
            Kind::Pressure,
            false,
        )
    };
    let mm = |x: f64| said(sys, format!("{:.0} mm", x * 1e3), x, Kind::Length, false);
    let um = |x: f64| said(sys, format!("{:.1} um", x * 1e6), x, Kind::Length, true);
    match *l {
        Limit::FlatContact {
            half_width_m,
            radius_m,
            peak_pressure_pa,
            crush_pa,
        } => format!(
            "stored on its side, the roll's floor contact is {} half-width on a {} radius with a peak pressure of {} (crush limit {}): the Hertz line contact behind the out-of-round estimate holds for a narrow contact below the crush limit; treat the flat as a rough bound",
            mm(half_width_m),
            mm(radius_m),
            mpa(peak_pressure_pa, 2),
            mpa(crush_pa, 2)
        ),
        Limit::UnwindTension {
            stress_pa,
            strength_pa,
        } => format!(
            "the converting tension stresses the web to {} at unwind, {:.2} times its MD tensile strength ({}): the web breaks as it is pulled off the roll; check converting.tension and material.strength.md_tensile",
            mpa(stress_pa, 1),
            stress_pa / strength_pa,
            mpa(strength_pa, 1)
        ),
        Limit::AirFloats {
            film_m,
            roughness_m,
        } => format!(
            "the air film entrained at full diameter ({}) exceeds the faces' combined roughness ({}) by enough to take away all the wound-in tension: the outer wraps float on air and the model holds their wound-in tension at zero; {SO}",
            film_words(film_m, sys),
            um(roughness_m)
        ),
        Limit::CorePressure {
            from_m,
            to_m,
            pressure_pa,
            limit_pa,
        } => format!(
            "core from {:.0} to {:.0} mm: pressure on the core of {} MPa (the mean over the {:.0} mm a tube carries a local load over, Timoshenko and Woinowsky-Krieger 1959) is {:.2} times the core's collapse pressure (its rating, else thin-ring buckling; {} MPa); check roll.core and the winding, or treat the roll with care",
            from_m * 1e3,
            to_m * 1e3,
            crate::units::sig(pressure_pa / 1e6, 4),
            (to_m - from_m) * 1e3,
            pressure_pa / limit_pa,
            crate::units::sig(limit_pa / 1e6, 4)
        ),
        other => super::limit_words::limit(&other, sys),
    }
}

/// Where a core collapse is: the core's most loaded window (its ends) and the mean pressure on
/// the core over it ([`crate::limits::core_load`]).
pub(super) fn core_where(m: &crate::numeric::WindowMean, sys: crate::units::System) -> String {
    use crate::units::Kind;
    format!(
        "core from {} to {}, mean pressure on the core {} over the {} a tube carries a local load over",
        super::pos(m.from_m, sys),
        super::pos(m.to_m, sys),
        super::q(m.mean, Kind::Pressure, sys),
        super::q(m.to_m - m.from_m, Kind::Length, sys)
    )
}

/// The headline of a diagnosis whose rules all fired without a finding standing (`below`, their
/// ids): below measurement noise, or (`unlikely`) some holding in fewer than half of the
/// plausible states.
pub(super) fn dropped_headline(below: &[String], unlikely: bool) -> String {
    let why = if unlikely {
        "but each is within what measurement noise alone makes or holds in fewer than half of the plausible states (the notes say which, and what the measurements can resolve)"
    } else {
        "but no more strongly than noise alone makes them (the notes say what the measurements can resolve)"
    };
    let head = if unlikely {
        "No finding stands"
    } else {
        "No finding stands above measurement noise"
    };
    format!(
        "{head}: {} rule(s) fired ({}), {why}.",
        below.len(),
        below.join(", ")
    )
}

/// A count in words; a threshold between counts (above 1.5) keeps its half.
pub(super) fn count(v: f64) -> String {
    if v.fract() == 0.0 {
        format!("{v:.0}")
    } else {
        format!("{v:.1}")
    }
}

/// Thickest air film the foil-bearing formula is read for, m: the Knox and Sweeney (1971) film
/// is a thin-film solution, h far below the roll radius; a web wound at so little tension that
/// the formula gives millimetres does not run on a film at all.
const FILM_READ_M: f64 = 1e-3;

/// An entrained air film in words: micrometres, or past [`FILM_READ_M`] that the formula is
/// outside its range.
fn film_words(film_m: f64, sys: System) -> String {
    if film_m > FILM_READ_M || !film_m.is_finite() {
        let f = FILM_READ_M;
        format!(
            "over {}, where the thin-film formula no longer holds: the web barely touches the roll",
            said(sys, format!("{:.0} um", f * 1e6), f, Kind::Length, true)
        )
    } else {
        said(
            sys,
            format!("{:.1} um", film_m * 1e6),
            film_m,
            Kind::Length,
            true,
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::note::NoiseBasis;
    use crate::vocab::Feature;

    /// A diagnosis without findings does not blame noise alone when a rule was dropped as
    /// unlikely over the plausible states.
    #[test]
    fn the_no_finding_headline_names_both_reasons_when_both_acted() {
        let ids = vec!["baggy-centre-drying".to_string()];
        let t = dropped_headline(&ids, true);
        assert!(t.contains("fewer than half of the plausible states"), "{t}");
        assert!(!t.contains("above measurement noise:"), "{t}");
        let t = dropped_headline(&ids, false);
        assert!(t.starts_with("No finding stands above measurement noise: 1 rule(s) fired"));
    }

    /// A note gives the bound of the test that decided, and only that one: a chance from the
    /// caliper readings' own test is not paired with the noise rolls' bound on the feature (the
    /// value could exceed that bound and still not stand); a bound that would take the feature
    /// below its range (a pressure below zero) is said to be out of reach.
    #[test]
    fn the_needed_difference_comes_from_the_deciding_test() {
        let f = Feature::CaliperRangePct;
        let t = needs(f, (4.79, 0.0, 2.7), NoiseBasis::CaliperReadings);
        assert!(t.contains("caliper readings") && !t.contains("2.7"), "{t}");
        let t = needs(f, (1.0, 0.0, 2.7), NoiseBasis::NoiseRolls);
        assert!(t.contains("takes a difference of 2.7"), "{t}");
        let p = Feature::SurfacePressureEndKpa;
        let t = needs(p, (17.4, 150.0, 151.0), NoiseBasis::NoiseRolls);
        assert!(t.contains("no value in its range"), "{t}");
        assert_eq!(clean(-1.86e-16, 0.6), 0.0);
        assert_eq!(clean(0.07, 0.6), 0.07);
    }
}
