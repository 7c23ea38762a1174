//! Winding model: core, rotation, nip, convergence, lanes, and facts of the trade.

use approx::assert_relative_eq;
use rollsleuth::case::{self, Case, Stack};
use rollsleuth::interp::linear_extrap;
use rollsleuth::lanes;
use rollsleuth::winding::hakiel::{LaneModel, LaneState};
use rollsleuth::winding::{core_stiffness, disk_stress, wind, wind_from, Options, WindInput};

fn demo(sets: &[&str]) -> Case {
    let s: Vec<String> = sets.iter().map(|s| s.to_string()).collect();
    case::load_demo(&s).unwrap()
}

/// Uniform demo roll: caliper profile flattened, no hardness/diameter-driven inference.
fn uniform(extra: &[&str]) -> Case {
    let mut sets = vec!["lanes.count=8"];
    sets.extend_from_slice(extra);
    let mut c = demo(&sets);
    c.profiles.clear();
    c
}

/// Lame thick cylinder under external pressure P with a free bore, plane stress (Timoshenko and
/// Goodier, Theory of Elasticity, 3rd ed. 1970, the thick-walled cylinder, from memory): the outer
/// surface moves u(b) = -(P b / E) ((1 - nu) b^2 + (1 + nu) a^2) / (b^2 - a^2), so the stiffness
/// the wound roll sees is E_c = -P b / u(b). Written out here independently of the model.
fn lame_core_stiffness(e: f64, nu: f64, a: f64, b: f64) -> f64 {
    let (p, a2, b2) = (1.0, a * a, b * b);
    let u_b = -(p * b / e) * ((1.0 - nu) * b2 + (1.0 + nu) * a2) / (b2 - a2);
    -p * b / u_b
}

/// Altmann (1968, TAPPI 51(4):176-179, from memory) closed form for a constant radial modulus:
/// core radial stress sigma_r(r_c) = -(phi(r_c)/r_c) integral_{r_c}^R T_w / phi ds,
/// phi(x) = x^g + C r_c^(2g) x^(-g), C = (g - 1 - kappa)/(g + 1 + kappa), by Simpson quadrature
/// (the same form as tests/winding_altmann.rs).
fn altmann_core_stress(rc: f64, big_r: f64, tw: f64, g: f64, kappa: f64) -> f64 {
    let c = (g - 1.0 - kappa) / (g + 1.0 + kappa);
    let phi = |x: f64| x.powf(g) + c * rc.powf(2.0 * g) * x.powf(-g);
    let n = 20000;
    let h = (big_r - rc) / n as f64;
    let s: f64 = (0..=n)
        .map(|i| {
            let w = match i {
                0 => 1.0,
                _ if i == n => 1.0,
                _ if i % 2 == 1 => 4.0,
                _ => 2.0,
            };
            w * tw / phi(rc + i as f64 * h)
        })
        .sum();
    -(phi(rc) / rc) * s * h / 3.0
}

/// Steel tube E = 207 GPa, nu = 0.3 (handbook values, from memory), a = 38.1 mm, b = 50.8 mm:
/// the library's core stiffness equals the Lame relation above (63.28 GPa with these numbers).
#[test]
fn core_stiffness_matches_thick_cylinder_relation() {
    let lame = lame_core_stiffness(207e9, 0.3, 0.0381, 0.0508);
    assert_relative_eq!(
        core_stiffness(207e9, 0.3, 0.0381, 0.0508),
        lame,
        max_relative = 1e-12
    );
    assert_relative_eq!(lame / 1e9, 63.28, max_relative = 2e-4);
    // thin-wall limit: E_c -> E t / b for t << b (membrane ring)
    let (b, t) = (0.05, 0.0005);
    assert_relative_eq!(
        core_stiffness(3e9, 0.3, b - t, b),
        3e9 * t / b,
        max_relative = 0.02
    );
}

