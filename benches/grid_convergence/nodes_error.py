#!/usr/bin/env python3
"""Grid-node convergence study of `rollsleuth stress` (radial stress).

Run from the crate root: python3 benches/grid_convergence/nodes_error.py (builds the release
binary first; about ten minutes). For each case: runs `rollsleuth stress CASE --nodes N --json
-q` (one at a time, RAYON_NUM_THREADS=1)
for the study node counts and the references (3201, 6401); compares each coarse radial stress
profile with the N = 6401 reference, interpolated linearly in ln r onto the coarse nodes.

error(node, lane) = |s - s_ref| / max(|s_ref(node)|, 1e-3 * max_lane |s_ref|)
max error = max over lanes and nodes, outermost (surface) node excluded.

Writes results.md in this directory; results.json and the raw outputs (runs/*.json.gz) go to
target/grid_convergence.
Pure standard library (no numpy on this machine).
"""
import bisect
import gzip
import json
import math
import os
import statistics
import subprocess
import time

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
RS = os.path.join(ROOT, "target", "release", "rollsleuth")
OUT = os.path.join(ROOT, "target", "grid_convergence")
# (tag, case file relative to the crate root, extra arguments)
CASES = [
    ("harrowgate_board_dry_store", "field_cases/harrowgate_board_dry_store.yaml", []),
    ("kestrel_coated_cold_to_humid", "field_cases/kestrel_coated_cold_to_humid.yaml", []),
    ("nordvik_pm3_caliper_band", "field_cases/nordvik_pm3_caliper_band.yaml", []),
    ("soft_roll", "benches/numpy_hakiel/soft_roll.yaml", []),
    ("nordvik_40_lanes", "field_cases/nordvik_pm3_caliper_band.yaml", ["--set", "lanes.count=40"]),
]
NS = [101, 151, 201, 251, 301, 401, 601]
N_CHECK = 3201
N_REF = 6401
REPEATS = int(os.environ.get("REPEATS", "3"))  # timing repeats; outputs must be identical
FLOOR = 1e-3


def run(spec, n):
    """Run the stress command REPEATS times, sequentially; return (json, median s, all s)."""
    tag, case, extra = spec
    env = dict(os.environ, RAYON_NUM_THREADS="1")
    cmd = [RS, "stress", os.path.join(ROOT, case), "--nodes", str(n), "--json", "-q"] + extra
    outs, times = [], []
    for _ in range(REPEATS):
        t0 = time.perf_counter()
        p = subprocess.run(cmd, env=env, capture_output=True)
        times.append(time.perf_counter() - t0)
        if p.returncode != 0:
            raise RuntimeError(f"{cmd} failed rc={p.returncode}: {p.stderr.decode()[:2000]}")
        outs.append(p.stdout)
    deterministic = all(o == outs[0] for o in outs)
    os.makedirs(os.path.join(OUT, "runs"), exist_ok=True)
    with gzip.open(os.path.join(OUT, "runs", f"{tag}_N{n}.json.gz"), "wb") as f:
        f.write(outs[0])
    return json.loads(outs[0]), statistics.median(times), times, deterministic


class Ref:
    def __init__(self, d):
        self.lanes = []
        for L in d["lanes"]:
            r, s = L["radius_m"], L["radial_stress_pa"]
            assert all(b > a for a, b in zip(r, r[1:])), "reference radii not increasing"
            self.lanes.append((r, s, [math.log(v) for v in r], max(abs(v) for v in s)))

    def at(self, lane, r):
        rr, ss, xx, _ = self.lanes[lane]
        xi = math.log(r)
        if xi < xx[0] - 1e-12 or xi > xx[-1] + 1e-12:
            raise ValueError(f"r={r} outside reference range [{rr[0]}, {rr[-1]}]")
        xi = min(max(xi, xx[0]), xx[-1])
        j = min(bisect.bisect_right(xx, xi) - 1, len(xx) - 2)
        t = (xi - xx[j]) / (xx[j + 1] - xx[j])
        return ss[j] + t * (ss[j + 1] - ss[j])


def compare(d, ref):
    """Error metrics of run d against the reference."""
    assert len(d["lanes"]) == len(ref.lanes), "lane count differs"
    worst = (-1.0, None, None, None)  # (err, lane, radius, abs diff Pa)
    core_worst = (-1.0, None)
    max_abs = 0.0
    for k, L in enumerate(d["lanes"]):
        r, s = L["radius_m"], L["radial_stress_pa"]
        smax_ref = ref.lanes[k][3]
        floor = FLOOR * smax_ref
        for i in range(len(r) - 1):  # outermost surface node excluded
            sr = ref.at(k, r[i])
            diff = abs(s[i] - sr)
            e = diff / max(abs(sr), floor)
            max_abs = max(max_abs, diff)
            if e > worst[0]:
                worst = (e, k, r[i], diff)
            if i == 0 and e > core_worst[0]:
                core_worst = (e, k)
    return {
        "max_rel": worst[0], "max_lane": worst[1], "max_radius_m": worst[2],
        "max_abs_at_max_pa": worst[3], "core_rel": core_worst[0], "core_lane": core_worst[1],
        "max_abs_pa": max_abs,
    }


