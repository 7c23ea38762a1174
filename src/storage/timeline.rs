//! The storage time grid and the moisture field over it: what storage does to a roll
//! independently of creep parameters.

use super::moisture::{radial_faces, Field, Surfaces};
use super::sorption::gab_moisture;
use super::AgeOptions;
use crate::case::{Material, Roll, Stance, Stretch, Wrap, WrapPermeance};
use crate::lanes::Lanes;
use crate::note::Note;
use std::sync::{Arc, Mutex};

/// What storage uses of a case: the web, the roll, the wraps' permeances, the storage history and
/// the times at which the state is wanted.
#[derive(Debug, Clone, Copy)]
pub struct StoreInput<'a> {
    pub material: &'a Material,
    pub roll: &'a Roll,
    pub wraps: &'a WrapPermeance,
    /// The stretches of storage, in order.
    pub storage: &'a [Stretch],
    /// Times (s since winding) that must be step ends of the time grid, such as the ages of
    /// measurements; storage is extended to the last of them.
    pub output_times_s: &'a [f64],
}

/// Floor contact at the lower end of a roll stored on end cuts that face's exchange to this
/// fraction (assumption).
pub const FLOOR_CONTACT: f64 = 0.1;

/// Temperature of the standard atmosphere (23 C; TAPPI T 402), K.
pub const STANDARD_TEMPERATURE_K: f64 = 296.15;

/// Ambient conditions assumed past the last stretch (standard atmosphere, TAPPI T 402).
fn standard_stretch() -> Stretch {
    Stretch {
        duration_s: 0.0,
        temperature_k: STANDARD_TEMPERATURE_K,
        rh: 0.5,
        barrel_wrap: Wrap::None,
        end_wrap: Wrap::None,
        stance: Stance::OnEnd,
        place: Some("assumed standard atmosphere".into()),
        contact_share: 1.0,
    }
}

/// A time step: duration (s) and the stretch it belongs to.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Step {
    pub dt: f64,
    pub stretch: usize,
}

/// Time grid over the storage history: geometric steps within each segment between stretch ends
/// and measurement ages, so measurement ages are step ends.
#[derive(Debug, Clone, PartialEq)]
pub struct Timeline {
    pub steps: Vec<Step>,
    /// Time at the end of each step, s (`times[0] = 0` is the start).
    pub times: Vec<f64>,
    /// Stretches used (the given ones, plus an assumed one when output times go past storage).
    pub stretches: Vec<Stretch>,
    pub notes: Vec<Note>,
}

/// Ratio of a segment's last step to its first: 1.15^19, growth by 1.15 over the default 20
/// steps.
const LAST_OVER_FIRST: f64 = 14.231_771_646_040_077;

/// The warning a storage history gets when `output_times_s` (the measurement ages) reach past
/// its end: storage is taken to go on to the last of them, the last stretch continued (the
/// standard atmosphere when there is none). [`timeline`] extends storage so; `check` shows the
/// same warning without a run.
pub fn storage_extended(storage: &[Stretch], output_times_s: &[f64]) -> Option<Note> {
    // a fold from +0: an empty history covers 0 d, not -0 d (an empty f64 sum is -0)
    let total: f64 = storage.iter().fold(0.0, |a, s| a + s.duration_s);
    let last_age = output_times_s.iter().copied().fold(0.0, f64::max);
    (last_age > total + 1.0).then_some(Note::StorageExtended {
        last_age_s: last_age,
        covered_s: total,
        added_s: last_age - total,
        standard: storage.is_empty(),
    })
}

/// Build the time grid for a storage history, with step ends at the output times.
pub fn timeline(storage: &[Stretch], output_times_s: &[f64], opt: &AgeOptions) -> Timeline {
    let mut stretches = storage.to_vec();
    let notes: Vec<Note> = storage_extended(storage, output_times_s)
        .into_iter()
        .collect();
    if let Some(&Note::StorageExtended { added_s, .. }) = notes.first() {
        let mut s = stretches.last().cloned().unwrap_or_else(standard_stretch);
        s.duration_s = added_s;
        stretches.push(s);
    }
    let mut cuts: Vec<(f64, usize)> = Vec::new();
    let mut t = 0.0;
    for (i, s) in stretches.iter().enumerate() {
        let t1 = t + s.duration_s;
        let mut inner: Vec<f64> = output_times_s
            .iter()
            .copied()
            .filter(|&a| a > t + 1.0 && a < t1 - 1.0)
            .collect();
        inner.sort_by(f64::total_cmp);
        inner.dedup_by(|a, b| (*a - *b).abs() < 1.0);
        for a in inner {
            cuts.push((a, i));
        }
        cuts.push((t1, i));
        t = t1;
    }
    let n = opt.steps.max(1);
    // the steps grow geometrically by q with the last LAST_OVER_FIRST times the first whatever
    // their number, so more steps refine the whole segment (a fixed q kept the last steps at
    // (q - 1) / q of the segment however many there were: 13 % at q = 1.15)
    let q = if n > 1 {
        LAST_OVER_FIRST.powf(1.0 / (n - 1) as f64)
    } else {
        2.0 // unused: one step spans the segment
    };
    let mut steps = Vec::new();
    let mut times = vec![0.0];
    let mut t0 = 0.0;
    for (t1, si) in cuts {
        let span = t1 - t0;
        if span <= 0.0 {
            continue;
        }
        let norm = (q.powi(n as i32) - 1.0) / (q - 1.0);
        let mut acc = t0;
        for j in 0..n {
            let dt = if j + 1 == n {
                t1 - acc
            } else {
                span * q.powi(j as i32) / norm
            };
            acc += dt;
            steps.push(Step { dt, stretch: si });
            times.push(acc);
        }
        t0 = t1;
    }
    Timeline {
        steps,
        times,
        stretches,
        notes,
    }
}

