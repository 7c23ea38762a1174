//! Cross-width profiles to lanes: edges, centres, and per lane the caliper, diameter and hardness
//! deviations and the wound-in strain difference a diameter difference implies. Every measured
//! profile is interpolated onto the lanes here, once: [`Lanes::series`] holds the per-lane
//! measurement series by kind and age, which fitting reads instead of the raw profiles.
//!
//! **Invariant:** lanes are sorted from the front edge, do not overlap, and lie inside the roll.

use crate::case::{Case, Measure, Profile};
use crate::interp::linear_extrap;
use crate::note::Note;
use crate::numeric::weighted_mean;
use serde::Serialize;

/// Where a lane's caliper came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum CaliperSource {
    /// Interpolated from a measured caliper profile.
    Profile,
    /// Inferred from the diameter profile at the earliest age (no caliper profile given).
    Diameter,
    /// The nominal caliper of the material.
    Nominal,
}

/// One lane of the roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Lane {
    /// Index from the front edge, 0-based.
    pub index: usize,
    /// Front-side edge, m from the front edge of the roll.
    pub left_m: f64,
    /// Back-side edge, m.
    pub right_m: f64,
    /// Centre position, m.
    pub position_m: f64,
    /// Lane width, m.
    pub width_m: f64,
    /// Lane caliper, m.
    pub caliper_m: f64,
    /// Caliper deviation from the width-weighted mean, fraction.
    pub caliper_deviation: f64,
    /// Diameter minus the mean diameter at the earliest diameter profile, m.
    pub diameter_deviation_m: Option<f64>,
    /// Hardness minus the mean at the earliest hardness profile, scale units.
    pub hardness_deviation: Option<f64>,
    /// Wound-in MD strain difference implied by the diameter difference, dR/R, dimensionless.
    pub wound_strain_difference: Option<f64>,
    /// The lane's MD strain excess in the web as it came to the winder, from the tension profile
    /// at winding (Hooke's law: (T_i - T_mean) / (E_MD c_i), with the profile's shape at the
    /// winder's tension at mid build), dimensionless; positive = a tight lane, which is shorter
    /// when free. 0 without a tension profile.
    pub web_strain: f64,
    /// The lane's moisture at winding from a moisture profile, % (`None`: the material's).
    pub winding_moisture_pct: Option<f64>,
    /// True where a profile value had to be extrapolated beyond the measured positions.
    pub extrapolated: bool,
}

/// One measured profile on the lanes.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    pub what: Measure,
    /// Roll age at the reading, s.
    pub age_s: f64,
    /// Value of each lane (caliper m, diameter m, hardness scale units): the mean of the readings
    /// inside the lane where it holds two or more, else the profile at its centre ([`onto`]).
    pub values: Vec<f64>,
    /// True where some lane takes a value extrapolated beyond the measured positions.
    pub extrapolated: bool,
    /// Per lane, whether its value is extrapolated.
    pub beyond: Vec<bool>,
    /// Factor on a reading's noise in each lane's value: 1 / sqrt(k) for the mean of k readings,
    /// else [`crate::interp::noise_gain`] at its centre (1 inside the readings, more where a lane
    /// is extrapolated).
    pub noise_gain: Vec<f64>,
}

/// The lanes of a roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Lanes {
    pub lanes: Vec<Lane>,
    /// Width-weighted mean caliper, m.
    pub mean_caliper_m: f64,
    pub caliper_source: CaliperSource,
    /// Notes on how the lanes were built (extrapolation, inference).
    pub notes: Vec<Note>,
    /// Every measured profile on the lanes, in the case's order.
    #[serde(skip)]
    pub series: Vec<Series>,
}

/// Default lane count when the case gives neither profiles nor lanes.
pub const DEFAULT_LANES: usize = 12;

/// Width of each edge lane, m: moisture exchange through the roll's ends and the tension of the
/// web's edges act in the outer centimetres (common practice), which a wide edge lane would
/// average away, so the edge lane has this width at every lane count.
pub const EDGE_STRIP_M: f64 = 0.025;

