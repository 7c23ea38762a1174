//! How lanes share the winder's loads while winding: the nip load by lane, the nip-induced
//! wound-in tension with its saturation, and CD levelling of lane strains over a shear-lag length.
//!
//! **Nip load by lane.** The nip roll is taken as a rigid line pressed onto the lanes, each lane a
//! Winkler (elastic) foundation whose stiffness per unit width is the stack's tangent radial
//! modulus E_r at the mean nip pressure N / a, a = [`NIP_CONTACT_M`] (the nip compresses a zone
//! about as deep as the contact is wide, so line load per width over indentation is about E_r;
//! assumption). With lane i's outer radius R_i and the highest lane at R_max, lane i carries
//! q_i = k (delta - (R_max - R_i)) where positive, zero where the lane is below contact, and delta
//! is set so that the lane loads add up to the nip line load: sum w_i q_i = N W. A high band so
//! carries more of the nip and a low lane may carry none (a rigid beam on an elastic foundation,
//! Hetenyi 1946, "Beams on Elastic Foundation", in its rigid limit). A lane's radius answers its
//! nip share with a delay (more nip, more wound-in tension, a stack compressed more a few layers
//! later), and the indentation under the nip (a tenth of a millimetre) is smaller than what one
//! build step changes: a share switched on and off at each step would chatter between lanes.
//! So each lane's share follows the contact solution over the radial distance
//! [`NIP_FOLLOW_M`] (a first-order lag in radius, the same whatever the grid; assumption), which
//! settles on the share that keeps the lanes in contact. The lag is updated once per grid step;
//! on a step longer than the follow length the update is damped (`roll::accrete`), since an
//! explicit update over several follow lengths chatters, and the noise rolls of a diagnosis are
//! wound with steps of at most 1.25 follow lengths (`diagnose::noise::noise_nodes`).
//!
//! **Nip-induced tension.** Each lane's wound-in tension is its web tension plus mu q_i (Good, Wu
//! and Fikes 1994, "The role of nip load in winding", in force per width: WIT = T_w + mu_k N, from
//! memory). They report the linear rise at moderate nip loads and a nip-induced part that levels
//! off at high loads (from memory); here that part is capped at [`NIP_SATURATION`] times the web
//! tension (just above the 2.5x at which `case` warns that the linear form overstates; assumption).
//!
//! **CD levelling over a shear-lag length (our derivation, from memory of the form).** A lane
//! wound to a larger radius is stretched by dR/R more than the mean lane; its neighbours in the
//! same wrap pull it back through in-plane shear, while friction on the layer beneath holds each
//! lane where it was laid. For the wrap's MD strain e(x) across the width, with e0(x) the strain
//! each lane would take on its own, in-plane shear stiffness G c (N/m) against an interlayer shear
//! stiffness k_s (N/m^3) gives G c e'' = k_s (e - e0), the form of Cox's 1952 shear-lag model,
//! with the shear-lag length L = sqrt(G c / k_s). The interlayer stiffness is friction mobilised
//! over a slip of about one caliper, k_s = mu p / c (assumption), with p the pressure under which
//! the wrap is laid (nip pressure N / a plus the wrap's own T / R). The in-plane shear modulus is
//! G = 0.387 sqrt(E_MD E_CD) (Baum, Brennan and Habeger 1981, from memory). So
//!
//! L = sqrt(G c^2 / (mu p)).
//!
//! A lane narrower than L is levelled towards its neighbours; a band much wider than L keeps its
//! own strain. The equation is solved on the lanes (finite volumes, zero shear at the roll ends),
//! so a wide band cut into narrow lanes behaves as the band does. For an isolated band of width b
//! the retained mean fraction is 1 - (L/b)(1 - exp(-b/L)). A further uniform `levelling`
//! fraction (0 by default; 1 = equal lane tensions) scales what remains.

use crate::case::Material;
use crate::numeric::thomas;

/// Nip-induced tension is capped at this multiple of the web tension (assumption; see the module
/// documentation).
pub const NIP_SATURATION: f64 = 3.0;

