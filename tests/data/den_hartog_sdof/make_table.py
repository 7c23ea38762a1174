#!/usr/bin/env python3
"""Check table for the once-per-turn tension swing at unwind, by time integration.

The roll's rotary inertia reduced to its surface (mass m per width) on the span's stiffness k
per width, with viscous damping c = 2 zeta sqrt(k m), driven by a run-out x(t) = e sin(w t):
m s'' = k (x - s) + c (x' - s'). The spring force k (x - s) in steady state has the amplitude
k e r^2 / sqrt((1 - r^2)^2 + (2 zeta r)^2), r = w / sqrt(k / m) (Den Hartog, J.P. 1956,
Mechanical Vibrations, 4th ed., ch. 2, base excitation). This script does not use that formula:
it integrates the equation of motion with SciPy's solve_ivp (DOP853, rtol 1e-11) over 400
periods of the slower of the two motions and takes the largest spring force over the last 20
forcing periods.

Columns: frequency ratio r, damping ratio zeta, spring force amplitude / (k e).
"""
import math
import numpy as np
from scipy.integrate import solve_ivp

K, M, E = 1.0, 1.0, 1.0
print("ratio,zeta,force_over_k_e")
for zeta in (0.1, 0.3):
    for r in (0.3, 0.7, 1.0, 1.3, 3.0):
        wn = math.sqrt(K / M)
        w = r * wn
        c = 2.0 * zeta * math.sqrt(K * M)
        x = lambda t: E * math.sin(w * t)
        xd = lambda t: E * w * math.cos(w * t)

        def rhs(t, y):
            s, v = y
            return [v, (K * (x(t) - s) + c * (xd(t) - v)) / M]

        period = 2.0 * math.pi / min(w, wn)
        t_end = 400.0 * period
        t_eval = np.linspace(t_end - 20.0 * 2.0 * math.pi / w, t_end, 20001)
        sol = solve_ivp(rhs, (0.0, t_end), [0.0, 0.0], method="DOP853", rtol=1e-11, atol=1e-13, t_eval=t_eval)
        force = K * (np.array([x(t) for t in sol.t]) - sol.y[0])
        print(f"{r!r},{zeta!r},{np.max(np.abs(force)):.9e}")