def interp_self_check(ref, interior=False):
    """Interpolation error of the reference itself: drop every other reference node and
    interpolate it from its neighbours (spacing 2h; at spacing h it is about 1/4 of this).
    interior: only nodes below 99 % of the ln r span (outside the surface's refined zone)."""
    worst = 0.0
    for rr, ss, xx, smax in ref.lanes:
        floor = FLOOR * smax
        for i in range(1, len(rr) - 2, 2):
            if interior and (xx[i] - xx[0]) > 0.99 * (xx[-1] - xx[0]):
                continue
            t = (xx[i] - xx[i - 1]) / (xx[i + 1] - xx[i - 1])
            si = ss[i - 1] + t * (ss[i + 1] - ss[i - 1])
            worst = max(worst, abs(si - ss[i]) / max(abs(ss[i]), floor))
    return worst


def order(n1, e1, n2, e2):
    if e1 <= 0 or e2 <= 0:
        return float("nan")
    return math.log(e1 / e2) / math.log((n2 - 1) / (n1 - 1))


def main():
    subprocess.run(["cargo", "build", "--release", "--locked"], cwd=ROOT, check=True)
    results = {}
    for case in CASES:
        tag = case[0]
        print(f"== {tag}", flush=True)
        runs = {}
        for n in NS + [N_CHECK, N_REF]:
            d, t, ts, det = run(case, n)
            runs[n] = (d, t, ts, det)
            print(f"  N={n}: {t:.3f} s (runs {', '.join(f'{x:.3f}' for x in ts)}), "
                  f"out nodes {len(d['radius_m'])}, deterministic {det}, "
                  f"warnings {len(d['warnings'])}", flush=True)
        ref = Ref(runs[N_REF][0])
        rows = []
        for n in NS + [N_CHECK]:
            d, t, ts, det = runs[n]
            c = compare(d, ref)
            c.update(N=n, seconds=t, seconds_all=ts, deterministic=det,
                     out_nodes=len(d["radius_m"]), layers=d.get("layer_count"),
                     warnings=d["warnings"], notes=d["notes"])
            rows.append(c)
        dref = runs[N_REF][0]
        results[tag] = {
            "case": " ".join([case[1]] + case[2]), "lanes": len(dref["lanes"]), "rows": rows,
            "ref": {"N": N_REF, "seconds": runs[N_REF][1], "seconds_all": runs[N_REF][2],
                    "deterministic": runs[N_REF][3], "out_nodes": len(dref["radius_m"]),
                    "layers": dref.get("layer_count"), "warnings": dref["warnings"],
                    "max_abs_ref_pa": max(l[3] for l in ref.lanes),
                    "interp_check_2h": interp_self_check(ref),
                    "interp_check_2h_interior": interp_self_check(ref, True)},
        }
    with open(os.path.join(OUT, "results.json"), "w") as f:
        json.dump(results, f, indent=1)
    write_md(results)


def fmt_pct(x):
    return f"{100 * x:.4g}"


def fit_order(rows, key):
    """-slope of ln e against ln (N - 1), least squares."""
    xs = [math.log(c["N"] - 1) for c in rows]
    ys = [math.log(c[key]) for c in rows]
    mx, my = sum(xs) / len(xs), sum(ys) / len(ys)
    return -sum((x - mx) * (y - my) for x, y in zip(xs, ys)) / sum((x - mx) ** 2 for x in xs)


