//! One lane's wound-in state summed up: peak and core pressure, the surface zone's pressure,
//! the tangential extremes and compressive band, the mean wound-in tension, the outer radius and
//! the lowest running pressure at the surface.

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
    let mut run_min = f64::INFINITY;
    for i in 0..n {
        let p = -st.sr[i];
        if p > peak.0 {
            peak = (p, r[i]);
        }
        tmin = tmin.min(st.st[i]);
        tmax = tmax.max(st.st[i]);
        if st.st[i] < 0.0 {
            cfrom.get_or_insert(r[i]);
            cto = Some(r[i]);
        }
        if r[i] >= big_r - SURFACE_ZONE_M && i + 1 < n {
            let (sr_c, _) = disk_stress(rho, omega, nu, r[0], big_r, r[i]);
            run_min = f64::min(run_min, p - sr_c);
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
        running_min_surface_pressure_pa: if run_min.is_finite() { run_min } else { 0.0 },
    }
}
