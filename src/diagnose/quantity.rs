//! Each defect's own quantity, measured on a forward run, and the lanes that carry a finding's
//! evidence.

use super::actions::Outcome;
use super::features::{self, Features};
use super::local;
use crate::lanes::Lanes;
use crate::vocab::{Defect, Feature, Quantity};
use crate::winding::Wound;

/// The quantity a defect is judged on.
pub const fn quantity_of(d: Defect) -> Quantity {
    match d {
        Defect::BaggyLane | Defect::Puckers => Quantity::LaneExcessMmPerM,
        Defect::Corrugations => Quantity::LocalPeakMmPerM,
        Defect::BaggyCenter => Quantity::CentreMinusEdgesMmPerM,
        Defect::BaggyEdges => Quantity::EdgesMinusCentreMmPerM,
        Defect::BaggyOneEdge => Quantity::LongEdgeMmPerM,
        Defect::Starring | Defect::CrepeWrinkles => Quantity::CoreMdCompressionMpa,
        Defect::Telescoping => Quantity::SurfacePressureKpa,
        Defect::Bursts => Quantity::OuterMdStressMpa,
        Defect::Ridges => Quantity::DiameterRidgePerMille,
        Defect::GaugeBands => Quantity::BandDiameterPerMille,
        Defect::CrushedLayers => Quantity::PeakPressureMpa,
        Defect::CoreCollapse => Quantity::CorePressureMpa,
        Defect::ConicalRoll => Quantity::SideToSideMmPerM,
        Defect::OutOfRound => Quantity::UnwindStressSwingMpa,
        Defect::LooseOuterWraps => Quantity::OuterZonePressureKpa,
        Defect::NoDefect => Quantity::SpreadMmPerM,
    }
}

/// A rule's threshold on `q` itself, in `q`'s unit: the bound on the defect's side of a
/// condition in `when` on the feature that reads `q` the same way (only the surface pressure:
/// [`Site::measure`] reads it as the feature does). None when the rule tests no such feature.
pub fn rule_threshold(q: Quantity, when: &[crate::rules::Condition]) -> Option<f64> {
    let twin = match q {
        Quantity::SurfacePressureKpa => Feature::SurfacePressureEndKpa,
        _ => return None,
    };
    let c = when.iter().find(|c| c.feature == twin)?;
    if q.lower_is_better() {
        c.above
    } else {
        c.below
    }
}

/// Where a quantity is measured: the roll's lanes, the finding's lanes and the lanes left out.
pub struct Site<'a> {
    pub lanes: &'a Lanes,
    /// The roll (its core, for the core's load width).
    pub roll: &'a crate::case::Roll,
    /// Roll width, m.
    pub width_m: f64,
    /// The finding's lanes (its evidence); none: the whole roll.
    pub at: &'a [usize],
    /// Lanes slit out.
    pub excluded: &'a [usize],
}

fn mean(v: impl Iterator<Item = f64>) -> f64 {
    let (s, n) = v.fold((0.0, 0usize), |(s, n), x| (s + x, n + 1));
    if n == 0 {
        0.0
    } else {
        s / n as f64
    }
}

/// Largest of an iterator (NEG_INFINITY when empty).
fn max(v: impl Iterator<Item = f64>) -> f64 {
    v.fold(f64::NEG_INFINITY, f64::max)
}

