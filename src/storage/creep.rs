//! Burgers four-element creep law: closed forms and the incremental update used in the roll.
//!
//! A Maxwell element (spring E, dashpot eta_M: the permanent, viscous part) in series with a
//! Kelvin element (spring E_K, dashpot eta_K: the delayed, recoverable part). Findley, Lai and
//! Onaran (1976) Creep and Relaxation of Nonlinear Viscoelastic Materials, ch. 5 (from memory).
//! Chosen over a Prony series or Findley's power law because it separates a permanent part (the
//! set a lane keeps at unwind) from a recoverable one with three parameters per direction, few
//! enough to fit per lane; its creep is log-time-like over the one to two decades that matter.
//!
//! Relative parameters (see [`crate::case::Burgers`]): delayed = E/E_K, retardation tau_K =
//! eta_K/E_K, viscous time tau_v = eta_M/E.

use crate::case::Burgers;
use crate::pack::Real;

/// Creep compliance J(t) (1/Pa) at reduced time `t` (s) for elastic modulus `e` (Pa):
/// J(t) = (1/E) [1 + delayed (1 - exp(-t/tau_K)) + t/tau_v].
///
/// ```
/// use rollsleuth::case::Burgers;
/// // standard linear solid limit (tau_v -> inf): E1 = 5 GPa, E2 = 10 GPa, eta = 1e15 Pa s
/// let b = Burgers { delayed: 0.5, retardation_s: 1e5, viscous_time_s: f64::INFINITY };
/// let j = rollsleuth::storage::creep_compliance(&b, 5e9, 1e5);
/// assert!((j / 2.6321e-10 - 1.0).abs() < 1e-4);
/// ```
pub fn creep_compliance(b: &Burgers, e: f64, t: f64) -> f64 {
    (1.0 + b.delayed * (1.0 - (-t / b.retardation_s).exp()) + t / b.viscous_time_s) / e
}

/// Relaxation modulus E(t) (Pa) of the Burgers model at reduced time `t` (s).
///
/// With E1 = E, eta1 = E tau_v, E2 = E/delayed, eta2 = E2 tau_K, the model's operator equation
/// sigma + p1 sigma' + p2 sigma'' = q1 eps' + q2 eps'' has p1 = eta1/E1 + eta1/E2 + eta2/E2,
/// p2 = eta1 eta2/(E1 E2), q1 = eta1, q2 = eta1 eta2/E2, and a unit strain step relaxes as
/// E(t) = [(q1 - q2 r1) exp(-r1 t) - (q1 - q2 r2) exp(-r2 t)] / A, A = sqrt(p1^2 - 4 p2),
/// r1,2 = (p1 -/+ A)/(2 p2) (Findley, Lai and Onaran 1976, from memory; re-derived and checked
/// against time stepping in the tests). Without a permanent part (tau_v infinite) it is the
/// standard linear solid: E(t) = E [E2 + E exp(-t/tau_r)]/(E + E2), tau_r = eta2/(E + E2).
pub fn relaxation_modulus(b: &Burgers, e: f64, t: f64) -> f64 {
    let e1 = e;
    let e2 = if b.delayed > 0.0 {
        e / b.delayed
    } else {
        f64::INFINITY
    };
    if !b.viscous_time_s.is_finite() {
        if !e2.is_finite() {
            return e1;
        }
        let tau_r = e2 * b.retardation_s / (e1 + e2);
        return e1 * (e2 + e1 * (-t / tau_r).exp()) / (e1 + e2);
    }
    let eta1 = e1 * b.viscous_time_s;
    if !e2.is_finite() {
        // Maxwell element alone
        return e1 * (-t / b.viscous_time_s).exp();
    }
    let eta2 = e2 * b.retardation_s;
    let p1 = eta1 / e1 + eta1 / e2 + eta2 / e2;
    let p2 = eta1 * eta2 / (e1 * e2);
    let q1 = eta1;
    let q2 = eta1 * eta2 / e2;
    let a = (p1 * p1 - 4.0 * p2).sqrt();
    let r1 = (p1 - a) / (2.0 * p2);
    let r2 = (p1 + a) / (2.0 * p2);
    ((q1 - q2 * r1) * (-r1 * t).exp() - (q1 - q2 * r2) * (-r2 * t).exp()) / a
}