/// Make each edge lane one edge strip wide, so that what happens at the roll's ends is averaged
/// over the same width at every lane count (the edge lane's length at unwind depends on its
/// width: moisture enters through the end faces over the outer centimetres). An edge lane more
/// than two strips wide has a strip split off (one lane more); with three lanes or more, one
/// between one and two strips wide gives its excess width to its neighbour (the lane count
/// stays); a narrower one is kept. Both ends are judged on the widths as given and treated
/// alike (a width within 1 nm of a threshold counts as on it, so rounding cannot split one end
/// and trim the other).
fn with_edge_strips(e: Vec<f64>) -> Vec<f64> {
    const TOL_M: f64 = 1e-9;
    let n = e.len();
    if n < 2 {
        return e;
    }
    let (first, last) = (e[0], e[n - 1]);
    let (w0, w1) = (e[1] - first, last - e[n - 2]);
    // trimming moves an inner edge: only when the two edge lanes do not share it
    let trim = n >= 4;
    let mut out = e;
    if w1 > 2.0 * EDGE_STRIP_M + TOL_M {
        out.insert(n - 1, last - EDGE_STRIP_M);
    } else if trim && w1 > EDGE_STRIP_M + TOL_M {
        out[n - 2] = last - EDGE_STRIP_M;
    }
    if w0 > 2.0 * EDGE_STRIP_M + TOL_M {
        out.insert(1, first + EDGE_STRIP_M);
    } else if trim && w0 > EDGE_STRIP_M + TOL_M {
        out[1] = first + EDGE_STRIP_M;
    }
    out
}

/// Most lanes made from a profile's positions when the case states no lanes; a denser scan is
/// merged to this many (a note says so).
pub const MAX_IMPLICIT_LANES: usize = 60;

/// The profile with the most positions (caliper first, then diameter, then hardness).
fn densest(case: &Case) -> Option<&Profile> {
    [Measure::Caliper, Measure::Diameter, Measure::Hardness]
        .iter()
        .filter_map(|m| {
            case.profiles
                .iter()
                .filter(|p| p.what == *m)
                .max_by_key(|p| p.positions_m.len())
        })
        .max_by_key(|p| p.positions_m.len())
}

/// Lane edges (m) for a case: explicit edges as given; otherwise a lane count or the densest
/// profile's positions, each edge lane made one edge strip wide ([`with_edge_strips`]).
pub fn edges(case: &Case) -> Vec<f64> {
    let w = case.roll.width_m;
    if let Some(e) = &case.lane_edges_m {
        return e.clone();
    }
    if let Some(n) = case.lane_count {
        return with_edge_strips((0..=n).map(|i| w * i as f64 / n as f64).collect());
    }
    match densest(case) {
        Some(p) => {
            let x = &p.positions_m;
            let mut mids: Vec<f64> = x.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
            if mids.len() + 1 > MAX_IMPLICIT_LANES {
                // merge neighbours: keep every k-th inner edge so at most MAX_IMPLICIT_LANES remain
                let k = (mids.len() + 1).div_ceil(MAX_IMPLICIT_LANES);
                mids = mids.into_iter().skip(k - 1).step_by(k).collect();
            }
            let mut e = vec![0.0];
            e.extend(mids);
            e.push(w);
            with_edge_strips(e)
        }
        None => with_edge_strips(
            (0..=DEFAULT_LANES)
                .map(|i| w * i as f64 / DEFAULT_LANES as f64)
                .collect(),
        ),
    }
}

/// How far a lane centre may lie beyond the outermost reading and still count as at it, m:
/// reading positions are given to the millimetre.
const POSITION_TOL_M: f64 = 1e-3;

/// Whether `x` (m) lies beyond the readings at `positions` (m) by more than [`POSITION_TOL_M`].
fn beyond(positions: &[f64], x: f64) -> bool {
    match (positions.first(), positions.last()) {
        (Some(a), Some(b)) => x < a - POSITION_TOL_M || x > b + POSITION_TOL_M,
        _ => true,
    }
}