impl Site<'_> {
    /// Lanes kept (not slit out).
    fn kept(&self) -> Vec<usize> {
        (0..self.lanes.lanes.len())
            .filter(|i| !self.excluded.contains(i))
            .collect()
    }

    /// Positions in `kept` of the finding's lanes still kept, or every kept lane when none is.
    fn focus(&self, kept: &[usize]) -> Vec<usize> {
        let f: Vec<usize> = (0..kept.len())
            .filter(|&k| self.at.contains(&kept[k]))
            .collect();
        if f.is_empty() {
            (0..kept.len()).collect()
        } else {
            f
        }
    }

    /// The largest diameter of the focus lanes over the kept web beside them, per mille of the
    /// median diameter; `ridge`: inner lanes only, as the feature counts a ridge.
    fn diameter_over_web(
        &self,
        o: &Outcome,
        kept: &[usize],
        spans: &[(f64, f64)],
        ridge: bool,
    ) -> f64 {
        let r = outer_radii(&o.wound, kept);
        let med = median(&r);
        let mut at = self.focus(kept);
        if ridge {
            let inner = local::inner_lanes(kept.len());
            at.retain(|k| inner.contains(k));
            if at.is_empty() {
                at = inner.collect();
            }
        }
        max(at
            .into_iter()
            .map(|k| local::baseline(spans, &r, k).map_or(0.0, |m| (r[k] - m) / med * 1e3)))
    }

    /// Evaluate `q` on an outcome, in the quantity's unit (0 when not finite). A local quantity
    /// is judged against the web that is kept ([`local::baseline`] over the kept lanes).
    pub fn measure(&self, q: Quantity, o: &Outcome) -> f64 {
        let kept = self.kept();
        let spans: Vec<(f64, f64)> = kept
            .iter()
            .map(|&i| (self.lanes.lanes[i].left_m, self.lanes.lanes[i].right_m))
            .collect();
        let last = o.aged.last();
        let s: Vec<f64> = kept
            .iter()
            .map(|&i| o.aged.lanes[i].strain_at_unwind[last] * 1e3)
            .collect();
        let v = match q {
            Quantity::LaneExcessMmPerM => {
                let w = self.lanes.widths();
                let wsum: f64 = kept.iter().map(|&i| w[i]).sum();
                let mw = kept.iter().zip(&s).map(|(&i, v)| w[i] * v).sum::<f64>() / wsum;
                max(self.focus(&kept).into_iter().map(|k| s[k] - mw))
            }
            Quantity::LocalPeakMmPerM => max(self
                .focus(&kept)
                .into_iter()
                .filter_map(|k| local::baseline(&spans, &s, k).map(|m| s[k] - m))),
            Quantity::CentreMinusEdgesMmPerM => self.centre_minus_ends(&kept, &s),
            Quantity::EdgesMinusCentreMmPerM => -self.centre_minus_ends(&kept, &s),
            Quantity::CoreMdCompressionMpa => {
                max(kept.iter().map(|&i| core_compression(&o.wound, i))) / 1e6
            }
            Quantity::SurfacePressureKpa => {
                // width-weighted over the kept web, as the feature reads it
                let p = features::surface_at(&o.aged, last);
                let w = self.lanes.widths();
                let kp: Vec<f64> = kept.iter().map(|&i| p[i]).collect();
                let kw: Vec<f64> = kept.iter().map(|&i| w[i]).collect();
                crate::numeric::weighted_mean(&kp, &kw) / 1e3
            }
            Quantity::OuterMdStressMpa => {
                max(kept.iter().map(|&i| {
                    *o.aged.lanes[i]
                        .final_tangential_stress_pa
                        .last()
                        .unwrap_or(&0.0)
                })) / 1e6
            }
            Quantity::DiameterRidgePerMille => self.diameter_over_web(o, &kept, &spans, true),
            Quantity::BandDiameterPerMille => self.diameter_over_web(o, &kept, &spans, false),
            Quantity::SpreadMmPerM => max(s.iter().copied()) + max(s.iter().map(|x| -x)),
            Quantity::SideToSideMmPerM => {
                let x: Vec<f64> = kept
                    .iter()
                    .map(|&i| self.lanes.lanes[i].position_m)
                    .collect();
                let w = self.lanes.widths();
                let w: Vec<f64> = kept.iter().map(|&i| w[i]).collect();
                features::line_difference(&x, &s, &w, self.width_m)
            }
            Quantity::LongEdgeMmPerM => local::end_excess(&spans, &s),
            Quantity::PeakPressureMpa => {
                max(self
                    .focus(&kept)
                    .into_iter()
                    .map(|k| o.wound.lanes[kept[k]].summary.peak_pressure_pa))
                    / 1e6
            }
            Quantity::UnwindStressSwingMpa => {
                o.unwind.swing.map_or(0.0, |s| s.stress_amplitude_pa) / 1e6
            }
            Quantity::OuterZonePressureKpa => outer_zone_kpa(&o.wound, &kept),
            Quantity::CorePressureMpa => {
                core_load(self.roll, &spans, &o.wound, &kept).map_or(0.0, |m| m.mean / 1e6)
            }
        };
        if v.is_finite() {
            v
        } else {
            0.0
        }
    }

    /// Centre half minus the outermost kept lane each side as a two-sided pattern, as the
    /// feature reads it ([`features::centre_against_ends`] over the kept lanes), mm/m.
    fn centre_minus_ends(&self, kept: &[usize], s: &[f64]) -> f64 {
        let centre = features::centre_lanes(self.lanes, self.width_m);
        let inner: Vec<usize> = (0..kept.len())
            .filter(|&k| centre.contains(&kept[k]))
            .collect();
        let ends = [0, kept.len().saturating_sub(1)];
        let w: Vec<f64> = (kept.iter())
            .map(|&i| self.lanes.lanes[i].width_m)
            .collect();
        features::centre_against_ends(s, &w, &inner, &ends)
    }
}