def write_md(results):
    out = ["# Radial-stress error of `rollsleuth stress` against grid node count", ""]
    head = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=ROOT,
                          capture_output=True, text=True).stdout.strip()
    out.append(f"Generated by `nodes_error.py` at commit {head} (release build). Each run: "
               "`RAYON_NUM_THREADS=1 rollsleuth stress CASE --nodes N --json -q`, one at a time.")
    out.append("")
    out.append(f"Reference N = {N_REF}, interpolated linearly in ln r onto each run's nodes. "
               "Error at a node = |s - s_ref| / max(|s_ref|, 1e-3 max|s_ref| of the lane); "
               "max over lanes and nodes, the outermost (surface, s = 0) node excluded. "
               "'core' = the innermost node (r = core radius), worst lane. Seconds = median "
               f"wall time of {REPEATS} sequential runs (process start and JSON output included; "
               "indicative only). Orders: p = ln(e1/e2) / ln((N2-1)/(N1-1)).")
    out.append("")
    summary = []
    for tag, R in results.items():
        rows = R["rows"]
        ref = R["ref"]
        out.append(f"## {tag} ({R['lanes']} lanes)")
        out.append("")
        out.append(f"`{R['case']}`; reference N = {N_REF}: {ref['out_nodes']} output nodes, "
                   f"{ref['seconds']:.3f} s, max |s_ref| = {ref['max_abs_ref_pa']:.6g} Pa, "
                   f"layers {ref['layers']:.6g}.")
        out.append("")
        out.append("| N | max rel error % | error at core % | radius of max error (mm) [lane] "
                   "| abs diff there (Pa) | seconds | output nodes |")
        out.append("|---:|---:|---:|---:|---:|---:|---:|")
        for c in rows:
            label = f"{c['N']} (check)" if c["N"] == N_CHECK else str(c["N"])
            out.append(f"| {label} | {fmt_pct(c['max_rel'])} | {fmt_pct(c['core_rel'])} | "
                       f"{1000 * c['max_radius_m']:.2f} [{c['max_lane']}] | "
                       f"{c['max_abs_at_max_pa']:.4g} | {c['seconds']:.3f} | {c['out_nodes']} |")
        out.append("")
        chk = [c for c in rows if c["N"] == N_CHECK][0]
        out.append(f"Reference convergence: N = {N_CHECK} vs {N_REF}: max rel difference "
                   f"{fmt_pct(chk['max_rel'])} % (at r = {1000 * chk['max_radius_m']:.2f} mm), "
                   f"core {fmt_pct(chk['core_rel'])} %, max abs difference "
                   f"{chk['max_abs_pa']:.4g} Pa. Interpolation error of the reference itself "
                   f"(every other node dropped, spacing 2h; at the reference's own spacing about a "
                   f"quarter of this): {fmt_pct(ref['interp_check_2h'])} % anywhere, "
                   f"{fmt_pct(ref['interp_check_2h_interior'])} % below 99 % of the ln r span "
                   f"(the larger values sit in the sub-nodes just under the surface). "
                   f"Coarse nodes coincide with reference nodes when 6400 / (N - 1) is an "
                   f"integer (N = 101, 201, 401, 3201), apart from some sub-nodes under the surface.")
        out.append("")
        out.append("Observed order between successive N (max error; core error):")
        out.append("")
        out.append("| N1 -> N2 | p (max) | p (core) |")
        out.append("|---|---:|---:|")
        study = [c for c in rows if c["N"] in NS]
        for a, b in zip(study, study[1:]):
            out.append(f"| {a['N']} -> {b['N']} | {order(a['N'], a['max_rel'], b['N'], b['max_rel']):.2f}"
                       f" | {order(a['N'], a['core_rel'], b['N'], b['core_rel']):.2f} |")
        a, b = study[-1], chk
        out.append(f"| {a['N']} -> {b['N']} | {order(a['N'], a['max_rel'], b['N'], b['max_rel']):.2f}"
                   f" | {order(a['N'], a['core_rel'], b['N'], b['core_rel']):.2f} |")
        a, b = study[0], chk
        out.append(f"| {a['N']} -> {b['N']} (end to end) | "
                   f"{order(a['N'], a['max_rel'], b['N'], b['max_rel']):.2f}"
                   f" | {order(a['N'], a['core_rel'], b['N'], b['core_rel']):.2f} |")
        out.append(f"| least-squares fit, N = {study[0]['N']}..{study[-1]['N']} | "
                   f"{fit_order(study, 'max_rel'):.2f} | {fit_order(study, 'core_rel'):.2f} |")
        out.append("")
        nondet = [c["N"] for c in rows if not c["deterministic"]] + \
            ([N_REF] if not ref["deterministic"] else [])
        if nondet:
            out.append(f"**Non-identical repeated outputs at N = {nondet}.**")
            out.append("")
        warns = sorted({w for c in rows for w in c["warnings"]} | set(ref["warnings"]))
        if warns:
            out.append("Warnings in the JSON (any N): " + "; ".join(warns))
            out.append("")
        below = {}
        for thr in (0.01, 0.005):
            ok = [c["N"] for c in study if c["max_rel"] < thr]
            # smallest N from which all larger study N also pass
            mono = None
            for c in reversed(study):
                if c["max_rel"] < thr:
                    mono = c["N"]
                else:
                    break
            below[thr] = (min(ok) if ok else None, mono)
        summary.append((tag, below))
    out.append("## Smallest N with max error below the target")
    out.append("")
    out.append("| case | < 1 % | < 0.5 % |")
    out.append("|---|---:|---:|")
    for tag, below in summary:
        cells = []
        for thr in (0.01, 0.005):
            first, mono = below[thr]
            if first is None:
                cells.append(f"none up to {NS[-1]}")
            elif first == mono:
                cells.append(str(first))
            elif mono is None:
                cells.append(f"{first} (but not at {NS[-1]})")
            else:
                cells.append(f"{first} (but not all larger; all from {mono})")
        out.append(f"| {tag} | {cells[0]} | {cells[1]} |")
    out.append("")
    with open(os.path.join(HERE, "results.md"), "w") as f:
        f.write("\n".join(out))


if __name__ == "__main__":
    main()
