"""Check table for rollsleuth's winding model (tests/winding_altmann.rs).

Altmann, H.C. (1968) "Formulas for computing the stresses in center-wound rolls", TAPPI 51(4):
176-179 (from memory). For a constant radial modulus E_r the accretion (Hakiel 1987) equation
has solutions r^(-1 +/- g), g = sqrt(E_t / E_r); with a compliant core (core condition
r sigma_r' = kappa sigma_r at r_c) and a free surface, for wound-in stress T_w(r):

    sigma_r(r) = -(phi(r) / r) * integral_r^R T_w(s) / phi(s) ds
    sigma_t(r) = d(r sigma_r)/dr = T_w(r) - phi'(r) * integral_r^R T_w(s) / phi(s) ds
    phi(x) = x^g + C r_c^(2g) x^(-g),  C = (g - 1 - kappa) / (g + 1 + kappa),
    kappa = E_t / E_c - 1 + nu.

The tangential form is derived here from the radial one by the equilibrium d(r sigma_r)/dr =
sigma_t (Timoshenko and Goodier 1970). The integral is evaluated with scipy.integrate.quad.

Check vector: r_c = 0.05 m, R = 0.5 m, T_w = 5 MPa (constant), E_t = 5 GPa, E_r = 50 MPa
(g = 10), E_c = 1 GPa, nu = 0.01.

Run: python3 make_table.py > table.csv   (SciPy 1.17.1, NumPy 2.4 were used)
"""
import math
from scipy.integrate import quad

RC, R, TW = 0.05, 0.5, 5e6
E_T, E_R, E_C, NU = 5e9, 50e6, 1e9, 0.01
G = math.sqrt(E_T / E_R)
KAPPA = E_T / E_C - 1.0 + NU
C = (G - 1.0 - KAPPA) / (G + 1.0 + KAPPA)
RADII = [0.05, 0.10, 0.20, 0.30, 0.40, 0.45, 0.49]


def phi(x):
    return x ** G + C * RC ** (2.0 * G) * x ** (-G)


def dphi(x):
    return G * x ** (G - 1.0) - G * C * RC ** (2.0 * G) * x ** (-G - 1.0)


def integral(r):
    val, _err = quad(lambda s: TW / phi(s), r, R, epsabs=0.0, epsrel=1e-13, limit=200)
    return val


print("r_m,sigma_r_kpa,sigma_t_kpa")
for r in RADII:
    i = integral(r)
    sr = -(phi(r) / r) * i
    st = TW - dphi(r) * i
    print(f"{r!r},{sr / 1e3:.4f},{st / 1e3:.4f}")