/// With a compliant core the first wound layer meets the core condition r s' = kappa s,
/// kappa = E_t/E_c - 1 + nu, which follows from u(r_c) = -P r_c / E_c with E_c the Lame
/// stiffness of the core tube (Timoshenko and Goodier 1970). Summed over the winding it reads
/// sigma_t(r_c) = T_w + (E_t/E_c + nu) sigma_r(r_c). Checked for two real cores (the steel tube
/// above, and a paper core of E = 3 GPa, nu = 0.3, 13 mm wall on a 102 mm diameter, of the order
/// of common paper cores, from memory): the model's core state meets the condition, its core
/// pressure matches Altmann's (1968) closed form within 1 %, and a softer core carries less
/// pressure.
#[test]
fn core_pressure_follows_thick_cylinder_compliance() {
    let (big_r, tw, e_t, e_r, nu) = (0.5, 5e6, 5e9, 50e6, 0.01);
    let run = |rc: f64, ec: Option<f64>| {
        let m = LaneModel {
            e_t,
            stack: Stack::Constant {
                radial_modulus_pa: e_r,
            },
            poisson: nu,
            core_stiffness: ec,
        };
        let n = 1501;
        let h = (big_r - rc) / (n as f64 - 1.0);
        let grid: Vec<f64> = (0..n).map(|j| rc + j as f64 * h).collect();
        let mut st = LaneState::new(grid.clone(), &m);
        for _ in &grid {
            st.add(&m, tw, 0.0).unwrap();
        }
        st.finish(tw);
        (st.sr[0], st.st[0])
    };
    let steel = (0.0508, lame_core_stiffness(207e9, 0.3, 0.0381, 0.0508));
    let paper = (0.051, lame_core_stiffness(3e9, 0.3, 0.051 - 0.013, 0.051));
    assert!(paper.1 < 1e9 && steel.1 > 50e9, "{paper:?} {steel:?}");
    let g = (e_t / e_r).sqrt();
    let mut pressures = Vec::new();
    for (rc, ec) in [steel, paper] {
        let (sr, stt) = run(rc, Some(ec));
        // the core condition, summed over the winding
        assert_relative_eq!(stt, tw + (e_t / ec + nu) * sr, max_relative = 1e-9);
        let kappa = e_t / ec - 1.0 + nu;
        let want = altmann_core_stress(rc, big_r, tw, g, kappa);
        assert_relative_eq!(sr, want, max_relative = 0.01);
        // on a rigid core of the same radius the pressure is higher
        let (sr_rigid, _) = run(rc, None);
        assert!(sr_rigid < sr, "rigid {sr_rigid} vs compliant {sr}");
        pressures.push(-sr);
    }
    assert!(
        pressures[0] > pressures[1],
        "steel core {} Pa, paper core {} Pa",
        pressures[0],
        pressures[1]
    );
}

/// Rotating annulus, plane stress (Timoshenko and Goodier, Theory of Elasticity, 3rd ed. 1970,
/// the rotating disk with a central hole, from memory):
/// sigma_t = (3 + nu)/8 rho w^2 (a^2 + b^2 + a^2 b^2/r^2 - (1 + 3 nu)/(3 + nu) r^2), and
/// sigma_r = (3 + nu)/8 rho w^2 (a^2 + b^2 - a^2 b^2/r^2 - r^2). Evaluated by hand for
/// rho = 700 kg/m3, w = 20 pi rad/s, nu = 0.3, a = 0.05 m, b = 0.5 m: sigma_t(a) = 571.18 kPa,
/// sigma_t(b) = 126.60 kPa, sigma_r(0.3 m) = 177.32 kPa.
#[test]
fn centrifugal_stresses_match_rotating_disk_formula() {
    let w = 20.0 * std::f64::consts::PI;
    let (_, sta) = disk_stress(700.0, w, 0.3, 0.05, 0.5, 0.05);
    let (srb, stb) = disk_stress(700.0, w, 0.3, 0.05, 0.5, 0.5);
    let (sr3, _) = disk_stress(700.0, w, 0.3, 0.05, 0.5, 0.3);
    assert_relative_eq!(sta / 1e3, 571.18, max_relative = 1e-4);
    assert_relative_eq!(stb / 1e3, 126.60, max_relative = 1e-4);
    assert_relative_eq!(sr3 / 1e3, 177.32, max_relative = 1e-4);
    assert!(srb.abs() < 1e-6, "free outer edge");
}