/// The pressure on the core over its load width ([`crate::limits::core_load`]) from lanes
/// `idx` at `spans` (m).
pub fn core_load(
    roll: &crate::case::Roll,
    spans: &[(f64, f64)],
    w: &Wound,
    idx: &[usize],
) -> Option<crate::numeric::WindowMean> {
    let p: Vec<f64> = idx
        .iter()
        .map(|&i| w.lanes[i].summary.core_pressure_pa)
        .collect();
    crate::limits::core_load(roll, spans, &p)
}

/// Largest MD compressive stress of lane `i` in the inner third of the wound roll, Pa.
fn core_compression(w: &Wound, i: usize) -> f64 {
    let rc = w.radius_m[0];
    let inner = rc + (w.radius_m[w.radius_m.len() - 1] - rc) / 3.0;
    max(w.lanes[i]
        .tangential_stress_pa
        .iter()
        .zip(&w.radius_m)
        .filter(|(_, r)| **r <= inner)
        .map(|(t, _)| -t))
}

/// Lowest mean interlayer pressure of the outer 25 mm at winding over lanes `idx`, kPa.
fn outer_zone_kpa(w: &Wound, idx: &[usize]) -> f64 {
    -max(idx
        .iter()
        .map(|&i| -w.lanes[i].summary.surface_zone_pressure_pa))
        / 1e3
}

fn outer_radii(w: &Wound, idx: &[usize]) -> Vec<f64> {
    idx.iter()
        .map(|&i| w.lanes[i].summary.outer_radius_m)
        .collect()
}

fn median(v: &[f64]) -> f64 {
    let mut s = v.to_vec();
    s.sort_by(f64::total_cmp);
    match s.len() {
        0 => 1.0,
        n if n % 2 == 1 => s[n / 2],
        n => 0.5 * (s[n / 2 - 1] + s[n / 2]),
    }
}

/// Contiguous lanes around `peak` whose `v` exceeds `level`.
fn around(v: &[f64], peak: usize, level: f64) -> Vec<usize> {
    let (mut lo, mut hi) = (peak, peak);
    while lo > 0 && v[lo - 1] > level {
        lo -= 1;
    }
    while hi + 1 < v.len() && v[hi + 1] > level {
        hi += 1;
    }
    (lo..=hi).collect()
}

/// Index of the largest value.
fn argmax(v: &[f64]) -> usize {
    (0..v.len()).fold(0, |a, i| if v[i] > v[a] { i } else { a })
}

/// Index of the largest value among the lanes that may stand out locally
/// ([`local::inner_lanes`]).
fn argmax_inner(v: &[f64]) -> usize {
    let inner = local::inner_lanes(v.len());
    inner
        .clone()
        .fold(inner.start, |a, i| if v[i] > v[a] { i } else { a })
}

/// A lane's excess over its [`local::baseline`] (the web 75-300 mm either side), per lane (0
/// for a lone lane).
fn local_excess(v: &[f64], spans: &[(f64, f64)]) -> Vec<f64> {
    (0..v.len())
        .map(|i| local::baseline(spans, v, i).map_or(0.0, |m| v[i] - m))
        .collect()
}

/// The band around the lane that stands out most from the web around it: lanes above halfway
/// between that lane and its baseline. Only inner lanes can peak from five lanes up, as in the
/// local-peak feature.
fn local_band(v: &[f64], spans: &[(f64, f64)]) -> Vec<usize> {
    let n = v.len();
    if n == 0 {
        return Vec::new();
    }
    let loc = local_excess(v, spans);
    let p = argmax_inner(&loc);
    around(v, p, v[p] - 0.5 * loc[p])
}

/// The ridge: the lanes around the inner lane whose radius `r` stands out most from the web
/// around it, down to half its excess.
fn ridge_band(r: &[f64], spans: &[(f64, f64)]) -> Vec<usize> {
    let loc = local_excess(r, spans);
    let p = argmax_inner(&loc);
    let mut band = around(&loc, p, 0.5 * loc[p]);
    band.retain(|&i| loc[i] > 0.0);
    band
}

/// Lanes whose value is within 10 % of the extreme; none (the whole roll) when every lane is.
fn near_extreme(v: &[f64]) -> Vec<usize> {
    let top = max(v.iter().copied());
    let idx: Vec<usize> = (0..v.len())
        .filter(|&i| v[i] >= top - 0.1 * top.abs())
        .collect();
    if idx.len() == v.len() {
        Vec::new()
    } else {
        idx
    }
}