/// A profile on the lanes between edges `e` (m). A lane that holds readings takes their mean,
/// whose noise is that of one reading over the root of their count: it uses every reading, where
/// its centre alone would skip those between lane centres (a band there would be lost), and a
/// lane that holds one reading takes it whole wherever the reading lies in the lane, so a band
/// one reading wide keeps its height at any lane count. (Interpolated at lane centres that
/// missed the reading, the demo's band lost up to a third of its height: its lanes' caliper
/// range read 2.9 to 3.8 % and its ridge 0.85 to 1.75 per mille at 16 to 40 lanes, around the
/// ridge rule's threshold; now 3.81 % and 1.62 to 2.03.) A lane that holds none takes the
/// profile interpolated at its centre, linearly, extrapolated from the end segment beyond the
/// readings.
fn onto(p: &Profile, e: &[f64]) -> Series {
    let n = e.len().saturating_sub(1);
    let (mut values, mut beyond_at, mut gain) = (Vec::new(), Vec::new(), Vec::new());
    for i in 0..n {
        let held = held(&p.positions_m, e, i);
        if !held.is_empty() {
            let k = held.len() as f64;
            values.push(held.iter().map(|&j| p.values[j]).sum::<f64>() / k);
            beyond_at.push(false);
            gain.push(1.0 / k.sqrt());
        } else {
            let x = 0.5 * (e[i] + e[i + 1]);
            values.push(linear_extrap(&p.positions_m, &p.values, x).0);
            beyond_at.push(beyond(&p.positions_m, x));
            gain.push(crate::interp::noise_gain(&p.positions_m, x));
        }
    }
    Series {
        what: p.what,
        age_s: p.age_s,
        values,
        extrapolated: beyond_at.iter().any(|&b| b),
        beyond: beyond_at,
        noise_gain: gain,
    }
}

/// Indices of the readings at `positions` (m) that lane `i` between edges `e` (m) holds: from
/// its left edge up to its right edge, a reading on an inner edge going to the lane on its right
/// (the last lane keeps its right edge).
pub fn held(positions: &[f64], e: &[f64], i: usize) -> Vec<usize> {
    let (left, right, last) = (e[i], e[i + 1], i + 2 == e.len());
    (0..positions.len())
        .filter(|&j| {
            let x = positions[j];
            x >= left && (x < right || (last && x <= right))
        })
        .collect()
}

/// Lanes wider than the caliper readings' median spacing by more than this share (reading
/// positions are rounded; a lane a few per cent wider still samples every band).
const COARSE_TOL: f64 = 0.1;

/// The note on lanes asked for (`e`, edges, m) whose inner lanes are wider than the densest
/// caliper profile's median reading spacing: a band narrower than a lane is averaged over the
/// lane that holds it with other readings, or falls between the centres of lanes that hold one
/// reading or none.
fn coarse_note(case: &Case, e: &[f64]) -> Option<Note> {
    if case.lane_count.is_none() && case.lane_edges_m.is_none() {
        return None;
    }
    let p = case.densest(Measure::Caliper)?;
    let mut gaps: Vec<f64> = p.positions_m.windows(2).map(|w| w[1] - w[0]).collect();
    if gaps.len() < 2 {
        return None;
    }
    gaps.sort_by(f64::total_cmp);
    let spacing = gaps[gaps.len() / 2];
    let inner = e.windows(2).skip(1).take(e.len().saturating_sub(3));
    let lane = inner.map(|w| w[1] - w[0]).fold(0.0, f64::max);
    (spacing > 0.0 && lane > spacing * (1.0 + COARSE_TOL)).then(|| Note::LanesCoarse {
        lane_m: lane,
        spacing_m: spacing,
        // a whole count of spacings is enough as it is (not one more for a rounding residue)
        enough: (case.roll.width_m / spacing * (1.0 - 1e-9)).ceil() as usize,
    })
}

