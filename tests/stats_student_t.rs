//! Student's t upper tail and quantile against SciPy 1.17.1 (`scipy.stats.t.sf` and `t.isf`;
//! table and script in `tests/data/scipy_student_t/`). The noise test reads its chances and
//! thresholds from these.

use rollsleuth::stats::{student_t_isf, student_t_sf};

#[test]
fn student_t_matches_scipy() {
    let text = include_str!("data/scipy_student_t/table.csv");
    let mut checked = 0;
    for line in text.lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let nu: f64 = f[1].parse().unwrap();
        let x: f64 = f[2].parse().unwrap();
        let want: f64 = f[3].parse().unwrap();
        let got = match f[0] {
            "sf" => student_t_sf(x, nu),
            "isf" => student_t_isf(x, nu),
            k => panic!("unknown kind {k}"),
        };
        // relative 1e-9 (absolute 1e-15 near zero)
        assert!(
            (got - want).abs() <= 1e-9 * want.abs() + 1e-15,
            "{line}: got {got}"
        );
        checked += 1;
    }
    assert_eq!(checked, 171);
}
