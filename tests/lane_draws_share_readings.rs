//! Lanes narrower than the survey readings' spacing are fitted to nearly the same interpolated
//! readings, so their posterior draws must move together across the plausible states, while lanes
//! fitted to different readings move independently (`fit::field`). The demo roll's hardness and
//! diameter are read at 18 positions; at 40 lanes, two or three lanes lie between two readings. A
//! scale pinned to the roll's value still takes the pooled posterior's draw k in state k in every
//! lane. The Spearman rank correlation of two lanes' MD creep draws over the 16 states is compared
//! with what the readings' noise gives: for two lanes whose data are made from the same two
//! readings (a lane holding one takes it, one holding none interpolates them with weights
//! (1 - t, t)), the scores' correlation rho follows from the weights, and the draws'
//! mean rank correlation is Moran's (1948) expectation for normal scores, 6 / (pi (n + 1)) (asin
//! rho + (n - 2) asin(rho / 2)) (from memory; checked against a SciPy Monte Carlo in
//! `tests/data/field/moran.py`).

use rollsleuth::case::{self, Measure};
use rollsleuth::fit::fit_roll;
use rollsleuth::lanes;
use rollsleuth::storage::AgeOptions;
use rollsleuth::winding::{wind, Options, WindInput};

/// Spearman's rank correlation of two samples without ties.
fn spearman(a: &[f64], b: &[f64]) -> f64 {
    let rank = |v: &[f64]| -> Vec<f64> {
        let mut idx: Vec<usize> = (0..v.len()).collect();
        idx.sort_by(|&i, &j| v[i].total_cmp(&v[j]));
        let mut r = vec![0.0; v.len()];
        for (k, &i) in idx.iter().enumerate() {
            r[i] = k as f64;
        }
        r
    };
    let (ra, rb, n) = (rank(a), rank(b), a.len() as f64);
    let d2: f64 = ra.iter().zip(&rb).map(|(x, y)| (x - y).powi(2)).sum();
    1.0 - 6.0 * d2 / (n * (n * n - 1.0))
}

#[test]
fn lanes_between_the_same_readings_draw_together_and_distant_lanes_do_not() {
    let c = case::load_demo(&["lanes.count=40".to_string()]).unwrap();
    let l = lanes::build(&c);
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    let w = wind(&input, &l, Options::with_nodes(121)).unwrap();
    let fit = fit_roll(&c, &l, &w, &AgeOptions::default()).unwrap();
    let survey = c.densest(Measure::Hardness).unwrap().positions_m.clone();
    // the lanes whose MD scale the data identify (a pinned scale moves with the roll instead)
    let own: Vec<usize> = (0..fit.lanes.len())
        .filter(|&i| !fit.lanes[i].pinned[0] && fit.lanes[i].draws_theta.len() == 16)
        .collect();
    let md = |i: usize| -> Vec<f64> { fit.lanes[i].draws_theta.iter().map(|d| d[0]).collect() };
    let between = |x: f64| survey.partition_point(|&q| q <= x);
    let edges = l.edges_m();
    // the weights that make lane i's data from the readings (`lanes::onto`): the mean of the
    // readings it holds, else its centre's interpolation between the two around it
    let weights = |i: usize, x: f64| -> Vec<f64> {
        let mut w = vec![0.0; survey.len()];
        let held = lanes::held(&survey, &edges, i);
        if !held.is_empty() {
            for &k in &held {
                w[k] = 1.0 / held.len() as f64;
            }
        } else {
            let b = between(x).clamp(1, survey.len() - 1);
            let t = (x - survey[b - 1]) / (survey[b] - survey[b - 1]);
            (w[b - 1], w[b]) = (1.0 - t, t);
        }
        w
    };
    let (mut near, mut far) = (Vec::new(), Vec::new());
    for (a, &i) in own.iter().enumerate() {
        for &j in &own[a + 1..] {
            let (xi, xj) = (fit.lanes[i].position_m, fit.lanes[j].position_m);
            let (bi, bj) = (between(xi), between(xj));
            let r = spearman(&md(i), &md(j));
            let (wi, wj) = (weights(i, xi), weights(j, xj));
            let dot = |u: &[f64], v: &[f64]| u.iter().zip(v).map(|(p, q)| p * q).sum::<f64>();
            let rho = dot(&wi, &wj) / (dot(&wi, &wi) * dot(&wj, &wj)).sqrt();
            if bi == bj && bi > 0 && bi < survey.len() && rho > 0.0 {
                // both made from readings bi - 1 and bi: the scores' correlation from the weights
                near.push((r, rho));
            } else if bi.abs_diff(bj) >= 3 {
                far.push(r);
            }
        }
    }
    assert!(
        near.len() >= 5 && far.len() >= 50,
        "{} {}",
        near.len(),
        far.len()
    );
    let n = 16.0;
    let moran = |rho: f64| {
        6.0 / (std::f64::consts::PI * (n + 1.0)) * (rho.asin() + (n - 2.0) * (0.5 * rho).asin())
    };
    let got = near.iter().map(|p| p.0).sum::<f64>() / near.len() as f64;
    let want = near.iter().map(|p| moran(p.1)).sum::<f64>() / near.len() as f64;
    // the pairs (29 on the demo) share the same 16 states, so their mean is far from 29
    // independent estimates: a wide tolerance (with independent draws it is about 0, failing)
    assert!(
        (got - want).abs() < 0.1,
        "near pairs: {got} against {want} ({near:?})"
    );
    // independent lanes: a mean of zero, the standard error of one pair's rho is 1 / sqrt(15)
    let mean_far = far.iter().sum::<f64>() / far.len() as f64;
    let se = (1.0 / 15.0f64).sqrt() / (far.len() as f64).sqrt();
    assert!(
        mean_far.abs() < 4.0 * se + 0.02,
        "far pairs: {mean_far} (se {se})"
    );
}

/// Every lane whose MD scale is pinned to the roll's value takes the same MD value in each state
/// (the pooled posterior's draw of that index), at the default lanes and at 40 lanes; the coated
/// roll has such lanes.
#[test]
fn pinned_scales_take_the_pooled_draw_of_the_state() {
    for sets in [vec![], vec!["lanes.count=40".to_string()]] {
        let path = concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/field_cases/kestrel_coated_cold_to_humid.yaml"
        );
        let c = case::load_file(std::path::Path::new(path), &sets).unwrap();
        let l = lanes::build(&c);
        let input = WindInput::new(&c.material, &c.roll, &c.winding);
        let w = wind(&input, &l, Options::with_nodes(121)).unwrap();
        let fit = fit_roll(&c, &l, &w, &AgeOptions::default()).unwrap();
        let pinned: Vec<&Vec<[f64; 2]>> = (fit.lanes.iter())
            .filter(|f| f.pinned[0] && f.draws_theta.len() == 16)
            .map(|f| &f.draws_theta)
            .collect();
        assert!(pinned.len() >= 2, "{sets:?}: {} pinned lanes", pinned.len());
        for d in &pinned[1..] {
            for k in 0..16 {
                assert_eq!(d[k][0], pinned[0][k][0], "{sets:?}: state {k}");
            }
        }
    }
}