/// Internal state of one Burgers element (strains, dimensionless), of one run or of a pack of
/// runs side by side ([`Real`]).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct CreepState<T = f64> {
    /// Kelvin (delayed, recoverable) strain.
    pub delayed: T,
    /// Viscous (permanent) strain, including mechano-sorptive creep.
    pub permanent: T,
}

/// One step of the Burgers law, linearised about the current stress.
///
/// The elastic strain is g(sigma) (sigma/E for MD; the stack law for the radial direction), with
/// tangent modulus `e_tan` = d sigma / d g. Over a reduced-time step `dxi` (s) with moisture change
/// `dmc` (percentage points) the stress increment is d sigma = E_hat (d eps - h), where
/// 1/E_hat = (c + a phi/(1+a)) / e_tan, h = g_n (b + a phi/(1+a)) - a eps_K/(1+a),
/// a = dxi/tau_K, b = dxi/tau_v + m_s |dmc| (mechano-sorptive creep, Haslach 2000 form
/// d eps_ms = m_s g |dMC|, from memory) and c = x + c(m) with x = dxi/tau_v, m = m_s |dmc| and
/// c(m) = m / (1 - e^-m) (`Rates::new`). The Kelvin element and the viscous flow step by
/// backward Euler (c = 1 + b when m = 0). The mechano-sorptive part is integrated exactly for a
/// strain rate that is constant over the step, the exponential algorithm of Taylor, Pister and
/// Goudreau (1970), Int. J. Numer. Meth. Eng. 2:45-59 (from memory): with no flow and no Kelvin
/// part, at a fixed strain the elastic strain keeps e^-m of itself, where backward Euler keeps
/// 1/(1 + m); under a constant stress the viscous strain grows by b g. Returns (E_hat, h).
pub fn step_coefficients(
    b: &Burgers,
    mech_sorptive: f64,
    e_tan: f64,
    g_n: f64,
    st: &CreepState,
    dxi: f64,
    dmc: f64,
) -> (f64, f64) {
    step_coefficients_at(
        b.delayed,
        e_tan,
        g_n,
        st,
        step_rates(b, mech_sorptive, dxi, dmc),
    )
}

/// The rates of a step of [`step_coefficients`] and [`step_update`], the same for the
/// coefficients and the update (all dimensionless). The Kelvin parts depend on the retardation
/// time only, which runs side by side share; the viscous part is per run.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Rates<T = f64> {
    /// a / (1 + a), with a = dxi / tau_K: the Kelvin element's share of the step.
    pub kelvin: f64,
    /// 1 / (1 + a).
    pub keep: f64,
    /// b = dxi / tau_v + m_s |dmc|: the viscous and mechano-sorptive part.
    pub viscous: T,
    /// c = x + c(m) ([`Rates::new`], [`exponential_ratio`]): 1 + b for backward Euler.
    pub relaxed: T,
}

impl<T: Real> Rates<T> {
    /// The rates from a = dxi / tau_K, the viscous flow x = dxi / tau_v of each run, and the
    /// mechano-sorptive part m = m_s |dmc| with its [`exponential_ratio`] `c_m`: b = x + m and
    /// c = x + c_m.
    #[inline]
    pub fn new(a: f64, flow: T, sorptive: f64, c_m: f64) -> Rates<T> {
        let keep = 1.0 / (1.0 + a);
        Rates {
            kelvin: a * keep,
            keep,
            viscous: flow + sorptive,
            relaxed: flow + c_m,
        }
    }
}

