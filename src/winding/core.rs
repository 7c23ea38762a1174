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

/// Elastic collapse pressure of a thin ring under external pressure, Pa: p_cr = 3 E I / r^3 with
/// I = t^3 / 12 per unit length (Timoshenko and Gere 1961, Theory of Elastic Stability, 2nd ed.,
/// ring buckling; from memory), r the mid-wall radius. For a thick paper core this overstates
/// (the wall crushes first); a maker's rating, when given, is used instead.
///
/// # Units
/// `modulus_pa` Pa, `wall_m` and `outer_radius_m` m; returns Pa.
///
/// ```
/// // 3 GPa tube, 4 mm wall, 38 mm outer radius: r = 36 mm, p = 3 E t^3 / (12 r^3) = 1.029 MPa
/// let p = rollsleuth::winding::ring_collapse_pressure(3e9, 0.004, 0.038);
/// assert!((p / 1e6 - 1.0288).abs() < 1e-3);
/// ```
pub fn ring_collapse_pressure(modulus_pa: f64, wall_m: f64, outer_radius_m: f64) -> f64 {
    let r = (outer_radius_m - 0.5 * wall_m).max(1e-9);
    3.0 * modulus_pa * wall_m.powi(3) / 12.0 / r.powi(3)
}

/// Decay length of a ring load on a thin cylindrical shell, m: pi / beta with
/// beta^4 = 3 (1 - nu^2) / (R^2 t^2), R the mid-wall radius and t the wall (Timoshenko and
/// Woinowsky-Krieger 1959, Theory of Plates and Shells, 2nd ed., section 114: the deflection
/// under a ring load goes as e^(-beta x) (cos beta x + sin beta x), down to e^(-pi) = 4 % of its
/// peak at x = pi / beta). A local pressure on a tube is carried over about this length, so the
/// pressure a core's collapse pressure (a pressure over its length) is compared with is a mean
/// over it.
///
/// # Units
/// `wall_m`, `outer_radius_m` m; returns m.
///
/// ```
/// // 152 mm core, 12 mm wall, nu 0.3: R = 70 mm, beta = (2.73 / (0.07 x 0.012)^2)^(1/4)
/// // = 44.35 /m, pi / beta = 70.84 mm
/// let l = rollsleuth::winding::ring_load_length(0.012, 0.076, 0.3);
/// assert!((l * 1e3 - 70.84).abs() < 0.01);
/// ```
pub fn ring_load_length(wall_m: f64, outer_radius_m: f64, poisson: f64) -> f64 {
    let r = (outer_radius_m - 0.5 * wall_m).max(1e-9);
    let beta = (3.0 * (1.0 - poisson * poisson)).powf(0.25) / (r * wall_m.max(1e-12)).sqrt();
    std::f64::consts::PI / beta
}

/// The width over which the pressure on a case's core is averaged before it is compared with
/// the core's collapse pressure, m: the tube's [`ring_load_length`], never more than the roll's
/// `width_m`; the whole width for a rigid core (its bending length is unbounded).
pub fn core_load_width(core: &Core, core_radius_m: f64, width_m: f64) -> f64 {
    match *core {
        Core::Rigid => width_m,
        Core::Tube {
            wall_m, poisson, ..
        } => ring_load_length(wall_m, core_radius_m, poisson).min(width_m),
    }
}

/// Collapse pressure of a case's core, Pa: the maker's `rating` when given, else the thin-ring
/// buckling pressure of a tube; `None` for a rigid core without a rating.
pub fn collapse_pressure(core: &Core, core_radius_m: f64, rating_pa: Option<f64>) -> Option<f64> {
    if rating_pa.is_some() {
        return rating_pa;
    }
    match *core {
        Core::Rigid => None,
        Core::Tube {
            modulus_pa, wall_m, ..
        } => Some(ring_collapse_pressure(modulus_pa, wall_m, core_radius_m)),
    }
}
