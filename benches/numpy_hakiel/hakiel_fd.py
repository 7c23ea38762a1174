"""Hakiel's (1987) nonlinear accretion model of wound-roll stresses, solved with the classic
finite-difference method in NumPy/SciPy: an implementation independent of rollsleuth's, used by
compare.py to measure both at equal accuracy.

Model (Hakiel, Z. 1987, "Nonlinear model for wound roll stresses", TAPPI J. 70(5):113-117, from
memory). The roll is built by accretion. When a radial element dr is wound at the surface with
hoop stress sigma_w, the radial-stress increment s on the wound part of the roll solves

    r^2 s'' + 3 r s' + (1 - E_t / E_r(P)) s = 0

with E_t the MD (tangential) modulus and E_r the radial modulus of the stack at the current
interlayer pressure P = -sigma_r (Pfeiffer 1966: E_r = K2 (P + K1)). Boundary conditions: at the
new outer layer s = -sigma_w dr / r; at the core r s' = kappa s with kappa = E_t / E_c - 1 + nu
(rigid core: kappa = nu - 1).

Discretisation (written from the equation above, not from rollsleuth's code):
- geometric grid of N nodes from the core radius to the outer radius (uniform in t = ln r). The
  equation is equidimensional in r (invariant under scaling of r), so in t it reads
  s_tt + 2 s_t + (1 - g^2) s = 0 with g^2 = E_t / E_r, and a uniform t grid spreads the error
  evenly; a uniform r grid would be coarsest, relative to the decay length r / g, at the core;
- accretion one grid interval at a time, as Hakiel winds one node per layer (here an interval
  stands for a group of layers): at step k the layers between r_(k-1) and r_k press on the outer
  node of the roll wound so far, the Dirichlet condition s_(k-1) = -sigma_w dr / r_(k-1) with
  dr = r_k - r_(k-1), and node k joins with zero radial stress (the free surface). The group's
  load is lumped at that node, so the scheme is first order in g dr / r (the layers' own inward
  decay across the interval is not resolved);
- central second-order differences on nodes 0..k-2, the core condition by a ghost node, so each
  step is one tridiagonal system (scipy.linalg.solve_banded);
- E_r per node by a predictor-corrector: predictor at the pressure before the step, corrector at
  the mid-step pressure P - s/2;
- the full wound part is solved at every step (no truncation of small increments), assembly is
  vectorised; the only Python loop is over the accretion steps.
"""

import numpy as np
from scipy.linalg import solve_banded


def grid(r_core, r_outer, nodes):
    """Geometric grid of `nodes` radii (m) from r_core to r_outer (same nodes as rollsleuth's)."""
    r = r_core * np.exp(np.log(r_outer / r_core) * np.arange(nodes) / (nodes - 1))
    r[-1] = r_outer
    return r


def wind(r, sigma_w, e_t, k1, k2, kappa, corrector=True):
    """Radial stress (Pa, compression negative) at the nodes `r` (m, geometric) after winding
    all of them with hoop stress sigma_w (Pa). e_t: MD modulus (Pa); k1 (Pa), k2: Pfeiffer stack
    law E_r = k2 (P + k1); kappa: core condition r s' = kappa s."""
    n = len(r)
    h = np.log(r[1] / r[0])
    up = 1.0 / h**2 + 1.0 / h  # coefficient of s_(i+1): s_tt + 2 s_t
    lo = 1.0 / h**2 - 1.0 / h  # coefficient of s_(i-1)
    mid = -2.0 / h**2 + 1.0  # diagonal without -g^2
    # ghost node at the core: s_(-1) = s_1 - 2 h kappa s_0
    mid0 = mid - 2.0 * kappa * lo * h
    load = -sigma_w * np.diff(r) / r[:-1]  # Dirichlet value at the roll's outer node, per step
    sr = np.zeros(n)
    ab = np.empty((3, n))
    ab[0, :] = up
    ab[0, 1] = up + lo  # row 0: both neighbours fold onto s_1
    ab[2, :] = lo
    diag = ab[1]
    rhs = np.zeros(n)
    e_over = e_t / k2

    def solve(m, pressure, bc):
        diag[:m] = mid - e_over / (np.maximum(pressure, 0.0) + k1)
        diag[0] += mid0 - mid
        rhs[m - 1] = -ab[0, m] * bc  # coefficient of the Dirichlet node in row m-1
        x = solve_banded((1, 1), ab[:, :m], rhs[:m], check_finite=False)
        rhs[m - 1] = 0.0
        return x

    for k in range(1, n):
        # the layers between r_(k-1) and r_k press on the roll's outer node k-1 (unknowns 0..k-2)
        bc = load[k - 1]
        if k == 1:
            sr[0] += bc
            continue
        p = -sr[: k - 1]
        s = solve(k - 1, p, bc)
        if corrector:
            s = solve(k - 1, p - 0.5 * s, bc)
        sr[: k - 1] += s
        sr[k - 1] += bc
    return sr
