//! Draws of the lanes' creep that share what the lanes' data share.
//!
//! Each lane is fitted to the survey readings interpolated onto its centre ([`crate::lanes`]).
//! Where lanes are narrower than the readings' spacing, neighbouring lanes are fitted to nearly
//! the same interpolated values: the noise in their data is nearly the same, and so is the error
//! of their fits. Drawing each lane's posterior deviation independently would make forty lanes
//! on seventeen readings look like forty independent measurements, and a noise-only roll's
//! smooth patterns (a side-to-side slope) too small and its lane-local extremes too large, so
//! the same roll would be judged differently at another lane count.
//!
//! So the draws are made to share the readings' noise: a standard normal score per survey position
//! (one field per state or noise roll), carried to each lane centre with the weights that
//! interpolate its data (linear within the segment it lies in, extrapolated from the end segment
//! beyond the ends) and scaled back to unit variance. The score's correlation between two lanes is
//! the correlation of their data noise. A lane's data are its centre's interpolation, or the mean
//! of the readings it holds where it holds two or more ([`crate::lanes`]), and its score is made
//! the same way. A lane's draws are then put in the order of their MD log-scale (the creep that
//! sets its length at unwind) and matched to the states by the ranks of the lane's scores, which
//! keeps each lane's draws exactly and induces the rank correlation of the scores between lanes
//! (Iman and Conover 1982). A noise-only roll takes from each lane the draw at the normal quantile
//! of the lane's score. Only the MD scale is coupled: a lane's radial draws follow its MD draws as
//! its posterior correlates them, and a lane whose MD scale is pinned to the roll's value draws
//! independently (its radial scale is not tied to a neighbour's MD scale). The whole of a lane's
//! posterior spread is coupled, the prior's part with the data's.

use super::posterior::normal;
use crate::case::{Case, Measure};
use rand_chacha::ChaCha8Rng;

/// The survey positions the lanes' creep information comes from.
#[derive(Debug, Clone, PartialEq)]
pub struct Field {
    /// Sorted distinct positions from the front edge, m (at least two).
    positions: Vec<f64>,
}

impl Field {
    /// The positions of `case`'s densest hardness or diameter survey; `None` with fewer than two
    /// positions (the lanes then draw independently).
    pub fn of(case: &Case) -> Option<Field> {
        let densest = [Measure::Hardness, Measure::Diameter]
            .into_iter()
            .filter_map(|m| case.densest(m))
            .fold(None::<&crate::case::Profile>, |best, p| match best {
                Some(b) if b.positions_m.len() >= p.positions_m.len() => Some(b),
                _ => Some(p),
            })?;
        let mut positions: Vec<f64> = densest
            .positions_m
            .iter()
            .copied()
            .filter(|x| x.is_finite())
            .collect();
        positions.sort_by(f64::total_cmp);
        positions.dedup();
        (positions.len() >= 2).then_some(Field { positions })
    }

    /// Number of survey positions (the length of a realisation).
    pub fn len(&self) -> usize {
        self.positions.len()
    }

    /// Whether the field has no positions (never, for a field made by [`Self::of`]).
    pub fn is_empty(&self) -> bool {
        self.positions.is_empty()
    }

    /// A realisation: one standard normal score per survey position, from `rng`.
    pub fn draw(&self, rng: &mut ChaCha8Rng) -> Vec<f64> {
        (0..self.len()).map(|_| normal(rng)).collect()
    }

    /// The unit-variance score of lane `i` between edges `e` (m) in realisation `z`: the
    /// readings' scores with the weights that make the lane's data ([`crate::lanes::build`]),
    /// over the root of their sum of squares. A lane holding readings takes their mean (one
    /// reading: that reading); any other its centre's interpolation
    /// ([`crate::interp::linear_extrap`]: the two
    /// readings of the segment the centre lies in, and beyond the ends the end segment's, so an
    /// end lane shares both end readings with its neighbour).
    pub fn score(&self, z: &[f64], e: &[f64], i: usize) -> f64 {
        let p = &self.positions;
        let held = crate::lanes::held(p, e, i);
        if !held.is_empty() {
            return held.iter().map(|&j| z[j]).sum::<f64>() / (held.len() as f64).sqrt();
        }
        // the positions are distinct, so every segment has a length
        let (j, t) = crate::interp::segment(p, 0.5 * (e[i] + e[i + 1])).unwrap_or((1, 0.0));
        ((1.0 - t) * z[j - 1] + t * z[j]) / ((1.0 - t).powi(2) + t * t).sqrt()
    }

