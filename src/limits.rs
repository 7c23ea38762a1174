//! Physical limits checked after each stage. The case was checked at load; these checks catch a
//! stage result that no real roll can have (a roll wound faster than its layers can stay on, a
//! stack squeezed past any real void content, moisture above saturation, a diameter inside the
//! core). A violation becomes a [`Note::Limit`], which every output shows as a warning; so does
//! a wound state whose diameter profile disagrees with the one measured at winding.
//!
//! **Invariant:** pure functions of stage results; no prose (words are in `report::words`).

use crate::case::{Gab, Material, Measure, Roll};
use crate::lanes::Lanes;
use crate::note::{DiameterMismatch, Limit, Note, Strength};
use crate::numeric::weighted_mean;
use crate::storage::Aged;
use crate::units::DAY_S;
use crate::winding::Wound;

/// Largest compressive radial strain of the wound stack taken as physical (dimensionless):
/// paper and board sheets hold roughly 30-60 % voids by volume and film stacks little more than
/// their air film, so a stack compressed by more than half its thickness means the stack law was
/// extrapolated past the sheet's solid content (common practice).
pub const MAX_STACK_STRAIN: f64 = 0.5;

/// Saturation moisture of the GAB isotherm at a water activity of 1, % (dry basis): the most
/// any storage atmosphere can give. Infinite when the multilayer constant K >= 1.
pub fn saturation_moisture_pct(g: &Gab) -> f64 {
    let k = g.k;
    if k >= 1.0 {
        return f64::INFINITY;
    }
    g.monolayer_pct * g.c * k / ((1.0 - k) * (1.0 - k + g.c * k))
}

/// The lanes past a limit: how many, and the worst as (position, value). `value` is `None` for a
/// lane within the limit; a NaN value counts as past it and is the worst.
fn worst(values: impl Iterator<Item = (f64, Option<f64>)>) -> Option<(u32, f64, f64)> {
    let mut out: Option<(u32, f64, f64)> = None;
    for (pos, v) in values {
        let Some(v) = v else { continue };
        out = Some(match out {
            None => (1, pos, v),
            Some((n, _, w)) if v.is_nan() || (!w.is_nan() && v > w) => (n + 1, pos, v),
            Some((n, p, w)) => (n + 1, p, w),
        });
    }
    out
}

/// `Some(v)` when `v` is past `limit` or not a number.
fn past(v: f64, limit: f64) -> Option<f64> {
    (v.is_nan() || v > limit).then_some(v)
}

/// Checks on the wound-in state: winding speed against the lift-off speed; the web's and the
/// core's strength ([`strength`]); the stack's compression at each lane's peak interlayer
/// pressure. One note per kind, naming the worst lane and the number of lanes.
pub fn after_winding(
    w: &Wound,
    lanes: &Lanes,
    material: &Material,
    roll: &Roll,
    speed_m_s: f64,
) -> Vec<Note> {
    let mut out = Vec::new();
    if speed_m_s > w.lift_off_speed_m_s {
        out.push(Note::Limit(Limit::AboveLiftOff {
            speed_m_s,
            lift_off_m_s: w.lift_off_speed_m_s,
        }));
    }
    for r in strength(material, roll, w, &spans(lanes)) {
        if r.which == Strength::CoreCollapse {
            if r.ratio.is_nan() || r.ratio > 1.0 {
                out.push(Note::Limit(Limit::CorePressure {
                    from_m: r.position_m - 0.5 * r.width_m,
                    to_m: r.position_m + 0.5 * r.width_m,
                    pressure_pa: r.value_pa,
                    limit_pa: r.limit_pa,
                }));
            }
        } else if r.lanes > 0 {
            out.push(Note::Limit(Limit::Strength {
                which: r.which,
                lanes: r.lanes,
                position_m: r.position_m,
                value_pa: r.value_pa,
                limit_pa: r.limit_pa,
            }));
        }
    }
    let stack = w.lanes.iter().map(|l| {
        let strain = material.stack.strain(l.summary.peak_pressure_pa);
        (l.position_m, past(strain, MAX_STACK_STRAIN))
    });
    if let Some((lanes, position_m, strain)) = worst(stack) {
        out.push(Note::Limit(Limit::StackCrushed {
            lanes,
            position_m,
            pressure_pa: material.stack.pressure(strain),
            strain,
        }));
    }
    out
}

