#!/usr/bin/env python3
"""Check table for the flat of a roll stored on its side, evaluated independently of rollsleuth.

Hertz line contact of a cylinder on a rigid flat (Johnson, K.L. 1985, Contact Mechanics,
Cambridge University Press, section 4.3, eq. 4.45): a = sqrt(4 P R / (pi E*)),
p0 = 2 P / (pi a); the flat's depth is the chord's sagitta a^2 / (2 R) = 2 P / (pi E*).
E* is the stack's secant modulus from the outer wraps' pressure ps to ps + P / (2 a) under the
Pfeiffer law eps(p) = ln(1 + p / K1) / K2 (or a constant modulus); a and E* are solved together
here with SciPy's brentq (rollsleuth uses a damped fixed point).
Creep under constant load (Lee and Radok 1960): 1/E* -> J(t) = (1 + phi(t)) / E*, Burgers
phi = delayed (1 - exp(-t / tau_K)) + t / tau_v at the Arrhenius-reduced time
t = sum dt / a_T, ln a_T = (Ea / R)(1 / T - 1 / 296.15). Recovery after the load: the Kelvin part
times exp(-t_r / tau_K), the viscous part stays.

Columns: case, then the inputs (density kg/m3, roll and core radius m, law, K1 Pa, K2 or the
constant modulus Pa, ps Pa, delayed, tau_K s, tau_v s, Ea J/mol, loaded days and C, recovery
days and C), then the outputs (load N/m, modulus Pa, elastic half-width m, peak pressure Pa,
elastic depth m, creep depth m, residual depth m).
"""
import math
from scipy.optimize import brentq

G = 9.80665
R_GAS = 8.314462618
T_REF = 296.15

CASES = [
    # id, rho, R, Rc, law, k1, k2_or_E, ps, delayed, tau_k_d, tau_v_d, Ea, load_d, load_C, rec_d, rec_C
    ("constant", 620.0, 0.5, 0.051, "constant", 0.0, 5e6, 0.0, 0.05, 3.0, 2000.0, 100e3, 60.0, 30.0, 10.0, 20.0),
    ("pfeiffer_news", 620.0, 0.5, 0.051, "pfeiffer", 1e3, 50.0, 20e3, 0.5, 3.0, 200.0, 100e3, 90.0, 30.0, 2.0, 23.0),
    ("pfeiffer_board", 700.0, 0.75, 0.076, "pfeiffer", 5e3, 35.0, 0.0, 0.3, 2.0, 500.0, 100e3, 30.0, 20.0, 0.0, 23.0),
]


def strain(law, k1, k2, p):
    return math.log1p(p / k1) / k2 if law == "pfeiffer" else p / k2


def secant(law, k1, k2, p0, dp):
    return dp / (strain(law, k1, k2, p0 + dp) - strain(law, k1, k2, p0))


def a_t(ea, c):
    return math.exp(ea / R_GAS * (1.0 / (c + 273.15) - 1.0 / T_REF))


print("case,density_kg_m3,radius_m,core_radius_m,law,k1_pa,k2_or_modulus,surface_pressure_pa,"
      "delayed,retardation_s,viscous_time_s,activation_j_mol,loaded_d,loaded_c,recovery_d,recovery_c,"
      "load_n_per_m,modulus_pa,half_width_m,peak_pressure_pa,elastic_depth_m,creep_depth_m,residual_depth_m")
for (cid, rho, r, rc, law, k1, k2, ps, dl, tk, tv, ea, ld, lc, rd, rcc) in CASES:
    p = G * rho * math.pi * (r * r - rc * rc)
    e_of = lambda a: secant(law, k1, k2, ps, p / (2.0 * a))
    a = brentq(lambda a: a - math.sqrt(4.0 * p * r / (math.pi * e_of(a))), 1e-6, r, xtol=1e-15, rtol=1e-14)
    e = e_of(a)
    p0 = 2.0 * p / (math.pi * a)
    tl = ld * 86400.0 / a_t(ea, lc)
    tr = rd * 86400.0 / a_t(ea, rcc)
    kel = dl * (1.0 - math.exp(-tl / (tk * 86400.0)))
    vis = tl / (tv * 86400.0)
    el = 2.0 * p / (math.pi * e)
    print(f"{cid},{rho!r},{r!r},{rc!r},{law},{k1!r},{k2!r},{ps!r},{dl!r},{tk * 86400.0!r},{tv * 86400.0!r},{ea!r},"
          f"{ld!r},{lc!r},{rd!r},{rcc!r},{p:.12e},{e:.12e},{a:.12e},{p0:.12e},{el:.12e},{el * (kel + vis):.12e},"
          f"{el * (kel * math.exp(-tr / (tk * 86400.0)) + vis):.12e}")
