//! Posterior of one lane's two log creep scales by deterministic quadrature on a grid along the
//! posterior's principal axes, grown until its edges hold no mass (the grid exploration of the
//! hyperparameters' posterior of Rue, Martino and Chopin 2009, section 3.1, here on the joint
//! posterior of two parameters).
//!
//! Why not a Gaussian: the misfit is flat towards small scales and steep towards large ones, so
//! the curvature at the optimum (a Laplace interval) is too narrow on one side and too wide on the
//! other, and where a lane's pressure reaches zero the misfit has a kink at the optimum and the
//! curvature is far narrower than the posterior. Why not a sampler: in two dimensions a grid of
//! about a hundred model runs integrates the posterior to a few per cent (the grid itself has no
//! Monte Carlo error; the summaries read from its pseudo-draws vary with the seed by under 1 %),
//! where a short ensemble sampler needed 512 runs per lane and still carried 10-20 % sampling
//! error in its quantiles.
//!
//! The grid ([`super::grid`]): the principal axes are the eigenvectors of the Hessian at the
//! optimum (one curvature sigma long). Along each of the four half-axes the distance at which
//! the objective rises by Z^2/2 is found by a few steps of a secant on sqrt(2 rise) (linear in
//! the distance for a Gaussian), so each half of the grid spans what the posterior itself spans,
//! not the curvature's guess. A few nodes per half-axis; then, while a node on an edge of the
//! grid still holds mass, that edge grows by a row of nodes (a curved or skewed posterior leaves
//! the box at its corners). Between nodes the log density is bilinear; the cell masses are its
//! integrals (Gauss-Legendre, 3 x 3 points), and pseudo-draws (a cell by its mass, a point in it
//! by rejection) give the summaries and the draws kept for
//! propagation ([`Posterior::draws`]). No model runs go into the pseudo-draws.
//!
//! Determinism: the pseudo-draws come from ChaCha8 seeded from a fixed hash (FNV-1a, 64 bit) of
//! the case id and the lane index, never from the operating system. The result is a pure function
//! of its inputs (lanes can be computed in any order or in parallel).

pub use super::grid::Density;
use super::grid::{at, Grid};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

/// Posterior draws kept per lane for propagation ([`Posterior::draws`]).
pub const DRAWS: usize = 16;
/// Pseudo-draws from the gridded posterior behind the summaries (no model runs).
const PSEUDO: usize = 4096;

/// FNV-1a 64-bit hash of a case id and a lane index: the pseudo-draws' seed.
pub fn seed_for(case_id: &str, lane: usize) -> u64 {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in case_id.bytes().chain((lane as u64).to_le_bytes()) {
        h ^= u64::from(b);
        h = h.wrapping_mul(0x0100_0000_01b3);
    }
    h
}

/// Posterior summary of one lane's log-scales (MD, radial).
#[derive(Debug, Clone, PartialEq)]
pub struct Posterior {
    /// Pseudo-draws of (ln MD scale, ln radial scale) from the gridded posterior.
    pub samples: Vec<[f64; 2]>,
    /// Posterior median of each log-scale.
    pub median: [f64; 2],
    /// Posterior standard deviation of each log-scale.
    pub sd: [f64; 2],
    /// 15.87 % and 84.13 % quantiles of each log-scale (a one-sigma equivalent interval).
    pub low: [f64; 2],
    pub high: [f64; 2],
    /// [`DRAWS`] draws kept for propagation: a seeded random member of each of `DRAWS` equal
    /// slices of the pseudo-draws (so of the posterior's mass), in a seeded random order (the
    /// fit then puts a lane's draws in state order, [`super::field`]; states pair them by index).
    pub draws: Vec<[f64; 2]>,
    /// Nodes of the quadrature grid.
    pub nodes: usize,
    /// The grid still held mass at an edge when it had grown as far as it may: the tails
    /// beyond are left out and the spread is understated.
    pub cut: bool,
    /// Objective evaluations (lane simulations).
    pub evaluations: u64,
}

/// Quantile `q` of sorted values (linear between order statistics).
pub fn quantile(sorted: &[f64], q: f64) -> f64 {
    if sorted.is_empty() {
        return f64::NAN;
    }
    let x = q.clamp(0.0, 1.0) * (sorted.len() - 1) as f64;
    let i = x.floor() as usize;
    let j = (i + 1).min(sorted.len() - 1);
    sorted[i] + (x - i as f64) * (sorted[j] - sorted[i])
}