/// Notes on how many lanes `n` were made from what the case asked for.
fn count_notes(case: &Case, n: usize) -> Vec<Note> {
    let mut notes = Vec::new();
    if let Some(k) = case.lane_count.filter(|&k| k != n) {
        notes.push(Note::LanesCount { asked: k, lanes: n });
    }
    if let Some(p) = densest(case).filter(|p| {
        case.lane_edges_m.is_none()
            && case.lane_count.is_none()
            && p.positions_m.len() > MAX_IMPLICIT_LANES
    }) {
        notes.push(Note::LanesMerged {
            what: p.what,
            positions: p.positions_m.len(),
            lanes: n,
        });
    }
    notes
}

/// Build the lanes of a case.
pub fn build(case: &Case) -> Lanes {
    let e = edges(case);
    let centres: Vec<f64> = e.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
    let widths: Vec<f64> = e.windows(2).map(|w| w[1] - w[0]).collect();
    let n = centres.len();
    let series: Vec<Series> = case.profiles.iter().map(|p| onto(p, &e)).collect();
    let mut notes = count_notes(case, n);
    notes.extend(coarse_note(case, &e));
    let mut extrap = vec![false; n];
    let mut mark = |what: Measure, notes: &mut Vec<Note>| {
        let i = earliest_index(&series, what)?;
        let (p, s) = (&case.profiles[i], &series[i]);
        if s.extrapolated {
            for (x, &b) in extrap.iter_mut().zip(&s.beyond) {
                *x |= b;
            }
            notes.push(Note::Extrapolated {
                what: p.what,
                age_s: p.age_s,
                from_m: p.positions_m[0],
                to_m: p.positions_m[p.positions_m.len() - 1],
            });
        }
        Some(s.values.clone())
    };
    let dia = mark(Measure::Diameter, &mut notes);
    let hard = mark(Measure::Hardness, &mut notes);
    let cal = mark(Measure::Caliper, &mut notes);
    let tension = mark(Measure::Tension, &mut notes);
    let moisture = mark(Measure::Moisture, &mut notes);
    let (calipers, source) =
        lane_calipers(case, cal.as_deref(), dia.as_deref(), &widths, &mut notes);
    let cbar = weighted_mean(&calipers, &widths);
    let dbar = dia.as_ref().map(|d| weighted_mean(d, &widths));
    let hbar = hard.as_ref().map(|h| weighted_mean(h, &widths));
    let web = web_strains(case, tension.as_deref(), &calipers, &widths);
    let lanes = (0..n)
        .map(|i| Lane {
            index: i,
            left_m: e[i],
            right_m: e[i + 1],
            position_m: centres[i],
            width_m: widths[i],
            caliper_m: calipers[i],
            caliper_deviation: calipers[i] / cbar - 1.0,
            diameter_deviation_m: dia.as_ref().zip(dbar).map(|(d, m)| d[i] - m),
            hardness_deviation: hard.as_ref().zip(hbar).map(|(h, m)| h[i] - m),
            wound_strain_difference: dia.as_ref().zip(dbar).map(|(d, m)| (d[i] - m) / m),
            web_strain: web[i],
            winding_moisture_pct: moisture.as_ref().map(|m| m[i]),
            extrapolated: extrap[i],
        })
        .collect();
    Lanes {
        lanes,
        mean_caliper_m: cbar,
        caliper_source: source,
        notes,
        series,
    }
}

/// Per lane, the web's MD strain excess at winding from the tension profile on the lanes
/// (`tension`, N/m or fractions of the mean: only its shape is read): the lane carried T_i =
/// T_w t_i / t_mean of the winder's tension T_w at mid build, so its strain was above the mean
/// lane's by (T_i - T_w) / (E_MD c_i) (Hooke's law). Zeros without a profile, or when its mean is
/// not positive.
fn web_strains(case: &Case, tension: Option<&[f64]>, calipers: &[f64], widths: &[f64]) -> Vec<f64> {
    let n = calipers.len();
    let Some(t) = tension else {
        return vec![0.0; n];
    };
    let tbar = weighted_mean(t, widths);
    if !(tbar > 0.0 && tbar.is_finite()) {
        return vec![0.0; n];
    }
    let (d0, d1) = (case.roll.core_diameter_m, case.roll.diameter_m);
    let t_w = case.winding.tension.at(0.5 * (d0 + d1));
    let e = case.material.md_modulus_pa;
    (0..n)
        .map(|i| t_w * (t[i] / tbar - 1.0) / (e * calipers[i]))
        .collect()
}

