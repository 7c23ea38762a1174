//! The compressed caliper of a roll: the mean layer thickness, compressed by the wound-in
//! pressure, at which the lanes' compressed build fills the stated diameter. A secant on its
//! logarithm, each miss one accretion of every lane on a coarse grid, or on the wanted grid where
//! that has no more nodes ([`super::roll`]).

use super::grid::Spacing;
use super::roll::{accrete, Accreted, Build, Options, WindError, WindInput};
use crate::lanes::Lanes;

/// The stated diameter is the as-wound one: the compressed mean caliper c_eff (m) for which the
/// compressed build of the mean lane fills the roll. Secant iteration on ln c_eff for the zero of
/// ln((built - rc) / (R - rc)), on a coarse grid of [`COARSE_NODES`] nodes (the build is a
/// smooth integral of the strain; its discretisation error there is far below the 1 % of the
/// stresses), to [`CALIPER_TOL`].
///
/// Where the wanted grid's `nodes` are no more than the coarse grid's, the secant runs on the
/// wanted grid itself (graded or not), and the answer's accretion is the wound state, handed
/// back so that it is not wound a second time. The iteration starts from
/// `start` (its caliper and slope), else from the mean caliper with slope -1. Where the miss is
/// rough (a step no longer halves the smallest miss so far, [`STALL`]), the answer is the best
/// iterate.
pub(super) fn compressed_caliper(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    start: Option<Secant>,
) -> Result<(Secant, Option<Accreted>), WindError> {
    // the wanted grid where it is no finer than the coarse one, else the coarse geometric grid
    let coarse = if opt.nodes <= COARSE_NODES {
        opt
    } else {
        Options {
            nodes: COARSE_NODES,
            spacing: Spacing::Geometric,
            ..opt
        }
    };
    // the miss at ln c_eff = x, and the accretion when it is the wound state itself
    let miss = |x: f64| build_miss(input, lanes, opt, coarse, x);
    // a step that lands where the layers are compressed to nothing is halved back towards the
    // best iterate (a secant from a like roll's slope can overshoot); the start itself is not
    let miss_back = |x: f64, best: f64| -> Result<(f64, f64, Option<Accreted>), WindError> {
        let mut x = x;
        for _ in 0..BACK_STEPS {
            match miss(x) {
                Err(WindError::Stack { .. }) => x = 0.5 * (x + best),
                other => return other.map(|(h, acc)| (x, h, acc)),
            }
        }
        miss(x).map(|(h, acc)| (x, h, acc))
    };
    // a miss's slope against ln c_eff is about -1 (the build scales with caliper / c_eff)
    let (mut x0, mut slope) = match start {
        Some(s) if s.slope.is_finite() && s.slope < -0.1 => (s.caliper_m.ln(), s.slope),
        Some(s) => (s.caliper_m.ln(), -1.0),
        None => (lanes.mean_caliper_m.ln(), -1.0),
    };
    let (mut h0, acc) = miss(x0)?;
    // the iterate with the smallest miss so far: (|miss|, x, its accretion)
    let mut best = (h0.abs(), x0, acc);
    let mut x1 = x0 - h0 / slope;
    for evals in 1..=12 {
        if h0.abs() < CALIPER_TOL {
            x1 = x0;
            break;
        }
        let (x, h1, acc) = miss_back(x1, best.1)?;
        x1 = x;
        let stalled = evals >= 2 && h1.abs() > STALL * best.0;
        if h1.abs() < best.0 {
            best = (h1.abs(), x1, acc);
        }
        if h1.abs() < CALIPER_TOL || h1 == h0 {
            break;
        }
        if stalled {
            // the miss is rough below this level (the nip's contact share chatters between
            // the steps of a coarse grid): the best iterate is as good as any further one
            x1 = best.1;
            break;
        }
        let x2 = x1 - h1 * (x1 - x0) / (h1 - h0);
        slope = (h1 - h0) / (x1 - x0);
        (x0, h0, x1) = (x1, h1, x2);
    }
    let kept = best.2.filter(|_| best.1.to_bits() == x1.to_bits());
    let found = Secant {
        caliper_m: x1.exp(),
        slope,
    };
    Ok((found, kept))
}

/// The secant's miss at ln c_eff = `x`: ln((built - rc) / (R - rc)) of the lanes accreted on
/// `coarse` nodes, and the accretion when it is the wound state itself (`coarse` is the wanted
/// grid). A build at or inside the core (layers compressed to nothing) is `WindError::Stack`; a
/// build that is not a number, a failed solve naming the lane.
fn build_miss(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    coarse: Options,
    x: f64,
) -> Result<(f64, Option<Accreted>), WindError> {
    let b = Build::of(input, lanes);
    let c_eff = x.exp();
    let acc = accrete(input, lanes, coarse, c_eff)?;
    let radius =
        |(s, c): (&super::hakiel::LaneState, &f64)| s.outer_radius(&b.model, 1.0 / c_eff, *c);
    let built = (acc.states.iter().zip(&b.cal))
        .map(radius)
        .zip(&b.widths)
        .map(|(r, w)| w * r)
        .sum::<f64>()
        / b.width;
    if !built.is_finite() {
        return Err(WindError::Solve {
            lane: (acc.states.iter().zip(&b.cal))
                .position(|sc| !radius(sc).is_finite())
                .unwrap_or(0),
            step: acc.grid_nodes - 1,
            nodes: acc.grid_nodes,
        });
    }
    if built <= b.rc {
        // the build is not above the core: the layers are compressed to nothing
        return Err(WindError::Stack { caliper_m: c_eff });
    }
    let h = ((built - b.rc) / (b.big_r - b.rc)).ln();
    Ok((h, (coarse == opt).then_some(acc)))
}

/// Where the secant for the compressed caliper ended (or is to start): the compressed caliper
/// (m) and the slope of its miss, d ln((built - rc) / (R - rc)) / d ln c_eff (about -1).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Secant {
    pub caliper_m: f64,
    pub slope: f64,
}

impl Secant {
    /// A start for a like roll of mean caliper `to_m` (m): this secant's end, the compressed
    /// caliper scaled from the mean caliper `from_m` (m) it was found for; `None` where there is
    /// no end to start from (a secant never run).
    pub fn scaled(&self, from_m: f64, to_m: f64) -> Option<Secant> {
        (self.caliper_m > 0.0).then(|| Secant {
            caliper_m: self.caliper_m * to_m / from_m.max(1e-12),
            slope: self.slope,
        })
    }
}

/// Nodes of the grid on which the compressed caliper is found.
const COARSE_NODES: usize = 121;
/// Tolerance on ln((built - rc) / (R - rc)) for the compressed caliper: 4 um of radius on a
/// 0.4 m build, some 25 times below a diameter tape's resolution and 15 times below the coarse
/// grid's own error in the build (about 1.5e-4, the difference of 61- and 121-node grids over
/// three). It ends most secants of a like roll after its second miss.
const CALIPER_TOL: f64 = 1e-5;
/// Halvings back towards the best iterate of a secant step that overshoots into a build of no
/// thickness, before the roll is refused.
const BACK_STEPS: usize = 30;
/// A secant step that does not at least halve the smallest miss so far (after the first two)
/// ends the iteration at the best iterate: the miss is rough at that level.
const STALL: f64 = 0.5;
