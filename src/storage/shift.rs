//! Time shifts: storage at other temperatures and moistures mapped onto one reduced time.
//!
//! Arrhenius: ln a_T = (E_a / R) (1/T - 1/T_ref) (Arrhenius form as used for creep of paper;
//! WLF, Williams, Landel and Ferry 1955, is poorly justified for paper at storage temperatures).
//! Moisture: log10 a_M = -c_M (MC - MC_ref) (common practice). Reduced time d xi = dt / (a_T a_M):
//! warmer or wetter storage runs the creep clock faster.

/// Universal gas constant, J/(mol K) (CODATA 2018, exact).
pub const GAS_R: f64 = 8.314_462_618;
/// Reference temperature for creep parameters: 23 C, the paper-testing standard atmosphere
/// (TAPPI T 402 / ISO 187), K.
pub const T_REF_K: f64 = 296.15;

/// Arrhenius shift factor a_T (dimensionless) at temperature `t_k` (K).
///
/// ```
/// // E_a = 100 kJ/mol, 23 C -> 40 C: a_T = 0.1103 (derived check value)
/// let a = rollsleuth::storage::arrhenius_shift(100e3, 313.15);
/// assert!((a - 0.1103).abs() < 5e-4);
/// ```
pub fn arrhenius_shift(activation_j_mol: f64, t_k: f64) -> f64 {
    ((activation_j_mol / GAS_R) * (1.0 / t_k - 1.0 / T_REF_K)).exp()
}

/// Moisture shift factor a_M at moisture `mc` (%) relative to `mc_ref` (%).
pub fn moisture_shift(c_dec_per_pct: f64, mc: f64, mc_ref: f64) -> f64 {
    10f64.powf(-c_dec_per_pct * (mc - mc_ref))
}
