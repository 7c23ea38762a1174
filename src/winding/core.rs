//! Core stiffness for the winding model's inner boundary.

use crate::case::Core;

/// Effective radial stiffness E_c (Pa) of an isotropic tube loaded by external pressure, defined
/// by u(b) = -P b / E_c.
///
/// Lame thick cylinder in plane stress (Timoshenko and Goodier, Theory of Elasticity, 3rd ed.,
/// 1970): E_c = E (b^2 - a^2) / [(b^2 + a^2) - nu (b^2 - a^2)], a inner and b outer radius.
///
/// # Units
/// `modulus_pa` Pa, radii m; returns Pa.
///
/// ```
/// // steel tube 38.1/50.8 mm radii: E_c = 63.28 GPa (derived check value)
/// let e = rollsleuth::winding::core_stiffness(207e9, 0.3, 0.0381, 0.0508);
/// assert!((e / 1e9 - 63.28).abs() < 0.01);
/// ```
pub fn core_stiffness(modulus_pa: f64, poisson: f64, a_m: f64, b_m: f64) -> f64 {
    let (a2, b2) = (a_m * a_m, b_m * b_m);
    modulus_pa * (b2 - a2) / ((b2 + a2) - poisson * (b2 - a2))
}

/// Core stiffness of a case's core (Pa); `None` for a rigid core.
pub fn of(core: &Core, core_radius_m: f64) -> Option<f64> {
    match *core {
        Core::Rigid => None,
        Core::Tube {
            modulus_pa,
            wall_m,
            poisson,
        } => Some(core_stiffness(
            modulus_pa,
            poisson,
            (core_radius_m - wall_m).max(0.0),
            core_radius_m,
        )),
    }
}
