//! Features of the predicted roll that rules test: the pattern of the strain at unwind across
//! the width, its link to caliper and moisture, and stress states tied to other defects. Each
//! group of features is one function; [`compute`] assembles them with an exhaustive match over
//! [`Feature`], so a new feature does not compile until it is computed.
//!
//! Edges and ends: the edge features (`centre_minus_edges_*`, `edge_moisture_change_pct`) compare
//! the centre half with the roll's ends, the outermost lane at each side ([`end_lanes`]). `lanes`
//! makes each edge lane one 25 mm strip wide at every lane count because moisture exchange through
//! the ends and the web's edge tension act in the outer centimetres, so the end lanes carry the
//! edge effect that a wider average would dilute; this is what the features' meanings say. Where a finding about
//! edges is reported, the lanes named are the edge zones, the outer 15 % of the width at each side
//! ([`edge_lanes`]), falling back to the ends when no lane centre lies in a zone. (The former code
//! computed an `edges_or_ends` set that always equalled the ends; it is replaced by these two
//! named sets, with the features' values unchanged.)

use super::local::{baseline, inner_lanes, spans};
use crate::case::{Case, Grade};
use crate::lanes::Lanes;
use crate::numeric::weighted_mean;
use crate::storage::Aged;
use crate::vocab::{Feature, FeatureValues};
use crate::winding::Wound;
use serde::Serialize;

/// Computed features and the lanes they single out.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Features {
    pub values: FeatureValues,
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
    pub fn get(&self, f: Feature) -> f64 {
        self.values[f]
    }
}

/// Threshold of the trade for a lane to run visibly slack, mm/m (0.05 %: common practice).
pub const SLACK_MM_PER_M: f64 = 0.5;

/// Prominence over the mean lane for a local peak to count as a long band, mm/m (common practice).
pub const BAND_MM_PER_M: f64 = 0.3;

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

/// Mean of `f` over lanes `idx` weighted by their widths `w` (m), so explicit lanes of unequal
/// widths count by the web they hold (0 for none).
fn mean_of(idx: &[usize], w: &[f64], f: &dyn Fn(usize) -> f64) -> f64 {
    let total: f64 = idx.iter().map(|&i| w[i]).sum();
    if total > 0.0 {
        idx.iter().map(|&i| w[i] * f(i)).sum::<f64>() / total
    } else {
        0.0
    }
}

/// Largest of `v`, or `init` when larger.
fn max_from(init: f64, v: impl Iterator<Item = f64>) -> f64 {
    v.fold(init, f64::max)
}

/// Smallest of `v`, or `init` when smaller.
fn min_from(init: f64, v: impl Iterator<Item = f64>) -> f64 {
    v.fold(init, f64::min)
}

/// Lanes whose centre lies in the centre half of the width.
pub fn centre_lanes(lanes: &Lanes, width_m: f64) -> Vec<usize> {
    (0..lanes.lanes.len())
        .filter(|&i| (lanes.lanes[i].position_m - 0.5 * width_m).abs() <= 0.25 * width_m)
        .collect()
}

/// Lanes whose centre lies in an edge zone, the outer 15 % of the width at either side; the
/// outermost lane at each end when no lane centre lies there (a few wide lanes).
pub fn edge_lanes(lanes: &Lanes, width_m: f64) -> Vec<usize> {
    let zone: Vec<usize> = (0..lanes.lanes.len())
        .filter(|&i| {
            let x = lanes.lanes[i].position_m;
            x <= 0.15 * width_m || x >= 0.85 * width_m
        })
        .collect();
    if zone.is_empty() {
        end_lanes(lanes)
    } else {
        zone
    }
}

/// The outermost lane at each end of the roll (none for a single lane).
pub fn end_lanes(lanes: &Lanes) -> Vec<usize> {
    let n = lanes.lanes.len();
    if n >= 2 {
        vec![0, n - 1]
    } else {
        Vec::new()
    }
}