/// The lanes that carry a finding's evidence (none: the whole roll; a flat and entrained air
/// act across the whole width).
pub fn locate(
    defect: Defect,
    lanes: &Lanes,
    width_m: f64,
    f: &Features,
    o: &Outcome,
) -> Vec<usize> {
    let x = &f.excess_mm_per_m;
    let n = x.len();
    let centre = features::centre_lanes(lanes, width_m);
    let ends = features::end_lanes(lanes);
    let spans = local::spans(lanes);
    match defect {
        Defect::BaggyLane => local_band(x, &spans),
        Defect::Puckers | Defect::Corrugations => {
            // the local maxima standing out from the mean lane (the feature's bands)
            let b: Vec<usize> = (0..n)
                .filter(|&i| {
                    (i == 0 || x[i] > x[i - 1])
                        && (i + 1 == n || x[i] > x[i + 1])
                        && x[i] > features::BAND_MM_PER_M
                })
                .collect();
            if b.is_empty() {
                local_band(x, &spans)
            } else {
                b
            }
        }
        Defect::Ridges => ridge_band(&outer_radii(&o.wound, &(0..n).collect::<Vec<_>>()), &spans),
        Defect::GaugeBands => {
            let c: Vec<f64> = lanes.lanes.iter().map(|l| l.caliper_deviation).collect();
            let p = argmax(&c);
            around(&c, p, 0.5 * (c[p] + median(&c)))
        }
        Defect::BaggyEdges => {
            let cm = mean(centre.iter().map(|&i| x[i]));
            let mut e = features::edge_lanes(lanes, width_m);
            e.extend(ends);
            e.sort_unstable();
            e.dedup();
            e.retain(|&i| x[i] > cm.max(0.0));
            e
        }
        Defect::BaggyOneEdge => long_edge(x, &spans),
        Defect::ConicalRoll => {
            // the long side: the lanes above the mean lane on the side the line rises to
            let half = 0.5 * width_m;
            let front: f64 = mean(
                (0..n)
                    .filter(|&i| lanes.lanes[i].position_m < half)
                    .map(|i| x[i]),
            );
            let back: f64 = mean(
                (0..n)
                    .filter(|&i| lanes.lanes[i].position_m >= half)
                    .map(|i| x[i]),
            );
            (0..n)
                .filter(|&i| (lanes.lanes[i].position_m >= half) == (back > front) && x[i] > 0.0)
                .collect()
        }
        Defect::BaggyCenter => {
            let em = mean(ends.iter().map(|&i| x[i]));
            centre.into_iter().filter(|&i| x[i] > em.max(0.0)).collect()
        }
        Defect::Starring | Defect::CrepeWrinkles | Defect::Bursts | Defect::CrushedLayers => {
            near_extreme(&stress_state(defect, o))
        }
        // the core is loaded over its load width (the finding names that window, not lanes);
        // the outer wraps slide against friction over the whole width
        Defect::CoreCollapse
        | Defect::Telescoping
        | Defect::OutOfRound
        | Defect::LooseOuterWraps
        | Defect::NoDefect => Vec::new(),
    }
}

/// The end lane longer over the web inward of it (as [`local::end_excess`] judges it), and the
/// lanes next to it as long.
fn long_edge(x: &[f64], spans: &[(f64, f64)]) -> Vec<usize> {
    let (front, back) = local::end_overs(spans, x);
    let end = if back > front { x.len() - 1 } else { 0 };
    around(x, end, 0.5 * (x[end] + median(x)))
}

/// Per lane, the stress state a stress-based defect is located by (the lanes near its extreme).
fn stress_state(defect: Defect, o: &Outcome) -> Vec<f64> {
    let n = o.wound.lanes.len();
    match defect {
        Defect::Starring | Defect::CrepeWrinkles => {
            (0..n).map(|i| core_compression(&o.wound, i)).collect()
        }
        Defect::Bursts => o
            .aged
            .lanes
            .iter()
            .map(|l| *l.final_tangential_stress_pa.last().unwrap_or(&0.0))
            .collect(),
        Defect::CrushedLayers => o
            .wound
            .lanes
            .iter()
            .map(|l| l.summary.peak_pressure_pa)
            .collect(),
        Defect::CoreCollapse
        | Defect::Telescoping
        | Defect::BaggyLane
        | Defect::BaggyCenter
        | Defect::BaggyEdges
        | Defect::BaggyOneEdge
        | Defect::Puckers
        | Defect::Ridges
        | Defect::Corrugations
        | Defect::GaugeBands
        | Defect::ConicalRoll
        | Defect::OutOfRound
        | Defect::LooseOuterWraps
        | Defect::NoDefect => vec![0.0; n],
    }
}
