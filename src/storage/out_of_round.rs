//! Out-of-round from storage on the side: a roll lying on its barrel bears its own weight on one
//! line of the floor, the stack there compresses and creeps, and a flat is left when the roll is
//! stood up or put on the unwind stand.
//!
//! - Contact: Hertz line contact of a cylinder on a rigid flat (Johnson 1985, Contact Mechanics,
//!   section 4.3, eq. 4.45): half-width a = sqrt(4 P R / (pi E*)), peak pressure
//!   p0 = 2 P / (pi a), with P the weight per width. The roll is taken as a homogeneous body with
//!   the stack's radial modulus and no Poisson coupling (E* = E_r): the radial direction carries
//!   the load, and a wound stack's in-plane coupling is small (the winding model's own
//!   assumption). The flat's depth is the sagitta of the contact chord, a^2 / (2 R) = 2 P / (pi
//!   E*).
//! - Stack modulus: the Pfeiffer law is non-linear, so E_r is the secant modulus of the stack from
//!   the outer wraps' interlayer pressure (the wound-in state) to that plus the mean contact
//!   pressure P / (2 a); a and E_r are solved together (fixed point).
//! - Creep: under a constant load the contact of a linear viscoelastic body follows the elastic
//!   one with 1/E* replaced by the creep compliance J(t) (Lee and Radok 1960, for a contact that
//!   does not shrink), so the depth is 2 P J(t) / pi with the model's radial Burgers law
//!   (relative to the secant compliance), at the reduced time of the stretches spent on the side
//!   (Arrhenius shift at each stretch's temperature; the roll's bulk at its winding moisture).
//! - Recovery: when the roll is stood up (or lifted onto the unwind stand) the elastic part
//!   recovers at once, the delayed (Kelvin) part as exp(-t / tau_K) over the reduced time after
//!   the last stretch on the side, and the viscous part stays (the Burgers law's own recovery;
//!   Findley, Lai and Onaran 1976). What is left is the run-out at unwind.
//!
//! Every stretch on the side loads the same contact line (unless `contact_share` says the roll
//! was turned), and the load is taken to end with the last such stretch: an upper bound when a
//! roll stood on end between stretches on its side.
//!
//! **Invariant:** pure functions of the material, roll, storage history and wound state; SI.

use crate::case::{Burgers, Material, Roll, Stance, Stretch};
use std::f64::consts::PI;

/// Standard gravity, m/s2 (CGPM 1901, exact).
pub const G_M_S2: f64 = 9.806_65;

/// The flat of a roll stored on its side.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Flat {
    /// Weight per width bearing on the floor, N/m.
    pub load_n_per_m: f64,
    /// Secant radial modulus of the stack over the contact's pressure, Pa.
    pub modulus_pa: f64,
    /// Contact half-width of the elastic contact, m.
    pub half_width_m: f64,
    /// Hertz peak contact pressure of the elastic contact, Pa.
    pub peak_pressure_pa: f64,
    /// Flat depth under load: the elastic part and the creep part at the end of the time on the
    /// side, m.
    pub elastic_depth_m: f64,
    pub creep_depth_m: f64,
    /// Depth left after the recovery up to unwind: the radial run-out, m.
    pub residual_depth_m: f64,
    /// Reduced time under load and recovering, s.
    pub loaded_s: f64,
    pub recovering_s: f64,
}

/// Reduced time of a stretch for a creep law with activation energy `ea` (J/mol).
fn reduced(st: &Stretch, ea: f64) -> f64 {
    st.duration_s / super::arrhenius_shift(ea, st.temperature_k)
}

/// Hertz half-width (m) of a line contact: load `p` per width (N/m), radius `r` (m), contact
/// modulus `e` (Pa) (Johnson 1985, eq. 4.45).
pub fn hertz_half_width_m(p: f64, r: f64, e: f64) -> f64 {
    (4.0 * p * r / (PI * e)).sqrt()
}

/// Hertz peak pressure (Pa) of a line contact of half-width `a` under load `p` per width.
pub fn hertz_peak_pressure_pa(p: f64, a: f64) -> f64 {
    2.0 * p / (PI * a)
}

/// Weight per width of a roll's wound stack, N/m (the core's weight is left out).
pub fn weight_per_width(material: &Material, roll: &Roll) -> f64 {
    let (r, rc) = (0.5 * roll.diameter_m, 0.5 * roll.core_diameter_m);
    G_M_S2 * material.density_kg_m3 * PI * (r * r - rc * rc)
}

/// Secant radial modulus (Pa) of the stack between pressure `p0` and `p0 + dp` (Pa).
fn secant_modulus(material: &Material, p0: f64, dp: f64) -> f64 {
    let s = &material.stack;
    let de = s.strain(p0 + dp) - s.strain(p0);
    if de > 0.0 {
        dp / de
    } else {
        s.modulus(p0)
    }
}

/// The flat of a roll stored on its side in any stretch of `storage` (None when it never was).
/// `surface_pressure_pa`: the interlayer pressure in the outer wraps (wound-in state);
/// `radial`: the radial Burgers creep law (the fitted lanes' mean).
pub fn flat(
    material: &Material,
    roll: &Roll,
    storage: &[Stretch],
    surface_pressure_pa: f64,
    radial: &Burgers,
) -> Option<Flat> {
    let last_side = storage.iter().rposition(|s| s.stance == Stance::OnSide)?;
    let ea = material.creep.activation_energy_j_mol;
    let loaded_s: f64 = storage[..=last_side]
        .iter()
        .filter(|s| s.stance == Stance::OnSide)
        .map(|s| reduced(s, ea) * s.contact_share.clamp(0.0, 1.0))
        .sum();
    let recovering_s: f64 = storage[last_side + 1..]
        .iter()
        .map(|s| reduced(s, ea))
        .sum();
    let p = weight_per_width(material, roll);
    let r = 0.5 * roll.diameter_m;
    let ps = surface_pressure_pa.max(0.0);
    // fixed point of a and the secant modulus (geometric mean damping; contraction about 1/2)
    let mut e = material.stack.modulus(ps).max(1.0);
    let mut a = hertz_half_width_m(p, r, e);
    for _ in 0..60 {
        e = secant_modulus(material, ps, p / (2.0 * a)).max(1.0);
        a = (a * hertz_half_width_m(p, r, e)).sqrt();
    }
    let elastic = 2.0 * p / (PI * e);
    let kelvin = radial.delayed * (1.0 - (-loaded_s / radial.retardation_s).exp());
    let viscous = loaded_s / radial.viscous_time_s;
    let creep = elastic * (kelvin + viscous);
    let residual = elastic * (kelvin * (-recovering_s / radial.retardation_s).exp() + viscous);
    Some(Flat {
        load_n_per_m: p,
        modulus_pa: e,
        half_width_m: a,
        peak_pressure_pa: hertz_peak_pressure_pa(p, a),
        elastic_depth_m: elastic,
        creep_depth_m: creep,
        residual_depth_m: residual,
        loaded_s,
        recovering_s,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn sagitta_of_the_hertz_chord_is_the_depth() {
        // a^2 / (2R) = 2P / (pi E): the chord's sagitta equals the depth used
        let (p, r, e) = (5000.0, 0.5, 5e6);
        let a = hertz_half_width_m(p, r, e);
        assert_relative_eq!(a * a / (2.0 * r), 2.0 * p / (PI * e), max_relative = 1e-12);
    }
}
