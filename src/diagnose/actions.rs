//! Model changes behind corrections and root-cause attribution: each turns a scenario (case, lanes,
//! CD levelling, fitted creep) into another, which is then re-run through winding and storage.

use crate::case::{Case, Stance, Tension, Wrap};
use crate::lanes::Lanes;
use crate::numeric::spread;
use crate::storage::{age, gab_moisture, AgeError, AgeOptions, Aged, HardnessMap, LaneCreep};
use crate::vocab::Action;
use crate::winding::{Cache, Options, WindError, WindInput, Wound};

/// Everything a forward run needs.
#[derive(Debug, Clone, PartialEq)]
pub struct Scenario {
    pub case: Case,
    pub lanes: Lanes,
    pub levelling: f64,
    pub creep: Vec<LaneCreep>,
    /// Lanes left out of the spread (slit out).
    pub excluded: Vec<usize>,
}

/// A forward run's result.
#[derive(Debug, Clone)]
pub struct Outcome {
    pub wound: Wound,
    pub aged: Aged,
    /// What the roll does at the converter's unwind (a flat from storage on the side).
    pub unwind: super::unwind::AtUnwind,
}

/// A forward run failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum RunError {
    #[error(transparent)]
    Wind(#[from] WindError),
    #[error(transparent)]
    Age(#[from] AgeError),
}

impl Scenario {
    /// Run winding and storage.
    pub fn run(&self, nodes: usize) -> Result<Outcome, RunError> {
        self.run_cached(nodes, &mut Cache::default())
    }

    /// Run winding and storage, reusing a wound state from `winds` when the winding inputs match.
    pub fn run_cached(&self, nodes: usize, winds: &mut Cache) -> Result<Outcome, RunError> {
        let wound = winds.wind(&self.wind_input(), &self.lanes, self.wind_options(nodes))?;
        self.age_on(wound)
    }

    /// What winding reads of this scenario's case.
    pub fn wind_input(&self) -> WindInput<'_> {
        WindInput::new(&self.case.material, &self.case.roll, &self.case.winding)
    }

    /// Winding options of this scenario at `nodes` nodes.
    pub fn wind_options(&self, nodes: usize) -> Options {
        Options {
            nodes,
            levelling: self.levelling,
            ..Options::default()
        }
    }

    /// Run storage on a wound state already computed for this scenario's case, lanes and
    /// levelling (winding does not depend on storage or creep). Forward only: no measurement
    /// times; hardness is read with the case's calibration or the default map.
    pub fn age_on(&self, wound: Wound) -> Result<Outcome, RunError> {
        let c = &self.case;
        let aged = age(
            &crate::fit::store_input(c, &[]),
            &self.lanes,
            &wound,
            Some(&self.creep),
            &HardnessMap::given(c.hardness.calibration.as_ref()),
            &AgeOptions::default(),
        )?;
        let unwind = super::unwind::at_unwind(c, &wound, &self.creep, &self.lanes);
        Ok(Outcome {
            wound,
            aged,
            unwind,
        })
    }
}

/// Largest minus smallest strain at unwind (mm/m) over the lanes not excluded.
pub fn spread_mm_per_m(aged: &Aged, excluded: &[usize]) -> f64 {
    let last = aged.last();
    let v: Vec<f64> = aged
        .lanes
        .iter()
        .enumerate()
        .filter(|(i, _)| !excluded.contains(i))
        .map(|(_, l)| l.strain_at_unwind[last] * 1e3)
        .collect();
    spread(&v)
}

