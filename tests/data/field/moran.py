#!/usr/bin/env python3
"""Check of Moran's (1948) expected Spearman rank correlation of n normal pairs with correlation
rho, E[r_s] = 6 / (pi (n + 1)) (asin rho + (n - 2) asin(rho / 2)), used by fit::field's unit test
and tests/lane_draws_share_readings.rs: a SciPy Monte Carlo of 20,000 sets of n = 16 pairs made
with the interpolation weights of two lanes between the same two readings, (0.75, 0.25) and
(0.5, 0.5).

Run: /path/to/python-with-scipy tests/data/field/moran.py
Printed on 2026-12-05 (NumPy 2.4.6, SciPy 1.17.1):
rho 0.894427 Monte Carlo 0.8531 formula 0.8536
"""
import numpy as np
from scipy.stats import spearmanr

rng = np.random.default_rng(1)
rho = 0.5 / np.sqrt(0.625 * 0.5)
n = 16
rs = []
for _ in range(20000):
    z = rng.standard_normal((n, 2))
    a = 0.75 * z[:, 0] + 0.25 * z[:, 1]
    b = 0.5 * z[:, 0] + 0.5 * z[:, 1]
    rs.append(spearmanr(a, b).statistic)
formula = 6 / (np.pi * (n + 1)) * (np.arcsin(rho) + (n - 2) * np.arcsin(rho / 2))
print(f"rho {rho:.6f} Monte Carlo {np.mean(rs):.4f} formula {formula:.4f}")