/// The strain at unwind across the width, shared by the length features.
struct Unwind {
    /// Strain at unwind per lane, mm/m.
    s: Vec<f64>,
    /// Lane centres, m; lane widths, m; lane edges, m.
    x: Vec<f64>,
    w: Vec<f64>,
    spans: Vec<(f64, f64)>,
    /// Roll width, m.
    width: f64,
    /// Width-weighted mean lane, mm/m.
    mean_w: f64,
    /// Longest lane and its strain, mm/m.
    imax: usize,
    smax: f64,
}

impl Unwind {
    fn new(case: &Case, lanes: &Lanes, aged: &Aged, last: usize) -> Self {
        let s: Vec<f64> = aged
            .lanes
            .iter()
            .map(|l| l.strain_at_unwind[last] * 1e3)
            .collect();
        let w = lanes.widths();
        let mean_w = weighted_mean(&s, &w);
        let (imax, smax) =
            s.iter().enumerate().fold(
                (0, f64::NEG_INFINITY),
                |a, (i, &v)| if v > a.1 { (i, v) } else { a },
            );
        Unwind {
            s,
            x: lanes.positions(),
            w,
            spans: spans(lanes),
            width: case.roll.width_m,
            mean_w,
            imax,
            smax,
        }
    }

    fn n(&self) -> usize {
        self.s.len()
    }
}

/// Lengths at unwind across the width: spread, longest lane, local peak, the long band, centre
/// against edges, side to side, bands.
struct LengthPattern {
    spread: f64,
    longest_excess: f64,
    local_peak: f64,
    peak_lanes: Vec<usize>,
    peak_width_mm: f64,
    centre_minus_edges: f64,
    side_to_side: f64,
    long_edge: f64,
    band_count: f64,
}

fn length_pattern(u: &Unwind, centre: &[usize], edges: &[usize]) -> LengthPattern {
    let s = &u.s;
    let smin = min_from(f64::INFINITY, s.iter().copied());
    let peak_lanes = long_band(u);
    LengthPattern {
        spread: u.smax - smin,
        longest_excess: u.smax - u.mean_w,
        local_peak: local_peak(s, &u.spans),
        peak_width_mm: peak_lanes.iter().map(|&i| u.w[i]).sum::<f64>() * 1e3,
        peak_lanes,
        centre_minus_edges: centre_against_ends(s, &u.w, centre, edges),
        side_to_side: side_to_side(u),
        long_edge: super::local::end_excess(&u.spans, s),
        band_count: band_count(u) as f64,
    }
}

/// Centre half (`centre`; its median weighted by the lane widths `w`, m, so a band narrower than
/// half of it does not make a long centre) against the end lanes (`ends`) as a two-sided pattern
/// ([`super::local::centre_minus_both`]), in the unit of `s`; 0 unless there are two end lanes
/// and a centre lane apart from them (one or two lanes resolve no centre against edges).
pub(super) fn centre_against_ends(s: &[f64], w: &[f64], centre: &[usize], ends: &[usize]) -> f64 {
    match ends {
        [a, b] if !centre.is_empty() && !centre.iter().any(|i| i == a || i == b) => {
            let mid = crate::stats::weighted_median(centre.iter().map(|&i| (s[i], w[i])).collect());
            super::local::centre_minus_both(mid, s[*a], s[*b])
        }
        _ => 0.0,
    }
}

/// Largest excess of an inner lane over its [`baseline`](super::local::baseline) (the web 75-300
/// mm either side), mm/m (every lane counts as inner below five lanes; 0 for a single lane).
fn local_peak(s: &[f64], spans: &[(f64, f64)]) -> f64 {
    let n = s.len();
    if n <= 1 {
        return 0.0;
    }
    max_from(
        f64::NEG_INFINITY,
        inner_lanes(n).filter_map(|i| baseline(spans, s, i).map(|m| s[i] - m)),
    )
}

/// Lanes around the longest lane longer than halfway between the mean lane and the longest.
fn long_band(u: &Unwind) -> Vec<usize> {
    let (s, n) = (&u.s, u.n());
    let half = u.mean_w + 0.5 * (u.smax - u.mean_w);
    let (mut lo, mut hi) = (u.imax, u.imax);
    while lo > 0 && s[lo - 1] > half {
        lo -= 1;
    }
    while hi + 1 < n && s[hi + 1] > half {
        hi += 1;
    }
    (lo..=hi).collect()
}

