"""Reference values of Student's t distribution for rollsleuth's noise test (tests/stats_student_t.rs).

For each (nu, t): the upper tail P(T >= t) from scipy.stats.t.sf, and for each (nu, p): the upper
quantile from scipy.stats.t.isf. Degrees of freedom cover the noise test's (the noise rolls less
one) and the small and large cases around it.

Run: python3 make_table.py > table.csv   (SciPy 1.17.1 was used)
"""
from scipy.stats import t

print("kind,nu,x,value")
for nu in [1, 2, 3, 5, 10, 23, 30, 63, 200]:
    for x in [-3.0, -1.0, 0.0, 0.5, 1.0, 2.0, 2.5, 3.0, 4.0, 6.0, 10.0]:
        print(f"sf,{nu},{x!r},{float(t.sf(x, nu))!r}")
    for p in [0.4, 0.1, 0.05, 0.01, 0.0036, 0.001, 1e-4, 1e-6]:
        print(f"isf,{nu},{p!r},{float(t.isf(p, nu))!r}")
