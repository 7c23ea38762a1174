//! Air entrained at winding: the web drags a film of air into the roll.
//!
//! - Without a nip the web wraps the roll as a foil bearing: film thickness
//!   h = 0.643 R (6 mu U / T)^(2/3) (Knox and Sweeney 1971, "Fluid effects associated with web
//!   handling", I&EC Process Design and Development 10(2)), with R the roll's radius, mu the air's
//!   viscosity, U the web speed and T the web tension per width.
//! - A nip (a lay-on roll) squeezes the film to the rigid-isoviscous line-contact thickness of
//!   Martin (1916): h = 4.9 mu U R_e / w, with w the nip load per width and R_e = R r_n / (R + r_n)
//!   (as given in Hamrock 1994, Fundamentals of Fluid Film Lubrication; from memory). The film is
//!   the smaller of the two: a light nip does not squeeze below the foil bearing.
//! - Air escapes through the valleys of the two faces in contact, combined roughness
//!   sqrt(2) x the grade's roughness of one face (root-sum-square of two alike faces; common
//!   practice). Only the film beyond it stays trapped.
//! - Effect (our model): the layer is wound on the trapped film; as the air bleeds out through
//!   the stack it moves inward by the film's excess over the roughness and loses hoop strain
//!   (h - sigma) / R. The wound-in tension is lowered by E c (h - sigma) / R (never below zero).
//!   Since h grows with R, the outer wraps lose the most: loose outer wraps on soft, fast, light
//!   rolls.
//!
//! **Invariant:** pure functions; SI in and out.

use crate::case::{Material, Winding};

/// Dynamic viscosity of air at 20 C, Pa s (1.81e-5; handbook value, from memory).
pub const AIR_VISCOSITY_PA_S: f64 = 1.81e-5;
/// Radius of the lay-on roll forming a winding nip, m (lay-on and rider rolls 150-300 mm in
/// diameter; from memory).
pub const NIP_ROLL_RADIUS_M: f64 = 0.1;

/// Knox and Sweeney (1971) foil-bearing film thickness, m: radius `r` (m), viscosity `mu`
/// (Pa s), speed `u` (m/s), web tension `t` (N/m).
pub fn foil_bearing_film_m(r: f64, mu: f64, u: f64, t: f64) -> f64 {
    0.643 * r * (6.0 * mu * u.max(0.0) / t.max(1e-9)).powf(2.0 / 3.0)
}

/// Martin (1916) rigid-isoviscous line-contact film, m: effective radius `r_e` (m), viscosity
/// `mu` (Pa s), entraining speed `u` (m/s), load per width `w` (N/m).
pub fn nip_film_m(r_e: f64, mu: f64, u: f64, w: f64) -> f64 {
    4.9 * mu * u.max(0.0) * r_e / w.max(1e-9)
}

/// The film entrained at roll radius `r` (m) under web tension `t` (N/m), m.
pub fn film_m(winding: &Winding, r: f64, t: f64) -> f64 {
    let u = winding.speed_m_s;
    let foil = foil_bearing_film_m(r, AIR_VISCOSITY_PA_S, u, t);
    if winding.nip_n_per_m > 0.0 {
        let r_e = r * NIP_ROLL_RADIUS_M / (r + NIP_ROLL_RADIUS_M);
        foil.min(nip_film_m(r_e, AIR_VISCOSITY_PA_S, u, winding.nip_n_per_m))
    } else {
        foil
    }
}

/// Combined roughness of two faces in contact, m.
pub fn escape_gap_m(material: &Material) -> f64 {
    std::f64::consts::SQRT_2 * material.roughness_m
}

/// Hoop strain a layer wound at radius `r` (m) under web tension `t` (N/m) loses as the trapped
/// air bleeds out: the film's excess over the combined roughness over the radius.
pub fn strain_loss(material: &Material, winding: &Winding, r: f64, t: f64) -> f64 {
    if r <= 0.0 {
        return 0.0;
    }
    (film_m(winding, r, t) - escape_gap_m(material)).max(0.0) / r
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn film_scales_as_the_two_thirds_power() {
        // h ~ (U / T)^(2/3): doubling the speed multiplies the film by 2^(2/3)
        let h1 = foil_bearing_film_m(0.5, AIR_VISCOSITY_PA_S, 10.0, 300.0);
        let h2 = foil_bearing_film_m(0.5, AIR_VISCOSITY_PA_S, 20.0, 300.0);
        assert_relative_eq!(h2 / h1, 2f64.powf(2.0 / 3.0), max_relative = 1e-12);
    }
}