/// A wound state against one strength: the largest ratio over the lanes (for the core, over
/// the running mean of [`core_load`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StrengthRatio {
    pub which: Strength,
    /// Largest state over its limit (0 when the limit is not positive).
    pub ratio: f64,
    /// The state in the worst lane, or the core's averaged pressure (a magnitude), Pa.
    pub value_pa: f64,
    /// The limit, Pa.
    pub limit_pa: f64,
    /// Centre of the worst lane, or of the core's worst window, m.
    pub position_m: f64,
    /// Width the state is taken over: the worst lane's, or the core's window, m.
    pub width_m: f64,
    /// Lanes whose state exceeds the limit (for the core: the lanes under its window when the
    /// window's mean does).
    pub lanes: u32,
}

/// The lanes' spans (left, right edges), m.
pub fn spans(lanes: &Lanes) -> Vec<(f64, f64)> {
    lanes.lanes.iter().map(|l| (l.left_m, l.right_m)).collect()
}

/// The pressure on the core as its collapse pressure sees it: the highest running mean of the
/// lanes' core pressures `core_pa` (Pa, lanes at `spans`, m) over the core's load width
/// ([`crate::winding::core_load_width`]: the tube's ring-load decay length, Timoshenko and
/// Woinowsky-Krieger 1959; the whole width for a rigid core). A collapse pressure is a uniform
/// pressure over the core's length, and a tube carries a local load over about that length, so
/// one lane narrower than it does not load the core by its own pressure alone; lanes wider than
/// it are read whole ([`crate::numeric::running_mean_max`]). A width in metres, so the lane
/// count does not change it.
pub fn core_load(
    roll: &Roll,
    spans: &[(f64, f64)],
    core_pa: &[f64],
) -> Option<crate::numeric::WindowMean> {
    let width =
        crate::winding::core_load_width(&roll.core, 0.5 * roll.core_diameter_m, roll.width_m);
    crate::numeric::running_mean_max(spans, core_pa, width)
}

/// The core against its collapse pressure `limit_pa` (Pa): [`core_load`] over it.
fn core_ratio(roll: &Roll, w: &Wound, spans: &[(f64, f64)], limit_pa: f64) -> StrengthRatio {
    let p: Vec<f64> = w.lanes.iter().map(|l| l.summary.core_pressure_pa).collect();
    let m = core_load(roll, spans, &p);
    let (value_pa, from_m, to_m) = m.map_or((0.0, 0.0, 0.0), |m| (m.mean, m.from_m, m.to_m));
    let ratio = if limit_pa > 0.0 {
        value_pa / limit_pa
    } else {
        0.0
    };
    let under = spans.iter().filter(|&&(a, b)| b > from_m && a < to_m);
    StrengthRatio {
        which: Strength::CoreCollapse,
        ratio,
        value_pa,
        limit_pa,
        position_m: 0.5 * (from_m + to_m),
        width_m: to_m - from_m,
        lanes: if ratio.is_nan() || ratio > 1.0 {
            under.count() as u32
        } else {
            0
        },
    }
}

