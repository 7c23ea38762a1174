//! One lane's wound-in state summed up: peak and core pressure, the surface zone's pressure,
//! the tangential extremes and compressive band, the mean wound-in tension, the outer radius and
//! the surface zone's pressure while spinning.

use super::centrifugal::disk_stress;
use super::hakiel::{LaneModel, LaneState};
use super::roll::LaneSummary;

/// Depth of the surface zone a hardness reading senses, m (common practice: readings respond to
/// the outer few centimetres).
pub const SURFACE_ZONE_M: f64 = 0.025;

/// Mean interlayer pressure (Pa) between radius `from` (m) and the surface: the trapezoid
/// integral of -sigma_r over radius, the stress interpolated linearly at `from`.
fn zone_mean(r: &[f64], sr: &[f64], from: f64) -> f64 {
    let n = r.len();
    if n < 2 || r[n - 1] <= from {
        return sr.first().map_or(0.0, |s| -s);
    }
    let (mut sum, mut len) = (0.0, 0.0);
    for i in 0..n - 1 {
        let (a, b) = (r[i].max(from), r[i + 1]);
        if b <= a {
            continue;
        }
        let at = |x: f64| sr[i] + (sr[i + 1] - sr[i]) * (x - r[i]) / (r[i + 1] - r[i]);
        sum -= 0.5 * (at(a) + at(b)) * (b - a);
        len += b - a;
    }
    sum / len
}

/// Mean interlayer pressure (Pa) over the outer [`SURFACE_ZONE_M`] of a lane at radii `r` (m)
/// with radial stress `sr` (Pa) while it spins at `omega` (rad/s): the wound-in pressure less the
/// rotating disk's radial stress (web density `rho` kg/m3, Poisson ratio `nu`), averaged as
/// [`zone_mean`] averages. A mean over a fixed depth, so it does not depend on how close to the
/// free surface (where the pressure is zero) the nodes reach.
fn running_zone(r: &[f64], sr: &[f64], rho: f64, omega: f64, nu: f64) -> f64 {
    let (Some(&a), Some(&b)) = (r.first(), r.last()) else {
        return 0.0;
    };
    let spun: Vec<f64> = (r.iter().zip(sr))
        .map(|(&x, &s)| s + disk_stress(rho, omega, nu, a, b, x).0)
        .collect();
    zone_mean(r, &spun, b - SURFACE_ZONE_M)
}

/// The summary of lane state `st` wound with compressed caliper `c_eff` (m), the lane's own
/// `caliper` (m), web density `rho` (kg/m3), final angular speed `omega` (rad/s) and Poisson
/// ratio `nu`.
pub(super) fn summarise(
    st: &LaneState,
    m: &LaneModel,
    c_eff: f64,
    caliper: f64,
    rho: f64,
    omega: f64,
    nu: f64,
) -> LaneSummary {
    let r = &st.r;
    let n = st.wound;
    let big_r = r[n - 1];
    let mut peak = (0.0, r[0]);
    let (mut tmin, mut tmax) = (f64::INFINITY, f64::NEG_INFINITY);
    let (mut cfrom, mut cto) = (None, None);
    for ((&ri, &sr), &t) in r[..n].iter().zip(&st.sr).zip(&st.st) {
        let p = -sr;
        if p > peak.0 {
            peak = (p, ri);
        }
        tmin = tmin.min(t);
        tmax = tmax.max(t);
        if t < 0.0 {
            cfrom.get_or_insert(ri);
            cto = Some(ri);
        }
    }
    // mean over the layers: trapezoid over radius (the grid is not uniform)
    let wit_mean = if n > 1 {
        (0..n - 1)
            .map(|i| 0.5 * (st.wit[i] + st.wit[i + 1]) * (r[i + 1] - r[i]))
            .sum::<f64>()
            / (r[n - 1] - r[0])
    } else {
        st.wit[0]
    };
    LaneSummary {
        peak_pressure_pa: peak.0,
        peak_pressure_radius_m: peak.1,
        core_pressure_pa: -st.sr[0],
        surface_zone_pressure_pa: zone_mean(&r[..n], &st.sr[..n], big_r - SURFACE_ZONE_M),
        tangential_min_pa: tmin,
        tangential_max_pa: tmax,
        compressive_from_m: cfrom,
        compressive_to_m: cto,
        wound_in_tension_mean_n_per_m: wit_mean,
        outer_radius_m: st.outer_radius(m, 1.0 / c_eff, caliper),
        running_surface_zone_pressure_pa: running_zone(r, &st.sr[..n], rho, omega, nu),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// At rest the zone's pressure while spinning is the zone's pressure; spinning takes the
    /// rotating disk's radial stress off it, which is positive (tension) inside a free disk
    /// (Timoshenko and Goodier, Theory of Elasticity, 3rd ed., 1970, rotating disks: sigma_r = 0
    /// at both faces, positive between).
    #[test]
    fn the_spinning_zone_is_the_zone_less_the_disk_stress() {
        let r: Vec<f64> = (0..=100)
            .map(|i| 0.05 + 0.45 * f64::from(i) / 100.0)
            .collect();
        let sr: Vec<f64> = r.iter().map(|&x| -1e5 * (0.5 - x)).collect();
        let at_rest = running_zone(&r, &sr, 700.0, 0.0, 0.3);
        assert_eq!(at_rest, zone_mean(&r, &sr, 0.5 - SURFACE_ZONE_M));
        let spun = running_zone(&r, &sr, 700.0, 60.0, 0.3);
        assert!(spun < at_rest);
    }
}
