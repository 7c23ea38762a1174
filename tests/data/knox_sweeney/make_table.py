#!/usr/bin/env python3
"""Check table for the air film entrained at winding, evaluated independently of rollsleuth.

Knox, K.L. and Sweeney, T.L. (1971) "Fluid effects associated with web handling", Industrial &
Engineering Chemistry Process Design and Development 10(2): the foil-bearing film
h = 0.643 R (6 mu U / T)^(2/3).
Martin, H.M. (1916) "Lubrication of gear teeth", Engineering 102 (rigid-isoviscous line contact,
as given in Hamrock 1994, Fundamentals of Fluid Film Lubrication; from memory):
h = 4.9 mu U R_e / w.

Columns: case (foil or nip), radius R or R_e (m), viscosity mu (Pa s), speed U (m/s), web
tension T or nip load w (N/m), film h (m).
"""
from fractions import Fraction as F

MU = 1.81e-5
rows = []
for r in (0.05, 0.25, 0.5, 0.75):
    for u in (2.0, 10.0, 25.0):
        for t in (100.0, 300.0, 1000.0):
            x = float(F(6) * F(MU) * F(u) / F(t))
            rows.append(("foil", r, MU, u, t, 0.643 * r * x ** (2.0 / 3.0)))
for re in (0.05, 0.08):
    for u in (2.0, 25.0):
        for w in (50.0, 1000.0):
            rows.append(("nip", re, MU, u, w, float(F(49, 10) * F(MU) * F(u) * F(re) / F(w))))

print("case,radius_m,viscosity_pa_s,speed_m_s,load_n_per_m,film_m")
for c, r, mu, u, t, h in rows:
    print(f"{c},{r!r},{mu!r},{u!r},{t!r},{h:.12e}")
