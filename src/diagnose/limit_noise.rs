//! A strength limit passed on measurement noise. The wound state is computed from the calipers
//! as read; where a strength limit (web crush, MD compression, the core's collapse pressure) is
//! passed and the finding of that same state was dropped because measurement noise alone moves
//! its ratio that far ([`Note::BelowNoiseFloor`], [`Note::OnProfileNoise`]), the readings cannot
//! tell whether the roll is beyond the limit: a roll with level calipers is within it, and the
//! measured one is as read. The limit's warning stays (a state beyond a limit is never silent),
//! and [`Note::LimitOnNoise`] says what the readings can resolve. Triage ranks such a roll after
//! those beyond a limit the readings resolve.
//!
//! **Invariant:** adds notes only; the limit's own note is kept.

use crate::note::{Limit, Note, Strength};
use crate::vocab::Feature;

/// The rule feature that reads the same state as a strength limit; `None` for a limit no rule
/// reads on the same state (MD tension at winding: the rule reads the outer wraps at the end of
/// storage).
fn feature_of(which: Strength) -> Option<Feature> {
    match which {
        Strength::ZdCrush => Some(Feature::PeakPressureCrushRatio),
        Strength::MdCompression => Some(Feature::MdCompressionStrengthRatio),
        Strength::CoreCollapse => Some(Feature::CorePressureRatio),
        Strength::MdTension => None,
    }
}

/// The strengths passed among `notes` (a core pressure is the core's collapse).
fn passed(notes: &[Note]) -> Vec<Strength> {
    let mut out = Vec::new();
    for n in notes {
        let which = match n {
            Note::Limit(Limit::Strength { which, .. }) => *which,
            Note::Limit(Limit::CorePressure { .. }) => Strength::CoreCollapse,
            _ => continue,
        };
        if !out.contains(&which) {
            out.push(which);
        }
    }
    out
}

/// The dropped finding on `feature`: (value as measured, value on a level roll, chance that
/// noise alone moves it so far); the first such note.
fn dropped(notes: &[Note], feature: Feature) -> Option<(f64, f64, f64)> {
    notes.iter().find_map(|n| match *n {
        Note::BelowNoiseFloor {
            feature: f,
            value,
            uniform,
            noise_chance,
            ..
        } if f == feature => Some((value, uniform, noise_chance)),
        Note::OnProfileNoise {
            feature: f,
            value,
            flattened,
            profile_chance,
            ..
        } if f == feature => Some((value, flattened, profile_chance)),
        _ => None,
    })
}

/// Whether `n` is the note of a passed strength `which`.
fn is_limit(n: &Note, which: Strength) -> bool {
    match n {
        Note::Limit(Limit::Strength { which: w, .. }) => *w == which,
        Note::Limit(Limit::CorePressure { .. }) => which == Strength::CoreCollapse,
        _ => false,
    }
}

/// The [`Note::LimitOnNoise`] of each strength limit in `notes` whose finding was dropped as
/// within measurement noise while a level roll is within the limit, put right after the
/// limit's own note.
pub fn qualify(notes: &mut Vec<Note>) {
    for which in passed(notes) {
        let Some(feature) = feature_of(which) else {
            continue;
        };
        let Some((ratio, level_ratio, noise_chance)) = dropped(notes, feature) else {
            continue;
        };
        // a level roll beyond the limit too: the limit does not rest on the readings' noise
        if level_ratio > 1.0 || level_ratio.is_nan() {
            continue;
        }
        let on_noise = Note::LimitOnNoise {
            which,
            ratio,
            level_ratio,
            noise_chance,
        };
        let at = notes.iter().rposition(|n| is_limit(n, which));
        if !notes.contains(&on_noise) {
            notes.insert(at.map_or(notes.len(), |i| i + 1), on_noise);
        }
    }
}

