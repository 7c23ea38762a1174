//! Condensation on a cold roll brought into warm humid air. When a stretch's dew point is above
//! the roll's temperature (taken as the previous stretch's air temperature: a roll's core and
//! outer wraps follow the air over days), water condenses on the faces that are not wrapped in
//! film until their surface warms past the dew point.
//!
//! - Dew point and saturation vapour pressure: Magnus form with the constants of Alduchov and
//!   Eskridge (1996): e_s(T) = 610.94 exp(17.625 T / (T + 243.04)) Pa, T in C.
//! - Mass transfer by the Chilton-Colburn analogy: h_m = h / (rho_air c_p,air Le^(2/3)), with
//!   the flux h_m (rho_v,air - rho_v,sat(T_s)).
//! - Surface heat-up: a semi-infinite solid under a step in ambient temperature with a
//!   convective coefficient (Carslaw and Jaeger 1959, section 2.7): (T_s - T_0) / (T_e - T_0) =
//!   1 - exp(b^2) erfc(b), b = h_e sqrt(alpha t) / k. The latent heat of the condensing water
//!   heats the surface too: with the saturation vapour density taken linear between the roll's
//!   temperature and the dew point (slope s), the surface takes h (T_air - T_s) + L h_m
//!   (rho_v,air - rho_v,sat(T_s)) = h_e (T_e - T_s), with h_e = h + L h_m s (the linearisation
//!   of the psychrometric energy balance).
//!
//! **Invariant:** pure functions of the storage history; SI in and out.

use crate::case::{Stretch, Wrap};
use crate::numeric::erfc;
use crate::units::ZERO_C_K;

/// Convective heat transfer coefficient at a stored roll's surface in still indoor air, W/(m2 K)
/// (natural convection on large surfaces, about 3-10 W/(m2 K); from memory).
pub const H_AIR_W_M2K: f64 = 5.0;
/// Thermal conductivity of a wound paper stack through its thickness, W/(m K) (paper 0.05-0.15
/// W/(m K); from memory).
pub const K_STACK_W_MK: f64 = 0.1;
/// Volumetric heat capacity of a paper stack, J/(m3 K): about 750 kg/m3 x 1300 J/(kg K) (paper's
/// specific heat 1.2-1.4 kJ/(kg K); from memory).
pub const RHO_C_STACK_J_M3K: f64 = 750.0 * 1300.0;
/// Air density and specific heat at room conditions: 1.2 kg/m3, 1005 J/(kg K) (handbook values,
/// from memory); Lewis number of water vapour in air 0.85 (from memory).
const RHO_CP_AIR: f64 = 1.2 * 1005.0;
const LEWIS: f64 = 0.85;
/// Molar mass of water over the gas constant, kg K / J: 0.018015 / 8.314462.
const MW_OVER_R: f64 = 0.018015 / 8.314_462;
/// Depth of the outer wraps that takes up condensed water first, m (a few millimetres of wraps;
/// an assumption stated in the note).
pub const UPTAKE_DEPTH_M: f64 = 0.002;

/// Saturation vapour pressure over water, Pa, at `t_k` (Magnus; Alduchov and Eskridge 1996).
pub fn saturation_pressure_pa(t_k: f64) -> f64 {
    let t = t_k - ZERO_C_K;
    610.94 * (17.625 * t / (t + 243.04)).exp()
}

/// Dew point, K, of air at `t_k` and relative humidity `rh` (fraction).
pub fn dew_point_k(t_k: f64, rh: f64) -> f64 {
    let t = t_k - ZERO_C_K;
    let g = rh.max(1e-6).ln() + 17.625 * t / (243.04 + t);
    ZERO_C_K + 243.04 * g / (17.625 - g)
}

/// exp(b^2) erfc(b) for b >= 0, written to stay finite for large b (asymptotic
/// 1 / (b sqrt(pi)) (1 - 1/(2 b^2)) beyond b = 5).
fn scaled_erfc(b: f64) -> f64 {
    if b > 5.0 {
        (1.0 - 0.5 / (b * b)) / (b * std::f64::consts::PI.sqrt())
    } else {
        (b * b).exp() * erfc(b)
    }
}