/// Sample the posterior exp(-objective) by quadrature on a grid about `mode` (the optimum, where
/// the objective is `mode_cost`, as the optimiser found it, and the Hessian is `hessian`), with
/// the prior's standard deviation `prior_sd` as the floor of its width (see the module note);
/// `seed` seeds the pseudo-draws.
pub fn quadrature(
    obj: &impl Density,
    (mode, mode_cost): (&[f64], f64),
    hessian: [[f64; 2]; 2],
    prior_sd: f64,
    seed: u64,
) -> Posterior {
    let (grid, ax, evaluations) = super::grid::explore(obj, (mode, mode_cost), hessian, prior_sd);
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    let samples = pseudo_draws(&grid, mode, &ax, prior_sd, &mut rng);
    let draws = kept_draws(&samples, DRAWS, &mut rng);
    let mut p = summarise(samples, draws, grid.f.len(), evaluations);
    p.cut = grid.cut();
    p
}

/// Gauss-Legendre nodes and weights on [0, 1], 3 points.
const GL: [(f64, f64); 3] = [
    (0.112_701_665_379_258_3, 5.0 / 18.0),
    (0.5, 8.0 / 18.0),
    (0.887_298_334_620_741_7, 5.0 / 18.0),
];

/// One grid cell: its corner log densities (relative to the peak; -inf where the model failed)
/// and its density at (a, b) in [0, 1]^2: the exponential of the bilinear log density, or the
/// bilinear density where a corner failed.
struct Cell {
    l: [f64; 4],
}

impl Cell {
    fn density(&self, a: f64, b: f64) -> f64 {
        let w = [(1.0 - a) * (1.0 - b), a * (1.0 - b), (1.0 - a) * b, a * b];
        if self.l.iter().all(|x| x.is_finite()) {
            (0..4).map(|k| w[k] * self.l[k]).sum::<f64>().exp()
        } else {
            (0..4).map(|k| w[k] * self.l[k].exp()).sum()
        }
    }

    /// Bound of the density over the cell (a bilinear function peaks at a corner).
    fn bound(&self) -> f64 {
        self.l
            .iter()
            .copied()
            .fold(f64::NEG_INFINITY, f64::max)
            .exp()
    }

    /// Mass over the unit cell (3 x 3 Gauss-Legendre).
    fn mass(&self) -> f64 {
        GL.iter()
            .flat_map(|&(a, wa)| GL.iter().map(move |&(b, wb)| wa * wb * self.density(a, b)))
            .sum()
    }
}

/// [`PSEUDO`] draws from the gridded posterior: a cell by its mass (stratified: the k-th draw
/// from the k-th of `PSEUDO` equal slices of the cumulative mass, so the cells get their shares
/// to within one draw), a point in it by rejection.
///
/// A grid with no mass (the model failed at every node, which a fit does not leave: it scores a
/// failed run finite) gives draws of the prior's width about the mode: nothing is known beyond
/// the prior, and the output must not look certain.
fn pseudo_draws(
    g: &Grid,
    mode: &[f64],
    ax: &[[f64; 2]; 2],
    prior_sd: f64,
    rng: &mut ChaCha8Rng,
) -> Vec<[f64; 2]> {
    let lo = g.lowest();
    let (n0, n1) = (g.u[0].len(), g.u[1].len());
    let l = |i: usize, j: usize| {
        let v = g.get(i, j);
        if v.is_finite() {
            lo - v
        } else {
            f64::NEG_INFINITY
        }
    };
    let mut cells = Vec::with_capacity((n0 - 1) * (n1 - 1));
    let mut cum = Vec::with_capacity(cells.capacity());
    let mut total = 0.0;
    for i in 0..n0 - 1 {
        for j in 0..n1 - 1 {
            let c = Cell {
                l: [l(i, j), l(i + 1, j), l(i, j + 1), l(i + 1, j + 1)],
            };
            let area = (g.u[0][i + 1] - g.u[0][i]) * (g.u[1][j + 1] - g.u[1][j]);
            total += area * c.mass();
            cum.push(total);
            cells.push((i, j, c));
        }
    }
    if !(total > 0.0 && total.is_finite()) {
        return (0..PSEUDO)
            .map(|_| [0, 1].map(|d| mode[d] + prior_sd * normal(rng)))
            .collect();
    }
    (0..PSEUDO)
        .map(|k| {
            let pick = (k as f64 + rng.random::<f64>()) / PSEUDO as f64 * total;
            let k = cum.partition_point(|&c| c <= pick).min(cells.len() - 1);
            let (i, j, c) = &cells[k];
            let bound = c.bound();
            let (mut a, mut b) = (0.5, 0.5);
            for _ in 0..1000 {
                (a, b) = (rng.random::<f64>(), rng.random::<f64>());
                if rng.random::<f64>() * bound <= c.density(a, b) {
                    break;
                }
            }
            let u0 = g.u[0][*i] + a * (g.u[0][i + 1] - g.u[0][*i]);
            let u1 = g.u[1][*j] + b * (g.u[1][j + 1] - g.u[1][*j]);
            at(mode, ax, [u0, u1])
        })
        .collect()
}

