//! The whole roll: all lanes wound together, coupled through the shared web and winder.
//!
//! Lane coupling (finite-width winding, after the idea of Cole and Hakiel 1992 and Lee and Wickert
//! 2002, from memory): every lane shares one rotation, so a lane whose compressed build is larger
//! by dR than the width-weighted mean is stretched by about dR/R more than the mean lane. Those
//! offsets are levelled across the width over a shear-lag length, and the nip load is shared by
//! contact (both in [`super::coupling`]). The web strain in lane i is eps_0 + e_i with e_i the
//! levelled offset; lane tension is E_MD c_i times that strain, zero where it would go negative (a
//! slack lane), and eps_0 is found so the lane tensions add up to the winder's web tension. Each
//! lane then adds its own pressure, compresses its own stack (Pfeiffer law), and so feeds back on
//! its radius: a thick lane takes more tension and more nip, compresses more and partly closes its
//! own excess, which is why caliper differences do not stack proportionally. `levelling` (default
//! 0.5, an assumption) is a further uniform levelling on top of the shear lag (1 = uniform
//! tension, the ablation): the shear-lag length of a paper web is about a centimetre, so it sets
//! how lane width matters, while published 2-D studies find CD differences partly levelled inside
//! the roll over wider bands too.
//!
//! A tension profile measured at winding adds each lane's own strain excess
//! ([`crate::lanes::Lane::web_strain`]) to its offset, unlevelled: with equal radii the lanes carry
//! the measured profile's shape, and a lane measured slack winds slack.

use super::centrifugal::{lift_off_speed, winder_stress};
use super::coupling;
use super::grid::{graded_grid, grid, Spacing};
use super::hakiel::{LaneModel, LaneState};
use super::secant::compressed_caliper;
pub use super::secant::Secant;
use super::summary::summarise;
pub use super::summary::SURFACE_ZONE_M;
pub use super::wound::{LaneStress, LaneSummary, Wound};
use crate::case::{Material, Roll, Winding};
use crate::lanes::Lanes;

/// What winding uses of a case: the web, the roll being built and the winder's settings.
#[derive(Debug, Clone, Copy)]
pub struct WindInput<'a> {
    pub material: &'a Material,
    pub roll: &'a Roll,
    pub winding: &'a Winding,
}

impl<'a> WindInput<'a> {
    /// Winding inputs from their parts.
    pub fn new(material: &'a Material, roll: &'a Roll, winding: &'a Winding) -> Self {
        WindInput {
            material,
            roll,
            winding,
        }
    }
}

/// Discretisation and coupling options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Options {
    /// Number of grid nodes (layer groups) per lane on a geometric grid, or the grid whose
    /// spacing a graded grid grows to ([`Spacing`]); the wound state adds the refined zone's
    /// sub-nodes under the surface ([`Wound::radius_m`]).
    pub nodes: usize,
    /// Uniform CD levelling fraction on top of the shear-lag levelling, 0..1 (0: shear lag only;
    /// 1: equal lane tensions).
    pub levelling: f64,
    /// How the grid's radii are spaced.
    pub spacing: Spacing,
}

impl Options {
    /// The default options on a geometric grid of `nodes` nodes.
    pub fn with_nodes(nodes: usize) -> Self {
        Options {
            nodes,
            ..Options::default()
        }
    }

    /// The grid's radii from the core radius `rc` to the roll's `big_r` (m).
    pub fn grid(&self, rc: f64, big_r: f64) -> Vec<f64> {
        match self.spacing {
            Spacing::Core { core_nodes, growth } => {
                graded_grid(rc, big_r, (self.nodes, core_nodes), growth)
            }
            Spacing::Geometric => grid(rc, big_r, self.nodes),
        }
    }
}

impl Default for Options {
    fn default() -> Self {
        Options {
            nodes: DEFAULT_NODES,
            levelling: DEFAULT_LEVELLING,
            spacing: Spacing::Geometric,
        }
    }
}

