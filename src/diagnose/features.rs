//! Features of the predicted roll that rules test: the pattern of the strain at unwind across
//! the width, its link to caliper and moisture, and stress states tied to other defects.

use crate::case::Case;
use crate::lanes::Lanes;
use crate::storage::Aged;
use crate::winding::Wound;
use serde::Serialize;
use std::collections::BTreeMap;

/// A feature rules may test: name, unit and meaning, and its possible range (for lint).
pub struct FeatureSpec {
    pub name: &'static str,
    pub meaning: &'static str,
    pub min: f64,
    pub max: f64,
}

const INF: f64 = f64::INFINITY;

/// Every feature a rule table may name.
pub const FEATURES: &[FeatureSpec] = &[
    FeatureSpec { name: "running_strain_mm_per_m", meaning: "the web's running strain T/(E c) at the converting tension, mm/m (a lane longer than this runs slack)", min: 0.0, max: INF },
    FeatureSpec { name: "local_peak_ratio", meaning: "local_peak_mm_per_m over the running strain", min: -INF, max: INF },
    FeatureSpec { name: "centre_minus_edges_ratio", meaning: "centre_minus_edges_mm_per_m over the running strain (positive: baggy centre)", min: -INF, max: INF },
    FeatureSpec { name: "longest_lane_ratio", meaning: "longest_lane_excess_mm_per_m over the running strain", min: 0.0, max: INF },
    FeatureSpec { name: "spread_mm_per_m", meaning: "largest minus smallest lane length at unwind, mm per m of web", min: 0.0, max: INF },
    FeatureSpec { name: "longest_lane_excess_mm_per_m", meaning: "longest lane minus the width-weighted mean lane, mm/m", min: 0.0, max: INF },
    FeatureSpec { name: "local_peak_mm_per_m", meaning: "largest excess of an inner lane (not an outermost lane) over its neighbours (two each side), mm/m", min: -INF, max: INF },
    FeatureSpec { name: "peak_width_mm", meaning: "width of the long band around the longest lane, mm", min: 0.0, max: INF },
    FeatureSpec { name: "centre_minus_edges_mm_per_m", meaning: "centre half minus the outermost lane each side, mm/m (positive: baggy centre)", min: -INF, max: INF },
    FeatureSpec { name: "side_to_side_mm_per_m", meaning: "front-to-back difference of a straight-line fit, absolute, mm/m", min: 0.0, max: INF },
    FeatureSpec { name: "band_count", meaning: "number of long bands (local peaks over 0.3 mm/m prominent)", min: 0.0, max: INF },
    FeatureSpec { name: "caliper_correlation", meaning: "correlation of lane caliper with lane length at unwind, -1..1", min: -1.0, max: 1.0 },
    FeatureSpec { name: "caliper_range_pct", meaning: "thickest minus thinnest lane caliper, % of mean", min: 0.0, max: INF },
    FeatureSpec { name: "moisture_share", meaning: "share of the lane-to-lane length differences from hygroexpansion, 0..1", min: 0.0, max: 1.0 },
    FeatureSpec { name: "creep_share", meaning: "share of the lane-to-lane length differences from creep, 0..1", min: 0.0, max: 1.0 },
    FeatureSpec { name: "core_md_stress_mpa", meaning: "most compressive MD stress in the inner third at winding, MPa (negative: compression)", min: -INF, max: INF },
    FeatureSpec { name: "surface_pressure_end_kpa", meaning: "lowest interlayer pressure in the outer 25 mm at the end of storage, kPa", min: 0.0, max: INF },
    FeatureSpec { name: "surface_pressure_loss_pct", meaning: "mean loss of surface-zone pressure over storage, %", min: -INF, max: 100.0 },
    FeatureSpec { name: "outer_md_stress_end_mpa", meaning: "highest MD stress in the outer wraps at the end of storage, MPa", min: -INF, max: INF },
    FeatureSpec { name: "edge_moisture_change_pct", meaning: "moisture change of the edge lanes minus the centre lanes, points", min: -INF, max: INF },
    FeatureSpec { name: "moisture_change_pct", meaning: "largest change of a lane's mean moisture over storage, points (absolute)", min: 0.0, max: INF },
    FeatureSpec { name: "wound_tension_ratio", meaning: "highest over lowest lane wound-in tension", min: 1.0, max: INF },
    FeatureSpec { name: "diameter_ridge_per_mille", meaning: "largest lane diameter at winding over the mean of its neighbours (two each side), per mille of diameter", min: 0.0, max: INF },
    FeatureSpec { name: "nip_to_tension_ratio", meaning: "friction x nip load over web tension", min: 0.0, max: INF },
    FeatureSpec { name: "slack_lanes", meaning: "lanes longer than the mean lane by over 0.5 mm/m", min: 0.0, max: INF },
];