/// Moisture at each lane's radial cells over time.
#[derive(Debug, Clone, PartialEq)]
pub struct MoistureHistory {
    /// Radial cell faces and centres shared with the mechanics, m.
    pub faces: Vec<f64>,
    pub r: Vec<f64>,
    /// `mc[time][lane][cell]`, %.
    pub mc: Vec<Vec<Vec<f64>>>,
    /// Equilibrium moisture of each stretch, %.
    pub m_eq: Vec<f64>,
    /// Each lane's drive once computed ([`super::drive::drive`]): the history is shared by every
    /// run on the same storage, so its lanes' drives are too.
    pub(super) drives: super::drive::Drives,
}

fn surfaces(input: &StoreInput, s: &Stretch) -> Surfaces {
    let w = input.wraps;
    let end = w.of(s.end_wrap);
    let back = if s.stance == Stance::OnEnd {
        end * FLOOR_CONTACT
    } else {
        end
    };
    Surfaces {
        front_m_s: end,
        back_m_s: back,
        barrel_m_s: w.of(s.barrel_wrap),
        // The core tube is open at its ends; treated like a paper wrap (assumption).
        core_m_s: w.paper_m_s,
        m_eq: gab_moisture(&input.material.sorption, s.rh),
    }
}

/// The moisture field over a time grid: a pure function of the material, the roll, the wraps,
/// the time grid and its stretches, the lanes' edges, centres and moisture at winding, and the
/// grid sizes. Fields already computed are kept, keyed by exactly those inputs (every number
/// to the bit), so scenarios and noise rolls with the same storage history share one field; at
/// most [`KEPT_VALUES`] moisture values are kept (oldest dropped first). The result does not
/// depend on what is kept or on the order threads ask, only the time taken does.
pub fn moisture(
    input: &StoreInput,
    lanes: &Lanes,
    tl: &Timeline,
    opt: &AgeOptions,
) -> Arc<MoistureHistory> {
    let key = MoistureKey::of(input, lanes, tl, opt);
    let kept = || KEPT.lock().unwrap_or_else(|e| e.into_inner());
    if let Some(h) = kept().find(&key) {
        return h;
    }
    let h = Arc::new(compute_moisture(input, lanes, tl, opt));
    kept().insert(key, Arc::clone(&h));
    h
}

/// Most moisture values (f64) the kept fields hold together: 32 MiB.
pub const KEPT_VALUES: usize = 4 << 20;

/// Everything [`compute_moisture`] reads, written out exactly (`{:?}` of an f64 is its
/// shortest round-trip form, so equal keys mean bit-equal inputs; lanes by the fields read).
#[derive(Debug, Clone, PartialEq, Eq)]
struct MoistureKey(String);

impl MoistureKey {
    fn of(input: &StoreInput, lanes: &Lanes, tl: &Timeline, opt: &AgeOptions) -> Self {
        use std::fmt::Write;
        let r = input.roll;
        let mut k = format!(
            "{:?}|{:?}|{:?}|{:?}|{:?}|{:?}|{:?}|{:?}|{:?}|",
            input.material,
            r.width_m,
            r.diameter_m,
            r.core_diameter_m,
            input.wraps,
            tl.steps,
            tl.stretches,
            opt.cells_r,
            opt.cells_x,
        );
        for l in &lanes.lanes {
            let _ = write!(
                k,
                "{:?},{:?},{:?},{:?};",
                l.position_m, l.left_m, l.right_m, l.winding_moisture_pct
            );
        }
        MoistureKey(k)
    }
}

/// Moisture fields kept for re-use, newest last, with their sizes in values.
struct Kept {
    fields: Vec<(MoistureKey, Arc<MoistureHistory>, usize)>,
}

static KEPT: Mutex<Kept> = Mutex::new(Kept { fields: Vec::new() });

impl Kept {
    fn find(&mut self, key: &MoistureKey) -> Option<Arc<MoistureHistory>> {
        let i = self.fields.iter().position(|(k, _, _)| k == key)?;
        let e = self.fields.remove(i);
        let h = Arc::clone(&e.1);
        self.fields.push(e);
        Some(h)
    }