/// Width of the nip contact, m, for the mean nip pressure N / a (order of a centimetre for paper
/// rolls under a steel rider or drum; from memory).
pub const NIP_CONTACT_M: f64 = 0.010;

/// Radial distance over which a lane's nip share follows the contact solution, m: about the
/// contact width (assumption; see the module documentation).
pub const NIP_FOLLOW_M: f64 = 0.010;

/// Move each lane's nip share `shares` (N/m) towards the contact solution `contact` (N/m) over a
/// radial step `dr_m` (m): the first-order lag over [`NIP_FOLLOW_M`], 1 - e^-x of the way with
/// x = dr / follow length. A step longer than the follow length moves it (1 - e^-x) / x of the
/// way instead, which keeps this explicit update stable on coarse grids (the lanes' radii answer
/// the shares within the step, and a full move chatters between lanes).
pub fn follow_nip(shares: &mut [f64], contact: &[f64], dr_m: f64) {
    let follow = NIP_FOLLOW_M;
    let keep = (-dr_m / follow).exp();
    let (keep, take) = if dr_m > follow {
        let take = (1.0 - keep) * follow / dr_m;
        (1.0 - take, take)
    } else {
        (keep, 1.0 - keep)
    };
    for (old, new) in shares.iter_mut().zip(contact) {
        *old = keep * *old + take * new;
    }
}

/// In-plane shear modulus of paper from its MD and CD moduli, Pa: G = 0.387 sqrt(E_MD E_CD)
/// (Baum, Brennan and Habeger 1981, from memory).
///
/// ```
/// # use rollsleuth::winding::coupling::shear_modulus_pa;
/// // 6 GPa x 2.5 GPa: sqrt = 3.873 GPa, x 0.387 = 1.499 GPa
/// assert!((shear_modulus_pa(6e9, 2.5e9) / 1e9 - 1.4989).abs() < 1e-3);
/// ```
pub fn shear_modulus_pa(md_modulus_pa: f64, cd_modulus_pa: f64) -> f64 {
    0.387 * (md_modulus_pa * cd_modulus_pa).max(0.0).sqrt()
}

/// Shear-lag length L = sqrt(G c^2 / (mu p)), m, for caliper `caliper_m` (m), web tension
/// `tension_n_per_m` (N/m) at radius `radius_m` (m) under nip `nip_n_per_m` (N/m), with p =
/// N / [`NIP_CONTACT_M`] + T / R. Infinite when there is no friction or no pressure (lanes fully
/// levelled).
pub fn shear_lag_length(
    material: &Material,
    caliper_m: f64,
    tension_n_per_m: f64,
    radius_m: f64,
    nip_n_per_m: f64,
) -> f64 {
    let p = nip_n_per_m.max(0.0) / NIP_CONTACT_M + tension_n_per_m.max(0.0) / radius_m.max(1e-6);
    let denom = material.friction * p;
    let g = shear_modulus_pa(material.md_modulus_pa, material.cd_modulus_pa);
    if denom > 0.0 && denom.is_finite() {
        (g * caliper_m * caliper_m / denom).sqrt()
    } else {
        f64::INFINITY
    }
}

