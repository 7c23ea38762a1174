//! Whether the model explains the readings each finding rests on. A lane whose surveys the model
//! misses by over the misfit limit ([`crate::fit::explained`]), or that a later survey contradicts,
//! is not explained: its fitted creep, and so its length at unwind, may carry the readings' own
//! noise rather than the roll's state. A finding resting on such a lane is said to, and is graded
//! medium at most, however many plausible states it holds in: the states are drawn from a fit
//! that does not fit there (a finding is never more confident than the data). That holds for a
//! finding judged at winding too: the surveys at winding test the wound state, so a lane they
//! miss leaves its wound state in doubt. On a roll the model does not explain as a whole, every
//! finding is graded medium at most, those resting on no lane (the core, the outer wraps) too.

use super::confidence::LaneSpread;
use super::{Finding, Fitted};
use crate::note::Note;
use crate::vocab::Likelihood;

/// The highest grade of a finding that rests on a lane the model does not explain.
pub const MOST_ON_UNEXPLAINED: Likelihood = Likelihood::Medium;

/// Notes on lanes and a roll the model does not explain, and on findings resting on them; such a
/// finding, and any on a roll not explained as a whole, is graded medium at most
/// ([`MOST_ON_UNEXPLAINED`]).
pub(super) fn notes(
    fitted: &Fitted,
    lanes: &[LaneSpread],
    roll_misfit: f64,
    findings: &mut [Finding],
    notes: &mut Vec<Note>,
) {
    for l in lanes.iter().filter(|l| !l.explained) {
        notes.push(Note::LaneNotExplained {
            position_m: l.position_m,
            misfit: l.misfit,
        });
    }
    let roll_unexplained = !crate::fit::explained::explained(roll_misfit);
    if roll_unexplained {
        notes.push(Note::RollNotExplained {
            misfit: roll_misfit,
        });
    }
    // a later survey that contradicts the model there leaves a lane unexplained too
    let contradicted = |i: usize| fitted.fit.contradictions.iter().any(|k| k.lane == i);
    for f in findings.iter_mut() {
        let unexplained = f
            .lanes
            .iter()
            .filter(|r| !lanes[r.index].explained || contradicted(r.index))
            .count();
        // a finding judged on the wound roll at winding does not rest on creep
        let at_winding = super::quantity::quantity_of(f.defect).at_winding();
        let identified = |i: usize| {
            let l = &fitted.fit.lanes[i];
            l.md_identifiable && l.radial_identifiable
        };
        let unidentified = if at_winding {
            0
        } else {
            (f.lanes.iter()).filter(|r| !identified(r.index)).count()
        };
        let weak = unexplained > 0 || roll_unexplained;
        if weak && f.likelihood.rank() > MOST_ON_UNEXPLAINED.rank() {
            f.likelihood = MOST_ON_UNEXPLAINED;
        }
        if unexplained + unidentified > 0 {
            notes.push(Note::FindingOnWeakLanes {
                defect: f.defect,
                lanes: f.lanes.len(),
                unexplained,
                unidentified,
            });
        }
    }
}
