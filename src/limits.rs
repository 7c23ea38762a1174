//! Physical limits checked after each stage. The case was checked at load; these checks catch a
//! stage result that no real roll can have (a roll wound faster than its layers can stay on, a
//! stack squeezed past any real void content, moisture above saturation, a diameter inside the
//! core). A violation becomes a [`Note::Limit`], which every output shows as a warning.
//!
//! **Invariant:** pure functions of stage results; no prose (words are in `report::words`).

use crate::case::{Gab, Material, Roll};
use crate::note::{Limit, Note};
use crate::storage::Aged;
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

/// Checks on the wound-in state: winding speed against the lift-off speed, and the stack's
/// compression at the highest radial pressure of each lane.
pub fn after_winding(w: &Wound, material: &Material, speed_m_s: f64) -> Vec<Note> {
    let mut out = Vec::new();
    if speed_m_s > w.lift_off_speed_m_s {
        out.push(Note::Limit(Limit::AboveLiftOff {
            speed_m_s,
            lift_off_m_s: w.lift_off_speed_m_s,
        }));
    }
    for l in &w.lanes {
        let p_max = l
            .radial_stress_pa
            .iter()
            .map(|s| -s)
            .fold(0.0_f64, f64::max);
        let strain = material.stack.strain(p_max);
        if strain.is_nan() || strain > MAX_STACK_STRAIN {
            out.push(Note::Limit(Limit::StackCrushed {
                position_m: l.position_m,
                pressure_pa: p_max,
                strain,
            }));
        }
    }
    out
}

/// Checks on the roll after storage: lane diameters outside the core, moisture at or below
/// saturation, finite predicted hardness. One note per lane and kind (its worst value).
pub fn after_storage(a: &Aged, material: &Material, roll: &Roll) -> Vec<Note> {
    let mut out = Vec::new();
    let saturation = saturation_moisture_pct(&material.sorption);
    for l in &a.lanes {
        let d_min = l.diameter_m.iter().copied().fold(f64::INFINITY, f64::min);
        if d_min.is_nan() || d_min <= roll.core_diameter_m {
            out.push(Note::Limit(Limit::DiameterInsideCore {
                position_m: l.position_m,
                diameter_m: d_min,
                core_diameter_m: roll.core_diameter_m,
            }));
        }
        let m_max = l
            .moisture_pct
            .iter()
            .copied()
            .fold(f64::NEG_INFINITY, f64::max);
        // 0.01 percentage point: the diffusion solver's rounding, far below any gauge
        if m_max.is_nan() || m_max > saturation + 0.01 {
            out.push(Note::Limit(Limit::MoistureAboveSaturation {
                position_m: l.position_m,
                moisture_pct: m_max,
                saturation_pct: saturation,
            }));
        }
        if l.hardness.iter().any(|h| !h.is_finite()) {
            out.push(Note::Limit(Limit::HardnessNotFinite {
                position_m: l.position_m,
            }));
        }
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
}
