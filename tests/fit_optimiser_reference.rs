//! The optimiser's minimum on a small problem against a general-purpose reference: SciPy 1.17.1
//! `scipy.optimize.minimize` on the same creep-curve objective from the same start
//! (tests/data/scipy_creep_curve/, with the script that produced the table).

use rollsleuth::case::Burgers;
use rollsleuth::fit::creep_curve::{fit, objective, CreepCurve};

fn table() -> std::collections::HashMap<String, Vec<f64>> {
    let text = std::fs::read_to_string("tests/data/scipy_creep_curve/table.csv").unwrap();
    text.lines()
        .skip(1)
        .map(|l| {
            let (k, v) = l.split_once(',').unwrap();
            (
                k.to_string(),
                v.split(';').map(|x| x.parse().unwrap()).collect(),
            )
        })
        .collect()
}

#[test]
fn nelder_mead_reaches_scipy_minimum_on_creep_curve() {
    let t = table();
    let curve = CreepCurve {
        stress_pa: t["sigma_pa"][0],
        times_s: t["times_s"].clone(),
        strains: t["strains"].clone(),
    };
    let s = &t["start"];
    let b0 = Burgers {
        delayed: s[1].exp(),
        retardation_s: s[2].exp(),
        viscous_time_s: s[3].exp(),
    };
    let f = fit(&curve, s[0].exp(), &b0).unwrap();
    let scipy_cost = t["min_cost"][0];
    let x = [
        f.modulus_pa.ln(),
        f.burgers.delayed.ln(),
        f.burgers.retardation_s.ln(),
        f.burgers.viscous_time_s.ln(),
    ];
    // same objective value at our optimum, recomputed independently of the optimiser's state
    assert!((objective(&curve, &x) - f.cost).abs() < 1e-15);
    // at least as low as SciPy's (to 1e-9 absolute on a cost of about 1e-3)
    assert!(
        f.cost <= scipy_cost + 1e-9,
        "ours {} scipy {}",
        f.cost,
        scipy_cost
    );
    // and the same minimiser: log-parameters within 0.01 (1 %)
    for (a, b) in x.iter().zip(&t["min_x"]) {
        assert!((a - b).abs() < 0.01, "{x:?} vs {:?}", t["min_x"]);
    }
    assert!(f.converged);
}