    fn insert(&mut self, key: MoistureKey, h: Arc<MoistureHistory>) {
        if self.fields.iter().any(|(k, _, _)| *k == key) {
            return;
        }
        let size: usize = h.mc.iter().flatten().map(|c| c.len()).sum();
        if size > KEPT_VALUES {
            return;
        }
        self.fields.push((key, h, size));
        let mut total: usize = self.fields.iter().map(|e| e.2).sum();
        while total > KEPT_VALUES {
            total -= self.fields.remove(0).2;
        }
    }
}

/// Run the moisture model over a time grid (uncached; see [`moisture`]).
fn compute_moisture(
    input: &StoreInput,
    lanes: &Lanes,
    tl: &Timeline,
    opt: &AgeOptions,
) -> MoistureHistory {
    let m = input.material;
    let faces = radial_faces(
        0.5 * input.roll.core_diameter_m,
        0.5 * input.roll.diameter_m,
        opt.cells_r,
    );
    let mut field = Field::new(
        input.roll.width_m,
        opt.cells_x,
        faces.clone(),
        m.moisture_pct,
        m.diffusivity_inplane_m2_s,
        m.diffusivity_radial_m2_s,
    );
    // a moisture profile at winding: each lane's moisture through its layers
    field.set_across(|x| {
        lanes
            .lanes
            .iter()
            .find(|l| x >= l.left_m && x <= l.right_m)
            .and_then(|l| l.winding_moisture_pct)
    });
    let centres = lanes.positions();
    let sample = |f: &Field| -> Vec<Vec<f64>> {
        centres
            .iter()
            .map(|&x| (0..f.nr()).map(|j| f.at(x, j)).collect())
            .collect()
    };
    let surf: Vec<Surfaces> = tl.stretches.iter().map(|s| surfaces(input, s)).collect();
    let mut mc = vec![sample(&field)];
    // condensation on a cold roll taken into warm humid air: the water goes into the faces it
    // condensed on as the stretch begins (it condenses within minutes to hours of arrival)
    let wet = super::condensation::check(&tl.stretches);
    // the most the paper takes up: its moisture in saturated air
    let saturated = super::gab_moisture(&m.sorption, 1.0);
    let mut entered = usize::MAX;
    for st in &tl.steps {
        if st.stretch != entered {
            entered = st.stretch;
            for c in wet.iter().filter(|c| c.stretch == st.stretch) {
                field.deposit(c.water_kg_m2, c.barrel, c.ends, m.density_kg_m3, saturated);
            }
        }
        field.step(st.dt, &surf[st.stretch]);
        mc.push(sample(&field));
    }
    MoistureHistory {
        r: field.r.clone(),
        faces,
        mc,
        m_eq: surf.iter().map(|s| s.m_eq).collect(),
        drives: super::drive::Drives::new(centres.len()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Surveys past an empty storage history: the roll is taken as stored at the standard
    /// atmosphere, which is a warning (an assumption behind every result), and the history it
    /// had covers 0 d, not -0 d (an empty f64 sum is -0 in Rust).
    #[test]
    fn surveys_past_the_history_are_a_warning_from_zero_days() {
        let t = timeline(&[], &[5.0 * crate::units::DAY_S], &AgeOptions::default());
        let n = t.notes.first().expect("a note");
        assert!(n.is_warning());
        match *n {
            Note::StorageExtended { covered_s, .. } => {
                assert!(covered_s == 0.0 && covered_s.is_sign_positive())
            }
            _ => panic!("{n:?}"),
        }
    }

    /// The longest step's share of a one-stretch history on `n` steps.
    fn longest_share(n: usize) -> f64 {
        let stretch = Stretch {
            duration_s: 40.0 * crate::units::DAY_S,
            ..standard_stretch()
        };
        let opt = AgeOptions {
            steps: n,
            ..AgeOptions::default()
        };
        let tl = timeline(std::slice::from_ref(&stretch), &[], &opt);
        assert_eq!(tl.steps.len(), n);
        let total: f64 = tl.steps.iter().map(|s| s.dt).sum();
        assert!((total - stretch.duration_s).abs() < 1e-6 * stretch.duration_s);
        tl.steps.iter().map(|s| s.dt).fold(0.0, f64::max) / total
    }

    /// Refining the time grid refines all of it: the longest step's share halves with each
    /// doubling of the steps (first-order methods then converge), where a fixed growth ratio of
    /// 1.15 kept it at 0.15 / 1.15 = 13 % however many steps. The default 20 steps still grow by
    /// 1.15 each (to the bit).
    #[test]
    fn more_steps_shorten_every_step() {
        let mut last = longest_share(20);
        assert!((last - 0.15 * 1.15f64.powi(19) / (1.15f64.powi(20) - 1.0)).abs() < 1e-12);
        for n in [40, 80, 160, 320] {
            let share = longest_share(n);
            let ratio = share / last;
            assert!(
                (0.45..0.6).contains(&ratio),
                "{n} steps: {share} after {last}"
            );
            last = share;
        }
        assert!(last < 0.02, "{last}");
        let q = LAST_OVER_FIRST.powf(1.0 / 19.0);
        assert_eq!(q.to_bits(), 1.15f64.to_bits());
    }
}