/// The wound state against the web's strength (ZD crush, MD compression, MD tension), lane by
/// lane, and, where the core has a collapse pressure ([`crate::winding::collapse_pressure`]),
/// the core's ([`core_load`] over the lanes at `spans`, m).
pub fn strength(
    material: &Material,
    roll: &Roll,
    w: &Wound,
    spans: &[(f64, f64)],
) -> Vec<StrengthRatio> {
    use crate::winding::LaneSummary;
    let s = &material.strength;
    type State = fn(&LaneSummary) -> f64;
    let items: Vec<(Strength, f64, State)> = vec![
        (Strength::ZdCrush, s.zd_crush_pa, |l| l.peak_pressure_pa),
        (Strength::MdCompression, s.md_compressive_pa, |l| {
            (-l.tangential_min_pa).max(0.0)
        }),
        (Strength::MdTension, s.md_tensile_pa, |l| {
            l.tangential_max_pa.max(0.0)
        }),
    ];
    let collapse = crate::winding::collapse_pressure(
        &roll.core,
        0.5 * roll.core_diameter_m,
        roll.core_rating_pa,
    );
    let mut out: Vec<StrengthRatio> = items
        .into_iter()
        .map(|(which, limit_pa, state)| {
            let mut r = StrengthRatio {
                which,
                ratio: 0.0,
                value_pa: 0.0,
                limit_pa,
                position_m: w.lanes.first().map_or(0.0, |l| l.position_m),
                width_m: spans.first().map_or(0.0, |s| s.1 - s.0),
                lanes: 0,
            };
            for (i, l) in w.lanes.iter().enumerate() {
                let v = state(&l.summary);
                let ratio = if limit_pa > 0.0 { v / limit_pa } else { 0.0 };
                if ratio.is_nan() || ratio > 1.0 {
                    r.lanes += 1;
                }
                if ratio.is_nan() || ratio > r.ratio {
                    (r.ratio, r.value_pa, r.position_m) = (ratio, v, l.position_m);
                    r.width_m = spans.get(i).map_or(0.0, |s| s.1 - s.0);
                }
            }
            r
        })
        .collect();
    if let Some(pc) = collapse {
        out.push(core_ratio(roll, w, spans, pc));
    }
    out
}

/// How many repeatabilities a lane's predicted diameter deviation may differ from the measured
/// one before the wound state is said to disagree (three sigma, common practice).
pub const DIAMETER_SIGMAS: f64 = 3.0;

/// The wound state against the winding-time diameter profile (the earliest diameter profile
/// read within a day of winding), when one is given: each lane's predicted diameter deviation
/// from the width-weighted mean against the measured one. The tolerance is [`DIAMETER_SIGMAS`]
/// x sqrt(2) x `repeatability_m` (m; one-sigma repeatability of a reading: a deviation from the
/// mean carries about one reading's scatter, the comparison two). One note naming the worst lane.
pub fn against_winding_diameter(lanes: &Lanes, w: &Wound, repeatability_m: f64) -> Option<Note> {
    let s = lanes
        .earliest(Measure::Diameter)
        .filter(|s| s.age_s < DAY_S && s.values.len() == w.lanes.len())?;
    let widths = lanes.widths();
    let measured = &s.values;
    let predicted: Vec<f64> = w
        .lanes
        .iter()
        .map(|l| 2.0 * l.summary.outer_radius_m)
        .collect();
    let (m_mean, p_mean) = (
        weighted_mean(measured, &widths),
        weighted_mean(&predicted, &widths),
    );
    let tolerance_m = DIAMETER_SIGMAS * std::f64::consts::SQRT_2 * repeatability_m;
    let off = (0..predicted.len()).map(|i| {
        let miss = (predicted[i] - p_mean) - (measured[i] - m_mean);
        (i as f64, past(miss.abs(), tolerance_m))
    });
    let (lanes_past, at, _) = worst(off)?;
    let i = at as usize;
    Some(Note::WindingDiameter(DiameterMismatch {
        age_s: s.age_s,
        lanes: lanes_past,
        position_m: lanes.lanes[i].position_m,
        predicted_m: predicted[i] - p_mean,
        measured_m: measured[i] - m_mean,
        tolerance_m,
    }))
}

/// The bottom of any hardness scale (rebound and durometer scales run from 0; common practice):
/// a predicted hardness below it is a limit, and a reading is judged against it there
/// ([`crate::fit::explained::normalised`]).
pub const HARDNESS_SCALE_BOTTOM: f64 = 0.0;

/// Moisture rise of the outer wraps below which condensation is not warned of, percentage points:
/// a moisture meter's resolution (0.1 point, common practice); the model still puts the water
/// into the paper.
pub const CONDENSATION_SHOWS_PCT: f64 = 0.1;

/// Condensation on a cold roll brought into warm humid air ([`crate::storage::condensation`]):
/// one note per stretch where enough water condenses to show ([`CONDENSATION_SHOWS_PCT`]).
pub fn condensation(storage: &[crate::case::Stretch], material: &Material) -> Vec<Note> {
    crate::storage::condensation::check(storage)
        .into_iter()
        .filter(|c| c.outer_rise_pct(material.density_kg_m3) >= CONDENSATION_SHOWS_PCT)
        .map(|c| {
            Note::Limit(Limit::Condensation(crate::note::Condensed {
                stretch: c.stretch as u32,
                roll_k: c.roll_k,
                dew_point_k: c.dew_point_k,
                wet_s: c.wet_s,
                water_kg_m2: c.water_kg_m2,
                outer_rise_pct: c.outer_rise_pct(material.density_kg_m3),
                barrel: c.barrel,
                ends: c.ends,
            }))
        })
        .collect()
}