/// Good, Wu and Fikes (1994) J. Appl. Mech. 61(1):182-185: wound-in tension = web tension +
/// mu x nip load (from memory). Check: 350 N/m + 0.3 x 3500 N/m = 1400 N/m.
#[test]
fn nip_induced_wound_in_tension_follows_good_wu_fikes() {
    let c = uniform(&[
        "winding.tension=350 N/m",
        "winding.nip=3500 N/m",
        "material.friction=0.3",
        "winding.speed=0 m/s",
    ]);
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options {
            nodes: 200,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    for lane in &w.lanes {
        assert_relative_eq!(
            lane.summary.wound_in_tension_mean_n_per_m,
            1400.0,
            max_relative = 1e-9
        );
    }
}

/// Facts of the trade (common practice): radial stress is zero at the surface, nearly constant
/// through the bulk for constant-tension winding and rising towards the core; the outermost layer
/// carries exactly its wound-in stress.
#[test]
fn constant_tension_profile_has_the_shape_the_trade_knows() {
    let c = uniform(&["winding.speed=0 m/s"]);
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options {
            nodes: 400,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let lane = &w.lanes[0];
    let n = lane.radial_stress_pa.len();
    assert_relative_eq!(lane.radial_stress_pa[n - 1], 0.0);
    // wound-in stress = wound-in tension over the compressed layer thickness
    let sigma_w = lane.wound_in_tension_n_per_m[n - 1] / w.layer_thickness_m;
    assert_relative_eq!(
        lane.tangential_stress_pa[n - 1],
        sigma_w,
        max_relative = 1e-12
    );
    // the pressure at a fraction `f` of the build, by radius (the nodes are not evenly spaced)
    let (r0, r1) = (w.radius_m[0], w.radius_m[n - 1]);
    let p = |f: f64| -linear_extrap(&w.radius_m, &lane.radial_stress_pa, r0 + f * (r1 - r0)).0;
    // bulk (30-70 % of the build) within 25 % of its mean; core above the bulk
    let bulk: Vec<f64> = (30..=70).map(|k| p(k as f64 / 100.0)).collect();
    let mean = bulk.iter().sum::<f64>() / bulk.len() as f64;
    assert!(
        bulk.iter().all(|x| (x / mean - 1.0).abs() < 0.25),
        "{bulk:?}"
    );
    assert!(p(0.0) > mean, "pressure rises towards the core");
    assert!(
        p(0.99) < 0.5 * mean,
        "pressure falls to zero at the surface"
    );
}

/// Higher winding speed lowers interlayer pressure (common practice; thin-ring argument).
#[test]
fn higher_speed_lowers_interlayer_pressure() {
    let slow = uniform(&["winding.speed=300 m/min"]);
    let fast = uniform(&["winding.speed=3000 m/min"]);
    let ws = wind(
        &WindInput::new(&slow.material, &slow.roll, &slow.winding),
        &lanes::build(&slow),
        Options {
            nodes: 200,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let wf = wind(
        &WindInput::new(&fast.material, &fast.roll, &fast.winding),
        &lanes::build(&fast),
        Options {
            nodes: 200,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    assert!(wf.lanes[0].summary.peak_pressure_pa < ws.lanes[0].summary.peak_pressure_pa);
    assert!(
        wf.lanes[0].summary.surface_zone_pressure_pa < ws.lanes[0].summary.surface_zone_pressure_pa
    );
}

/// For equal web stress, tension scales with caliper (web stress = tension / caliper): a roll of
/// twice the caliper wound at twice the tension has the same wound-in stress.
#[test]
fn equal_stress_means_tension_scales_with_caliper() {
    let a = uniform(&[
        "winding.speed=0 m/s",
        "material.caliper=72 um",
        "winding.tension=300 N/m",
        "winding.nip=0 N/m",
    ]);
    let b = uniform(&[
        "winding.speed=0 m/s",
        "material.caliper=144 um",
        "winding.tension=600 N/m",
        "winding.nip=0 N/m",
    ]);
    let wa = wind(
        &WindInput::new(&a.material, &a.roll, &a.winding),
        &lanes::build(&a),
        Options {
            nodes: 200,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let wb = wind(
        &WindInput::new(&b.material, &b.roll, &b.winding),
        &lanes::build(&b),
        Options {
            nodes: 200,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let n = wa.lanes[0].tangential_stress_pa.len() - 1;
    assert_relative_eq!(
        wa.lanes[0].tangential_stress_pa[n],
        wb.lanes[0].tangential_stress_pa[n],
        max_relative = 1e-9
    );
}

/// Grid convergence (exact element per interval, refined zone at the surface, second order in
/// the node spacing): the core pressure, surface-zone pressure and wound-in tension of every
/// lane move by less than 0.5 % from 801 to 1601 nodes and by less than 2 % from 401 to 1601
/// (measured on the demo roll: 0.3 % and 0.1 % at 401 nodes for the core and the surface zone).
/// The surface-zone pressure sits in the soft boundary layer of the outer wraps (Pfeiffer 1966,
/// TAPPI 49(8):342-347, from memory: E_r = K2 (P + K1), so E_r = K2 K1 at zero pressure).
#[test]
fn wound_state_converges_with_grid_refinement() {
    let c = demo(&[]);
    let l = lanes::build(&c);
    let run = |n| {
        wind(
            &WindInput::new(&c.material, &c.roll, &c.winding),
            &l,
            Options {
                nodes: n,
                levelling: 0.5,
                spacing: Default::default(),
            },
        )
        .unwrap()
    };
    let (w1, w2, w3) = (run(401), run(801), run(1601));
    for i in 0..l.lanes.len() {
        type Pick = fn(&rollsleuth::winding::LaneSummary) -> f64;
        let picks: [(&str, Pick, f64, f64); 3] = [
            ("core pressure", |s| s.core_pressure_pa, 0.005, 0.02),
            (
                "surface pressure",
                |s| s.surface_zone_pressure_pa,
                0.005,
                0.02,
            ),
            (
                "wound-in tension",
                |s| s.wound_in_tension_mean_n_per_m,
                0.005,
                0.02,
            ),
        ];
        for (name, f, tol_fine, tol_coarse) in picks {
            let (a, b, c) = (
                f(&w1.lanes[i].summary),
                f(&w2.lanes[i].summary),
                f(&w3.lanes[i].summary),
            );
            assert!(
                (b / c - 1.0).abs() < tol_fine,
                "lane {i} {name}: {b} vs {c}"
            );
            assert!(
                (a / c - 1.0).abs() < tol_coarse,
                "lane {i} {name}: {a} vs {c}"
            );
        }
    }
}

/// Lanes with equal caliper give identical results; a thicker lane gets higher tension and
/// pressure (lanes coupled through the shared web).
#[test]
fn equal_lanes_are_identical_and_a_thicker_lane_is_tighter() {
    let c = uniform(&[]);
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options {
            nodes: 300,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    for lane in &w.lanes[1..] {
        assert_eq!(lane.radial_stress_pa, w.lanes[0].radial_stress_pa);
    }
    let mut l2 = l.clone();
    l2.lanes[3].caliper_m *= 1.02;
    let w2 = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l2,
        Options {
            nodes: 300,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let s3 = &w2.lanes[3].summary;
    let s0 = &w2.lanes[0].summary;
    assert!(s3.wound_in_tension_mean_n_per_m > 1.2 * s0.wound_in_tension_mean_n_per_m);
    assert!(s3.peak_pressure_pa > s0.peak_pressure_pa);
    // independent lanes overstate the difference relative to levelled ones
    let wi = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l2,
        Options {
            nodes: 300,
            levelling: 0.0,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let ratio = |w: &rollsleuth::winding::Wound| {
        w.lanes[3].summary.core_pressure_pa / w.lanes[0].summary.core_pressure_pa
    };
    assert!(
        ratio(&wi) >= ratio(&w2) * 0.999,
        "{} vs {}",
        ratio(&wi),
        ratio(&w2)
    );
}

/// Radial equilibrium of the wound roll holds exactly for any material law:
/// r sigma_r(r) = -integral_r^R sigma_t ds, integrated from the equilibrium equation
/// d(r sigma_r)/dr = sigma_t (Timoshenko and Goodier 1970, plane stress in polar coordinates)
/// with a free outer surface. Checked on the nonlinear coupled demo
/// roll by trapezoid integration of the model's own tangential stress, at every node, within
/// 0.5 % of the largest |r sigma_r| (measured: 0.3 % at 401 nodes, 0.09 % at 801, 0.03 % at 1601).
#[test]
fn wound_state_satisfies_radial_equilibrium_identity() {
    let c = demo(&[]);
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options {
            nodes: 801,
            levelling: 0.5,
            spacing: Default::default(),
        },
    )
    .unwrap();
    let r = &w.radius_m;
    let n = r.len();
    for lane in [&w.lanes[0], &w.lanes[7]] {
        let scale = (0..n)
            .map(|i| (r[i] * lane.radial_stress_pa[i]).abs())
            .fold(0.0, f64::max);
        let mut integral = 0.0;
        for i in (0..n - 1).rev() {
            integral += 0.5
                * (lane.tangential_stress_pa[i] + lane.tangential_stress_pa[i + 1])
                * (r[i + 1] - r[i]);
            let lhs = r[i] * lane.radial_stress_pa[i];
            assert!(
                (lhs + integral).abs() < 0.005 * scale,
                "r = {}: {lhs} vs {}",
                r[i],
                -integral
            );
        }
    }
}

/// A secant started from another roll's end (as the noise rolls start from the noise-free
/// roll's) finds the same compressed caliper: the lanes' compressed builds fill the diameter the
/// case states, and the stresses agree with the roll wound from the mean caliper to within the
/// secant's tolerance (1e-5 in ln of the build ratio, slope about -1: each answer within 1e-5
/// of the root, so the two within 2e-5; the stresses scale with 1 / c_eff).
#[test]
fn a_started_secant_fills_the_stated_diameter() {
    let c = demo(&["lanes.count=12"]);
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    let opt = Options {
        nodes: 61,
        ..Options::default()
    };
    let clean = lanes::build(&uniform(&["lanes.count=12"]));
    let (_, start) = wind_from(&input, &clean, opt, None).unwrap();
    let l = lanes::build(&c);
    let cold = wind(&input, &l, opt).unwrap();
    let (warm, _) = wind_from(&input, &l, opt, Some(start)).unwrap();
    assert_relative_eq!(
        warm.layer_thickness_m,
        cold.layer_thickness_m,
        max_relative = 2e-5
    );
    let widths = l.widths();
    let width: f64 = widths.iter().sum();
    let built = warm
        .lanes
        .iter()
        .zip(&widths)
        .map(|(x, w)| x.summary.outer_radius_m * w)
        .sum::<f64>()
        / width;
    assert_relative_eq!(2.0 * built, c.roll.diameter_m, max_relative = 1e-5);
    for (a, b) in warm.lanes.iter().zip(&cold.lanes) {
        let scale = b
            .radial_stress_pa
            .iter()
            .fold(0.0_f64, |m, x| m.max(x.abs()));
        assert_eq!(a.radial_stress_pa.len(), b.radial_stress_pa.len());
        for (x, y) in a.radial_stress_pa.iter().zip(&b.radial_stress_pa) {
            assert!((x - y).abs() <= 4e-5 * scale, "{x} vs {y}");
        }
    }
}

/// A roll whose lanes all have the same caliper and own strain is wound as one lane across its
/// width (every lane winds alike: equal radii, no levelling offsets, equal nip shares). The
/// short cut agrees with the lanes wound side by side, which a caliper difference of one part in
/// 10^12 on one lane forces: stresses within 1e-7 of the largest, the compressed layer thickness
/// within 1e-9, the nip shares within 1e-6.
#[test]
fn a_uniform_roll_wound_as_one_lane_matches_its_lanes_wound_together() {
    let c = uniform(&["lanes.count=9"]);
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    let opt = Options {
        nodes: 121,
        ..Options::default()
    };
    let l = lanes::build(&c);
    let one = wind(&input, &l, opt).unwrap();
    let mut l2 = l.clone();
    l2.lanes[3].caliper_m *= 1.0 + 1e-12;
    let all = wind(&input, &l2, opt).unwrap();
    assert_eq!(one.lanes.len(), all.lanes.len());
    assert_relative_eq!(
        one.layer_thickness_m,
        all.layer_thickness_m,
        max_relative = 1e-9
    );
    for (a, b) in one.lanes.iter().zip(&all.lanes) {
        assert_eq!(a.position_m, b.position_m);
        assert_relative_eq!(a.nip_load_n_per_m, b.nip_load_n_per_m, max_relative = 1e-6);
        for (xs, ys) in [
            (&a.radial_stress_pa, &b.radial_stress_pa),
            (&a.tangential_stress_pa, &b.tangential_stress_pa),
        ] {
            let scale = ys.iter().fold(0.0_f64, |m, y| m.max(y.abs()));
            assert_eq!(xs.len(), ys.len());
            for (x, y) in xs.iter().zip(ys) {
                assert!((x - y).abs() <= 1e-7 * scale, "{x} vs {y}");
            }
        }
    }
    assert_relative_eq!(one.shear_lag_m, all.shear_lag_m, max_relative = 1e-9);
}

/// A roll wound with a given compressed caliper (`Caliper::Given`) has that caliper's layer count:
/// given the caliper a diameter-filling winding found, it is that winding, to the bit (one lane
/// across the width, and 8 lanes of a caliper profile); given the same caliper with every lane 2 %
/// thicker, the same layers carry the same tension at the same pressures, so the build over the
/// core grows by the caliper ratio (layers times thickness; the centrifugal relief, rho c v^2,
/// moves it by far less than the 0.2 % allowed). A caliper far from a like roll's is refused.
#[test]
fn a_given_caliper_winds_the_like_rolls_layer_count() {
    use rollsleuth::winding::{wind_caliper, Caliper, Secant};
    let opt = Options {
        nodes: 101,
        ..Options::default()
    };
    for c in [uniform(&[]), demo(&["lanes.count=8"])] {
        let l = lanes::build(&c);
        let input = WindInput::new(&c.material, &c.roll, &c.winding);
        let (w, found) = wind_from(&input, &l, opt, None).unwrap();
        let (g, used) = wind_caliper(&input, &l, opt, Caliper::Given(found)).unwrap();
        assert_eq!(used, found);
        assert_eq!(w, g);
    }
    let c = uniform(&[]);
    let l = lanes::build(&c);
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    let (w, found) = wind_from(&input, &l, opt, None).unwrap();
    let mut thick = l.clone();
    for lane in thick.lanes.iter_mut() {
        lane.caliper_m *= 1.02;
    }
    thick.mean_caliper_m *= 1.02;
    let (t, _) = wind_caliper(&input, &thick, opt, Caliper::Given(found)).unwrap();
    let rc = 0.5 * c.roll.core_diameter_m;
    let grown = |w: &rollsleuth::winding::Wound| w.lanes[0].summary.outer_radius_m - rc;
    assert_relative_eq!(grown(&t) / grown(&w), 1.02, max_relative = 0.002);
    for caliper_m in [-1.0, f64::NAN, 0.5 * found.caliper_m] {
        let bad = Caliper::Given(Secant {
            caliper_m,
            slope: -1.0,
        });
        assert!(wind_caliper(&input, &l, opt, bad).is_err(), "{caliper_m}");
    }
}
