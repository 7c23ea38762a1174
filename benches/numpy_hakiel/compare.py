"""Winding at 1 % accuracy: rollsleuth against the independent NumPy/SciPy finite-difference
implementation of the same model (hakiel_fd.py), measured in one run on one machine.

    python3 benches/numpy_hakiel/compare.py          (from the crate root; see README.md)

Steps: (a) rollsleuth's refined reference and its convergence check; (b) NumPy's nodes for 1 %
(doubling, then bisection), and the agreement of its refined solution with rollsleuth's; (c) the
same for rollsleuth; (d) seconds per wind of each at its 1 % resolution and at an equal number of
nodes, in-process (import time, process start and case loading excluded); (e) a table.
Error measure: max over the nodes of the grid under test, the surface node excepted, of
|sigma_r - sigma_r,ref| / |sigma_r,ref|, the reference interpolated linearly in ln r.
"""

import argparse
import json
import os
import statistics
import subprocess
import sys
import time

import numpy as np
import scipy

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
sys.path.insert(0, HERE)
import hakiel_fd  # noqa: E402

CASE = os.path.join(HERE, "soft_roll.yaml")


def run_json(cmd):
    out = subprocess.run(cmd, cwd=ROOT, check=True, capture_output=True, text=True).stdout
    return json.loads(out)


class Rollsleuth:
    def __init__(self, binary, timing, case):
        self.binary, self.timing, self.case = binary, timing, case

    def params(self):
        """The model's parameters in SI, from `rollsleuth check --json` (so both solve the
        case as rollsleuth reads it)."""
        c = run_json([self.binary, "check", self.case, "--json"])["cases"][0]
        m, roll, w = c["material"], c["roll"], c["winding"]
        need = {
            "a rigid core": roll["core"]["kind"] == "rigid",
            "no nip": w["nip_n_per_m"] == 0.0,
            "winding at rest": w["speed_m_s"] == 0.0,
            "a constant tension": w["tension"]["kind"] == "constant",
            "a Pfeiffer stack": m["stack"]["law"] == "pfeiffer",
        }
        for what, ok in need.items():
            if not ok:
                sys.exit(f"{self.case}: the study needs {what}")
        return {
            "e_t": m["md_modulus_pa"],
            "k1": m["stack"]["k1_pa"],
            "k2": m["stack"]["k2_dimensionless"],
            "kappa": m["poisson_ratio"] - 1.0,  # rigid core: E_t / E_c = 0
            "r_core": 0.5 * roll["core_diameter_m"],
            "r_outer": 0.5 * roll["diameter_m"],
            "tension": w["tension"]["tension_n_per_m"],
        }

    def stress(self, nodes):
        d = run_json([self.binary, "stress", self.case, "--json", "--nodes", str(nodes)])
        if len(d["lanes"]) != 1:
            sys.exit(f"{self.case}: the study needs one lane")
        lane = d["lanes"][0]
        return {
            "r": np.array(d["radius_m"]),
            "sr": np.array(lane["radial_stress_pa"]),
            "c_eff": d["layer_thickness_m"],
        }

    def seconds(self, nodes, repeats):
        d = run_json([self.timing, self.case, str(nodes), str(repeats)])
        return d["median_s"], d["min_s"]


def error(r, sr, ref):
    """Max relative error of sigma_r at the nodes r (surface node excepted) against `ref`."""
    want = np.interp(np.log(r[:-1]), np.log(ref["r"]), ref["sr"])
    return float(np.max(np.abs(sr[:-1] - want) / np.abs(want)))


def smallest_nodes(err_of, start, target, tol, log):
    """Nodes for error < target: double from `start` until met, then bisect between the last
    miss and the first hit until they are within `tol` (relative). Returns (nodes, error)."""
    n, errs = start, {}
    while True:
        errs[n] = err_of(n)
        log(n, errs[n])
        if errs[n] < target:
            break
        n = 2 * (n - 1) + 1
    hi, lo = n, (n - 1) // 2 + 1
    while lo in errs and errs[lo] >= target and hi - lo > tol * hi:
        mid = (hi + lo) // 2
        errs[mid] = err_of(mid)
        log(mid, errs[mid])
        if errs[mid] < target:
            hi = mid
        else:
            lo = mid
    return hi, errs[hi], errs


