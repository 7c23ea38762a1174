//! Wound states already computed, keyed by exactly what winding reads: the web's mechanical
//! values, the roll, the winder, each lane's centre, width, caliper and own strain, the mean
//! caliper and the options. A diagnosis re-runs scenarios whose change touches only storage,
//! creep, the lanes counted in the spread, the web's moisture or the lanes' moisture at winding;
//! those reuse the wound state.
//!
//! **Invariant:** [`Key`] holds every value `winding` reads; a new read must be added to it.

use super::roll::{wind_from, Options, WindError, WindInput, Wound};
use crate::case::{Roll, Stack, Winding};
use crate::lanes::Lanes;

/// What a wound state depends on (numbers as bits, so equal keys mean bit-equal inputs).
#[derive(Debug, Clone, PartialEq)]
struct Key {
    /// Density, MD and CD modulus, Poisson ratio, friction, roughness of the web.
    web: [u64; 6],
    stack: Stack,
    roll: Roll,
    winding: Winding,
    /// Per lane: centre, width, caliper, own strain at winding.
    lanes: Vec<[u64; 4]>,
    mean_caliper: u64,
    opt: Options,
}

impl Key {
    fn of(input: &WindInput, lanes: &Lanes, opt: Options) -> Self {
        let m = input.material;
        Key {
            web: [
                m.density_kg_m3,
                m.md_modulus_pa,
                m.cd_modulus_pa,
                m.poisson,
                m.friction,
                m.roughness_m,
            ]
            .map(f64::to_bits),
            stack: m.stack,
            roll: input.roll.clone(),
            winding: input.winding.clone(),
            lanes: lanes
                .lanes
                .iter()
                .map(|l| [l.position_m, l.width_m, l.caliper_m, l.web_strain].map(f64::to_bits))
                .collect(),
            mean_caliper: lanes.mean_caliper_m.to_bits(),
            opt,
        }
    }
}

/// A cache of wound states (a handful per diagnosis; looked up by equality).
#[derive(Debug, Clone, Default)]
pub struct Cache {
    entries: Vec<(Key, Wound)>,
}

impl Cache {
    /// Wound states held.
    pub fn len(&self) -> usize {
        self.entries.len()
    }

    /// Whether no wound state is held.
    pub fn is_empty(&self) -> bool {
        self.entries.is_empty()
    }

    /// Record a wound state computed elsewhere for these inputs.
    pub fn insert(&mut self, input: &WindInput, lanes: &Lanes, opt: Options, wound: &Wound) {
        let key = Key::of(input, lanes, opt);
        if !self.entries.iter().any(|(k, _)| *k == key) {
            self.entries.push((key, wound.clone()));
        }
    }

    /// [`Self::wind`] for each job (inputs, lanes, options), in order. The distinct rolls not
    /// held are wound side by side (rayon), each started where the first roll held ended
    /// ([`Self::start_for`]; into an empty cache the first new roll is wound alone, as it starts
    /// the rest), and held in the order of the jobs: the wound states and the cache are the same
    /// as winding the jobs one by one, and an error is the first failing job's in that order.
    pub fn wind_all(
        &mut self,
        jobs: &[(WindInput, &Lanes, Options)],
    ) -> Result<Vec<Wound>, WindError> {
        use rayon::prelude::*;
        let keys: Vec<Key> = jobs.iter().map(|(i, l, o)| Key::of(i, l, *o)).collect();
        let mut todo: Vec<usize> = Vec::new();
        for (j, k) in keys.iter().enumerate() {
            let held = self.entries.iter().any(|(h, _)| h == k);
            if !held && !todo.iter().any(|&t| keys[t] == *k) {
                todo.push(j);
            }
        }
        if self.entries.is_empty() && !todo.is_empty() {
            // the first roll wound is every later roll's start, so it is wound alone
            let j = todo.remove(0);
            let (i, l, o) = &jobs[j];
            let (w, _) = wind_from(i, l, *o, None)?;
            self.entries.push((keys[j].clone(), w));
        }
        let made: Vec<Result<Wound, WindError>> = todo
            .par_iter()
            .map(|&j| {
                let (i, l, o) = &jobs[j];
                wind_from(i, l, *o, self.start_for(l)).map(|(w, _)| w)
            })
            .collect();
        for (&j, w) in todo.iter().zip(made) {
            self.entries.push((keys[j].clone(), w?));
        }
        Ok(keys
            .iter()
            .filter_map(|k| self.entries.iter().find(|(h, _)| h == k))
            .map(|(_, w)| w.clone())
            .collect())
    }

    /// Where a new roll on `lanes` starts its secant: where the first roll held ended.
    fn start_for(&self, lanes: &Lanes) -> Option<super::roll::Secant> {
        self.entries.first().and_then(|(k, w)| {
            w.secant
                .scaled(f64::from_bits(k.mean_caliper), lanes.mean_caliper_m)
        })
    }

    /// [`super::wind`], or the wound state already computed for the same inputs. A new roll's
    /// secant for the compressed caliper starts where the first roll held ended, scaled by the
    /// ratio of the mean calipers ([`wind_from`]: the start moves the result only within the
    /// secant's tolerance, and saves about one winding of the coarse grid in four). A batch of
    /// one ([`Self::wind_all`]).
    pub fn wind(
        &mut self,
        input: &WindInput,
        lanes: &Lanes,
        opt: Options,
    ) -> Result<Wound, WindError> {
        let mut one = self.wind_all(&[(*input, lanes, opt)])?;
        Ok(one.remove(0))
    }
}