/// Radial nodes per lane for every command (`stress`, `fit`, `diagnose`, `triage`): within 1 %
/// of the converged radial stress at every radius on the soft Pfeiffer study roll and on each
/// field case (measured 0.30 % on the soft roll, at most 0.72 % on the field cases; see
/// DEVELOPERS.md, "Numerical practice").
pub const DEFAULT_NODES: usize = 401;

/// Default uniform CD levelling on top of the shear-lag levelling: an assumption between the
/// published bounds (independent lanes overstate differences; a fully levelled roll hides them).
/// The shear lag of a paper web is about a centimetre ([`super::coupling`]), so it decides how
/// narrow lanes level against wide bands, and this fraction the levelling of both.
pub const DEFAULT_LEVELLING: f64 = 0.5;

/// Most nodes of the geometric grid whose spacing a graded grid starts from at the core
/// ([`Spacing::Core`]): 64 times the default resolution.
pub const MAX_CORE_NODES: usize = 64 * DEFAULT_NODES;

/// The winding model failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum WindError {
    /// A linear solve failed.
    #[error("winding solve failed in lane {lane} at node {step} of {nodes}; the stack law or core stiffness may be unphysical (check material.stack and roll.core)")]
    Solve {
        lane: usize,
        step: usize,
        nodes: usize,
    },
    /// Bad options.
    #[error("{0}")]
    Options(String),
    /// No shared web strain carries the winder's tension (the bracket search hit its bound).
    #[error("no web strain up to {limit} carries the wound-in tension of {tension_n_per_m:.4e} N/m; the tension is far above what the web can carry (check winding.tension, its unit, and material.md_modulus)")]
    Tension {
        /// Tension to be carried, N/m.
        tension_n_per_m: f64,
        /// Largest strain tried (dimensionless).
        limit: f64,
    },
    /// The stack law squeezes the wound layers to nothing: no compressed caliper fills the roll.
    #[error("the stack law compresses the wound layers by 100 % or more at the pressures this winding builds (the roll's build has no thickness left at a compressed caliper of {caliper_m:.3e} m); the stack is far too soft for the tension: check material.stack (paper's Pfeiffer K2 is typically 20 to 100; Pfeiffer 1981, from memory) or material.radial_modulus, and winding.tension")]
    Stack {
        /// Compressed caliper at which the build failed, m.
        caliper_m: f64,
    },
}

/// Largest shared web strain the bracket search tries before it gives up (dimensionless).
const MAX_SHARED_STRAIN: f64 = 1.0e3;

