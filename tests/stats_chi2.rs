//! The chi-square upper tail against SciPy 1.17.1 (`scipy.stats.chi2.sf`; table and script in
//! `tests/data/scipy_chi2/`). The caliper profile test reads its chances from it.

use rollsleuth::stats::chi2_sf;

#[test]
fn chi_square_tail_matches_scipy() {
    let text = include_str!("data/scipy_chi2/table.csv");
    let mut checked = 0;
    for line in text.lines().skip(1) {
        let f: Vec<f64> = line.split(',').map(|x| x.parse().unwrap()).collect();
        let (k, x, want) = (f[0], f[1], f[2]);
        let got = chi2_sf(x, k);
        // relative 1e-9 (absolute 1e-15 near zero)
        assert!(
            (got - want).abs() <= 1e-9 * want.abs() + 1e-15,
            "{line}: got {got}"
        );
        checked += 1;
    }
    assert_eq!(checked, 140);
}

/// The tail beyond an infinite statistic is 0 (a limit of the law's definition), and at 0 it is 1.
#[test]
fn chi_square_tail_ends_at_zero_and_one() {
    for k in [1.0, 19.0, 4999.0] {
        assert_eq!(chi2_sf(f64::INFINITY, k), 0.0);
        assert_eq!(chi2_sf(0.0, k), 1.0);
    }
}
