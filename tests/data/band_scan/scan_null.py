"""Reference for diagnose::profile_test: the null of the trend leg of the caliper band test (the
largest excess of a band of 1-3 adjacent readings over the least-squares trend through the
readings outside it, in units of its standard deviation; the trend is the straight line
against position, or the quadratic where six or more readings stay outside, their own
quadratic coefficient is more than 2 standard errors from zero and their residual sum of
squares about it is below the chi-square upper 0.001 point on their count less 3) for 15 and
for 6 level unit-normal readings, by NumPy Monte Carlo, 1,000,000 draws each (an implementation independent
of the Rust one: numpy.linalg.lstsq on the design matrix, variances from its pseudo-inverse).
Run: /path/to/python-with-numpy tests/data/band_scan/scan_null.py
NumPy 2.4.6 printed:
n=15 q0.999 4.1059 q0.99 3.5018 share of bands on the quadratic 0.04542
n=6 q0.999 3.7943 q0.99 3.1548 share of bands on the quadratic 0.00000
(The leg on the straight line alone: 4.0428 and 3.4414 for 15.)"""
import numpy as np
from scipy.stats import chi2


def stat(Z, K=3):
    N, n = Z.shape
    x = np.linspace(-1.0, 1.0, n)
    best = np.zeros(N)
    bent = []
    for k in range(1, min(K, n - 3) + 1):
        for s in range(0, n - k + 1):
            inB = np.zeros(n, bool)
            inB[s:s + k] = True
            yb = Z[:, inB].mean(1)
            exc = {}
            for d in (1, 2):
                if n - k < (6 if d == 2 else 3):
                    continue
                X = np.vander(x, d + 1, increasing=True)
                XR, f = X[~inB], X[inB].mean(0)
                coef = np.linalg.lstsq(XR, Z[:, ~inB].T, rcond=None)[0]
                cov = np.linalg.pinv(XR.T @ XR)
                exc[d] = (yb - f @ coef) / np.sqrt(1 / k + f @ cov @ f)
                if d == 2:
                    rss = ((Z[:, ~inB].T - XR @ coef) ** 2).sum(0)
                    use2 = (np.abs(coef[2] / np.sqrt(cov[2, 2])) > 2.0) & (
                        rss < chi2.isf(0.001, n - k - 3))
            e = np.where(use2, exc[2], exc[1]) if 2 in exc else exc[1]
            if 2 in exc:
                bent.append(use2.mean())
            best = np.maximum(best, e)
    return best, (np.mean(bent) if bent else 0.0)


rng = np.random.default_rng(2026)
for n in (15, 6):
    parts = [stat(rng.standard_normal((100000, n))) for _ in range(10)]
    s = np.concatenate([p[0] for p in parts])
    print(f'n={n} q0.999 {np.quantile(s, 0.999):.4f} q0.99 {np.quantile(s, 0.99):.4f}'
          f' share of bands on the quadratic {np.mean([p[1] for p in parts]):.5f}')