/// Front-to-back difference of the robust straight line across the width, absolute, mm/m.
fn side_to_side(u: &Unwind) -> f64 {
    line_difference(&u.x, &u.s, &u.w, u.width)
}

/// Difference over `width` of the robust straight line through `(x, s)` with lane widths `w`
/// ([`crate::stats::theil_sen_slope`]: a single long band near one edge hardly tilts it, a wedge
/// across the width does), absolute, in the unit of `s` (0 when the positions do not spread).
pub fn line_difference(x: &[f64], s: &[f64], w: &[f64], width: f64) -> f64 {
    (crate::stats::theil_sen_slope(x, s, w) * width).abs()
}

/// Local maxima standing out from the mean lane by over [`BAND_MM_PER_M`].
fn band_count(u: &Unwind) -> usize {
    let (s, n) = (&u.s, u.n());
    (0..n)
        .filter(|&i| {
            let l = if i > 0 { s[i - 1] } else { f64::NEG_INFINITY };
            let r = if i + 1 < n {
                s[i + 1]
            } else {
                f64::NEG_INFINITY
            };
            s[i] > l && s[i] > r && s[i] - u.mean_w > BAND_MM_PER_M
        })
        .count()
}

/// Correlation of lane caliper with length at unwind over the width
/// ([`super::width_means::correlation`]), and the caliper range, % of mean.
fn caliper_link(lanes: &Lanes, u: &Unwind) -> (f64, f64) {
    let cal: Vec<f64> = lanes.lanes.iter().map(|l| l.caliper_deviation).collect();
    let cmax = max_from(f64::NEG_INFINITY, cal.iter().copied());
    let cmin = min_from(f64::INFINITY, cal.iter().copied());
    let r = super::width_means::correlation(&cal, &u.s, &u.w);
    (r, (cmax - cmin) * 100.0)
}

/// Shares of the lane-to-lane differences from hygroexpansion and from creep, in the same
/// outer-third average (absolute deviations from the mean lane integrated over the width `w`, m;
/// the web's own length profile at winding taken out of both; [`super::width_means::shares`]).
fn shares(aged: &Aged, last: usize, w: &[f64]) -> (f64, f64) {
    let hyg: Vec<f64> = aged.lanes.iter().map(|l| l.hygro_strain[last]).collect();
    let tot: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.strain_at_unwind[last] - l.web_length_strain)
        .collect();
    super::width_means::shares(&hyg, &tot, w)
}

/// Share of the longest lane's excess over the mean lane that the web brought to the winder
/// (its own length from the tension profile at winding), 0..1; 0 when the longest lane is not
/// longer than the mean lane.
fn web_share(aged: &Aged, u: &Unwind) -> f64 {
    let web: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.web_length_strain * 1e3)
        .collect();
    let excess = u.smax - u.mean_w;
    if excess.is_nan() || excess <= 0.0 || web.is_empty() {
        return 0.0;
    }
    let wbar = weighted_mean(&web, &u.w);
    ((web[u.imax] - wbar) / excess).clamp(0.0, 1.0)
}

/// Stress states tied to other defects, in MPa and kPa as the features name them.
struct StressStates {
    core_md_mpa: f64,
    surface_pressure_end_kpa: f64,
    surface_pressure_loss_pct: f64,
    outer_md_end_mpa: f64,
}