/// Lane calipers (m) and where they came from: the earliest caliper profile on the lanes, else
/// inferred from the earliest diameter profile, else the nominal caliper.
fn lane_calipers(
    case: &Case,
    cal: Option<&[f64]>,
    dia: Option<&[f64]>,
    widths: &[f64],
    notes: &mut Vec<Note>,
) -> (Vec<f64>, CaliperSource) {
    let nominal = case.material.caliper_m;
    let r_core = 0.5 * case.roll.core_diameter_m;
    match (cal, dia) {
        (Some(c), _) => (c.to_vec(), CaliperSource::Profile),
        (None, Some(d)) => {
            // A lane larger by dR over a build of (R - r_core) carries about dR/(R - r_core) more
            // caliper (uncompressed estimate).
            let dbar = weighted_mean(d, widths);
            let build = (0.5 * dbar - r_core).max(1e-9);
            notes.push(Note::CaliperFromDiameter);
            (
                d.iter()
                    .map(|&di| nominal * (1.0 + 0.5 * (di - dbar) / build))
                    .collect(),
                CaliperSource::Diameter,
            )
        }
        _ => (vec![nominal; widths.len()], CaliperSource::Nominal),
    }
}

/// Index of the earliest series of a kind (the first of equally early ones).
fn earliest_index(series: &[Series], what: Measure) -> Option<usize> {
    series
        .iter()
        .enumerate()
        .filter(|(_, s)| s.what == what)
        .min_by(|a, b| a.1.age_s.total_cmp(&b.1.age_s))
        .map(|(i, _)| i)
}