def numpy_seconds(fn, repeats):
    fn()  # warm-up, untimed
    secs = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        fn()
        secs.append(time.perf_counter() - t0)
    return statistics.median(secs), min(secs)


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--ref-nodes", type=int, default=12801, help="rollsleuth reference nodes")
    ap.add_argument("--equal-nodes", type=int, default=401, help="nodes of the equal-N timing")
    ap.add_argument("--target", type=float, default=0.01, help="accuracy goal (relative)")
    ap.add_argument("--numpy-repeats", type=int, default=3)
    ap.add_argument("--rollsleuth-repeats", type=int, default=21)
    ap.add_argument("--no-build", action="store_true", help="use the built binaries as they are")
    a = ap.parse_args()
    if not a.no_build:
        subprocess.run(
            ["cargo", "build", "--release", "--quiet", "--bin", "rollsleuth", "--example",
             "wind_timing"],
            cwd=ROOT, check=True,
        )
    target_dir = os.environ.get("CARGO_TARGET_DIR", os.path.join(ROOT, "target"))
    rs = Rollsleuth(
        os.path.join(target_dir, "release", "rollsleuth"),
        os.path.join(target_dir, "release", "examples", "wind_timing"),
        CASE,
    )
    p = rs.params()
    print(f"numpy {np.__version__}, scipy {scipy.__version__}, python {sys.version.split()[0]}")
    print(f"run {time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}, {os.cpu_count()} cores, "
          f"load average {os.getloadavg()[0]:.2f}")
    print(f"case {os.path.relpath(CASE, ROOT)}: {p}")

    # (a) rollsleuth's reference, checked against the next coarser grid (the grids nest)
    ref = rs.stress(a.ref_nodes)
    half = (a.ref_nodes - 1) // 2 + 1
    coarser = rs.stress(half)
    ref_check = error(coarser["r"], coarser["sr"], ref)
    c_eff = ref["c_eff"]
    sigma_w = p["tension"] / c_eff
    print(f"(a) rollsleuth reference {a.ref_nodes} nodes; {half} nodes differ from it by "
          f"{100 * ref_check:.4f} % at most; c_eff = {c_eff:.6e} m, sigma_w = {sigma_w:.6e} Pa")

    def numpy_wind(nodes):
        r = hakiel_fd.grid(p["r_core"], p["r_outer"], nodes)
        return r, hakiel_fd.wind(r, sigma_w, p["e_t"], p["k1"], p["k2"], p["kappa"])

    # (b) NumPy: nodes for 1 %, and where its refined solution goes
    print("(b) NumPy finite differences (nodes, max relative error):")
    log = lambda n, e: print(f"    {n:6d}  {100 * e:8.4f} %", flush=True)  # noqa: E731
    solved = {}

    def numpy_err(nodes):
        solved[nodes] = numpy_wind(nodes)
        return error(*solved[nodes], ref)

    np_nodes, np_err, np_errs = smallest_nodes(numpy_err, 101, a.target, 0.03, log)
    n2 = max(np_errs)  # the last doubling (bisection stays below it)
    n1 = (n2 - 1) // 2 + 1
    order = np.log2(np_errs[n1] / np_errs[n2])
    # first-order Richardson extrapolation on the nested grids n1 (coarse) and n2 (fine)
    (r1, s1), (_, s2) = solved[n1], solved[n2]
    rich = 2.0 * s2[:: (n2 - 1) // (n1 - 1)] - s1
    rich_err = error(r1, rich, ref)
    print(f"    observed order {order:.2f} ({n1} -> {n2} nodes); Richardson extrapolation of "
          f"{n1} and {n2} nodes differs from rollsleuth's reference by {100 * rich_err:.4f} %")
    solved.clear()

    # (b') context: the same NumPy solver with first-order Richardson extrapolation on two nested
    # grids (m and 2m - 1 nodes); its cost is both winds
    def richardson(m):
        (r1, s1), (_, s2) = numpy_wind(m), numpy_wind(2 * (m - 1) + 1)
        return r1, 2.0 * s2[::2] - s1

    print("(b') NumPy finite differences + Richardson extrapolation (coarse nodes, error):")
    ri_nodes, ri_err, _ = smallest_nodes(
        lambda m: error(*richardson(m), ref), 101, a.target, 0.03, log
    )

    # (c) rollsleuth: nodes for 1 %
    print("(c) rollsleuth (nodes, max relative error):")
    rs_nodes, rs_err, _ = smallest_nodes(
        lambda n: error((s := rs.stress(n))["r"], s["sr"], ref), 26, a.target, 0.03, log
    )

    # (d) seconds per wind
    print("(d) timing (median and min seconds per wind) ...", flush=True)
    np_1 = numpy_seconds(lambda: numpy_wind(np_nodes), a.numpy_repeats)
    rs_1 = rs.seconds(rs_nodes, a.rollsleuth_repeats)
    eq = a.equal_nodes
    ri_1 = numpy_seconds(lambda: richardson(ri_nodes), a.numpy_repeats)
    np_eq = numpy_seconds(lambda: numpy_wind(eq), max(a.numpy_repeats, 11))
    rs_eq = rs.seconds(eq, a.rollsleuth_repeats)
    np_eq_err = error(*numpy_wind(eq), ref)
    rs_eq_err = error((s := rs.stress(eq))["r"], s["sr"], ref)

    # (e) table
    print()
    print("| solver | nodes | max rel. error | s per wind (median) | s per wind (min) |")
    print("|---|---:|---:|---:|---:|")
    rows = [
        ("NumPy FD, 1 %", np_nodes, np_err, np_1),
        ("rollsleuth, 1 %", rs_nodes, rs_err, rs_1),
        (f"NumPy FD + Richardson, 1 % ({ri_nodes} and {2 * ri_nodes - 1} nodes)",
         ri_nodes, ri_err, ri_1),
        (f"NumPy FD, {eq} nodes", eq, np_eq_err, np_eq),
        (f"rollsleuth, {eq} nodes", eq, rs_eq_err, rs_eq),
    ]
    for name, n, e, (med, mn) in rows:
        print(f"| {name} | {n} | {100 * e:.3f} % | {med:.4g} | {mn:.4g} |")
    print()
    print(f"ratio NumPy / rollsleuth at 1 %: {np_1[0] / rs_1[0]:.0f}x (median), "
          f"{np_1[1] / rs_1[1]:.0f}x (min)")
    print(f"ratio NumPy + Richardson / rollsleuth at 1 %: {ri_1[0] / rs_1[0]:.0f}x (median), "
          f"{ri_1[1] / rs_1[1]:.0f}x (min)")
    print(f"ratio NumPy / rollsleuth at {eq} nodes: {np_eq[0] / rs_eq[0]:.1f}x (median), "
          f"{np_eq[1] / rs_eq[1]:.1f}x (min)")
    print(f"load average at the end {os.getloadavg()[0]:.2f}")


if __name__ == "__main__":
    main()