/// `widths`: the lanes' widths, m. The surface pressure at the end is the width-weighted mean:
/// the outer wraps slide axially (telescope) against friction over the whole width, a
/// resisting force of friction times the interlayer pressure integrated over the face
/// (Coulomb's law of friction, Coulomb 1785), so one narrow lane's low pressure does not decide.
/// Its loss over storage is that integral's ([`super::width_means::pressure_loss_pct`]).
fn stress_states(wound: &Wound, aged: &Aged, last: usize, widths: &[f64]) -> StressStates {
    let rc = wound.radius_m[0];
    let rr = wound.radius_m[wound.radius_m.len() - 1];
    let inner = rc + (rr - rc) / 3.0;
    let core_md = min_from(
        f64::INFINITY,
        wound.lanes.iter().flat_map(|l| {
            l.tangential_stress_pa
                .iter()
                .zip(&wound.radius_m)
                .filter(|(_, r)| **r <= inner)
                .map(|(t, _)| *t)
        }),
    );
    let p0: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.surface_pressure_pa[0])
        .collect();
    let p1 = surface_at(aged, last);
    StressStates {
        core_md_mpa: core_md / 1e6,
        surface_pressure_end_kpa: weighted_mean(&p1, widths) / 1e3,
        surface_pressure_loss_pct: super::width_means::pressure_loss_pct(&p0, &p1, widths),
        outer_md_end_mpa: max_from(
            f64::NEG_INFINITY,
            aged.lanes
                .iter()
                .map(|l| *l.final_tangential_stress_pa.last().unwrap_or(&0.0)),
        ) / 1e6,
    }
}

/// Each lane's surface-zone pressure at step `last`, Pa.
pub(super) fn surface_at(aged: &Aged, last: usize) -> Vec<f64> {
    aged.lanes
        .iter()
        .map(|l| l.surface_pressure_pa[last])
        .collect()
}

/// Moisture change over storage: edge lanes minus centre lanes, and the largest of any lane,
/// points.
fn moisture_change(
    aged: &Aged,
    last: usize,
    w: &[f64],
    centre: &[usize],
    edges: &[usize],
) -> (f64, f64) {
    let dmc = |i: usize| aged.lanes[i].moisture_pct[last] - aged.lanes[i].moisture_pct[0];
    (
        // the two ends count alike (each is one face's exchange), the centre half by width
        mean_of(edges, &vec![1.0; w.len()], &dmc) - mean_of(centre, w, &dmc),
        max_from(0.0, (0..aged.lanes.len()).map(|i| dmc(i).abs())),
    )
}

/// Winding states: highest over lowest lane wound-in tension, the largest diameter ridge (a
/// lane's diameter over its [`baseline`](super::local::baseline), per mille of the median
/// diameter), friction x nip over web tension at mid diameter, and the number of hard rings
/// ([`hard_band_count`]).
struct WindingStates {
    tension_ratio: f64,
    ridge: f64,
    nip_ratio: f64,
    hard_bands: usize,
}

fn winding_states(case: &Case, lanes: &Lanes, wound: &Wound) -> WindingStates {
    let wit: Vec<f64> = wound
        .lanes
        .iter()
        .map(|l| l.summary.wound_in_tension_mean_n_per_m)
        .collect();
    let wmax = max_from(f64::NEG_INFINITY, wit.iter().copied());
    let wmin = min_from(f64::INFINITY, wit.iter().copied());
    let tension_ratio = if wmin > 0.0 { wmax / wmin } else { 1e3 };
    let radii: Vec<f64> = wound
        .lanes
        .iter()
        .map(|l| l.summary.outer_radius_m)
        .collect();
    let rmed = median(&radii);
    // a ridge is local: an inner lane's diameter over the web 75-300 mm either side
    let sp = spans(lanes);
    let ridge = max_from(
        0.0,
        inner_lanes(radii.len())
            .map(|i| baseline(&sp, &radii, i).map_or(0.0, |m| (radii[i] - m) / rmed * 1e3)),
    );
    let t_mid = case
        .winding
        .tension
        .at(0.5 * (case.roll.core_diameter_m + case.roll.diameter_m));
    let nip_ratio = case.material.friction * case.winding.nip_n_per_m / t_mid.max(1e-9);
    WindingStates {
        tension_ratio,
        ridge,
        nip_ratio,
        hard_bands: hard_band_count(&wit, &lanes.widths()),
    }
}

/// A lane wound in this fraction above the width-weighted mean lane's wound-in tension is a hard
/// ring (assumption: of the order of the lane-to-lane scatter of wound-in tension on a roll
/// wound without a pattern, so a peak beyond it is a pattern, not noise).
pub const HARD_BAND_FRACTION: f64 = 0.1;

