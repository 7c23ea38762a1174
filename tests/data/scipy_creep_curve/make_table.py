"""Reference minimum for rollsleuth's creep-curve fit (tests/fit_optimiser_reference.rs).

The same objective as src/fit/creep_curve.rs: sum of squared relative residuals of a Burgers
creep compliance, eps = sigma * J(t), J(t) = (1/E) [1 + d (1 - exp(-t/tK)) + t/tv], over the
log-parameters [ln E, ln d, ln tK, ln tv]. The data are a Burgers curve with a fixed, deterministic
multiplicative perturbation (so the minimum is not at the generating values). SciPy's
Nelder-Mead and L-BFGS-B both minimise it from the same start; the better minimum is recorded.

Run: python3 make_table.py > table.csv   (SciPy 1.17.1, NumPy 2.4 were used)
"""
import math
import numpy as np
from scipy.optimize import minimize

SIGMA = 8e6
TIMES = [60.0 * 1.6 ** k for k in range(24)]  # 1 min .. about 24 days, s
TRUE = (5.2e9, 0.35, 1.5 * 86400.0, 250.0 * 86400.0)
PERTURB = [1.0 + 0.01 * math.sin(1.7 * k) for k in range(len(TIMES))]


def compliance(e, d, tk, tv, t):
    return (1.0 + d * (1.0 - math.exp(-t / tk)) + t / tv) / e


STRAINS = [SIGMA * compliance(*TRUE, t) * p for t, p in zip(TIMES, PERTURB)]


def objective(x):
    e, d, tk, tv = (math.exp(v) for v in x)
    return sum((SIGMA * compliance(e, d, tk, tv, t) / s - 1.0) ** 2 for t, s in zip(TIMES, STRAINS))


START = [math.log(4e9), math.log(0.2), math.log(86400.0), math.log(100.0 * 86400.0)]

best = None
for method, opts in (("Nelder-Mead", {"xatol": 1e-12, "fatol": 1e-16, "maxiter": 100000, "maxfev": 100000}),
                     ("L-BFGS-B", {"ftol": 1e-16, "gtol": 1e-12, "maxiter": 100000})):
    r = minimize(objective, np.array(START), method=method, options=opts)
    if best is None or r.fun < best.fun:
        best = r
print("quantity,value")
print(f"sigma_pa,{SIGMA!r}")
print(f"times_s,{';'.join(repr(t) for t in TIMES)}")
print(f"strains,{';'.join(repr(s) for s in STRAINS)}")
print(f"start,{';'.join(repr(v) for v in START)}")
print(f"min_cost,{float(best.fun)!r}")
print(f"min_x,{';'.join(repr(float(v)) for v in best.x)}")