/// A changed roll's notes (`changed`) with, after each strength limit it passes,
/// [`Note::LimitOnSameReadings`] where the measured roll (`measured`, its diagnosis notes)
/// passes it only on measurement noise (both rolls rest on the same caliper readings), else the
/// changed roll's own [`Note::LimitOnNoise`] where its own screen (`own`, the notes of the
/// changed roll screened as `diagnose` screens it) dropped the limit's finding as noise.
pub fn carry(measured: &[Note], own: &[Note], changed: &mut Vec<Note>) {
    for which in passed(changed) {
        let on_noise = |n: &&Note| matches!(n, Note::LimitOnNoise { which: w, .. } if *w == which);
        let note = if measured.iter().any(|n| on_noise(&n)) {
            Note::LimitOnSameReadings { which }
        } else if let Some(n) = own.iter().find(on_noise) {
            *n
        } else {
            continue;
        };
        if let Some(i) = changed.iter().rposition(|n| is_limit(n, which)) {
            if !changed.contains(&note) {
                changed.insert(i + 1, note);
            }
        }
    }
}

/// How many of the physical limits in `notes` the readings resolve, and how many rest on
/// measurement noise ([`Note::LimitOnNoise`]): `(resolved, on_noise)`.
pub fn count(notes: &[Note]) -> (u32, u32) {
    let on_noise: Vec<Strength> = (notes.iter())
        .filter_map(|n| match n {
            Note::LimitOnNoise { which, .. } => Some(*which),
            _ => None,
        })
        .collect();
    let (mut resolved, mut noise) = (0, 0);
    for n in notes {
        let Note::Limit(l) = n else { continue };
        if !l.beyond_physical() {
            continue;
        }
        let which = match l {
            Limit::Strength { which, .. } => Some(*which),
            Limit::CorePressure { .. } => Some(Strength::CoreCollapse),
            _ => None,
        };
        if which.is_some_and(|w| on_noise.contains(&w)) {
            noise += 1;
        } else {
            resolved += 1;
        }
    }
    (resolved, noise)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::note::NoiseBasis;
    use crate::vocab::Defect;

    fn core(p: f64) -> Note {
        Note::Limit(Limit::CorePressure {
            from_m: 0.0,
            to_m: 0.07,
            pressure_pa: p,
            limit_pa: 1e6,
        })
    }

    fn floor(feature: Feature, value: f64, uniform: f64) -> Note {
        Note::BelowNoiseFloor {
            defect: Defect::CoreCollapse,
            feature,
            value,
            uniform,
            threshold: 1.0,
            noise_chance: 0.14,
            level: 0.0006,
            basis: NoiseBasis::NoiseRolls,
        }
    }

    #[test]
    fn a_limit_whose_finding_is_noise_is_qualified_and_counted_apart() {
        let mut notes = vec![core(1.8e6), floor(Feature::CorePressureRatio, 1.8, 0.83)];
        qualify(&mut notes);
        // right after the limit's own warning, which stays
        assert_eq!(
            notes[1],
            Note::LimitOnNoise {
                which: Strength::CoreCollapse,
                ratio: 1.8,
                level_ratio: 0.83,
                noise_chance: 0.14,
            }
        );
        assert_eq!(notes[0], core(1.8e6));
        assert_eq!(count(&notes), (0, 1));
        // a changed roll passing the same limit rests on the same readings
        let mut changed = vec![core(1.4e6)];
        carry(&notes, &notes, &mut changed);
        let same = Note::LimitOnSameReadings {
            which: Strength::CoreCollapse,
        };
        assert_eq!(changed, vec![core(1.4e6), same]);
        let mut resolved = vec![core(1.4e6)];
        carry(&[core(1.8e6)], &[core(1.4e6)], &mut resolved);
        assert_eq!(resolved, vec![core(1.4e6)]);
        // a limit only the changed roll passes, within noise by its own screen, says so
        let mut own = vec![core(1.4e6)];
        carry(&[], &notes, &mut own);
        assert_eq!(own, vec![core(1.4e6), notes[1]]);
    }

    #[test]
    fn a_level_roll_beyond_the_limit_or_a_standing_finding_leaves_it_resolved() {
        let mut beyond = vec![core(1.8e6), floor(Feature::CorePressureRatio, 1.8, 1.2)];
        qualify(&mut beyond);
        assert_eq!(count(&beyond), (1, 0));
        let mut standing = vec![core(1.8e6)];
        qualify(&mut standing);
        assert_eq!(count(&standing), (1, 0));
        // another feature's dropped finding does not qualify the core
        let mut other = vec![
            core(1.8e6),
            floor(Feature::PeakPressureCrushRatio, 1.8, 0.5),
        ];
        qualify(&mut other);
        assert_eq!(count(&other), (1, 0));
    }
}