/// c(m) = m / (1 - e^-m) for m >= 0 (dimensionless): 1 + m/2 + m^2/12 + ... for small m, m for
/// large m; 1 at m = 0.
pub fn exponential_ratio(m: f64) -> f64 {
    if m > 1e-9 {
        m / -(-m).exp_m1()
    } else {
        1.0 + 0.5 * m
    }
}

/// The rates of a step over reduced time `dxi` (s) with moisture change `dmc` (percentage
/// points): a = dxi/tau_K and b = dxi/tau_v + m_s |dmc|.
#[inline]
pub fn step_rates(b: &Burgers, mech_sorptive: f64, dxi: f64, dmc: f64) -> Rates {
    step_rates_of(b.retardation_s, b.viscous_time_s, mech_sorptive, dxi, dmc)
}

/// [`step_rates`] from the retardation time (s) and the viscous time (s) of each run.
#[inline]
pub fn step_rates_of<T: Real>(
    retardation_s: f64,
    viscous_time_s: T,
    mech_sorptive: f64,
    dxi: f64,
    dmc: f64,
) -> Rates<T> {
    let m = mech_sorptive * dmc.abs();
    Rates::new(
        dxi / retardation_s,
        T::splat(dxi) / viscous_time_s,
        m,
        exponential_ratio(m),
    )
}

/// [`step_coefficients`] with the element's `delayed` (E / E_K) and the step's rates from
/// [`step_rates`].
#[inline]
pub fn step_coefficients_at<T: Real>(
    delayed: T,
    e_tan: T,
    g_n: T,
    st: &CreepState<T>,
    rates: Rates<T>,
) -> (T, T) {
    let k = delayed * rates.kelvin;
    let e_hat = e_tan / (rates.relaxed + k);
    let h = g_n * (rates.viscous + k) - st.delayed * rates.kelvin;
    (e_hat, h)
}

/// Update the internal strains after a step, given the elastic strain at its start `g_prev` and
/// at its end `g_next`.
pub fn step_update(
    b: &Burgers,
    mech_sorptive: f64,
    g_prev: f64,
    g_next: f64,
    st: &mut CreepState,
    dxi: f64,
    dmc: f64,
) {
    step_update_at(
        b.delayed,
        g_prev,
        g_next,
        st,
        step_rates(b, mech_sorptive, dxi, dmc),
    );
}

/// [`step_update`] with the element's `delayed` and the step's rates from [`step_rates`]: the
/// delayed strain moves to (eps_K + a delayed g) / (1 + a); the viscous strain grows by
/// (c - 1) g_next + (b + 1 - c) g_prev, which is b g_next for backward Euler (c = 1 + b).
#[inline]
pub fn step_update_at<T: Real>(
    delayed: T,
    g_prev: T,
    g_next: T,
    st: &mut CreepState<T>,
    rates: Rates<T>,
) {
    st.delayed = st.delayed * rates.keep + delayed * rates.kelvin * g_next;
    let c = rates.relaxed;
    st.permanent += (c - 1.0) * g_next + (rates.viscous - c + 1.0) * g_prev;
}

#[cfg(test)]
mod tests {
    use super::exponential_ratio;

    /// c(m) = m / (1 - e^-m) has the series 1 + m/2 + m^2/12 - m^4/720 (the Bernoulli-number
    /// generating function, Abramowitz and Stegun 1964, 23.1.1, from memory): the two branches
    /// meet at the
    /// switch, and the large-m limit is m.
    #[test]
    fn exponential_ratio_follows_its_series_and_limit() {
        for &m in &[1e-12_f64, 1e-9, 1.0000001e-9, 1e-6, 1e-3, 0.01] {
            let series = 1.0 + m / 2.0 + m * m / 12.0 - m.powi(4) / 720.0;
            assert!((exponential_ratio(m) - series).abs() < 1e-15, "m = {m}");
        }
        assert_eq!(exponential_ratio(0.0), 1.0);
        assert!((exponential_ratio(40.0) / 40.0 - 1.0).abs() < 1e-15);
    }
}
