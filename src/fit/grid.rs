//! The posterior's grid ([`super::posterior`]): principal axes from the Hessian at the optimum,
//! half-axes searched out to where the objective has risen by [`Z_EDGE`]^2/2, [`HALF_NODES`]
//! nodes on each, and edges grown while they hold mass.

use super::lane_fit::{Known, Objective};

/// Each half-axis of the grid reaches where the objective has risen by Z^2/2 over the optimum:
/// 4 equivalent standard deviations (beyond it lies 0.003 % of a normal's mass per side; a
/// heavier tail, as at a kink, holds more there, and its variance most).
pub const Z_EDGE: f64 = 4.0;
/// Grid nodes on each half-axis (besides the optimum).
pub const HALF_NODES: usize = 4;
/// An edge node less than this above the lowest node (3.5 equivalent standard deviations) still
/// holds mass: the grid grows a row beyond it (a skewed or bent posterior's tail carries much of
/// its variance).
pub const EDGE_RISE: f64 = 0.5 * 3.5 * 3.5;
/// Rows a grid edge may grow by (after the first two each doubles the spacing: 32 of the grid's
/// spacings in all; none of the 900 lane fits of a 90-roll recovery study used them all).
const MAX_GROW: usize = 6;
/// Secant rounds of the half-axis search, and its tolerance on sqrt(2 rise) / Z.
const SEARCH_ROUNDS: usize = 8;
const SEARCH_TOL: f64 = 0.15;
/// Farthest a half-axis reaches, in prior standard deviations (the prior alone has risen by 18
/// there).
const REACH_PRIORS: f64 = 6.0;

/// A negative log density of the two log-scales: one point, or several at once (the same
/// values, to the bit).
pub trait Density {
    fn value(&self, theta: &[f64]) -> f64;
    fn values(&self, thetas: &[[f64; 2]]) -> Vec<f64>;
}

impl Density for Objective<'_, '_> {
    fn value(&self, theta: &[f64]) -> f64 {
        Objective::value(self, theta)
    }
    fn values(&self, thetas: &[[f64; 2]]) -> Vec<f64> {
        Objective::values(self, thetas)
    }
}

/// The principal axes of a 2 x 2 Hessian `h` (eigenvectors, each one curvature sigma long in the
/// log-scales). A curvature below the prior's own (1 / `prior_sd`^2), or not a number, is taken
/// as the prior's: the objective holds the prior, so it curves at least that much.
pub fn axes(h: [[f64; 2]; 2], prior_sd: f64) -> [[f64; 2]; 2] {
    let floor = 1.0 / (prior_sd * prior_sd);
    let (a, b, d) = (h[0][0], 0.5 * (h[0][1] + h[1][0]), h[1][1]);
    if !(a.is_finite() && b.is_finite() && d.is_finite()) {
        return [[prior_sd, 0.0], [0.0, prior_sd]];
    }
    let mid = 0.5 * (a + d);
    let rad = (0.25 * (a - d) * (a - d) + b * b).sqrt();
    let (l1, l2) = (mid + rad, mid - rad);
    let v1 = if b.abs() > 1e-12 * (a.abs() + d.abs()) {
        let (x, y) = (l1 - d, b);
        let n = x.hypot(y);
        [x / n, y / n]
    } else if a >= d {
        [1.0, 0.0]
    } else {
        [0.0, 1.0]
    };
    let v2 = [-v1[1], v1[0]];
    let s1 = 1.0 / l1.max(floor).sqrt();
    let s2 = 1.0 / l2.max(floor).sqrt();
    [[v1[0] * s1, v1[1] * s1], [v2[0] * s2, v2[1] * s2]]
}

/// The point `u` (grid coordinates along `ax`) from `mode`.
pub(super) fn at(mode: &[f64], ax: &[[f64; 2]; 2], u: [f64; 2]) -> [f64; 2] {
    [0, 1].map(|d| mode[d] + u[0] * ax[0][d] + u[1] * ax[1][d])
}