/// Hertz's line contact holds for a contact narrow against the radius (Johnson 1985, section
/// 4.3); beyond a quarter of the radius it is extrapolated (common practice for "small").
pub const MAX_CONTACT_TO_RADIUS: f64 = 0.25;

/// The floor contact of a roll stored on its side ([`crate::storage::out_of_round`]) against the
/// small-contact assumption and the stack's crush limit (elastic contact, grade creep), with the
/// outer wraps' pressure as the mean over the width of the `lanes` the roll was wound on.
pub fn flat_contact(case: &crate::case::Case, lanes: &Lanes, wound: &Wound) -> Vec<Note> {
    let ps = wound.mean_surface_pressure_pa(&lanes.widths());
    let m = &case.material;
    let r = 0.5 * case.roll.diameter_m;
    crate::storage::out_of_round::flat(m, &case.roll, &case.storage, ps, &m.creep.radial)
        .filter(|f| {
            f.half_width_m > MAX_CONTACT_TO_RADIUS * r
                || f.peak_pressure_pa > m.strength.zd_crush_pa
        })
        .map(|f| {
            Note::Limit(Limit::FlatContact {
                half_width_m: f.half_width_m,
                radius_m: r,
                peak_pressure_pa: f.peak_pressure_pa,
                crush_pa: m.strength.zd_crush_pa,
            })
        })
        .into_iter()
        .collect()
}

/// Entrained air ([`crate::winding::air`]) that takes away all of the web tension's strain at
/// full diameter.
pub fn air_floats(case: &crate::case::Case) -> Vec<Note> {
    use crate::winding::air;
    let m = &case.material;
    let (d, w) = (case.roll.diameter_m, &case.winding);
    let t = w.tension.at(d);
    let lost = air::strain_loss(m, w, 0.5 * d, t) * m.md_modulus_pa * m.caliper_m;
    if lost >= t + m.friction * w.nip_n_per_m {
        vec![Note::Limit(Limit::AirFloats {
            film_m: air::film_m(w, 0.5 * d, t),
            roughness_m: air::escape_gap_m(m),
        })]
    } else {
        Vec::new()
    }
}

/// The converting tension's running stress (tension over caliper) against the web's MD tensile
/// strength: a web at its strength breaks as it is unwound. The swing of an out-of-round roll
/// comes on top of it (the `out-of-round-break` rule looks at that, from half the strength up).
pub fn unwind_tension(case: &crate::case::Case) -> Vec<Note> {
    let m = &case.material;
    let stress_pa = case.converting_tension_n_per_m / m.caliper_m;
    let strength_pa = m.strength.md_tensile_pa;
    if strength_pa > 0.0 && stress_pa >= strength_pa {
        vec![Note::Limit(Limit::UnwindTension {
            stress_pa,
            strength_pa,
        })]
    } else {
        Vec::new()
    }
}

/// Loose outer wraps: cells of a lane's outer half that a storage step held at zero interlayer
/// pressure ([`crate::storage::LaneAged`]`::loose_outer_depth_m`); a note naming the deepest.
fn loose_outer_wraps(a: &Aged) -> Option<Note> {
    let loose = a.lanes.iter().map(|l| {
        let d = l.loose_outer_depth_m;
        (l.position_m, (d > 0.0).then_some(d))
    });
    let (lanes, position_m, depth_m) = worst(loose)?;
    let time_s = a
        .lanes
        .iter()
        .find(|l| l.position_m == position_m)
        .map_or(0.0, |l| l.loose_outer_time_s);
    let end_depth_m = a
        .lanes
        .iter()
        .map(|l| l.loose_outer_end_depth_m)
        .fold(0.0, f64::max);
    Some(Note::Limit(Limit::LooseOuterWraps {
        lanes,
        position_m,
        depth_m,
        time_s,
        end_depth_m,
    }))
}

