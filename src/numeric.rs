//! Small numerical kernels shared by the models: the tridiagonal (Thomas) solver.

/// Solve a tridiagonal system in place by the Thomas algorithm.
///
/// `a` is the sub-diagonal (`a[0]` unused), `b` the diagonal, `c` the super-diagonal (`c[n-1]`
/// unused), `d` the right-hand side; the solution overwrites `d`. `scratch` must have length n.
/// Returns `false` if a pivot vanishes (the caller reports a solver failure).
///
/// ```
/// // 2x = 2, x + 2y = 5  ->  x = 1, y = 2
/// let (a, b, c) = ([0.0, 1.0], [2.0, 2.0], [0.0, 0.0]);
/// let mut d = [2.0, 5.0];
/// let mut s = [0.0; 2];
/// assert!(rollsleuth::numeric::thomas(&a, &b, &c, &mut d, &mut s));
/// assert!((d[1] - 2.0).abs() < 1e-12);
/// ```
pub fn thomas(a: &[f64], b: &[f64], c: &[f64], d: &mut [f64], scratch: &mut [f64]) -> bool {
    let n = d.len();
    if n == 0 {
        return true;
    }
    let mut beta = b[0];
    if beta.abs() < 1e-300 || !beta.is_finite() {
        return false;
    }
    d[0] /= beta;
    for i in 1..n {
        scratch[i] = c[i - 1] / beta;
        beta = b[i] - a[i] * scratch[i];
        if beta.abs() < 1e-300 || !beta.is_finite() {
            return false;
        }
        d[i] = (d[i] - a[i] * d[i - 1]) / beta;
    }
    for i in (0..n - 1).rev() {
        d[i] -= scratch[i + 1] * d[i + 1];
    }
    d.iter().all(|x| x.is_finite())
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn thomas_matches_dense_solution() {
        // [4 1 0; 1 4 1; 0 1 4] x = [5 6 5] -> x = [1 1 1]
        let a = [0.0, 1.0, 1.0];
        let b = [4.0, 4.0, 4.0];
        let c = [1.0, 1.0, 0.0];
        let mut d = [5.0, 6.0, 5.0];
        let mut s = [0.0; 3];
        assert!(thomas(&a, &b, &c, &mut d, &mut s));
        for x in d {
            assert_relative_eq!(x, 1.0, epsilon = 1e-12);
        }
    }

    #[test]
    fn thomas_reports_singular() {
        let mut d = [1.0];
        assert!(!thomas(&[0.0], &[0.0], &[0.0], &mut d, &mut [0.0]));
    }
}