/// The grid: node coordinates along each axis (increasing) and the objective at every node
/// (`f[i * u[1].len() + j]` at `(u[0][i], u[1][j])`).
pub(super) struct Grid {
    pub u: [Vec<f64>; 2],
    pub f: Vec<f64>,
}

impl Grid {
    pub fn get(&self, i: usize, j: usize) -> f64 {
        self.f[i * self.u[1].len() + j]
    }

    /// Lowest objective on the grid.
    pub fn lowest(&self) -> f64 {
        self.f
            .iter()
            .copied()
            .filter(|v| v.is_finite())
            .fold(f64::INFINITY, f64::min)
    }

    /// Whether any edge still holds mass (after [`grow`], an edge it could not grow further).
    pub(super) fn cut(&self) -> bool {
        (0..4).any(|k| self.edge_holds_mass(k / 2, k % 2))
    }

    /// Whether the edge (`axis`, `side`: 0 low, 1 high) has a node within [`EDGE_RISE`] of the
    /// lowest.
    fn edge_holds_mass(&self, axis: usize, side: usize) -> bool {
        let lo = self.lowest();
        let n = [self.u[0].len(), self.u[1].len()];
        let k = if side == 0 { 0 } else { n[axis] - 1 };
        (0..n[1 - axis]).any(|m| {
            let v = if axis == 0 {
                self.get(k, m)
            } else {
                self.get(m, k)
            };
            v - lo < EDGE_RISE
        })
    }
}

/// Distance (in axis units) along each of the four half-axes (axis, side) at which the objective
/// rises by Z^2/2 over `f0`, the four searched side by side; with the points evaluated.
fn half_extents(
    obj: &impl Density,
    mode: &[f64],
    (ax, prior_sd): (&[[f64; 2]; 2], f64),
    f0: f64,
) -> ([[f64; 2]; 2], u64, Known) {
    let reach = |a: usize| REACH_PRIORS * prior_sd / ax[a][0].hypot(ax[a][1]);
    let mut t = [[Z_EDGE; 2]; 2];
    let mut done = [[false; 2]; 2];
    let mut evaluations = 0;
    let mut seen = Known::default();
    for _ in 0..SEARCH_ROUNDS {
        let open: Vec<(usize, usize)> = (0..4)
            .map(|k| (k / 2, k % 2))
            .filter(|&(a, s)| !done[a][s])
            .collect();
        if open.is_empty() {
            break;
        }
        let sign = |s: usize| if s == 0 { -1.0 } else { 1.0 };
        let pts: Vec<[f64; 2]> = open
            .iter()
            .map(|&(a, s)| {
                let mut u = [0.0; 2];
                u[a] = sign(s) * t[a][s];
                at(mode, ax, u)
            })
            .collect();
        let v = obj.values(&pts);
        evaluations += pts.len() as u64;
        seen.add(&pts, &v);
        for (&(a, s), &fv) in open.iter().zip(&v) {
            let rise = fv - f0;
            let next = if !rise.is_finite() {
                0.5 * t[a][s]
            } else if rise <= 0.0 {
                2.0 * t[a][s]
            } else {
                // at or beyond the target rise, by no more than the tolerance: a tail heavier than
                // a normal's must not be cut short
                let ratio = Z_EDGE / (2.0 * rise).sqrt();
                if (1.0 - SEARCH_TOL..=1.0).contains(&ratio) {
                    done[a][s] = true;
                }
                t[a][s]
                    * if ratio > 1.0 {
                        (ratio * 1.05).min(4.0)
                    } else {
                        ratio.max(0.25)
                    }
            };
            if next >= reach(a) && t[a][s] >= reach(a) {
                done[a][s] = true;
            }
            if !done[a][s] {
                t[a][s] = next.min(reach(a));
            }
        }
    }
    (t, evaluations, seen)
}