/// Lane strain offsets after shear-lag levelling: `raw` (dR/R per lane) smoothed over the length
/// `lag_m` (m) across lanes of widths `widths` (m), then scaled by (1 - `levelling`). Solves
/// w_i (e_i - e0_i) / L^2 = sum over the lane's faces (e_j - e_i) / d_ij (finite volumes, no
/// shear through the roll ends), which keeps the width-weighted mean offset.
pub fn levelled_offsets(raw: &[f64], widths: &[f64], lag_m: f64, levelling: f64) -> Vec<f64> {
    let n = raw.len();
    let keep = 1.0 - levelling;
    let wsum: f64 = widths.iter().sum();
    let mean = raw.iter().zip(widths).map(|(r, w)| r * w).sum::<f64>() / wsum.max(1e-300);
    if n < 2 {
        return raw.iter().map(|r| keep * r).collect();
    }
    if !lag_m.is_finite() {
        return vec![keep * mean; n];
    }
    let l2 = lag_m * lag_m;
    let (mut a, mut b, mut c) = (vec![0.0; n], vec![0.0; n], vec![0.0; n]);
    let mut d: Vec<f64> = (0..n).map(|i| widths[i] * raw[i] / l2).collect();
    for i in 0..n {
        b[i] = widths[i] / l2;
        if i > 0 {
            let g = 2.0 / (widths[i] + widths[i - 1]);
            a[i] = -g;
            b[i] += g;
        }
        if i + 1 < n {
            let g = 2.0 / (widths[i] + widths[i + 1]);
            c[i] = -g;
            b[i] += g;
        }
    }
    let mut s = vec![0.0; n];
    if thomas(&a, &b, &c, &mut d, &mut s) && d.iter().all(|v| v.is_finite()) {
        d.iter().map(|e| keep * e).collect()
    } else {
        vec![keep * mean; n]
    }
}