/// Relative humidity (fraction) at which the GAB isotherm gives moisture `mc` (%), by bisection.
pub fn rh_for_moisture(case: &Case, mc: f64) -> f64 {
    let g = &case.material.sorption;
    let (mut lo, mut hi) = (0.0, 0.99);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if gab_moisture(g, mid) < mc {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// A model change: a correction from a rule table, a source removal or an amplifier's feasible
/// alternative for attribution.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Change {
    /// A rule table's correction.
    Correct(Action),
    /// Every lane given the roll's mean creep.
    UniformCreep,
    /// The web tension alone scaled (the nip left as it is).
    ScaleWebTension,
    /// The winding speed scaled.
    ScaleSpeed,
}

/// Apply a change with its factor (1 when none). `slit` lists the lanes a `slit_out` leaves out.
pub fn apply(s: &Scenario, change: Change, factor: Option<f64>, slit: &[usize]) -> Scenario {
    let mut n = s.clone();
    let f = factor.unwrap_or(1.0);
    match change {
        Change::Correct(a) => correct(&mut n, a, f, slit),
        Change::UniformCreep => uniform_creep(&mut n.creep, &n.lanes.widths()),
        Change::ScaleWebTension => n.case.winding.tension = scaled(&n.case.winding.tension, f),
        Change::ScaleSpeed => n.case.winding.speed_m_s *= f,
    }
    n
}

/// A tension schedule scaled by `f`.
fn scaled(t: &Tension, f: f64) -> Tension {
    match t {
        Tension::Constant { tension_n_per_m } => Tension::Constant {
            tension_n_per_m: tension_n_per_m * f,
        },
        Tension::Taper { points } => Tension::Taper {
            points: points.iter().map(|(d, t)| (*d, t * f)).collect(),
        },
    }
}

/// Mean of `g(d)` over diameters `d0..d1` weighted by the web length wound there (proportional
/// to d dd), by the trapezoid rule on 400 intervals.
fn length_weighted_mean(d0: f64, d1: f64, g: &dyn Fn(f64) -> f64) -> f64 {
    let n = 400;
    let (mut num, mut den) = (0.0, 0.0);
    for k in 0..=n {
        let d = d0 + (d1 - d0) * k as f64 / n as f64;
        let w = if k == 0 || k == n { 0.5 } else { 1.0 } * d;
        num += w * g(d);
        den += w;
    }
    num / den
}

/// A linear taper from a raised start to `f` times the start at full diameter, with the same
/// web-length-weighted mean tension as `t`: the tension moved from the outer wraps to the inner.
pub fn raised_start_taper(t: &Tension, d0: f64, d1: f64, f: f64) -> Tension {
    let shape = |d: f64| 1.0 - (1.0 - f) * (d - d0) / (d1 - d0).max(1e-12);
    let start = length_weighted_mean(d0, d1, &|d| t.at(d)) / length_weighted_mean(d0, d1, &shape);
    Tension::Taper {
        points: vec![(d0, start), (d1, start * f)],
    }
}

/// Apply a rule table's action with factor `f`, as its text says.
fn correct(n: &mut Scenario, action: Action, f: f64, slit: &[usize]) {
    let (d0, d1) = (n.case.roll.core_diameter_m, n.case.roll.diameter_m);
    match action {
        Action::FlattenCaliper => {
            let m = n.lanes.mean_caliper_m;
            for l in &mut n.lanes.lanes {
                l.caliper_m = m;
                l.caliper_deviation = 0.0;
            }
        }
        Action::EvenCaliperLocally => even_locally(&mut n.lanes, slit),
        // the wound-in tension is web tension + friction x nip load (Good, Wu and Fikes 1994):
        // scaling it scales both parts
        Action::ScaleTension => {
            n.case.winding.tension = scaled(&n.case.winding.tension, f);
            n.case.winding.nip_n_per_m *= f;
        }
        Action::TaperTension => {
            let t0 = n.case.winding.tension.at(d0);
            n.case.winding.tension = Tension::Taper {
                points: vec![(d0, t0), (d1, t0 * f)],
            };
        }
        Action::RaiseStartAndTaper => {
            n.case.winding.tension = raised_start_taper(&n.case.winding.tension, d0, d1, f);
        }
        Action::ScaleNip => n.case.winding.nip_n_per_m *= f,
        Action::FilmWrap => {
            for st in &mut n.case.storage {
                st.barrel_wrap = Wrap::Film;
                st.end_wrap = Wrap::Film;
            }
        }
        Action::KeepWrappedUntilUse => keep_wraps(&mut n.case),
        Action::StoreAtEquilibrium => {
            let rh = rh_for_moisture(&n.case, n.case.material.moisture_pct);
            for st in &mut n.case.storage {
                st.rh = rh;
            }
        }
        Action::MakeAtPressroomEquilibrium => {
            if let Some(rh) = n.case.storage.last().map(|st| st.rh) {
                n.case.material.moisture_pct = gab_moisture(&n.case.material.sorption, rh);
                // the paper is made at that moisture across the width
                for l in &mut n.lanes.lanes {
                    l.winding_moisture_pct = None;
                }
            }
        }
        Action::EvenWebProfile => even_web(&mut n.lanes),
        Action::ShortenStorage => {
            for st in &mut n.case.storage {
                st.duration_s *= f;
            }
        }
        Action::SlitOut => n.excluded = slit.to_vec(),
        Action::StoreOnEnd => {
            for st in &mut n.case.storage {
                st.stance = Stance::OnEnd;
            }
        }
        Action::TurnRolls => {
            for st in &mut n.case.storage {
                st.contact_share = st.contact_share.min(f);
            }
        }
        Action::ScaleUnwindSpeed => n.case.converting_speed_m_s *= f,
        Action::ScaleWindingSpeed => n.case.winding.speed_m_s *= f,
        Action::AddNip => {
            let t_mid = n.case.winding.tension.at(0.5 * (d0 + d1));
            n.case.winding.nip_n_per_m = n.case.winding.nip_n_per_m.max(f * t_mid);
        }
    }
}

/// How far beside a finding's lanes the web whose caliper they are brought to lies, m (the
/// outer reach of the web a lane is judged against, [`super::local::baseline`]).
pub const BESIDE_M: f64 = 0.3;

/// The lanes `at` (a finding's) brought to the caliper of the web beside them. Each run of
/// neighbouring lanes of `at` (a band; each edge of a pair of edges) takes the width-weighted
/// mean caliper of the lanes not in `at` within [`BESIDE_M`] of that run (of all the lanes not
/// in `at` when none lies that near; of every lane when `at` holds them all), all taken from the
/// calipers before any is changed. The rest of the profile is kept; the mean caliper and every
/// lane's deviation from it are taken anew.
fn even_locally(lanes: &mut Lanes, at: &[usize]) {
    if at.is_empty() {
        return;
    }
    let mut idx = at.to_vec();
    idx.sort_unstable();
    idx.dedup();
    let ls = &lanes.lanes;
    let mean_over = |keep: &dyn Fn(usize) -> bool| {
        let (c, w): (Vec<f64>, Vec<f64>) = (0..ls.len())
            .filter(|&j| keep(j))
            .map(|j| (ls[j].caliper_m, ls[j].width_m))
            .unzip();
        (!c.is_empty()).then(|| crate::numeric::weighted_mean(&c, &w))
    };
    let other = |j: usize| !idx.contains(&j);
    let targets: Vec<(Vec<usize>, f64)> = (idx.chunk_by(|a, b| b == &(a + 1)))
        .map(|run| {
            let (lo, hi) = (ls[run[0]].left_m, ls[run[run.len() - 1]].right_m);
            let near = |j: usize| {
                other(j) && ls[j].right_m > lo - BESIDE_M && ls[j].left_m < hi + BESIDE_M
            };
            let t =
                (mean_over(&near).or_else(|| mean_over(&other))).unwrap_or(lanes.mean_caliper_m);
            (run.to_vec(), t)
        })
        .collect();
    for (run, t) in targets {
        for i in run {
            lanes.lanes[i].caliper_m = t;
        }
    }
    let (c, w) = (lanes.calipers(), lanes.widths());
    let mean = crate::numeric::weighted_mean(&c, &w);
    lanes.mean_caliper_m = mean;
    for l in &mut lanes.lanes {
        l.caliper_deviation = l.caliper_m / mean - 1.0;
    }
}

/// The wrap the roll came in (the stretch before the last) kept on through the last stretch:
/// it warms up inside it and is unwrapped just before use. A roll that came in unwrapped has
/// none to keep.
fn keep_wraps(c: &mut Case) {
    let k = c.storage.len();
    if k >= 2 {
        let came = &c.storage[k - 2];
        let (barrel, end) = (came.barrel_wrap, came.end_wrap);
        let last = &mut c.storage[k - 1];
        last.barrel_wrap = kept(last.barrel_wrap, barrel);
        last.end_wrap = kept(last.end_wrap, end);
    }
}

/// A wrap kept on: the tighter of the one the roll came in and the one it has (none, paper,
/// film), so keeping a paper wrap never takes a film off.
fn kept(now: Wrap, came: Wrap) -> Wrap {
    let tight = |w: Wrap| match w {
        Wrap::None => 0,
        Wrap::Paper => 1,
        Wrap::Film => 2,
    };
    if tight(came) > tight(now) {
        came
    } else {
        now
    }
}

/// The web made even before winding: no lane's own strain, the moisture at winding at its
/// width-weighted mean over the lanes that have one.
fn even_web(lanes: &mut Lanes) {
    let given: Vec<(f64, f64)> = lanes
        .lanes
        .iter()
        .filter_map(|l| l.winding_moisture_pct.map(|m| (m, l.width_m)))
        .collect();
    let (m, w): (Vec<f64>, Vec<f64>) = given.into_iter().unzip();
    let mean = (!m.is_empty()).then(|| crate::numeric::weighted_mean(&m, &w));
    for l in &mut lanes.lanes {
        l.web_strain = 0.0;
        l.winding_moisture_pct = l.winding_moisture_pct.and(mean);
    }
}

/// Give every lane the roll's mean delayed compliance and mean viscous fluidity, per direction:
/// means over the width (`widths`, the lanes' widths, m), so a 25 mm edge strip counts for its
/// 25 mm whatever the lane count.
pub(super) fn uniform_creep(creep: &mut [LaneCreep], widths: &[f64]) {
    let mean = |g: &dyn Fn(&LaneCreep) -> f64| {
        crate::numeric::weighted_mean(&creep.iter().map(g).collect::<Vec<_>>(), widths)
    };
    let (md_d, md_v, r_d, r_v) = (
        mean(&|c| c.md.delayed),
        mean(&|c| c.md.viscous_time_s.recip()),
        mean(&|c| c.radial.delayed),
        mean(&|c| c.radial.viscous_time_s.recip()),
    );
    for c in creep {
        c.md.delayed = md_d;
        c.md.viscous_time_s = md_v.recip();
        c.radial.delayed = r_d;
        c.radial.viscous_time_s = r_v.recip();
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::case::Burgers;

    fn lane(delayed: f64, viscous_time_s: f64) -> LaneCreep {
        let b = Burgers {
            delayed,
            retardation_s: 1e4,
            viscous_time_s,
        };
        LaneCreep { md: b, radial: b }
    }

    /// Two bands apart each take the web beside them, worked by hand: six 100 mm lanes of 90,
    /// 100, 110, 100, 104 and 120 um, the bands lanes 2 and 5. Lane 2 takes lanes 0, 1, 3 and 4
    /// (within 0.3 m of 0.2-0.3 m): 98.5 um; lane 5 takes lanes 3 and 4 (lane 2 is a band):
    /// 102 um. The others keep theirs; the mean is the new width-weighted mean.
    #[test]
    fn each_band_is_levelled_to_the_web_beside_it() {
        let c = [90.0, 100.0, 110.0, 100.0, 104.0, 120.0].map(|x| x * 1e-6);
        let lane = |i: usize| crate::lanes::Lane {
            index: i,
            left_m: 0.1 * i as f64,
            right_m: 0.1 * (i + 1) as f64,
            position_m: 0.1 * i as f64 + 0.05,
            width_m: 0.1,
            caliper_m: c[i],
            caliper_deviation: 0.0,
            diameter_deviation_m: None,
            hardness_deviation: None,
            wound_strain_difference: None,
            web_strain: 0.0,
            winding_moisture_pct: None,
            extrapolated: false,
        };
        let mut l = Lanes {
            lanes: (0..6).map(lane).collect(),
            mean_caliper_m: c.iter().sum::<f64>() / 6.0,
            caliper_source: crate::lanes::CaliperSource::Profile,
            notes: Vec::new(),
            series: Vec::new(),
        };
        even_locally(&mut l, &[5, 2]);
        let want = [90.0, 100.0, 98.5, 100.0, 104.0, 102.0];
        for (lane, w) in l.lanes.iter().zip(want) {
            assert!(
                (lane.caliper_m - w * 1e-6).abs() < 1e-15,
                "{}",
                lane.caliper_m
            );
        }
        let mean = want.iter().sum::<f64>() / 6.0 * 1e-6;
        assert!((l.mean_caliper_m - mean).abs() < 1e-15);
        assert!((l.lanes[2].caliper_deviation - (98.5e-6 / mean - 1.0)).abs() < 1e-12);
    }

    /// Hand computation: a 25 mm edge strip (delayed 1.0, viscous time 1e5 s: fluidity 1e-5 /s)
    /// beside a 200 mm lane (delayed 0.1, 1e6 s: 1e-6 /s). Over the width (0.225 m): delayed
    /// (0.025 + 0.02) / 0.225 = 0.2; fluidity (2.5e-7 + 2e-7) / 0.225 = 2e-6 /s, viscous time
    /// 5e5 s. Counted by lanes it would be 0.55 and 1.82e5 s.
    #[test]
    fn uniform_creep_is_the_mean_over_the_width() {
        let mut c = [lane(1.0, 1e5), lane(0.1, 1e6)];
        uniform_creep(&mut c, &[0.025, 0.2]);
        for l in &c {
            for b in [l.md, l.radial] {
                assert!((b.delayed - 0.2).abs() < 1e-12, "{b:?}");
                assert!((b.viscous_time_s - 5e5).abs() < 1e-6, "{b:?}");
            }
        }
    }
}