/// The grid about `mode` (the optimum, where the objective is `f0` and the Hessian is `hessian`)
/// with the prior's standard deviation `prior_sd` as the floor of its width: the grid, its axes
/// and the objective's evaluations.
pub(super) fn explore(
    obj: &impl Density,
    (mode, f0): (&[f64], f64),
    hessian: [[f64; 2]; 2],
    prior_sd: f64,
) -> (Grid, [[f64; 2]; 2], u64) {
    let ax = axes(hessian, prior_sd);
    let (ext, mut evaluations, seen) = half_extents(obj, mode, (&ax, prior_sd), f0);
    let line = |a: usize| -> Vec<f64> {
        let h = HALF_NODES as f64;
        let lo = (1..=HALF_NODES).rev().map(|k| -ext[a][0] * k as f64 / h);
        let hi = (1..=HALF_NODES).map(|k| ext[a][1] * k as f64 / h);
        lo.chain(std::iter::once(0.0)).chain(hi).collect()
    };
    let u = [line(0), line(1)];
    let pts: Vec<[f64; 2]> = u[0]
        .iter()
        .flat_map(|&a| u[1].iter().map(move |&b| [a, b]))
        .collect();
    // every node but the optimum, and but those the search already evaluated (the axis ends)
    let far: Vec<[f64; 2]> = pts
        .iter()
        .filter(|p| p[0] != 0.0 || p[1] != 0.0)
        .map(|p| at(mode, &ax, *p))
        .filter(|x| seen.get(x).is_none())
        .collect();
    let mut v = obj.values(&far).into_iter();
    evaluations += far.len() as u64;
    let f: Vec<f64> = pts
        .iter()
        .map(|p| {
            if p[0] != 0.0 || p[1] != 0.0 {
                let x = at(mode, &ax, *p);
                seen.get(&x).or_else(|| v.next()).unwrap_or(f64::NAN)
            } else {
                f0
            }
        })
        .collect();
    let mut grid = Grid { u, f };
    evaluations += grow(obj, mode, &ax, &mut grid);
    (grid, ax, evaluations)
}

/// Grow the grid's edges that still hold mass, a row at a time (at most [`MAX_GROW`] per edge);
/// returns the evaluations.
fn grow(obj: &impl Density, mode: &[f64], ax: &[[f64; 2]; 2], g: &mut Grid) -> u64 {
    let mut evaluations = 0;
    let mut grown = [[0usize; 2]; 2];
    loop {
        let Some((a, s)) = (0..4)
            .map(|k| (k / 2, k % 2))
            .find(|&(a, s)| grown[a][s] < MAX_GROW && g.edge_holds_mass(a, s))
        else {
            return evaluations;
        };
        grown[a][s] += 1;
        let n = g.u[a].len();
        // past two rows at the grid's spacing the rows double theirs: a flat side is reached in
        // a few rows, where the log density is flat enough to interpolate over wide cells
        let widen = if grown[a][s] > 2 { 2.0 } else { 1.0 };
        let (edge, step) = if s == 0 {
            (g.u[a][0], widen * (g.u[a][1] - g.u[a][0]))
        } else {
            (g.u[a][n - 1], widen * (g.u[a][n - 1] - g.u[a][n - 2]))
        };
        let new = if s == 0 { edge - step } else { edge + step };
        let pts: Vec<[f64; 2]> = g.u[1 - a]
            .iter()
            .map(|&w| {
                let mut p = [0.0; 2];
                p[a] = new;
                p[1 - a] = w;
                at(mode, ax, p)
            })
            .collect();
        let v = obj.values(&pts);
        evaluations += pts.len() as u64;
        let (n0, n1) = (g.u[0].len(), g.u[1].len());
        let old = |i: usize, j: usize| g.f[i * n1 + j];
        let f: Vec<f64> = match (a, s) {
            (0, 0) => v.iter().copied().chain(g.f.iter().copied()).collect(),
            (0, _) => g.f.iter().copied().chain(v.iter().copied()).collect(),
            (_, 0) => (0..n0)
                .flat_map(|i| std::iter::once(v[i]).chain((0..n1).map(move |j| old(i, j))))
                .collect(),
            _ => (0..n0)
                .flat_map(|i| (0..n1).map(move |j| old(i, j)).chain(std::iter::once(v[i])))
                .collect(),
        };
        g.f = f;
        if s == 0 {
            g.u[a].insert(0, new);
        } else {
            g.u[a].push(new);
        }
    }
}
