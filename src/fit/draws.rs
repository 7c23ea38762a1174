//! A lane's posterior draws carried forward: the draws (a scale pinned to the pooled value takes
//! the pooled posterior's draws), their runs through the whole of storage, and the prediction bands
//! they give each observation.

use super::lane_fit::{creep_from, LaneProblem, Residual, PACK};
use crate::case::Material;
use crate::storage::{age_lane_pack, LaneAged, LaneCreep, LaneRun, Track};

/// Posterior draws for propagation. A scale shrunk to the pooled value (`pinned`) stays with the
/// roll's value, as the optimum does, and takes draw k of the pooled posterior (`pooled_draws`, one
/// per draw) in draw k: every lane so pinned moves with the roll's value in the same state, so the
/// roll-level uncertainty reaches the lanes' lengths without making lane-to-lane differences the
/// data do not show. Without pooled draws the scale stays at the pooled optimum.
///
/// With `scores` (the lane's score in each state, as many as the draws) and the lane's MD scale
/// its own, the lane's own draws are first put in state order by them
/// ([`super::field::rank_matched`]), so that lanes fitted to the same survey readings move
/// together; else they keep their seeded random order.
pub(super) fn pinned_draws(
    material: &Material,
    post: &crate::fit::posterior::Posterior,
    theta: &[f64],
    (pinned, pooled_draws): ([bool; 2], &[[f64; 2]]),
    scores: Option<&[f64]>,
) -> (Vec<LaneCreep>, Vec<[f64; 2]>) {
    let own = match scores.filter(|s| s.len() == post.draws.len() && super::field::coupled(pinned))
    {
        Some(s) => super::field::rank_matched(&post.draws, s),
        None => post.draws.clone(),
    };
    let t: Vec<[f64; 2]> = (own.iter().enumerate())
        .map(|(k, t)| {
            [0, 1].map(|i| match (pinned[i], pooled_draws.get(k)) {
                (true, Some(d)) => d[i],
                (true, None) => theta[i],
                (false, _) => t[i],
            })
        })
        .collect();
    (t.iter().map(|x| creep_from(material, x)).collect(), t)
}

/// The lane run through the whole of storage with each of `draws`, everything kept, [`PACK`]
/// at a time side by side ([`age_lane_pack`]); `None` when a run fails or the draws do not
/// share their retardation times.
pub(super) fn draw_runs(p: &LaneProblem, draws: &[LaneCreep]) -> Option<Vec<LaneAged>> {
    let mut out = Vec::with_capacity(draws.len());
    for chunk in draws.chunks(PACK) {
        let creep: [LaneCreep; PACK] = std::array::from_fn(|m| chunk[m.min(chunk.len() - 1)]);
        let run = LaneRun::whole(p.material, (p.prep, p.wound, p.lane), &creep[0], &p.drive);
        let aged = age_lane_pack(&run, &creep, p.hardness)?;
        out.extend(aged.into_iter().take(chunk.len()));
    }
    Some(out)
}

/// Each residual's 5 % and 95 % prediction over the posterior draws: from their `runs` when
/// they all ran, else simulated here (a draw the model cannot run is left out).
pub(super) fn prediction_bands(
    p: &LaneProblem,
    draws: &[[f64; 2]],
    runs: Option<&[LaneAged]>,
    residuals: &mut [Residual],
) {
    let tracks: Vec<Track> = match runs {
        Some(r) => r
            .iter()
            .map(|a| Track {
                surface_pressure_pa: a.surface_pressure_pa.clone(),
                diameter_m: a.diameter_m.clone(),
            })
            .collect(),
        None => p.simulate_many(draws).into_iter().flatten().collect(),
    };
    let preds: Vec<Vec<f64>> = tracks
        .iter()
        .map(|a| p.obs.iter().map(|o| p.predict(o, a)).collect())
        .collect();
    for (j, r) in residuals.iter_mut().enumerate() {
        let mut v: Vec<f64> = preds.iter().map(|x| x[j]).collect();
        if v.is_empty() {
            continue;
        }
        v.sort_by(f64::total_cmp);
        r.predicted_p05 = crate::fit::posterior::quantile(&v, 0.05);
        r.predicted_p95 = crate::fit::posterior::quantile(&v, 0.95);
    }
}
