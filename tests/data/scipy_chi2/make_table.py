"""Reference values of the chi-square upper tail for rollsleuth's profile test (tests/stats_chi2.rs).

For each (k, x): P(X >= x) from scipy.stats.chi2.sf. Degrees of freedom cover one component
(k = 1) and the spread of profiles of 3 to 200 readings (k = n - 1).

Run: python3 make_table.py > table.csv   (SciPy 1.17.1 was used)
"""
from scipy.stats import chi2

print("k,x,sf")
for k in [1, 2, 3, 5, 8, 11, 19, 30, 63, 199]:
    for x in [0.0, 0.01, 0.5, 1.0, 2.0, 3.84, 6.63, 10.83, 15.0, 25.0, 40.0, 60.0, 100.0, 250.0]:
        print(f"{k},{x!r},{float(chi2.sf(x, k))!r}")