/// Computed features, by name.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Features {
    pub values: BTreeMap<String, f64>,
    /// Lane index of the longest lane.
    pub longest_lane: usize,
    /// Lanes in the long band around it.
    pub peak_lanes: Vec<usize>,
    /// Lanes longer than the mean lane by over 0.5 mm/m.
    pub slack: Vec<usize>,
    /// Per-lane length at unwind relative to the width-weighted mean lane, mm/m.
    pub excess_mm_per_m: Vec<f64>,
}

impl Features {
    /// Value of a feature.
    pub fn get(&self, name: &str) -> Option<f64> {
        self.values.get(name).copied()
    }
}

fn median(v: &[f64]) -> f64 {
    let mut s = v.to_vec();
    s.sort_by(f64::total_cmp);
    let n = s.len();
    if n == 0 {
        0.0
    } else if n % 2 == 1 {
        s[n / 2]
    } else {
        0.5 * (s[n / 2 - 1] + s[n / 2])
    }
}

fn correlation(a: &[f64], b: &[f64]) -> f64 {
    let n = a.len() as f64;
    let (ma, mb) = (a.iter().sum::<f64>() / n, b.iter().sum::<f64>() / n);
    let cov: f64 = a.iter().zip(b).map(|(x, y)| (x - ma) * (y - mb)).sum();
    let va: f64 = a.iter().map(|x| (x - ma).powi(2)).sum();
    let vb: f64 = b.iter().map(|y| (y - mb).powi(2)).sum();
    if va <= 1e-30 || vb <= 1e-30 {
        0.0
    } else {
        cov / (va * vb).sqrt()
    }
}

/// Threshold of the trade for a lane to run visibly slack, mm/m (0.05 %: common practice).
pub const SLACK_MM_PER_M: f64 = 0.5;

