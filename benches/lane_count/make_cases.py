#!/usr/bin/env python3
"""Invented rolls for the lane-count study (made-up mill: Brackenfold PM3 newsprint; made-up film
line: Tarrowby Films line 2, BOPP): 67 rolls with caliper bands, wedges, a crown, a dish, few
readings, film and level (noise-only) profiles. Caliper shapes are given per reading index i
(0..14) or per position x (mm) as a fraction of nominal caliper; hardness and diameter surveys at
winding and after storage are synthesised from the model (`rollsleuth age`) with reading noise.

Usage: ROLLSLEUTH=target/release/rollsleuth python3 benches/lane_count/make_cases.py OUTDIR
(system python3 with PyYAML)."""
import json, os, random, subprocess, sys, tempfile
import yaml

BIN = os.environ['ROLLSLEUTH']
OUT = sys.argv[1] if len(sys.argv) > 1 else 'target/lane_count/cases'
W = 1800.0
N = 15

def band(idx, amp):
    s = set(idx)
    return lambda i: amp if i in s else 0.0

def wedge(p):
    return lambda i: p * (i / (N - 1))   # front (i=0) nominal, back p thick

CASES = {}
for p in (3, 4, 5, 8):
    for s in (1, 2, 3):
        CASES[f'wedge{p}_s{s}'] = ('news', f'wedge {p} %', wedge(p / 100), 100 * p + s)
