//! Equilibrium moisture from the GAB sorption isotherm.
//!
//! Guggenheim-Anderson-de Boer: M = Mm C K a / [(1 - K a)(1 - K a + C K a)], a the water activity
//! (RH as a fraction), M in % dry basis. Van den Berg (1985) gives the temperature dependence of
//! C and K; it is not modelled here (constants at 23 C).

use crate::case::Gab;

/// Equilibrium moisture content (%) at relative humidity `rh` (fraction 0..1).
///
/// ```
/// use rollsleuth::case::Gab;
/// let g = Gab { monolayer_pct: 5.5, c: 10.0, k: 0.75 };
/// assert!((rollsleuth::storage::gab_moisture(&g, 0.5) - 7.543).abs() < 1e-3);
/// ```
pub fn gab_moisture(g: &Gab, rh: f64) -> f64 {
    let a = rh.clamp(0.0, 0.999);
    let ka = g.k * a;
    g.monolayer_pct * g.c * ka / ((1.0 - ka) * (1.0 - ka + g.c * ka))
}
