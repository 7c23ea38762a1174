//! The radial grids the layers are wound on: geometric ([`grid`]), or refined towards the core
//! ([`graded_grid`]), as [`Spacing`] says.

/// How a grid's radii are spaced between the core and the surface.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum Spacing {
    /// `nodes` radii in geometric progression ([`grid`]).
    #[default]
    Geometric,
    /// Refined towards the core ([`graded_grid`]): the steps in ln r start at those of a
    /// geometric grid of `core_nodes` nodes and grow by `growth` per step to those of `nodes`
    /// nodes, which hold beyond. The grid has at least `nodes` nodes and at most `core_nodes`.
    Core { core_nodes: usize, growth: f64 },
}

/// The radial grid: `nodes` radii from `rc` to `big_r` (m) in geometric progression, so that
/// every interval spans the same fraction of its radius. The accretion equation is invariant
/// under scaling of r, so this spreads the discretisation error evenly; near the core, where a
/// uniform grid is coarsest relative to r / g, the nodes are closest.
pub fn grid(rc: f64, big_r: f64, nodes: usize) -> Vec<f64> {
    let last = (nodes - 1) as f64;
    let ratio = (big_r / rc).ln();
    (0..nodes)
        .map(|j| {
            if j + 1 == nodes {
                big_r
            } else {
                rc * (ratio * j as f64 / last).exp()
            }
        })
        .collect()
}

/// A grid from `rc` to `big_r` (m) refined towards the core: steps in ln r start at those of a
/// geometric grid of `core` nodes and grow by `growth` per step while shorter than those of
/// `nodes` nodes; the rest of the way is split into equal steps no longer than that. It has at
/// least `nodes` nodes and at most `core` (`core > nodes >= 2`); with `growth` not above 1 (or
/// `core <= nodes`) it is the geometric grid of `nodes` nodes.
///
/// Why: the lanes' offsets and nip shares are updated once per grid step. Near the core a
/// coarse step is comparable to the build there, so what the update misses is of order one, and
/// the pressures the core carries converge slowly with the steps there (DEVELOPERS.md,
/// "Numerical practice"); grading keeps the core's steps those of the fine grid at a fraction of
/// its nodes.
pub fn graded_grid(rc: f64, big_r: f64, (nodes, core): (usize, usize), growth: f64) -> Vec<f64> {
    if growth.is_nan() || growth <= 1.0 || core <= nodes || nodes < 2 {
        return grid(rc, big_r, nodes.max(2));
    }
    let ln = (big_r / rc).ln();
    let coarse = ln / (nodes - 1) as f64;
    let mut step = ln / (core - 1) as f64;
    let mut at = vec![0.0];
    let mut s = 0.0;
    // the ramp leaves room for at least one step of the coarse length; every ramp step is at
    // least the first, so it has fewer than `core` of them
    while step < coarse && s + step + coarse <= ln && at.len() < core {
        s += step;
        at.push(s);
        step *= growth;
    }
    let rest = ((ln - s) / coarse * (1.0 - 1e-12)).ceil().max(1.0);
    let n = rest as usize;
    at.extend((1..n).map(|j| s + (ln - s) * j as f64 / rest));
    let mut r: Vec<f64> = at.iter().map(|x| rc * x.exp()).collect();
    r.push(big_r);
    r
}

#[cfg(test)]
mod tests {
    use super::*;

    fn steps(r: &[f64]) -> Vec<f64> {
        r.windows(2).map(|w| (w[1] / w[0]).ln()).collect()
    }

    #[test]
    fn the_geometric_grid_has_equal_steps_in_ln_r() {
        let r = grid(0.05, 0.5, 81);
        assert_eq!((r.len(), r[0], r[80]), (81, 0.05, 0.5));
        let want = (10.0_f64).ln() / 80.0;
        for d in steps(&r) {
            approx::assert_relative_eq!(d, want, max_relative = 1e-12);
        }
    }

    #[test]
    fn the_graded_grid_starts_fine_grows_and_ends_on_the_coarse_spacing() {
        let (rc, big_r): (f64, f64) = (0.076, 0.75);
        let ln = (big_r / rc).ln();
        let r = graded_grid(rc, big_r, (81, 401), 1.05);
        assert_eq!((r[0], *r.last().unwrap()), (rc, big_r));
        let d = steps(&r);
        // the core's step is the fine grid's; each step grows by at most the growth factor
        approx::assert_relative_eq!(d[0], ln / 400.0, max_relative = 1e-9);
        for w in d.windows(2) {
            assert!(w[1] / w[0] < 1.05 + 1e-9, "{} -> {}", w[0], w[1]);
        }
        // the outer steps are the coarse grid's, within the rounding of the rest of the way
        let coarse = ln / 80.0;
        let last = *d.last().unwrap();
        assert!(
            (last / coarse - 1.0).abs() < 0.02,
            "{last} against {coarse}"
        );
        // more nodes than the coarse grid, far fewer than the fine one: the ramp from 1/400 to
        // 1/80 of ln(R / rc) by 1.05 takes ln 5 / ln 1.05 = 33 steps over a fifth of ln(R / rc),
        // the rest 64 coarse steps
        assert!((95..=100).contains(&r.len()), "{} nodes", r.len());
    }

    #[test]
    fn a_graded_grid_keeps_its_node_bounds_and_its_steps_under_the_coarse_step() {
        let (rc, big_r): (f64, f64) = (0.0508, 0.508);
        for nodes in (5..130).step_by(3) {
            let coarse = (big_r / rc).ln() / (nodes - 1) as f64;
            for core in [nodes + 1, nodes + 2, nodes + 7, 2 * nodes, 401, 4000] {
                for growth in [1.001, 1.05, 1.5] {
                    let r = graded_grid(rc, big_r, (nodes, core), growth);
                    let d = steps(&r);
                    assert!(d.iter().all(|x| *x > 0.0));
                    assert!(
                        r.len() >= nodes && r.len() <= core,
                        "{nodes} {core}: {}",
                        r.len()
                    );
                    let most = d.iter().fold(0.0_f64, |m, x| m.max(*x));
                    assert!(most <= coarse * (1.0 + 1e-9), "{nodes} {core} {growth}");
                }
            }
        }
        // growth not above 1, and a core grid no finer: the geometric grid
        for growth in [1.0, 0.5, 0.0, f64::NAN] {
            assert_eq!(
                graded_grid(rc, big_r, (81, 401), growth),
                grid(rc, big_r, 81)
            );
        }
        assert_eq!(graded_grid(rc, big_r, (81, 81), 1.05), grid(rc, big_r, 81));
    }

    #[test]
    fn a_graded_grid_on_a_thin_build_still_reaches_the_surface() {
        for (nodes, core) in [(5, 401), (3, 9), (81, 82)] {
            let r = graded_grid(0.05, 0.051, (nodes, core), 1.5);
            assert!(r.windows(2).all(|w| w[1] > w[0]), "{r:?}");
            assert_eq!((r[0], *r.last().unwrap()), (0.05, 0.051));
            assert!(r.len() >= nodes && r.len() <= core, "{} nodes", r.len());
        }
    }
}