for k in (1, 2, 3):
    for amp in (3, 5):
        for where, first in (('end', N - k), ('in1', N - k - 1), ('mid', 7 - (k - 1) // 2)):
            CASES[f'band{k}r_{amp}pct_{where}'] = ('news', f'{k}-reading band {amp} % at {where}',
                                                   band(range(first, first + k), amp / 100), 1000 + 10 * k + amp + first)
w5 = wedge(0.05)
for where, idx in (('mid', [7]), ('thick_end', [14]), ('thin_end', [0]), ('q3', [11])):
    b = band(idx, 0.05)
    CASES[f'wedge5_band5_{where}'] = ('news', f'wedge 5 % plus 1-reading band 5 % at {where}',
                                      (lambda b: lambda i: w5(i) + b(i))(b), 2000 + idx[0])
for s in range(10):
    CASES[f'level_s{s}'] = ('news', 'level (noise only)', lambda i: 0.0, 3000 + s)
for s in (1, 2):
    CASES[f'crown4_s{s}'] = ('news', 'crown 4 % (centre thick)', lambda i: 0.04 * (1 - (2 * i / (N - 1) - 1) ** 2), 4000 + s)
    CASES[f'dish4_s{s}'] = ('news', 'dish 4 % (edges thick)', lambda i: 0.04 * (2 * i / (N - 1) - 1) ** 2, 4100 + s)
for s in (1, 2, 3):
    CASES[f'film_wedge5_s{s}'] = ('film', 'BOPP wedge 5 %', wedge(0.05), 5000 + s)
    CASES[f'film_level_s{s}'] = ('film', 'BOPP level', lambda i: 0.0, 5100 + s)


def base(kind, seed, title, pos, vals, rep):
    if kind == 'news':
        return {
            'format': 1, 'case': f'BRK-PM3-{seed:05d}', 'title': f'Brackenfold PM3 newsprint (invented): {title}',
            'complaint': 'none',
            'material': {'grade': 'newsprint', 'caliper': '78 um', 'basis_weight': '48.8 g/m2', 'moisture': '8 %'},
            'roll': {'width': '1800 mm', 'diameter': '1100 mm', 'core_diameter': '102 mm',
                     'core': {'modulus': '3 GPa', 'wall': '13 mm', 'poisson': 0.3}},
            'winding': {'tension': '350 N/m', 'nip': '1.8 kN/m', 'speed': '1500 m/min'},
            'converting': {'tension': '250 N/m'},
            'hardness': {'scale': 'rebound 0-100', 'repeatability': 1.0},
            'profiles': [{'what': 'caliper', 'age': '0 d', 'unit': 'um', 'position_unit': 'mm',
                          'positions': pos, 'values': vals, 'repeatability': f'{rep} um'}],
            'storage': [
                {'duration': '8 d', 'temperature': '18 C', 'rh': '45 %', 'barrel_wrap': 'paper',
                 'end_wrap': 'paper', 'stance': 'on_end', 'place': 'Brackenfold mill store'},
                {'duration': '16 d', 'temperature': '22 C', 'rh': '50 %', 'barrel_wrap': 'paper',
                 'end_wrap': 'paper', 'stance': 'on_end', 'place': 'Quillan Moor print store'}],
        }
    return {
        'format': 1, 'case': f'TRW-L2-{seed:05d}', 'title': f'Tarrowby Films line 2 BOPP 20 um (invented): {title}',
        'complaint': 'none',
        'material': {'grade': 'film', 'caliper': '20 um', 'density': '910 kg/m3'},
        'roll': {'width': '1800 mm', 'diameter': '800 mm', 'core_diameter': '152 mm',
                 'core': {'modulus': '4 GPa', 'wall': '12 mm'}},
        'winding': {'tension': '60 N/m', 'nip': '300 N/m', 'speed': '400 m/min'},
        'hardness': {'scale': 'rebound 0-100', 'repeatability': 1.0},
        'profiles': [{'what': 'caliper', 'age': '0 d', 'unit': 'um', 'position_unit': 'mm',
                      'positions': pos, 'values': vals, 'repeatability': f'{rep} um'}],
        'storage': [
            {'duration': '30 d', 'temperature': '24 C', 'rh': '55 %', 'barrel_wrap': 'film',
             'end_wrap': 'none', 'stance': 'on_end', 'place': 'Tarrowby film store'}],
    }


def make(name, kind, title, shape, seed, pos=None, xshape=None):
    rng = random.Random(seed)
    c0, rep = (78.0, 0.5) if kind == 'news' else (20.0, 0.1)
    if pos is None:
        pos = [round(W * (i + 0.5) / N, 1) for i in range(N)]
    if xshape is not None:
        vals = [round(c0 * (1 + xshape(x)) + rng.gauss(0, rep), 2) for x in pos]
    else:
        vals = [round(c0 * (1 + shape(i)) + rng.gauss(0, rep), 2) for i in range(len(pos))]
    case = base(kind, seed, title, pos, vals, rep)
    with tempfile.NamedTemporaryFile('w', suffix='.yaml', delete=False) as f:
        yaml.safe_dump(case, f, sort_keys=False, default_flow_style=None, width=200)
    r = subprocess.run([BIN, 'age', '--json', f.name], capture_output=True, text=True)
    os.unlink(f.name)
    if r.returncode:
        print(name, 'age failed', r.stderr, file=sys.stderr); return
    aged = json.loads(r.stdout)
    lanes = aged['lanes']
    xs = [l['position_m'] * 1000 for l in lanes]

    def at(x, ys):
        if x <= xs[0]:
            return ys[0]
        for i in range(len(xs) - 1):
            if x <= xs[i + 1]:
                t = (x - xs[i]) / (xs[i + 1] - xs[i])
                return ys[i] * (1 - t) + ys[i + 1] * t
        return ys[-1]

    hp = [round(x) for x in xs]
    days = round(aged['times_s'][-1] / 86400, 3)
    for k, age in ((0, 0), (-1, days)):
        h = [min(100.0, max(0.0, round(at(p, [l['hardness_hardness_units'][k] for l in lanes]) + rng.gauss(0, 1.0), 1))) for p in hp]
        d = [round(at(p, [l['diameter_m'][k] * 1e3 for l in lanes]) + rng.gauss(0, 0.1), 2) for p in hp]
        case['profiles'].append({'what': 'hardness', 'age': f'{age:g} d', 'position_unit': 'mm', 'positions': hp, 'values': h})
        case['profiles'].append({'what': 'diameter', 'age': f'{age:g} d', 'unit': 'mm', 'position_unit': 'mm', 'positions': hp, 'values': d})
    with open(os.path.join(OUT, f'{name}.yaml'), 'w') as f:
        f.write(f'# Invented roll (lane-count study): {title}; surveys synthesised from the model with reading noise.\n')
        yaml.safe_dump(case, f, sort_keys=False, default_flow_style=None, width=200)


def extra():
    """Uneven reading spacing and few readings."""
    pos = [30+60*i for i in range(10)] + [660 + 270*j for j in range(5)]
    for p in (5, 8):
        for s in (1, 2):
            make(f'uneven_wedge{p}_s{s}', 'news', f'uneven spacing, wedge {p} % in position', None, 6000+10*p+s, pos=pos, xshape=(lambda p: lambda x: p/100*x/1800)(p))
    for n in (3, 4, 5):
        pos = [round(1800*(i+0.5)/n, 1) for i in range(n)]
        make(f'few{n}_wedge5', 'news', f'{n} readings, wedge 5 %', None, 7000+n, pos=pos, xshape=lambda x: 0.05*x/1800)
        make(f'few{n}_endband5', 'news', f'{n} readings, end reading 5 % thick', None, 7100+n, pos=pos, xshape=lambda x: 0.05 if x > 1800*(1-1/n) else 0)
        make(f'few{n}_level', 'news', f'{n} readings level', None, 7200+n, pos=pos, xshape=lambda x: 0.0)


if __name__ == '__main__':
    os.makedirs(OUT, exist_ok=True)
    for name, (kind, title, shape, seed) in CASES.items():
        make(name, kind, title, shape, seed)
    extra()
    print(len(CASES) + 13, 'cases', file=sys.stderr)