/// Latent heat of condensation of water near room temperature, J/kg (2.45 MJ/kg at 20 C;
/// handbook value, from memory).
const LATENT_J_KG: f64 = 2.45e6;

/// Surface temperature, K, of a semi-infinite stack at `t0_k` a time `t_s` after the ambient
/// around it changed to `ambient_k`, with convective coefficient `h` (W/(m2 K)).
pub fn surface_temperature_k(t0_k: f64, ambient_k: f64, h: f64, t_s: f64) -> f64 {
    let alpha = K_STACK_W_MK / RHO_C_STACK_J_M3K;
    let b = h * (alpha * t_s.max(0.0)).sqrt() / K_STACK_W_MK;
    t0_k + (ambient_k - t0_k) * (1.0 - scaled_erfc(b))
}

/// Saturation vapour density, kg/m3, at `t_k`.
fn vapour_density(t_k: f64) -> f64 {
    saturation_pressure_pa(t_k) * MW_OVER_R / t_k
}

/// Water condensed on an exposed face, and how long the surface stays below the dew point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Condensation {
    /// Index of the stretch the roll was brought into.
    pub stretch: usize,
    /// Roll temperature on arrival, K.
    pub roll_k: f64,
    /// Dew point of the new air, K.
    pub dew_point_k: f64,
    /// Time until the surface passes the dew point, s (capped at the stretch's duration).
    pub wet_s: f64,
    /// Water condensed per unit area of exposed face, kg/m2.
    pub water_kg_m2: f64,
    /// Whether the barrel and the end faces were exposed (not wrapped in film).
    pub barrel: bool,
    pub ends: bool,
}

impl Condensation {
    /// Moisture rise of the outer [`UPTAKE_DEPTH_M`] of wraps if they take up all the water,
    /// percentage points (dry basis), for a stack of `density_kg_m3`.
    pub fn outer_rise_pct(&self, density_kg_m3: f64) -> f64 {
        100.0 * self.water_kg_m2 / (density_kg_m3 * UPTAKE_DEPTH_M)
    }
}

/// Condensation at each stretch whose dew point is above the roll's temperature on arrival and
/// which leaves a face unwrapped in film. The first stretch follows winding at its own
/// temperature: no condensation.
pub fn check(storage: &[Stretch]) -> Vec<Condensation> {
    let mut out = Vec::new();
    for (i, w) in storage.windows(2).enumerate() {
        let (before, after) = (&w[0], &w[1]);
        let roll_k = before.temperature_k;
        let dew = dew_point_k(after.temperature_k, after.rh);
        let barrel = after.barrel_wrap != Wrap::Film;
        let ends = after.end_wrap != Wrap::Film;
        if dew <= roll_k || !(barrel || ends) {
            continue;
        }
        let (wet_s, water) = integrate(roll_k, after.temperature_k, after.rh, after.duration_s);
        if water > 0.0 {
            out.push(Condensation {
                stretch: i + 1,
                roll_k,
                dew_point_k: dew,
                wet_s,
                water_kg_m2: water,
                barrel,
                ends,
            });
        }
    }
    out
}

