//! Whether the model explains the measurements: the fit's misfit (root-mean-square residual in
//! noise units) against [`MISFIT_LIMIT`], for the roll and for each lane. Every output opens
//! with this one verdict ([`ModelFit`]): `diagnose`, its report, `fit` and `triage`.

use super::RollFit;
use serde::Serialize;

/// Misfit (root-mean-square residual in noise units) above which a lane, or the roll over every
/// reading, is not explained: readings that miss the fit by three times their noise are not
/// noise (common practice: a three-sigma limit).
pub const MISFIT_LIMIT: f64 = 3.0;

/// How far the model explains the surveys.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Verdict {
    /// The roll and every lane within [`MISFIT_LIMIT`].
    Explained,
    /// The roll within the limit, some lanes beyond it.
    LanesNotExplained,
    /// The roll's misfit over every reading beyond the limit: the model does not explain the
    /// surveys, so neither the findings nor their absence can be trusted.
    NotExplained,
}

/// The roll's misfit and its verdict.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ModelFit {
    pub verdict: Verdict,
    /// Root-mean-square residual over every reading of the roll, in noise units.
    pub roll_misfit_noise_units: f64,
    /// [`MISFIT_LIMIT`], in noise units.
    pub limit_noise_units: f64,
    /// Lanes in the roll.
    pub lanes: usize,
    /// Centres of the lanes whose own misfit is beyond the limit, m.
    pub lanes_not_explained_m: Vec<f64>,
    /// Largest lane misfit, in noise units (0 with no lane).
    pub worst_lane_misfit_noise_units: f64,
}

/// A reading's residual in units of its repeatability, `(predicted - measured) / sigma`. A
/// hardness predicted below the bottom of the scale is taken at the bottom: the map
/// H = a + b ln P no longer holds there, and all the model says is that the instrument reads its
/// lowest, so a reading at the bottom agrees and one well above it does not (a prediction
/// censored at the scale's limit).
pub fn normalised(what: crate::case::Measure, predicted: f64, measured: f64, sigma: f64) -> f64 {
    let p = if what == crate::case::Measure::Hardness {
        predicted.max(crate::limits::HARDNESS_SCALE_BOTTOM)
    } else {
        predicted
    };
    (p - measured) / sigma
}

/// Root-mean-square normalised residual over every reading of the roll (0 with no reading).
pub fn roll_misfit(fit: &RollFit) -> f64 {
    let r: Vec<f64> = (fit.lanes.iter())
        .flat_map(|l| l.residuals.iter().map(|r| r.normalised))
        .collect();
    if r.is_empty() {
        0.0
    } else {
        (r.iter().map(|x| x * x).sum::<f64>() / r.len() as f64).sqrt()
    }
}

/// Whether a misfit (noise units) is within [`MISFIT_LIMIT`].
pub fn explained(misfit: f64) -> bool {
    misfit <= MISFIT_LIMIT
}

/// The verdict of a roll's fit.
pub fn model_fit(fit: &RollFit) -> ModelFit {
    let lanes = fit.lanes.iter().map(|l| (l.position_m, l.rmse));
    from_lanes(roll_misfit(fit), lanes)
}

/// The verdict from the roll's misfit and each lane's (centre m, misfit in noise units).
pub fn from_lanes(roll: f64, lanes: impl Iterator<Item = (f64, f64)>) -> ModelFit {
    let lanes: Vec<(f64, f64)> = lanes.collect();
    let not: Vec<f64> = (lanes.iter())
        .filter(|(_, m)| !explained(*m))
        .map(|(p, _)| *p)
        .collect();
    let verdict = if !explained(roll) {
        Verdict::NotExplained
    } else if !not.is_empty() {
        Verdict::LanesNotExplained
    } else {
        Verdict::Explained
    };
    ModelFit {
        verdict,
        roll_misfit_noise_units: roll,
        limit_noise_units: MISFIT_LIMIT,
        lanes: lanes.len(),
        lanes_not_explained_m: not,
        worst_lane_misfit_noise_units: lanes.iter().map(|l| l.1).fold(0.0, f64::max),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The roll's misfit decides "not explained"; lanes alone beyond the limit are named; at the
    /// limit itself a misfit is still explained.
    #[test]
    fn the_roll_misfit_decides_and_lanes_beyond_the_limit_are_named() {
        let v = |roll, lanes: &[(f64, f64)]| from_lanes(roll, lanes.iter().copied());
        assert_eq!(v(6.0, &[(0.1, 6.0)]).verdict, Verdict::NotExplained);
        let some = v(1.5, &[(0.1, 1.0), (0.3, 3.4)]);
        assert_eq!(some.verdict, Verdict::LanesNotExplained);
        assert_eq!(some.lanes_not_explained_m, vec![0.3]);
        assert_eq!(some.worst_lane_misfit_noise_units, 3.4);
        assert_eq!(v(3.0, &[(0.1, 3.0)]).verdict, Verdict::Explained);
    }
}