/// A standard normal draw (Box-Muller, the cosine branch).
pub fn normal(rng: &mut ChaCha8Rng) -> f64 {
    let u1: f64 = rng.random::<f64>().max(1e-300);
    let u2: f64 = rng.random::<f64>();
    (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
}

/// `count` of `samples` (all of them when fewer): a random member of each of `count` equal
/// slices, then shuffled (Fisher-Yates).
fn kept_draws(samples: &[[f64; 2]], count: usize, rng: &mut ChaCha8Rng) -> Vec<[f64; 2]> {
    let n = samples.len();
    let count = count.min(n);
    let mut out: Vec<[f64; 2]> = (0..count)
        .map(|k| {
            let (a, b) = (k * n / count, (k + 1) * n / count);
            samples[a + rng.random_range(0..b - a)]
        })
        .collect();
    for i in (1..out.len()).rev() {
        out.swap(i, rng.random_range(0..=i));
    }
    out
}

fn summarise(
    samples: Vec<[f64; 2]>,
    draws: Vec<[f64; 2]>,
    nodes: usize,
    evaluations: u64,
) -> Posterior {
    let n = samples.len() as f64;
    let mut median = [0.0; 2];
    let mut sd = [0.0; 2];
    let mut low = [0.0; 2];
    let mut high = [0.0; 2];
    for d in 0..2 {
        let mut v: Vec<f64> = samples.iter().map(|s| s[d]).collect();
        v.sort_by(f64::total_cmp);
        let m = v.iter().sum::<f64>() / n;
        sd[d] = (v.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (n - 1.0).max(1.0)).sqrt();
        median[d] = quantile(&v, 0.5);
        low[d] = quantile(&v, 0.1587);
        high[d] = quantile(&v, 0.8413);
    }
    Posterior {
        samples,
        median,
        sd,
        low,
        high,
        draws,
        nodes,
        cut: false,
        evaluations,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::fit::lane_fit::hessian2;

    /// A density given by a function of the two parameters.
    struct Of(fn(f64, f64) -> f64);

    impl Density for Of {
        fn value(&self, t: &[f64]) -> f64 {
            (self.0)(t[0], t[1])
        }
        fn values(&self, thetas: &[[f64; 2]]) -> Vec<f64> {
            thetas.iter().map(|t| self.value(t)).collect()
        }
    }

    fn post(d: &Of, mode: [f64; 2]) -> Posterior {
        let h = hessian2(&|t| d.values(t), &mode, d.value(&mode), 0.05);
        quadrature(d, (&mode, d.value(&mode)), h, 1.0, 7)
    }

    /// A correlated normal (sd 1 and 0.5, correlation 0.9): sd and the one-sigma quantiles
    /// +/-1 sd of the normal distribution (Abramowitz and Stegun 1964, 26.2). Tolerance 3 %
    /// (measured 0.5 % rms over 40 seeds: the grid's error and that of the pseudo-draws).
    #[test]
    fn a_correlated_normal_is_integrated_to_its_moments() {
        let d = Of(|x, y| {
            let (s1, s2, r) = (1.0, 0.5, 0.9);
            let (a, b) = (x / s1, y / s2);
            0.5 * (a * a - 2.0 * r * a * b + b * b) / (1.0 - r * r)
        });
        let p = post(&d, [0.0, 0.0]);
        for (k, s) in [1.0, 0.5].into_iter().enumerate() {
            assert!((p.sd[k] / s - 1.0).abs() < 0.03, "sd {k}: {}", p.sd[k]);
            assert!(p.median[k].abs() < 0.03 * s, "median {k}: {}", p.median[k]);
            assert!((p.low[k] + s).abs() < 0.05 * s, "low {k}: {}", p.low[k]);
            assert!((p.high[k] - s).abs() < 0.05 * s, "high {k}: {}", p.high[k]);
        }
        assert!(p.evaluations < 150, "evaluations {}", p.evaluations);
    }

    /// A bent ("banana") density: x ~ N(0, 1) and y | x ~ N(0.3 x^2, 0.5^2), so the
    /// marginal of x is the standard normal and y has mean 0.3 and variance 0.25 + 0.09 Var(x^2) =
    /// 0.43 (Var(x^2) = 2 for a standard normal; Abramowitz and Stegun 1964, 26.4, chi-square of
    /// one degree of freedom). The curvature at the mode knows nothing of the bend: the grid's
    /// growth must find it. The bend moves the ridge by up to two conditional sigmas across one
    /// cell, where a bilinear log density cuts the corner: measured -4.6 % on the sd of x and
    /// -4.1 % on that of y over 40 seeds (the 16-walker ensemble sampler this replaced: -6 % and
    /// -10 %, with 16 % and 20 % rms, at 528 evaluations to this grid's 187).
    #[test]
    fn a_curved_density_is_integrated_to_its_marginals() {
        let d = Of(|x, y| 0.5 * x * x + 2.0 * (y - 0.3 * x * x).powi(2));
        let p = post(&d, [0.0, 0.0]);
        assert!((p.sd[0] - 1.0).abs() < 0.06, "sd x {}", p.sd[0]);
        assert!((p.low[0] + 1.0).abs() < 0.06 && (p.high[0] - 1.0).abs() < 0.06);
        let mean_y = p.samples.iter().map(|s| s[1]).sum::<f64>() / p.samples.len() as f64;
        assert!((mean_y - 0.3).abs() < 0.03, "mean y {mean_y}");
        let sd_y = p.sd[1] / 0.43f64.sqrt();
        assert!((sd_y - 1.0).abs() < 0.06, "sd y {}", p.sd[1]);
        assert!(p.evaluations < 250, "evaluations {}", p.evaluations);
    }

    /// A kink at the mode: y ~ Laplace(0, b = 0.5), density e^(-|y|/b) / (2b). Its variance is
    /// the integral of y^2 e^(-|y|/b) / (2b), 2 b^2, so its sd is b sqrt 2; its distribution
    /// function above 0 is 1 - e^(-y/b) / 2, so its 84.13 % quantile is -b ln(2 (1 - 0.8413)) =
    /// 0.574 (both by direct integration). The finite-difference curvature at the kink (step
    /// 0.05) is 80, 40 times the 2 of a normal of the same sd: the half-axis search must widen
    /// the grid.
    #[test]
    fn a_kink_at_the_mode_does_not_narrow_the_posterior() {
        let d = Of(|x, y| 0.5 * x * x + y.abs() / 0.5);
        let p = post(&d, [0.0, 0.0]);
        assert!(
            (p.sd[1] / (0.5 * 2f64.sqrt()) - 1.0).abs() < 0.05,
            "sd {}",
            p.sd[1]
        );
        assert!((p.high[1] / 0.574 - 1.0).abs() < 0.06, "high {}", p.high[1]);
        assert!((p.sd[0] - 1.0).abs() < 0.03, "sd x {}", p.sd[0]);
    }

    /// The draws kept for propagation are draws of the posterior, and those of two lanes (two
    /// seeds) paired by index, as the diagnosis's states pair them, are independent: over 50
    /// seed pairs of a standard normal, the 800 pairs correlate within 4/sqrt(800) = 0.14 of
    /// zero (the sampling sd of a correlation, 1/sqrt(n); Fisher 1915, from memory), and draw 0
    /// has mean within 4 standard errors (0.57) of zero and the pooled sd within 10 % of 1.
    #[test]
    fn kept_draws_of_two_lanes_are_independent_draws_of_the_posterior() {
        let d = Of(|x, y| 0.5 * (x * x + y * y));
        let h = hessian2(&|t| d.values(t), &[0.0, 0.0], d.value(&[0.0, 0.0]), 0.05);
        let (mut a, mut b, mut first) = (vec![], vec![], vec![]);
        for s in 0..50u64 {
            let p = quadrature(&d, (&[0.0, 0.0], d.value(&[0.0, 0.0])), h, 1.0, 100 + s);
            let q = quadrature(&d, (&[0.0, 0.0], d.value(&[0.0, 0.0])), h, 1.0, 1000 + s);
            assert_eq!(p.draws.len(), DRAWS);
            first.push(p.draws[0][0]);
            a.extend(p.draws.iter().map(|t| t[0]));
            b.extend(q.draws.iter().map(|t| t[0]));
        }
        let m = |v: &[f64]| v.iter().sum::<f64>() / v.len() as f64;
        let (ma, mb) = (m(&a), m(&b));
        let sxy: f64 = a.iter().zip(&b).map(|(x, y)| (x - ma) * (y - mb)).sum();
        let sxx: f64 = a.iter().map(|x| (x - ma).powi(2)).sum();
        let syy: f64 = b.iter().map(|y| (y - mb).powi(2)).sum();
        let corr = sxy / (sxx * syy).sqrt();
        assert!(corr.abs() < 0.14, "corr {corr}");
        assert!(m(&first).abs() < 0.57, "draw 0 mean {}", m(&first));
        assert!(((sxx / a.len() as f64).sqrt() - 1.0).abs() < 0.1);
    }

    /// A Hessian that is not a number, or not positive, leaves the grid to the prior's width and
    /// the half-axis search: the posterior of a normal with sd 0.2 and 2 is still found.
    #[test]
    fn a_useless_hessian_does_not_spoil_the_posterior() {
        let d = Of(|x, y| 0.5 * ((x / 0.2).powi(2) + (y / 2.0).powi(2)));
        for h in [
            [[f64::NAN; 2]; 2],
            [[0.0; 2]; 2],
            [[-1.0, 0.0], [0.0, -3.0]],
        ] {
            let p = quadrature(&d, (&[0.0, 0.0], d.value(&[0.0, 0.0])), h, 1.0, 3);
            assert!((p.sd[0] / 0.2 - 1.0).abs() < 0.05, "{h:?}: {:?}", p.sd);
            assert!((p.sd[1] / 2.0 - 1.0).abs() < 0.05, "{h:?}: {:?}", p.sd);
        }
    }

    /// A posterior flat over a range a thousand times its width at the mode (no prior to bound
    /// it) still holds mass at the edge of the widest grid: it is marked cut, so the spread it
    /// reports is known to be short. A normal one is not.
    #[test]
    fn a_posterior_past_the_widest_grid_is_marked_cut() {
        let flat = Of(|x, y| 0.5 * x * x + 0.5 * (y.abs() - 1e3).max(0.0).powi(2));
        assert!(post(&flat, [0.0, 0.0]).cut);
        let normal = Of(|x, y| 0.5 * (x * x + y * y));
        assert!(!post(&normal, [0.0, 0.0]).cut);
    }

    /// The same inputs give the same posterior to the bit; another seed moves only the
    /// pseudo-draws, not the grid.
    #[test]
    fn the_posterior_is_a_pure_function_of_its_inputs() {
        let d = Of(|x, y| 0.5 * x * x + 2.0 * (y - 0.3 * x * x).powi(2));
        assert_eq!(post(&d, [0.0, 0.0]), post(&d, [0.0, 0.0]));
        let h = hessian2(&|t| d.values(t), &[0.0, 0.0], d.value(&[0.0, 0.0]), 0.05);
        let other = quadrature(&d, (&[0.0, 0.0], d.value(&[0.0, 0.0])), h, 1.0, 8);
        assert_eq!(other.nodes, post(&d, [0.0, 0.0]).nodes);
        assert!((other.sd[0] - 1.0).abs() < 0.06);
    }
}