/// Compute the features of a predicted roll.
pub fn compute(case: &Case, lanes: &Lanes, wound: &Wound, aged: &Aged) -> Features {
    let n = aged.lanes.len();
    let last = aged.last();
    let s: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.strain_at_unwind[last] * 1e3)
        .collect();
    let x = lanes.positions();
    let w = lanes.widths();
    let width = case.roll.width_m;
    let wsum: f64 = w.iter().sum();
    let mean_w = s.iter().zip(&w).map(|(a, b)| a * b).sum::<f64>() / wsum;
    let excess: Vec<f64> = s.iter().map(|v| v - mean_w).collect();
    let (imax, smax) =
        s.iter().enumerate().fold(
            (0, f64::NEG_INFINITY),
            |a, (i, &v)| if v > a.1 { (i, v) } else { a },
        );
    let smin = s.iter().cloned().fold(f64::INFINITY, f64::min);
    let mut v = BTreeMap::new();
    let mut put = |k: &str, val: f64| {
        v.insert(k.to_string(), if val.is_finite() { val } else { 0.0 });
    };
    put("spread_mm_per_m", smax - smin);
    put("longest_lane_excess_mm_per_m", smax - mean_w);
    // local peak: lane over the mean of up to two neighbours each side
    let mut local = f64::NEG_INFINITY;
    let inner: Vec<usize> = if n >= 5 {
        (1..n - 1).collect()
    } else {
        (0..n).collect()
    };
    for &i in &inner {
        let nb: Vec<f64> = (i.saturating_sub(2)..(i + 3).min(n))
            .filter(|&j| j != i)
            .map(|j| s[j])
            .collect();
        if nb.is_empty() {
            continue;
        }
        let e = s[i] - nb.iter().sum::<f64>() / nb.len() as f64;
        if e > local {
            local = e;
        }
    }
    put("local_peak_mm_per_m", if n > 1 { local } else { 0.0 });
    // width of the band around the longest lane
    let half = mean_w + 0.5 * (smax - mean_w);
    let (mut lo, mut hi) = (imax, imax);
    while lo > 0 && s[lo - 1] > half {
        lo -= 1;
    }
    while hi + 1 < n && s[hi + 1] > half {
        hi += 1;
    }
    let peak_lanes: Vec<usize> = (lo..=hi).collect();
    put(
        "peak_width_mm",
        peak_lanes.iter().map(|&i| w[i]).sum::<f64>() * 1e3,
    );
    let centre: Vec<usize> = (0..n)
        .filter(|&i| (x[i] - 0.5 * width).abs() <= 0.25 * width)
        .collect();
    let edges: Vec<usize> = if n >= 2 { vec![0, n - 1] } else { vec![] };
    let mean_of = |idx: &[usize], f: &dyn Fn(usize) -> f64| {
        if idx.is_empty() {
            0.0
        } else {
            idx.iter().map(|&i| f(i)).sum::<f64>() / idx.len() as f64
        }
    };
    let edges_or_ends: Vec<usize> = if edges.is_empty() && n >= 2 {
        vec![0, n - 1]
    } else {
        edges.clone()
    };
    put(
        "centre_minus_edges_mm_per_m",
        mean_of(&centre, &|i| s[i]) - mean_of(&edges_or_ends, &|i| s[i]),
    );
    // straight-line fit across the width
    let xm = x.iter().sum::<f64>() / n as f64;
    let sm = s.iter().sum::<f64>() / n as f64;
    let sxx: f64 = x.iter().map(|a| (a - xm).powi(2)).sum();
    let slope = if sxx > 0.0 {
        x.iter()
            .zip(&s)
            .map(|(a, b)| (a - xm) * (b - sm))
            .sum::<f64>()
            / sxx
    } else {
        0.0
    };
    put("side_to_side_mm_per_m", (slope * width).abs());
    let bands = (0..n)
        .filter(|&i| {
            let l = if i > 0 { s[i - 1] } else { f64::NEG_INFINITY };
            let r = if i + 1 < n {
                s[i + 1]
            } else {
                f64::NEG_INFINITY
            };
            s[i] > l && s[i] > r && s[i] - mean_w > 0.3
        })
        .count();
    put("band_count", bands as f64);
    let cal: Vec<f64> = lanes.lanes.iter().map(|l| l.caliper_deviation).collect();
    put("caliper_correlation", correlation(&cal, &s));
    let cmax = cal.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let cmin = cal.iter().cloned().fold(f64::INFINITY, f64::min);
    put("caliper_range_pct", (cmax - cmin) * 100.0);
    // shares of the lane-to-lane differences: hygro vs creep, in the same outer-third average
    let hyg: Vec<f64> = aged.lanes.iter().map(|l| l.hygro_strain[last]).collect();
    let tot: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.strain_at_unwind[last])
        .collect();
    let hm = hyg.iter().sum::<f64>() / n as f64;
    let tm = tot.iter().sum::<f64>() / n as f64;
    let dh: f64 = hyg.iter().map(|h| (h - hm).abs()).sum();
    let dc: f64 = tot
        .iter()
        .zip(&hyg)
        .map(|(t, h)| ((t - h) - (tm - hm)).abs())
        .sum();
    let ms = if dh + dc > 0.0 { dh / (dh + dc) } else { 0.0 };
    put("moisture_share", ms);
    put("creep_share", if dh + dc > 0.0 { 1.0 - ms } else { 0.0 });
    let rc = wound.radius_m[0];
    let rr = wound.radius_m[wound.radius_m.len() - 1];
    let inner = rc + (rr - rc) / 3.0;
    let core_md = wound
        .lanes
        .iter()
        .flat_map(|l| {
            l.tangential_stress_pa
                .iter()
                .zip(&wound.radius_m)
                .filter(|(_, r)| **r <= inner)
                .map(|(t, _)| *t)
        })
        .fold(f64::INFINITY, f64::min);
    put("core_md_stress_mpa", core_md / 1e6);
    put(
        "surface_pressure_end_kpa",
        aged.lanes
            .iter()
            .map(|l| l.surface_pressure_pa[last])
            .fold(f64::INFINITY, f64::min)
            / 1e3,
    );
    put(
        "surface_pressure_loss_pct",
        aged.lanes
            .iter()
            .map(|l| {
                let p0 = l.surface_pressure_pa[0].max(1.0);
                100.0 * (p0 - l.surface_pressure_pa[last]) / p0
            })
            .sum::<f64>()
            / n as f64,
    );
    put(
        "outer_md_stress_end_mpa",
        aged.lanes
            .iter()
            .map(|l| *l.final_tangential_stress_pa.last().unwrap_or(&0.0))
            .fold(f64::NEG_INFINITY, f64::max)
            / 1e6,
    );
    let dmc = |i: usize| aged.lanes[i].moisture_pct[last] - aged.lanes[i].moisture_pct[0];
    put(
        "edge_moisture_change_pct",
        mean_of(&edges_or_ends, &dmc) - mean_of(&centre, &dmc),
    );
    put(
        "moisture_change_pct",
        (0..n).map(|i| dmc(i).abs()).fold(0.0, f64::max),
    );
    let wit: Vec<f64> = wound
        .lanes
        .iter()
        .map(|l| l.summary.wound_in_tension_mean_n_per_m)
        .collect();
    let wmax = wit.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let wmin = wit.iter().cloned().fold(f64::INFINITY, f64::min);
    put(
        "wound_tension_ratio",
        if wmin > 0.0 { wmax / wmin } else { 1e3 },
    );
    let radii: Vec<f64> = wound
        .lanes
        .iter()
        .map(|l| l.summary.outer_radius_m)
        .collect();
    let rmed = median(&radii);
    // a ridge is local: a lane's diameter over the mean of its neighbours (two each side)
    let ridge = (0..n)
        .map(|i| {
            let nb: Vec<f64> = (i.saturating_sub(2)..(i + 3).min(n))
                .filter(|&j| j != i)
                .map(|j| radii[j])
                .collect();
            if nb.is_empty() {
                0.0
            } else {
                (radii[i] - nb.iter().sum::<f64>() / nb.len() as f64) / rmed * 1e3
            }
        })
        .fold(0.0, f64::max);
    put("diameter_ridge_per_mille", ridge);
    let t_mid = case
        .winding
        .tension
        .at(0.5 * (case.roll.core_diameter_m + case.roll.diameter_m));
    put(
        "nip_to_tension_ratio",
        case.material.friction * case.winding.nip_n_per_m / t_mid.max(1e-9),
    );
    let slack: Vec<usize> = (0..n).filter(|&i| excess[i] > SLACK_MM_PER_M).collect();
    put("slack_lanes", slack.len() as f64);
    let running = case.converting_tension_n_per_m
        / (case.material.md_modulus_pa * lanes.mean_caliper_m)
        * 1e3;
    put("running_strain_mm_per_m", running);
    let ratio =
        |k: &str, v: &BTreeMap<String, f64>| v.get(k).copied().unwrap_or(0.0) / running.max(1e-12);
    let lp = ratio("local_peak_mm_per_m", &v);
    let ce = ratio("centre_minus_edges_mm_per_m", &v);
    let ll = ratio("longest_lane_excess_mm_per_m", &v);
    v.insert("local_peak_ratio".into(), lp);
    v.insert("centre_minus_edges_ratio".into(), ce);
    v.insert("longest_lane_ratio".into(), ll);
    Features {
        values: v,
        longest_lane: imax,
        peak_lanes,
        slack,
        excess_mm_per_m: excess,
    }
}
