//! Wound states already computed, keyed by everything winding reads: the web, the roll, the
//! winder, the lanes and the options. A diagnosis re-runs scenarios whose change touches only
//! storage, creep or the lanes counted in the spread; those reuse the wound state.

use super::roll::{wind, Options, WindError, WindInput, Wound};
use crate::case::{Material, Roll, Winding};
use crate::lanes::Lanes;

/// What a wound state depends on.
#[derive(Debug, Clone, PartialEq)]
struct Key {
    material: Material,
    roll: Roll,
    winding: Winding,
    lanes: Lanes,
    opt: Options,
}

impl Key {
    fn of(input: &WindInput, lanes: &Lanes, opt: Options) -> Self {
        Key {
            material: input.material.clone(),
            roll: input.roll.clone(),
            winding: input.winding.clone(),
            lanes: lanes.clone(),
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

    /// [`wind`], or the wound state already computed for the same inputs.
    pub fn wind(
        &mut self,
        input: &WindInput,
        lanes: &Lanes,
        opt: Options,
    ) -> Result<Wound, WindError> {
        let key = Key::of(input, lanes, opt);
        if let Some((_, w)) = self.entries.iter().find(|(k, _)| *k == key) {
            return Ok(w.clone());
        }
        let w = wind(input, lanes, opt)?;
        self.entries.push((key, w.clone()));
        Ok(w)
    }
}
