//! Stresses of a rotating annular disk (the spinning roll), superposed on the wound-in state.

/// Radial and tangential stress (Pa) at radius `r` of a free rotating annulus, plane stress:
///
/// sigma_r = (3+nu)/8 rho w^2 (b^2 + a^2 - a^2 b^2 / r^2 - r^2)
/// sigma_t = (3+nu)/8 rho w^2 (b^2 + a^2 + a^2 b^2 / r^2 - (1+3 nu)/(3+nu) r^2)
///
/// (Timoshenko and Goodier, Theory of Elasticity, 3rd ed., 1970, rotating disks.)
///
/// # Units
/// `rho` kg/m3, `omega` rad/s, radii m; returns (Pa, Pa), tension positive.
///
/// ```
/// let (_, st) = rollsleuth::winding::disk_stress(700.0, 20.0 * std::f64::consts::PI, 0.3, 0.05, 0.5, 0.05);
/// assert!((st / 1e3 - 571.18).abs() < 0.05);
/// ```
pub fn disk_stress(rho: f64, omega: f64, nu: f64, a: f64, b: f64, r: f64) -> (f64, f64) {
    let k = (3.0 + nu) / 8.0 * rho * omega * omega;
    let (a2, b2, r2) = (a * a, b * b, r * r);
    let sr = k * (b2 + a2 - a2 * b2 / r2 - r2);
    let st = k * (b2 + a2 + a2 * b2 / r2 - (1.0 + 3.0 * nu) / (3.0 + nu) * r2);
    (sr, st)
}

/// Surface speed (m/s) at which a new layer wound at `wound_in_stress_pa` (before the spin takes
/// its part, [`winder_stress`]) no longer presses on the roll: a free ring spinning
/// at surface speed v needs hoop stress rho v^2 to hold itself, so it adds interlayer pressure
/// (sigma_w - rho v^2) h / r (thin-ring equilibrium, derived); pressure vanishes at
/// v = sqrt(sigma_w / rho).
///
/// # Units
/// `wound_in_stress_pa` Pa, `rho` kg/m3; returns m/s.
pub fn lift_off_speed(wound_in_stress_pa: f64, rho: f64) -> f64 {
    (wound_in_stress_pa.max(0.0) / rho).sqrt()
}

/// Points over the build at which [`winder_stress`] samples the winder's tension.
const BUILD_SAMPLES: usize = 64;

/// The least stress a layer is wound at over the build before spin and entrained air take their
/// part, Pa: the winder's web tension at each diameter (its taper, sampled evenly in radius)
/// plus the nip-induced part (friction x nip, at most [`super::coupling::NIP_SATURATION`] times
/// the tension), over the web's caliper. The stress [`lift_off_speed`] needs: layers lift off
/// wherever they are wound at less than rho v^2 (a taper's low outer tension first), and the
/// wound-in tension the model carries has the spin already taken out, so it would put lift-off
/// at zero once the winder runs past it.
pub fn winder_stress(input: &super::WindInput, caliper_m: f64) -> f64 {
    let w = input.winding;
    let (d0, d1) = (input.roll.core_diameter_m, input.roll.diameter_m);
    let least = (0..=BUILD_SAMPLES)
        .map(|k| {
            let d = d0 + (d1 - d0) * k as f64 / BUILD_SAMPLES as f64;
            let t = w.tension.at(d).max(0.0);
            t + super::coupling::nip_tension(input.material.friction, w.nip_n_per_m, t)
        })
        .fold(f64::INFINITY, f64::min);
    least / caliper_m.max(1e-12)
}
