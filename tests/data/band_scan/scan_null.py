"""Reference for diagnose::profile_test: the null of the line leg of the caliper band test (the
largest excess of a band of 1-3 adjacent readings over the least-squares line through the
readings outside it, in units of its standard deviation) for 15 level unit-normal readings,
by NumPy Monte Carlo, 1,000,000 draws (an implementation independent of the Rust one).
Run: python3 tests/data/band_scan/scan_null.py (NumPy 2.4.6 printed: q0.999 4.0428, q0.99 3.4414)."""
import numpy as np
def stat(Z, K=3):
    N, n = Z.shape; x = np.arange(n, dtype=float); best = np.zeros(N)
    for k in range(1, min(K, n - 3) + 1):
        for s in range(0, n - k + 1):
            inB = np.zeros(n, bool); inB[s:s+k] = True
            xr = x[~inB]; m = len(xr); xrm = xr.mean(); sxx = ((xr - xrm)**2).sum()
            yr = Z[:, ~inB]; yrm = yr.mean(1)
            b = ((yr - yrm[:, None]) * (xr - xrm)).sum(1) / sxx
            xb = x[inB].mean()
            exc = Z[:, inB].mean(1) - (yrm + b * (xb - xrm))
            sd = np.sqrt(1/k + 1/m + (xb - xrm)**2 / sxx)
            best = np.maximum(best, exc / sd)
    return best
rng = np.random.default_rng(2026)
s = np.concatenate([stat(rng.standard_normal((100000, 15))) for _ in range(10)])
print('n=15 q0.999', np.quantile(s, 0.999), 'q0.99', np.quantile(s, 0.99))
print('examples', stat(np.array([[0.5*i for i in range(15)]])), stat(np.array([[0.5*i + (6 if i==14 else 0) for i in range(15)]])))