/// Nip line load per lane, N/m: a rigid line pressed onto lanes of outer radii `radii_m` (m) and
/// widths `widths_m` (m), each an elastic foundation of stiffness `k_pa` (line load per width over
/// indentation, Pa), carrying `nip_n_per_m` (N/m) on average over the width. The width-weighted
/// mean of the result is `nip_n_per_m`.
///
/// ```
/// # use rollsleuth::winding::coupling::nip_shares;
/// // two equal lanes, one 10 um higher, k = 10 MPa: 1000 N/m +/- k D / 2 = +/- 50 N/m
/// let q = nip_shares(1000.0, &[0.50001, 0.5], &[0.1, 0.1], 1e7);
/// assert!((q[0] - 1050.0).abs() < 1e-6 && (q[1] - 950.0).abs() < 1e-6);
/// ```
pub fn nip_shares(nip_n_per_m: f64, radii_m: &[f64], widths_m: &[f64], k_pa: f64) -> Vec<f64> {
    let n = radii_m.len();
    let ok = radii_m.iter().chain(widths_m).all(|v| v.is_finite());
    if nip_n_per_m <= 0.0 || n == 0 || !ok || !(k_pa > 0.0 && k_pa.is_finite()) {
        return vec![nip_n_per_m.max(0.0); n];
    }
    let rmax = radii_m.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let wsum: f64 = widths_m.iter().sum();
    let total = nip_n_per_m * wsum;
    let load = |delta: f64| -> f64 {
        radii_m
            .iter()
            .zip(widths_m)
            .map(|(r, w)| w * k_pa * (delta - (rmax - r)).max(0.0))
            .sum::<f64>()
    };
    // bisection on the indentation of the highest lane (the load is monotone in it)
    let (mut lo, mut hi) = (0.0, total / (k_pa * wsum.max(1e-300)));
    for _ in 0..200 {
        if load(hi) >= total {
            break;
        }
        hi *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if load(mid) < total {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-15 * hi.max(1e-30) {
            break;
        }
    }
    let delta = 0.5 * (lo + hi);
    radii_m
        .iter()
        .map(|r| k_pa * (delta - (rmax - r)).max(0.0))
        .collect()
}

/// Contact stiffness of the lanes under the nip, Pa: the stack's tangent radial modulus at the
/// mean nip pressure N / [`NIP_CONTACT_M`] (`nip_n_per_m` in N/m).
pub fn nip_stiffness(material: &Material, nip_n_per_m: f64) -> f64 {
    material.stack.modulus(nip_n_per_m.max(0.0) / NIP_CONTACT_M)
}

/// Nip-induced wound-in tension of a lane pressed by `lane_nip_n_per_m` (N/m), N/m: mu q, capped
/// at [`NIP_SATURATION`] times the web tension `tension_n_per_m` (N/m).
///
/// ```
/// # use rollsleuth::winding::coupling::nip_tension;
/// assert!((nip_tension(0.3, 1000.0, 500.0) - 300.0).abs() < 1e-12); // linear part
/// assert!((nip_tension(0.3, 9000.0, 500.0) - 1500.0).abs() < 1e-12); // saturated at 3 T
/// ```
pub fn nip_tension(friction: f64, lane_nip_n_per_m: f64, tension_n_per_m: f64) -> f64 {
    (friction * lane_nip_n_per_m.max(0.0)).min(NIP_SATURATION * tension_n_per_m.max(0.0))
}

/// A lane's effective wound-in tension, N/m: its web tension `tension` + its nip part (friction x
/// its nip share `nip_q`, capped against the web tension `t_web`; all N/m), less what a ring of
/// caliper `caliper` (m) spinning at the surface speed `v` (m/s) needs to hold itself (thin ring,
/// rho c v^2) and the hoop strain `air` lost to entrained air (times E c); never below zero.
pub(super) fn effective_wit(
    mat: &Material,
    tension: f64,
    nip_q: f64,
    t_web: f64,
    caliper: f64,
    v: f64,
    air: f64,
) -> f64 {
    let nip_part = nip_tension(mat.friction, nip_q, t_web);
    let spin = mat.density_kg_m3 * caliper * v * v;
    (tension + nip_part - spin - mat.md_modulus_pa * caliper * air).max(0.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Equal lanes share the nip equally; the loads add up to the nip line load.
    #[test]
    fn equal_lanes_share_the_nip_equally() {
        let q = nip_shares(2000.0, &[0.5; 4], &[0.1, 0.2, 0.3, 0.4], 3e6);
        for v in &q {
            assert!((v - 2000.0).abs() < 1e-6, "{v}");
        }
    }

    /// A lane far below the others is out of contact and carries nothing; the others carry the
    /// whole line load.
    #[test]
    fn a_low_lane_leaves_the_nip() {
        let q = nip_shares(1000.0, &[0.5, 0.499, 0.5], &[0.1, 0.1, 0.1], 1e7);
        assert!(q[1].abs() < 1e-12);
        assert!((q[0] - 1500.0).abs() < 1e-6 && (q[2] - 1500.0).abs() < 1e-6);
    }

    /// A single band of width b in an infinite sheet keeps 1 - (L/b)(1 - exp(-b/L)) of its own
    /// offset on average: the closed-form solution of e'' = (e - e0)/L^2 with e0 a step of width b
    /// (inside the band e = e0 (1 - exp(-b/2L) cosh(x/L))). Checked on a fine lane grid with
    /// far-away ends.
    #[test]
    fn shear_lag_band_matches_the_closed_form() {
        let (lag, b, dx) = (0.05, 0.1, 0.001);
        let n = 2001;
        let widths = vec![dx; n];
        let raw: Vec<f64> = (0..n)
            .map(|i| {
                let x = (i as f64 + 0.5) * dx - 1.0005;
                if x.abs() < 0.5 * b {
                    1.0
                } else {
                    0.0
                }
            })
            .collect();
        let e = levelled_offsets(&raw, &widths, lag, 0.0);
        let inside: Vec<f64> = (0..n).filter(|&i| raw[i] > 0.5).map(|i| e[i]).collect();
        let got = inside.iter().sum::<f64>() / inside.len() as f64;
        let want = 1.0 - (lag / b) * (1.0 - (-b / lag).exp());
        assert!((got - want).abs() < 0.01, "{got} vs {want}");
    }

    /// Narrow lanes level more than wide bands: a 30 mm lane keeps less of its offset than a
    /// 100 mm band under the same shear-lag length.
    #[test]
    fn narrow_lanes_level_more_than_wide_bands() {
        let kept = |b: f64| {
            let dx = 0.001;
            let n = 1001;
            let raw: Vec<f64> = (0..n)
                .map(|i| {
                    let x = (i as f64 + 0.5) * dx - 0.5005;
                    f64::from(u8::from(x.abs() < 0.5 * b))
                })
                .collect();
            let e = levelled_offsets(&raw, &vec![dx; n], 0.015, 0.0);
            let m = n / 2;
            e[m]
        };
        assert!(kept(0.03) < kept(0.1));
    }
}