/// Water condensed per area, kg/m2, and the time the surface stays below the dew point, s: the
/// surface warms with the effective coefficient and ambient of the module notes; the flux is
/// integrated on a geometric time grid (1 s to the stretch's end, 400 steps, midpoint rule).
fn integrate(roll_k: f64, air_k: f64, rh: f64, duration_s: f64) -> (f64, f64) {
    let h = H_AIR_W_M2K;
    let h_m = h / (RHO_CP_AIR * LEWIS.powf(2.0 / 3.0));
    let dew = dew_point_k(air_k, rh);
    let rho_v_air = vapour_density(dew);
    let slope = (rho_v_air - vapour_density(roll_k)) / (dew - roll_k);
    let h_e = h + LATENT_J_KG * h_m * slope;
    // h (T_air - T) + L h_m (rho_air - rho_0 - s (T - T_0)) = h_e (T_e - T)
    let t_e = (h * air_k
        + LATENT_J_KG * h_m * (rho_v_air - vapour_density(roll_k) + slope * roll_k))
        / h_e;
    let (mut water, mut wet, mut t_prev) = (0.0, 0.0, 0.0);
    let steps = 400;
    let t_end = duration_s.max(1.0);
    for k in 0..=steps {
        let t = t_end.powf(k as f64 / steps as f64);
        let ts = surface_temperature_k(roll_k, t_e, h_e, 0.5 * (t + t_prev));
        if ts >= dew {
            break;
        }
        water += h_m * (rho_v_air - vapour_density(ts)).max(0.0) * (t - t_prev);
        wet = t;
        t_prev = t;
    }
    (wet, water)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn erfc_matches_the_tables() {
        // Abramowitz and Stegun (1964), table 7.1: erf(0.5) = 0.5204998778, erf(1) =
        // 0.8427007929, erf(2) = 0.9953222650
        assert_relative_eq!(erfc(0.5), 1.0 - 0.520_499_877_8, epsilon = 2e-7);
        assert_relative_eq!(erfc(1.0), 1.0 - 0.842_700_792_9, epsilon = 2e-7);
        assert_relative_eq!(erfc(2.0), 1.0 - 0.995_322_265_0, epsilon = 2e-7);
        assert_relative_eq!(erfc(-1.0), 1.0 + 0.842_700_792_9, epsilon = 2e-7);
        // the asymptotic branch joins the direct one
        assert_relative_eq!(
            scaled_erfc(5.0 - 1e-9),
            scaled_erfc(5.0 + 1e-9),
            max_relative = 2e-3
        );
    }

    #[test]
    fn dew_point_and_saturation_match_magnus() {
        // Alduchov and Eskridge (1996) constants: e_s(0 C) = 610.94 Pa; at 20 C, 50 % RH the
        // dew point is 9.26 C (the same form worked through by hand: gamma = ln 0.5 +
        // 17.625 * 20 / 263.04 = 0.64695, Td = 243.04 * gamma / (17.625 - gamma) = 9.26 C)
        assert_relative_eq!(saturation_pressure_pa(ZERO_C_K), 610.94, epsilon = 1e-9);
        assert_relative_eq!(
            dew_point_k(ZERO_C_K + 20.0, 0.5) - ZERO_C_K,
            9.26,
            epsilon = 0.01
        );
        // saturated air: the dew point is the air temperature
        assert_relative_eq!(dew_point_k(300.0, 1.0), 300.0, epsilon = 1e-9);
    }

    #[test]
    fn surface_heats_up_as_the_semi_infinite_solution() {
        // at t = 0 the surface is at the roll's temperature; much later at the air's
        let h = H_AIR_W_M2K;
        // (the erfc fit is good to 1.2e-7, so within 20 K x 1.2e-7)
        assert_relative_eq!(
            surface_temperature_k(280.0, 300.0, h, 0.0),
            280.0,
            epsilon = 1e-5
        );
        assert!(surface_temperature_k(280.0, 300.0, h, 1e9) > 299.0);
        // b = 1 (t = k^2 / (h^2 alpha)): 1 - exp(1) erfc(1) = 0.57241 (A&S table 7.1 values)
        let alpha = K_STACK_W_MK / RHO_C_STACK_J_M3K;
        let t = (K_STACK_W_MK / H_AIR_W_M2K).powi(2) / alpha;
        let frac = (surface_temperature_k(280.0, 300.0, h, t) - 280.0) / 20.0;
        assert_relative_eq!(frac, 1.0 - 1f64.exp() * 0.157_299_207, epsilon = 1e-6);
    }
}