    /// The draw a noise-only roll takes from lane `i` between edges `e` (m), with posterior
    /// `draws` (log-scales), in realisation `z`: the one at the normal quantile of the lane's
    /// score among its draws in the order of their MD log-scale.
    pub fn pick(&self, z: &[f64], draws: &[[f64; 2]], (e, i): (&[f64], usize)) -> usize {
        at_score(&by_effect(draws), self.score(z, e, i))
    }
}

/// Whether a lane's draws are coupled to the field: its MD creep scale is its own (not pinned to
/// the roll's value). The draws are ordered by the MD scale, the one that sets a lane's length at
/// unwind; a lane whose MD scale is pinned keeps its radial draws independent of its neighbours'
/// (ordering them by the radial scale would tie one lane's radial scale to another's MD).
pub fn coupled(pinned: [bool; 2]) -> bool {
    !pinned[0]
}

/// Indices of `draws` in increasing order of their MD log-scale (ties in their given order).
pub fn by_effect(draws: &[[f64; 2]]) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..draws.len()).collect();
    idx.sort_by(|&a, &b| draws[a][0].total_cmp(&draws[b][0]));
    idx
}

/// `draws` put in state order: the state with the r-th smallest score takes the draw with the
/// r-th smallest MD log-scale (ties among scores in state order). Scores must be as many as
/// draws.
pub fn rank_matched(draws: &[[f64; 2]], scores: &[f64]) -> Vec<[f64; 2]> {
    debug_assert_eq!(draws.len(), scores.len());
    let sorted = by_effect(draws);
    let mut states: Vec<usize> = (0..scores.len()).collect();
    states.sort_by(|&a, &b| scores[a].total_cmp(&scores[b]));
    let mut out = draws.to_vec();
    for (r, &k) in states.iter().enumerate() {
        out[k] = draws[sorted[r]];
    }
    out
}