impl Lanes {
    /// Lane edges from the front edge, m (one more than the lanes).
    pub fn edges_m(&self) -> Vec<f64> {
        let right = self.lanes.last().map(|l| l.right_m);
        self.lanes.iter().map(|l| l.left_m).chain(right).collect()
    }
    /// Lane centres, m.
    pub fn positions(&self) -> Vec<f64> {
        self.lanes.iter().map(|l| l.position_m).collect()
    }
    /// Lane widths, m.
    pub fn widths(&self) -> Vec<f64> {
        self.lanes.iter().map(|l| l.width_m).collect()
    }
    /// Lane calipers, m.
    pub fn calipers(&self) -> Vec<f64> {
        self.lanes.iter().map(|l| l.caliper_m).collect()
    }
    /// Width-weighted mean of a per-lane value: the value of the mean lane.
    pub fn mean(&self, v: &[f64]) -> f64 {
        weighted_mean(v, &self.widths())
    }
    /// The earliest measured series of a kind, if any.
    pub fn earliest(&self, what: Measure) -> Option<&Series> {
        earliest_index(&self.series, what).map(|i| &self.series[i])
    }
    /// The measured series of a kind, in the case's order.
    pub fn series_of(&self, what: Measure) -> impl Iterator<Item = &Series> {
        self.series.iter().filter(move |s| s.what == what)
    }
    /// Ages of all measurements, s, in the case's order.
    pub fn measurement_ages(&self) -> Vec<f64> {
        self.series.iter().map(|s| s.age_s).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn widths(e: &[f64]) -> Vec<f64> {
        e.windows(2)
            .map(|w| ((w[1] - w[0]) * 1e4).round() / 1e4)
            .collect()
    }

    fn even(w: f64, n: usize) -> Vec<f64> {
        (0..=n).map(|i| w * i as f64 / n as f64).collect()
    }

    /// Each edge lane is one 25 mm strip at every count, both ends alike (the edge strip is a
    /// resolution choice of ours: common practice that end effects act in the outer centimetres).
    #[test]
    fn edge_lanes_are_one_strip_wide_at_both_ends() {
        // 1.6 m at 32 lanes: 50 mm lanes, on the threshold at both ends despite rounding
        let e = with_edge_strips(even(1.6, 32));
        let w = widths(&e);
        assert_eq!(e.len(), 33, "{w:?}");
        assert_eq!((w[0], w[1]), (0.025, 0.075));
        assert_eq!((w[31], w[30]), (0.025, 0.075));
        // 1.2 m at 12 lanes: a strip split off each 100 mm edge lane
        let w = widths(&with_edge_strips(even(1.2, 12)));
        assert_eq!(w.len(), 14);
        assert_eq!((w[0], w[1], w[12], w[13]), (0.025, 0.075, 0.075, 0.025));
        // 1.2 m at 30 lanes: 40 mm edge lanes give 15 mm to their neighbours
        let w = widths(&with_edge_strips(even(1.2, 30)));
        assert_eq!(w.len(), 30);
        assert_eq!((w[0], w[1], w[28], w[29]), (0.025, 0.055, 0.055, 0.025));
        // lanes narrower than a strip are kept
        assert_eq!(with_edge_strips(even(0.2, 10)), even(0.2, 10));
    }

    /// A lane holding two or more readings takes their mean, whose noise is one reading's over
    /// the root of their count (the standard error of a mean of independent readings); a lane
    /// holding one takes it whole, off its centre too; a lane holding none takes the profile at
    /// its centre, extrapolated beyond the readings.
    #[test]
    fn a_wide_lane_takes_the_mean_of_the_readings_it_holds() {
        let p = Profile {
            what: Measure::Hardness,
            age_s: 0.0,
            positions_m: vec![0.1, 0.2, 0.3, 0.4],
            values: vec![1.0, 2.0, 3.0, 4.0],
            origin: "test".into(),
        };
        let s = onto(&p, &[0.0, 0.25, 0.5]);
        assert_eq!(s.values, vec![1.5, 3.5]);
        for g in &s.noise_gain {
            approx::assert_relative_eq!(*g, 0.5f64.sqrt(), max_relative = 1e-12);
        }
        assert!(!s.extrapolated);
        // a lane holding none takes its centre's extrapolation; a reading on an inner edge goes
        // to the lane on its right, and the last lane keeps its right edge
        let s = onto(&p, &[0.0, 0.1, 0.5]);
        approx::assert_relative_eq!(s.values[0], 0.5);
        assert!(s.extrapolated && s.beyond[0] && !s.beyond[1]);
        approx::assert_relative_eq!(s.values[1], 2.5);
        approx::assert_relative_eq!(s.noise_gain[1], 0.5);
        assert_eq!(held(&p.positions_m, &[0.0, 0.2, 0.4], 1), vec![1, 2, 3]);
        // a lane holding one reading off its centre (0.2 in 0.17-0.27) takes it, not 2.2
        let s = onto(&p, &[0.0, 0.17, 0.27, 0.5]);
        assert_eq!(s.values[1], 2.0);
        assert_eq!(s.noise_gain[1], 1.0);
    }

    /// One or two lanes: only splits (the two edge lanes share their one inner edge), never a
    /// trim; one lane wider than two strips becomes strip, middle, strip.
    #[test]
    fn one_or_two_lanes_are_split_and_never_trimmed() {
        assert_eq!(widths(&with_edge_strips(even(0.06, 2))), vec![0.03, 0.03]);
        assert_eq!(
            widths(&with_edge_strips(even(0.12, 2))),
            vec![0.025, 0.035, 0.035, 0.025]
        );
        assert_eq!(
            widths(&with_edge_strips(even(0.5, 1))),
            vec![0.025, 0.45, 0.025]
        );
        assert_eq!(with_edge_strips(vec![0.0]), vec![0.0]);
    }
}