/// Find eps_0 so that sum w_i max(0, k_i (eps_0 + s_i)) = total (bisection; monotone).
/// The bracket grows from the slackest possible strain by doubling steps, at most up to
/// `MAX_SHARED_STRAIN` above it; past that, or on non-finite input, a typed error.
fn shared_strain(k: &[f64], s: &[f64], w: &[f64], total: f64) -> Result<f64, WindError> {
    let f = |e: f64| -> f64 {
        k.iter()
            .zip(s)
            .zip(w)
            .map(|((k, s), w)| w * k * (e + s).max(0.0))
            .sum::<f64>()
            - total
    };
    let smax = s.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let too_much = || WindError::Tension {
        tension_n_per_m: total / w.iter().sum::<f64>(),
        limit: MAX_SHARED_STRAIN,
    };
    if !smax.is_finite() || !total.is_finite() {
        return Err(too_much());
    }
    let mut lo = -smax;
    let mut step = 1.0;
    // at most log2(MAX_SHARED_STRAIN) = 10 doublings
    while f(lo + step) < 0.0 {
        if step >= MAX_SHARED_STRAIN {
            return Err(too_much());
        }
        step *= 2.0;
    }
    let mut hi = lo + step;
    for _ in 0..100 {
        let mid = 0.5 * (lo + hi);
        if f(mid) < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo < 1e-15 {
            break;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Lane model of a input.
pub fn lane_model(input: &WindInput) -> LaneModel {
    LaneModel {
        e_t: input.material.md_modulus_pa,
        stack: input.material.stack,
        poisson: input.material.poisson,
        core_stiffness: super::core::of(&input.roll.core, 0.5 * input.roll.core_diameter_m),
    }
}

/// What a roll's build is measured against: the lane model, core and roll radii (m), the lanes'
/// widths (m) and their sum, and the lanes' calipers (m).
pub(super) struct Build {
    pub model: LaneModel,
    pub rc: f64,
    pub big_r: f64,
    pub widths: Vec<f64>,
    pub width: f64,
    pub cal: Vec<f64>,
}

impl Build {
    pub(super) fn of(input: &WindInput, lanes: &Lanes) -> Self {
        let widths = lanes.widths();
        Build {
            model: lane_model(input),
            rc: 0.5 * input.roll.core_diameter_m,
            big_r: 0.5 * input.roll.diameter_m,
            width: widths.iter().sum(),
            widths,
            cal: lanes.calipers(),
        }
    }
}

/// Lanes accreted together: their states, the layers per node, and each lane's nip load (N/m)
/// and outer radius (m) at the last contact update.
pub(super) struct Accreted {
    pub states: Vec<LaneState>,
    /// Nodes of the grid wound on.
    pub grid_nodes: usize,
    pub per_node: f64,
    pub nip_n_per_m: Vec<f64>,
    pub radii_m: Vec<f64>,
}

/// How the lanes share the winder's loads at one update of their radii ([`super::coupling`]):
/// each lane's levelled strain offset, from the lanes' radii where the layers are wound (`mid`,
/// m), and its share of the nip line load (N/m), from their radii at the update (`radii`, m).
fn couple(
    input: &WindInput,
    lanes: &Lanes,
    (radii, mid): (&[f64], &[f64]),
    levelling: f64,
) -> (Vec<f64>, Vec<f64>) {
    let mat = input.material;
    let nip = input.winding.nip_n_per_m;
    let widths = lanes.widths();
    let width: f64 = widths.iter().sum();
    let rbar = mid.iter().zip(&widths).map(|(r, w)| r * w).sum::<f64>() / width;
    let raw: Vec<f64> = mid.iter().map(|r| (r - rbar) / rbar).collect();
    let t = input.winding.tension.at(2.0 * rbar);
    let lag = coupling::shear_lag_length(mat, lanes.mean_caliper_m, t, rbar, nip);
    let offs = coupling::levelled_offsets(&raw, &widths, lag, levelling);
    let k_nip = coupling::nip_stiffness(mat, nip);
    (offs, coupling::nip_shares(nip, radii, &widths, k_nip))
}

/// How much the lanes' builds grow from a build reaching `start` to one reaching `mid` (m) on a
/// core of radius `rc` (m): in proportion to the nominal build, 1 with nothing wound yet. The
/// offsets take the lanes' radii to the middle of the step, where its layers are wound: from the
/// step's start they lag half a step, which near the core is of the order of the build itself
/// (the core's response to a lane pattern converged at first order only; DEVELOPERS.md,
/// "Numerical practice").
fn build_growth(rc: f64, start: f64, mid: f64) -> f64 {
    if start > rc {
        ((mid - rc) / (start - rc)).min(MAX_BUILD_GROWTH)
    } else {
        1.0
    }
}

/// Most that [`build_growth`] takes the lanes' builds on: from a step's start to its middle the
/// build may at most double (it grows by about 1.5 at the second step of a geometric or graded
/// grid; a grid whose steps jump more would have the offsets extrapolated far beyond what was
/// wound).
const MAX_BUILD_GROWTH: f64 = 2.0;

/// Each lane's outer radius (m) now (`radii`) and with its build grown by `grow` (`mid`; the
/// core's displacement stays), for lanes of calipers `cal` (m) wound at compressed caliper
/// `c_eff` (m).
fn lane_radii(
    states: &[LaneState],
    (model, c_eff, cal): (&LaneModel, f64, &[f64]),
    grow: f64,
    (radii, mid): (&mut [f64], &mut [f64]),
) {
    for (i, st) in states.iter().enumerate() {
        radii[i] = st.outer_radius(model, 1.0 / c_eff, cal[i]);
        let core = st.outer_radius(model, 1.0 / c_eff, 0.0);
        mid[i] = core + (radii[i] - core) * grow;
    }
}

/// Accrete all lanes on the grid `opt` gives. A grid step's sub-steps are the same for every
/// lane: they are planned once per step ([`LaneState::plan`]).
pub(super) fn accrete(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    c_eff: f64,
) -> Result<Accreted, WindError> {
    let mat = &input.material;
    let model = lane_model(input);
    let rc = 0.5 * input.roll.core_diameter_m;
    let big_r = 0.5 * input.roll.diameter_m;
    let (grid, levelling) = (opt.grid(rc, big_r), opt.levelling);
    let nodes = grid.len();
    let per_node = (big_r - rc) / (nodes as f64 - 1.0) / c_eff;
    let n = lanes.lanes.len();
    let widths = lanes.widths();
    let cal = lanes.calipers();
    let width: f64 = widths.iter().sum();
    let stiff: Vec<f64> = cal.iter().map(|c| mat.md_modulus_pa * c).collect();
    let mut states: Vec<LaneState> = (0..n)
        .map(|_| LaneState::new(grid.clone(), &model))
        .collect();
    let v = input.winding.speed_m_s;
    let mut radii = vec![rc; n];
    let mut mid = vec![rc; n];
    // the web's own lane strains (a tension profile at winding) come in unlevelled: they are the
    // tensions the lanes carried in the free span
    let web: Vec<f64> = lanes.lanes.iter().map(|l| l.web_strain).collect();
    let mut offs = web.clone();
    let mut nip_q = vec![input.winding.nip_n_per_m.max(0.0); n];
    let mut last_wit = vec![0.0; n];
    // The lanes' radii and shares are updated at every grid step, however fine the grid (a
    // fixed number of updates would leave a lag that refining the grid does not remove).
    for (k, &rk) in grid.iter().enumerate() {
        // the grid radius half way through the step, where its layers are wound (the end of
        // the step lagged the winder's taper and the air film by half a step: first order)
        let r_step = if k > 0 { 0.5 * (grid[k - 1] + rk) } else { rk };
        if k > 0 {
            let grow = build_growth(rc, grid[k - 1], r_step);
            lane_radii(&states, (&model, c_eff, &cal), grow, (&mut radii, &mut mid));
            let (o, q) = couple(input, lanes, (&radii, &mid), levelling);
            coupling::follow_nip(&mut nip_q, &q, rk - grid[k - 1]);
            for i in 0..n {
                offs[i] = web[i] + o[i];
            }
        }
        let rbar = radii.iter().zip(&widths).map(|(r, w)| r * w).sum::<f64>() / width;
        let t_web = input.winding.tension.at(2.0 * rbar.max(r_step));
        let e0 = shared_strain(&stiff, &offs, &widths, t_web * width)?;
        // hoop strain lost as entrained air bleeds out (see `air`)
        let air = super::air::strain_loss(mat, input.winding, rbar.max(r_step), t_web);
        let plan = states.first().map(|st| st.plan(&model, k));
        let plan = plan.unwrap_or_default();
        for (i, st) in states.iter_mut().enumerate() {
            let tens = stiff[i] * (e0 + offs[i]).max(0.0);
            let wit = coupling::effective_wit(mat, tens, nip_q[i], t_web, cal[i], v, air);
            // hoop stress on the grid: force over the compressed layer thickness, so that each
            // step adds pressure p r = sigma_w h (radial equilibrium holds exactly)
            let sigma_w = wit / c_eff;
            last_wit[i] = wit;
            st.add_planned(&model, &plan, sigma_w, wit)
                .map_err(|f| WindError::Solve {
                    lane: i,
                    step: f.step,
                    nodes,
                })?;
        }
    }
    for (i, st) in states.iter_mut().enumerate() {
        st.finish(last_wit[i] / c_eff);
    }
    Ok(Accreted {
        states,
        grid_nodes: nodes,
        per_node,
        nip_n_per_m: nip_q,
        radii_m: radii,
    })
}

/// Wind every lane of the roll.
///
/// Each lane's wound-in tension is its share of the web tension plus the nip-induced part
/// (friction x nip load, Good, Wu and Fikes 1994) less rho c v^2 (a layer spinning at surface
/// speed v needs that hoop force to hold itself, so it does not press on the roll). Tangential
/// stresses are per unit of compressed layer thickness on the shared grid, so that every layer adds
/// interlayer pressure p = sigma_w h / r and radial equilibrium r sigma_r = -integral sigma_t
/// holds.
///
/// Each grid interval is solved exactly for its mean radial modulus and each step's layers are
/// integrated over their own interval (see [`super::hakiel`]), so the result converges at second
/// order in the node spacing without the layer's inward decay having to be resolved.
pub fn wind(input: &WindInput, lanes: &Lanes, opt: Options) -> Result<Wound, WindError> {
    wind_from(input, lanes, opt, None).map(|(w, _)| w)
}

/// [`wind`] with the secant for the compressed caliper started at `start` (`None`: the mean
/// caliper, slope -1), e.g. from a like roll already wound; also returns where the secant
/// ended. The start changes the result only within the secant's tolerance, and the time taken.
pub fn wind_from(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    start: Option<Secant>,
) -> Result<(Wound, Secant), WindError> {
    wind_caliper(input, lanes, opt, Caliper::Fill(start))
}

/// How a winding sets its compressed caliper (the mean compressed layer thickness).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Caliper {
    /// Found by the secant so that the build fills the stated diameter, started where given
    /// ([`wind_from`]).
    Fill(Option<Secant>),
    /// Given: a like roll's caliper (e.g. scaled by the mean calipers, which fills the stated
    /// diameter to first order); the layer count is (R - rc) / caliper and the build ends
    /// where the lanes put it. One accretion instead of the secant's two or more. A build more
    /// than 5 % of the wound depth from the stated diameter is refused.
    Given(Secant),
}

/// [`wind_from`] with the compressed caliper set as `caliper` says; returns the wound state and
/// the caliper used (with the secant's slope).
pub fn wind_caliper(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    caliper: Caliper,
) -> Result<(Wound, Secant), WindError> {
    if opt.nodes < 5 {
        return Err(WindError::Options("nodes must be at least 5".into()));
    }
    if !(0.0..=1.0).contains(&opt.levelling) {
        return Err(WindError::Options("levelling must be within 0..1".into()));
    }
    if let Spacing::Core { growth, core_nodes } = opt.spacing {
        if !(growth > 1.0 && growth.is_finite()) || core_nodes > MAX_CORE_NODES {
            return Err(WindError::Options(format!(
                "a graded grid needs a growth per step above 1 and finite (not {growth}) and at \
                 most {MAX_CORE_NODES} core nodes (not {core_nodes})"
            )));
        }
    }
    if let Some(one) = super::uniform::one_lane(lanes) {
        let (w, found) = wind_caliper(input, &one, opt, caliper)?;
        return Ok((super::uniform::on_every_lane(w, input, lanes), found));
    }
    let (found, kept) = match caliper {
        Caliper::Fill(start) => compressed_caliper(input, lanes, opt, start)?,
        Caliper::Given(s) if s.caliper_m > 0.0 && s.caliper_m.is_finite() => (s, None),
        Caliper::Given(s) => {
            return Err(WindError::Options(format!(
                "a given compressed caliper must be positive and finite, not {} m",
                s.caliper_m
            )))
        }
    };
    let wound = wound_at(input, lanes, opt, found, kept)?;
    if let Caliper::Given(_) = caliper {
        given_build_check(input, lanes, &wound)?;
    }
    Ok((wound, found))
}

/// A given caliper is a like roll's: a build that ends more than [`GIVEN_BUILD_MISS`] of the
/// wound depth from the stated diameter is not a like roll, and is refused.
fn given_build_check(input: &WindInput, lanes: &Lanes, wound: &Wound) -> Result<(), WindError> {
    let (rc, big_r) = (
        0.5 * input.roll.core_diameter_m,
        0.5 * input.roll.diameter_m,
    );
    let built = mean_outer_radius(lanes, &wound.lanes);
    let miss = (built - big_r) / (big_r - rc);
    if miss.abs() <= GIVEN_BUILD_MISS {
        return Ok(());
    }
    Err(WindError::Options(format!(
        "a given compressed caliper of {:.4e} m builds to a radius of {built:.4} m where the \
         stated diameter gives {big_r:.4} m ({:+.1} % of the wound depth): it is not a like \
         roll's; find the caliper by filling the diameter instead",
        wound.layer_thickness_m,
        100.0 * miss
    )))
}

/// Largest miss of a given caliper's build from the stated diameter, as a share of the wound
/// depth (R - rc): a noise roll misses by well under 1 %.
const GIVEN_BUILD_MISS: f64 = 0.05;

/// The wound state of every lane at compressed caliper `found` (its accretion on the wanted grid
/// when already done, `kept`), with the lanes' summaries and the roll's.
fn wound_at(
    input: &WindInput,
    lanes: &Lanes,
    opt: Options,
    found: Secant,
    kept: Option<Accreted>,
) -> Result<Wound, WindError> {
    let mat = &input.material;
    let Build {
        model,
        rc,
        big_r,
        cal,
        ..
    } = Build::of(input, lanes);
    let c_eff = found.caliper_m;
    let layers = (big_r - rc) / c_eff;
    let Accreted {
        states,
        grid_nodes,
        per_node,
        nip_n_per_m,
        radii_m,
    } = kept.map_or_else(|| accrete(input, lanes, opt, c_eff), Ok)?;
    // every lane has the same output radii: the refinement, the sub-steps' plan and the
    // coarsening depend on the shared model and grid only
    let grid = states.first().map(|s| s.r.clone()).unwrap_or_default();
    debug_assert!(states.iter().all(|s| s.r == grid));
    let rho = mat.density_kg_m3;
    let v = input.winding.speed_m_s;
    let omega = if big_r > 0.0 { v / big_r } else { 0.0 };
    let out: Vec<LaneStress> = states
        .into_iter()
        .enumerate()
        .map(|(i, st)| {
            let s = summarise(&st, &model, c_eff, cal[i], rho, omega, mat.poisson);
            LaneStress {
                position_m: lanes.lanes[i].position_m,
                caliper_m: cal[i],
                radial_stress_pa: st.sr,
                tangential_stress_pa: st.st,
                wound_in_tension_n_per_m: st.wit,
                nip_load_n_per_m: nip_n_per_m[i],
                nip_contact_radius_m: radii_m[i],
                summary: s,
            }
        })
        .collect();
    // a stack strain of 100 % or more at a lane's peak pressure leaves layers of no thickness
    let crushed = |l: &LaneStress| mat.stack.strain(l.summary.peak_pressure_pa) >= 1.0;
    if out.iter().any(crushed) {
        return Err(WindError::Stack { caliper_m: c_eff });
    }
    let shear_lag_m = final_shear_lag(input, lanes, &out);
    let wound = Wound {
        radius_m: grid,
        lanes: out,
        layers,
        layers_per_node: per_node,
        grid_nodes,
        stack_compression: 1.0 - c_eff / lanes.mean_caliper_m,
        layer_thickness_m: c_eff,
        lift_off_speed_m_s: lift_off_speed(winder_stress(input, lanes.mean_caliper_m), rho),
        levelling: opt.levelling,
        shear_lag_m,
        core_stiffness_pa: model.core_stiffness,
        secant: found,
    };
    Ok(wound)
}

/// The lanes' width-weighted mean outer radius at the end of the build, m.
fn mean_outer_radius(lanes: &Lanes, out: &[LaneStress]) -> f64 {
    let widths = lanes.widths();
    let width: f64 = widths.iter().sum();
    out.iter()
        .zip(&widths)
        .map(|(l, w)| l.summary.outer_radius_m * w)
        .sum::<f64>()
        / width
}

/// Shear-lag length of CD levelling at the end of the build, m ([`coupling::shear_lag_length`]
/// at the lanes' width-weighted mean outer radius).
pub(super) fn final_shear_lag(input: &WindInput, lanes: &Lanes, out: &[LaneStress]) -> f64 {
    let r = mean_outer_radius(lanes, out);
    let t = input.winding.tension.at(2.0 * r);
    let nip = input.winding.nip_n_per_m;
    coupling::shear_lag_length(input.material, lanes.mean_caliper_m, t, r, nip)
}