/// The draw a noise-only roll takes from a lane whose score is `u`: the one at the normal
/// quantile of `u` among the lane's draws in the order of `by_effect`.
pub fn at_score(sorted: &[usize], u: f64) -> usize {
    debug_assert!(u.is_finite(), "a lane's score is a finite normal draw");
    let q = crate::stats::normal_sf(-u);
    let n = sorted.len();
    sorted[((q * n as f64) as usize).min(n - 1)]
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::SeedableRng;

    fn field(p: &[f64]) -> Field {
        Field {
            positions: p.to_vec(),
        }
    }

    /// The score of a lane 2 um wide centred on `x` (m): its centre's.
    fn at(f: &Field, z: &[f64], x: f64) -> f64 {
        f.score(z, &[x - 1e-6, x + 1e-6], 0)
    }

    /// At a survey position the score is that position's; half way it is the mean of the two
    /// over sqrt(1/2), so every lane's score is standard normal; beyond the ends, the end
    /// segment's extrapolation weights (as the lane's data are extrapolated). The variance and
    /// correlation checked are those of weighted sums of independent standard normals,
    /// sum w_i^2 and sum w_i v_i (textbook probability).
    #[test]
    fn scores_interpolate_with_unit_variance() {
        let f = field(&[0.1, 0.3, 0.5]);
        let z = [1.0, -2.0, 0.5];
        assert_eq!(at(&f, &z, 0.1), 1.0);
        assert_eq!(at(&f, &z, 0.3), -2.0);
        assert_eq!(at(&f, &z, 0.5), 0.5);
        // half a spacing before the first reading: weights 1.5 and -0.5
        let before = (1.5 * 1.0 - 0.5 * -2.0) / (1.5f64 * 1.5 + 0.25).sqrt();
        approx::assert_relative_eq!(at(&f, &z, 0.0), before, max_relative = 1e-12);
        // the weights are those that extrapolate the lane's data
        let (y, _) = crate::interp::linear_extrap(&[0.1, 0.3, 0.5], &z, 0.0);
        approx::assert_relative_eq!(y, 1.5 * 1.0 - 0.5 * -2.0, max_relative = 1e-12);
        // a lane holding two readings takes their mean (the lane's data are the mean), three
        // likewise; one on an inner edge belongs to the lane on its right
        let e = [0.0, 0.2, 0.6];
        approx::assert_relative_eq!(f.score(&z, &e, 1), (-2.0 + 0.5) / 2f64.sqrt());
        approx::assert_relative_eq!(f.score(&z, &[0.0, 0.6], 0), (1.0 - 2.0 + 0.5) / 3f64.sqrt());
        let e = [0.1, 0.3, 0.6];
        approx::assert_relative_eq!(f.score(&z, &e, 1), (-2.0 + 0.5) / 2f64.sqrt());
        // a lane holding one reading takes it (0.1 in 0.1-0.3, whose centre 0.2 lies half way)
        assert_eq!(f.score(&z, &e, 0), 1.0);
        approx::assert_relative_eq!(
            at(&f, &z, 0.2),
            (0.5 * 1.0 + 0.5 * -2.0) / 0.5f64.sqrt(),
            max_relative = 1e-12
        );
        // the variance over many realisations is one at any centre, and the correlation of two
        // centres is that of their interpolation weights
        let mut rng = ChaCha8Rng::seed_from_u64(7);
        let (mut s2, mut sab, n) = (0.0, 0.0, 40_000);
        for _ in 0..n {
            let z = f.draw(&mut rng);
            let (a, b) = (at(&f, &z, 0.15), at(&f, &z, 0.2));
            s2 += a * a;
            sab += a * b;
        }
        let (va, cab) = (s2 / n as f64, sab / n as f64);
        // weights (0.75, 0.25) and (0.5, 0.5): correlation (0.375 + 0.125) / sqrt(0.625 * 0.5)
        let want = 0.5 / (0.625f64 * 0.5).sqrt();
        assert!((va - 1.0).abs() < 0.03, "variance {va}");
        assert!(
            (cab - want).abs() < 0.02,
            "correlation {cab} against {want}"
        );
    }

    /// Rank matching keeps a lane's draws (a permutation) and puts the largest draw in the state
    /// with the largest score.
    #[test]
    fn rank_matching_permutes_the_draws_by_the_scores() {
        let draws = [[3.0, 0.0], [1.0, 9.0], [2.0, 5.0], [0.0, 7.0]];
        let scores = [0.2, -1.0, 1.5, 0.0];
        let out = rank_matched(&draws, &scores);
        assert_eq!(out, vec![[2.0, 5.0], [0.0, 7.0], [3.0, 0.0], [1.0, 9.0]]);
        // a lane whose MD scale is pinned is not coupled
        assert!(coupled([false, true]) && !coupled([true, false]));
    }

    /// Rank matching induces between two lanes the rank correlation of their scores: over
    /// states of 16, the mean Spearman correlation of two lanes' draws is Moran's (1948)
    /// expectation for normal scores of correlation rho, 6 / (pi (n + 1)) (asin rho + (n - 2)
    /// asin(rho / 2)) (from memory; a SciPy 1.17.1 Monte Carlo of 20,000 sets gave 0.8531
    /// against the formula's 0.8536 for the weights below: `tests/data/field/moran.py`).
    #[test]
    fn rank_matching_carries_the_scores_correlation_to_the_draws() {
        let f = field(&[0.0, 1.0]);
        let draws: Vec<[f64; 2]> = (0..16).map(|k| [k as f64, 0.0]).collect();
        let mut rng = ChaCha8Rng::seed_from_u64(11);
        let (sets, n) = (4000, 16.0);
        let mut sum = 0.0;
        for _ in 0..sets {
            let z: Vec<Vec<f64>> = (0..16).map(|_| f.draw(&mut rng)).collect();
            let a: Vec<f64> = z.iter().map(|zk| at(&f, zk, 0.25)).collect();
            let b: Vec<f64> = z.iter().map(|zk| at(&f, zk, 0.5)).collect();
            let (da, db) = (rank_matched(&draws, &a), rank_matched(&draws, &b));
            // the draws' keys are their ranks 0..15: Spearman's rho from the rank differences
            let d2: f64 = da.iter().zip(&db).map(|(x, y)| (x[0] - y[0]).powi(2)).sum();
            sum += 1.0 - 6.0 * d2 / (n * (n * n - 1.0));
        }
        let rho = 0.5 / (0.625f64 * 0.5).sqrt();
        let want = 6.0 / (std::f64::consts::PI * (n + 1.0))
            * (rho.asin() + (n - 2.0) * (0.5 * rho).asin());
        let got = sum / sets as f64;
        assert!(
            (got - want).abs() < 0.01,
            "mean Spearman {got} against {want}"
        );
    }

    /// A noise-only roll's pick at a standard normal score takes each draw equally often: the
    /// normal distribution function of a standard normal is uniform (the probability integral
    /// transform, textbook).
    #[test]
    fn a_quantile_pick_is_uniform_over_the_draws() {
        let sorted: Vec<usize> = (0..16).collect();
        let mut rng = ChaCha8Rng::seed_from_u64(3);
        let mut hits = [0usize; 16];
        for _ in 0..32_000 {
            hits[at_score(&sorted, normal(&mut rng))] += 1;
        }
        for h in hits {
            assert!((h as f64 / 2000.0 - 1.0).abs() < 0.1, "{hits:?}");
        }
    }
}