/// Hard rings wound in: inner lanes ([`inner_lanes`]) whose mean wound-in tension `wit` (N/m) is
/// a local maximum over both neighbours and [`HARD_BAND_FRACTION`] above the width-weighted mean
/// (`widths` m). An end lane is not counted: it has a neighbour on one side only, so thick or
/// tight edges would count as two rings of a repeating pattern, which they are not (the edge
/// rules judge them).
fn hard_band_count(wit: &[f64], widths: &[f64]) -> usize {
    let n = wit.len();
    let mean = weighted_mean(wit, widths);
    let side = |j: Option<usize>| j.and_then(|j| wit.get(j)).copied();
    inner_lanes(n)
        .filter(|&i| {
            let left = side(i.checked_sub(1)).unwrap_or(f64::NEG_INFINITY);
            let right = side(Some(i + 1)).unwrap_or(f64::NEG_INFINITY);
            wit[i] > left && wit[i] > right && wit[i] > (1.0 + HARD_BAND_FRACTION) * mean
        })
        .count()
}

/// The web's running strain T/(E c) at the converting tension, mm/m.
fn running_strain(case: &Case, lanes: &Lanes) -> f64 {
    case.converting_tension_n_per_m / (case.material.md_modulus_pa * lanes.mean_caliper_m) * 1e3
}

/// A feature value as rules see it: a value that is not finite counts as 0.
fn finite(v: f64) -> f64 {
    if v.is_finite() {
        v
    } else {
        0.0
    }
}

/// The wound and stored state against the strength limits, the drying of the outer wraps and
/// the grade kind.
struct LimitRatios {
    core: f64,
    crush: f64,
    md_compression: f64,
    md_tension: f64,
    outer_loss: f64,
    paper: f64,
}

fn limit_ratios(
    case: &Case,
    wound: &Wound,
    aged: &Aged,
    last: usize,
    st: &StressStates,
    spans: &[(f64, f64)],
) -> LimitRatios {
    use crate::note::Strength;
    let checks = crate::limits::strength(&case.material, &case.roll, wound, spans);
    let ratio = |which: Strength| {
        checks
            .iter()
            .find(|c| c.which == which)
            .map_or(0.0, |c| c.ratio)
    };
    let m = &case.material;
    let outer_loss = max_from(
        f64::NEG_INFINITY,
        aged.lanes.iter().map(|l| {
            let o = &l.outer_moisture_pct;
            o.first().copied().unwrap_or(0.0) - o.get(last).copied().unwrap_or(0.0)
        }),
    );
    let paper = match m.grade {
        Grade::Film => false,
        Grade::Custom => m.hygro_md_per_pct > 0.0,
        Grade::Newsprint | Grade::Coated | Grade::Board => true,
    };
    LimitRatios {
        core: ratio(Strength::CoreCollapse),
        crush: ratio(Strength::ZdCrush),
        md_compression: ratio(Strength::MdCompression),
        md_tension: st.outer_md_end_mpa * 1e6 / m.strength.md_tensile_pa.max(1e-9),
        outer_loss,
        paper: if paper { 1.0 } else { 0.0 },
    }
}

