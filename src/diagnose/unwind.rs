//! What a roll does at the converter's unwind that the lane lengths do not show: the
//! once-per-turn swing of web tension from a flat left by storage on the side
//! ([`crate::storage::out_of_round`]).
//!
//! Tension swing model: the unwind roll turns against a brake whose torque does not follow a
//! once-per-turn swing; its rotary inertia reduced to its surface, m = J / R^2 per width
//! (J = M (R^2 + R_c^2) / 2, a thick-walled cylinder), rides on the free span's stiffness
//! k = E c / L per width (the quasi-static limit of the first-order span model of Whitworth and
//! Harrison 1983: a span of length L stretched by a path change dx carries E c dx / L). The flat
//! is taken as a once-per-turn sinusoidal run-out of the same peak-to-peak depth (amplitude
//! e = depth / 2; a narrow flat also has higher harmonics, not modelled) at w = v / R. The
//! spring force of a base-excited single-degree-of-freedom oscillator (Den Hartog 1956,
//! Mechanical Vibrations, ch. 2) is the tension swing:
//! dT = k e r^2 / sqrt((1 - r^2)^2 + (2 zeta r)^2), r = w / w_n, w_n = sqrt(k / m).
//! Slow (r << 1) the roll follows the flat and the swing is its inertia force m w^2 e, growing as
//! the square of the speed; fast (r >> 1) the span takes the whole run-out, k e.
//!
//! **Invariant:** pure functions; SI in and out.

use crate::case::Case;
use crate::lanes::Lanes;
use crate::numeric::weighted_mean;
use crate::storage::out_of_round::{self, Flat};
use crate::storage::LaneCreep;
use crate::winding::Wound;
use serde::Serialize;

/// Free span from the unwind roll to the first roller, m (1-2 m on presses and sheeters; common
/// practice, from memory).
pub const SPAN_M: f64 = 1.5;
/// Damping ratio of the roll-on-span oscillation (a web span is lightly damped, a few to 10 % of
/// critical; from memory).
pub const DAMPING_RATIO: f64 = 0.1;

/// The once-per-turn tension swing at unwind.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Swing {
    /// Radial run-out at unwind (the flat's residual depth), m.
    pub run_out_m: f64,
    /// Once-per-turn frequency at the converter's speed and the natural frequency of the roll on
    /// its span, rad/s.
    pub turn_rad_s: f64,
    pub natural_rad_s: f64,
    /// Amplitude of the tension swing, N/m.
    pub amplitude_n_per_m: f64,
    /// Amplitude of the swing of web stress (tension over caliper), Pa.
    pub stress_amplitude_pa: f64,
    /// Running tension plus the swing over the caliper, Pa.
    pub peak_stress_pa: f64,
}

/// What the roll does at unwind: the flat (None unless stored on its side) and its swing.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct AtUnwind {
    pub flat: Option<Flat>,
    pub swing: Option<Swing>,
}

/// Relative-motion response of a base-excited oscillator at frequency ratio `r` and damping
/// ratio `zeta`: r^2 / sqrt((1 - r^2)^2 + (2 zeta r)^2) (Den Hartog 1956).
pub fn relative_response(r: f64, zeta: f64) -> f64 {
    let r2 = r * r;
    r2 / ((1.0 - r2).powi(2) + (2.0 * zeta * r).powi(2)).sqrt()
}

/// The tension swing of a roll with run-out `run_out_m` (peak to peak, m) at the case's
/// converting speed and tension.
pub fn swing(case: &Case, run_out_m: f64) -> Swing {
    let m = &case.material;
    let (r, rc) = (0.5 * case.roll.diameter_m, 0.5 * case.roll.core_diameter_m);
    let mass = 0.5
        * m.density_kg_m3
        * std::f64::consts::PI
        * (r * r - rc * rc)
        * (1.0 + rc * rc / (r * r));
    let k = m.md_modulus_pa * m.caliper_m / SPAN_M;
    let wn = (k / mass.max(1e-9)).sqrt();
    let w = case.converting_speed_m_s / r.max(1e-9);
    let amplitude = k * 0.5 * run_out_m * relative_response(w / wn, DAMPING_RATIO);
    Swing {
        run_out_m,
        turn_rad_s: w,
        natural_rad_s: wn,
        amplitude_n_per_m: amplitude,
        stress_amplitude_pa: amplitude / m.caliper_m,
        peak_stress_pa: (case.converting_tension_n_per_m + amplitude) / m.caliper_m,
    }
}

/// The roll at unwind after storage: the flat with the lanes' mean radial creep law (delayed
/// compliance and viscous fluidity) and the outer wraps' mean wound-in pressure, and its swing.
/// The means are over the width (`lanes`' widths): the floor contact runs along the whole barrel,
/// so a 25 mm edge strip counts for its 25 mm whatever the lane count.
pub fn at_unwind(case: &Case, wound: &Wound, creep: &[LaneCreep], lanes: &Lanes) -> AtUnwind {
    let w = lanes.widths();
    let mut radial = case.material.creep.radial;
    if !creep.is_empty() {
        let mean = |g: &dyn Fn(&LaneCreep) -> f64| {
            weighted_mean(&creep.iter().map(g).collect::<Vec<_>>(), &w)
        };
        radial.delayed = mean(&|c| c.radial.delayed);
        radial.viscous_time_s = mean(&|c| c.radial.viscous_time_s.recip()).recip();
    }
    let ps = wound.mean_surface_pressure_pa(&w);
    let flat = out_of_round::flat(&case.material, &case.roll, &case.storage, ps, &radial);
    AtUnwind {
        swing: flat.map(|f| swing(case, f.residual_depth_m)),
        flat,
    }
}

/// The unwind features: run-out, mm; tension swing over the converting tension; peak web stress
/// over the MD tensile strength (the running stress alone for a round roll).
pub struct UnwindFeatures {
    pub run_out_mm: f64,
    pub tension_swing_ratio: f64,
    pub stress_strength_ratio: f64,
}

/// The unwind features of a roll.
pub fn features(case: &Case, u: &AtUnwind) -> UnwindFeatures {
    let t = case.converting_tension_n_per_m;
    let running = t / case.material.caliper_m;
    let s = u.swing;
    UnwindFeatures {
        run_out_mm: s.map_or(0.0, |s| s.run_out_m * 1e3),
        tension_swing_ratio: s.map_or(0.0, |s| s.amplitude_n_per_m / t.max(1e-9)),
        stress_strength_ratio: s.map_or(running, |s| s.peak_stress_pa)
            / case.material.strength.md_tensile_pa.max(1e-9),
    }
}

/// The air features at full diameter, where the film is thickest (it grows with the radius).
pub struct AirFeatures {
    /// Entrained film over the combined roughness of two faces.
    pub film_roughness_ratio: f64,
    /// Wound-in tension lost to the air over the web tension.
    pub tension_loss_ratio: f64,
}

/// The air entrained at full diameter ([`crate::winding::air`]).
pub fn air_features(case: &Case) -> AirFeatures {
    use crate::winding::air;
    let r = 0.5 * case.roll.diameter_m;
    let t = case.winding.tension.at(case.roll.diameter_m);
    let m = &case.material;
    let h = air::film_m(&case.winding, r, t);
    let loss = air::strain_loss(m, &case.winding, r, t) * m.md_modulus_pa * m.caliper_m;
    AirFeatures {
        film_roughness_ratio: h / air::escape_gap_m(m).max(1e-12),
        tension_loss_ratio: loss / t.max(1e-9),
    }
}