/// Checks on the roll after storage: lane diameters outside the core, outer wraps that kept
/// some interlayer pressure (none held at zero by the storage kernel's no-tension cut-off),
/// moisture at or below saturation, predicted hardness finite and not below zero (the bottom of
/// any hardness scale); one note per kind naming the worst lane.
pub fn after_storage(a: &Aged, material: &Material, roll: &Roll) -> Vec<Note> {
    let mut out = Vec::new();
    let core = roll.core_diameter_m;
    // how far inside the core's surface (m): positive is past the limit
    let inside = a.lanes.iter().map(|l| {
        let d = l.diameter_m.iter().copied().fold(f64::INFINITY, f64::min);
        (l.position_m, past(core - d, -f64::EPSILON * core))
    });
    if let Some((lanes, position_m, depth)) = worst(inside) {
        out.push(Note::Limit(Limit::DiameterInsideCore {
            lanes,
            position_m,
            diameter_m: core - depth,
            core_diameter_m: core,
        }));
    }
    out.extend(loose_outer_wraps(a));
    let saturation = saturation_moisture_pct(&material.sorption);
    // 0.01 percentage point: the diffusion solver's rounding, far below any gauge
    let wet = a.lanes.iter().map(|l| {
        let m = l
            .moisture_pct
            .iter()
            .copied()
            .fold(f64::NEG_INFINITY, f64::max);
        (l.position_m, past(m, saturation + 0.01))
    });
    if let Some((lanes, position_m, moisture_pct)) = worst(wet) {
        out.push(Note::Limit(Limit::MoistureAboveSaturation {
            lanes,
            position_m,
            moisture_pct,
            saturation_pct: saturation,
        }));
    }
    // under the bottom of any hardness scale (a NaN is the next check's)
    let low = a.lanes.iter().map(|l| {
        let h = l
            .hardness
            .iter()
            .copied()
            .filter(|h| !h.is_nan())
            .fold(f64::INFINITY, f64::min);
        (l.position_m, past(-h, -HARDNESS_SCALE_BOTTOM))
    });
    if let Some((lanes, position_m, depth)) = worst(low) {
        out.push(Note::Limit(Limit::HardnessBelowScale {
            lanes,
            position_m,
            hardness: -depth,
        }));
    }
    let bad = a.lanes.iter().map(|l| {
        let any = l.hardness.iter().any(|h| !h.is_finite());
        (l.position_m, any.then_some(1.0))
    });
    if let Some((lanes, position_m, _)) = worst(bad) {
        out.push(Note::Limit(Limit::HardnessNotFinite { lanes, position_m }));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn saturation_is_the_gab_isotherm_at_unit_activity() {
        // GAB (Guggenheim 1966; Anderson 1946; de Boer 1953): M(a) = Mm C K a /
        // [(1 - K a)(1 - K a + C K a)]; at a = 1 with Mm = 5 %, C = 10, K = 0.8:
        // 5 * 10 * 0.8 / (0.2 * (0.2 + 8)) = 40 / 1.64 = 24.39 %
        let g = Gab {
            monolayer_pct: 5.0,
            c: 10.0,
            k: 0.8,
        };
        assert_relative_eq!(
            saturation_moisture_pct(&g),
            40.0 / 1.64,
            max_relative = 1e-12
        );
        let open = Gab { k: 1.0, ..g };
        assert!(saturation_moisture_pct(&open).is_infinite());
    }

    #[test]
    fn the_worst_lane_and_the_count_are_kept() {
        let v = [
            (0.1, None),
            (0.2, Some(2.0)),
            (0.3, Some(5.0)),
            (0.4, Some(3.0)),
        ];
        assert_eq!(worst(v.into_iter()), Some((3, 0.3, 5.0)));
        let n = worst([(0.1, Some(2.0)), (0.2, Some(f64::NAN))].into_iter()).unwrap();
        assert_eq!((n.0, n.1), (2, 0.2));
        assert!(n.2.is_nan());
        assert_eq!(worst([(0.1, None)].into_iter()), None);
        assert_eq!(past(1.0, 2.0), None);
        assert!(past(f64::NAN, 2.0).is_some());
    }
}