/// Compute the features of a predicted roll.
pub fn compute(case: &Case, lanes: &Lanes, o: &super::actions::Outcome) -> Features {
    let (wound, aged) = (&o.wound, &o.aged);
    let last = aged.last();
    let u = Unwind::new(case, lanes, aged, last);
    let centre = centre_lanes(lanes, u.width);
    let ends = end_lanes(lanes);
    let len = length_pattern(&u, &centre, &ends);
    let (caliper_correlation, caliper_range_pct) = caliper_link(lanes, &u);
    let (moisture_share, creep_share) = shares(aged, last, &u.w);
    let web_length_share = web_share(aged, &u);
    let st = stress_states(wound, aged, last, &u.w);
    let (edge_moisture, moisture_change) = moisture_change(aged, last, &u.w, &centre, &ends);
    let ws = winding_states(case, lanes, wound);
    let lim = limit_ratios(case, wound, aged, last, &st, &u.spans);
    let excess: Vec<f64> = u.s.iter().map(|v| v - u.mean_w).collect();
    let slack: Vec<usize> = (0..u.n()).filter(|&i| excess[i] > SLACK_MM_PER_M).collect();
    let running = running_strain(case, lanes);
    // the ratios divide the finite values by the running strain
    let ratio = |v: f64| finite(v) / running.max(1e-12);
    let un = super::unwind::features(case, &o.unwind);
    let air = super::unwind::air_features(case);
    use Feature as F;
    let values = FeatureValues::from_fn(|f| match f {
        F::LocalPeakRatio => ratio(len.local_peak),
        F::CentreMinusEdgesRatio => ratio(len.centre_minus_edges),
        F::LongestLaneRatio => ratio(len.longest_excess),
        F::SideToSideRatio => ratio(len.side_to_side),
        F::LongEdgeRatio => ratio(len.long_edge),
        F::RunningStrainMmPerM => finite(running),
        F::SpreadMmPerM => finite(len.spread),
        F::LongestLaneExcessMmPerM => finite(len.longest_excess),
        F::LocalPeakMmPerM => finite(len.local_peak),
        F::PeakWidthMm => finite(len.peak_width_mm),
        F::CentreMinusEdgesMmPerM => finite(len.centre_minus_edges),
        F::SideToSideMmPerM => finite(len.side_to_side),
        F::LongEdgeMmPerM => finite(len.long_edge),
        F::BandCount => finite(len.band_count),
        F::CaliperCorrelation => finite(caliper_correlation),
        F::CaliperRangePct => finite(caliper_range_pct),
        F::MoistureShare => finite(moisture_share),
        F::CreepShare => finite(creep_share),
        F::WebLengthShare => finite(web_length_share),
        F::CoreMdStressMpa => finite(st.core_md_mpa),
        F::SurfacePressureEndKpa => finite(st.surface_pressure_end_kpa),
        F::SurfacePressureLossPct => finite(st.surface_pressure_loss_pct),
        F::OuterMdStressEndMpa => finite(st.outer_md_end_mpa),
        F::EdgeMoistureChangePct => finite(edge_moisture),
        F::MoistureChangePct => finite(moisture_change),
        F::WoundTensionRatio => finite(ws.tension_ratio),
        F::DiameterRidgePerMille => finite(ws.ridge),
        F::NipToTensionRatio => finite(ws.nip_ratio),
        F::HardBandCount => ws.hard_bands as f64,
        F::SlackLanes => finite(slack.len() as f64),
        F::CorePressureRatio => finite(lim.core),
        F::PeakPressureCrushRatio => finite(lim.crush),
        F::MdCompressionStrengthRatio => finite(lim.md_compression),
        F::MdTensionStrengthRatio => finite(lim.md_tension),
        F::OuterMoistureLossPct => finite(lim.outer_loss),
        F::PaperGrade => lim.paper,
        F::RunOutMm => finite(un.run_out_mm),
        F::UnwindTensionSwingRatio => finite(un.tension_swing_ratio),
        F::UnwindStressStrengthRatio => finite(un.stress_strength_ratio),
        F::AirFilmRoughnessRatio => finite(air.film_roughness_ratio),
        F::AirTensionLossRatio => finite(air.tension_loss_ratio),
    });
    Features {
        values,
        longest_lane: u.imax,
        peak_lanes: len.peak_lanes,
        slack,
        excess_mm_per_m: excess,
    }
}

#[cfg(test)]
mod tests {
    /// The centre half's median counts lanes by width: a 100 mm band 1 long beside a 300 mm lane
    /// level leaves it level (the mean would be 0.25, by count 0.5), 1 over ends 1 short; a band
    /// over more than half of the centre's width moves it.
    #[test]
    fn the_centre_half_is_weighted_by_lane_width() {
        let (s, w) = ([-1.0, 1.0, 0.0, -1.0], [0.025, 0.1, 0.3, 0.025]);
        let v = super::centre_against_ends(&s, &w, &[1, 2], &[0, 3]);
        assert!((v - 1.0).abs() < 1e-12, "{v}");
        let wide = [0.025, 0.3, 0.1, 0.025];
        let v = super::centre_against_ends(&s, &wide, &[1, 2], &[0, 3]);
        assert!((v - 2.0).abs() < 1e-12, "{v}");
    }
}
