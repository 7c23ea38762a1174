#!/usr/bin/env python3
"""Make the invented rolls of tests/one_sided_roll.rs (made-up mill: Ashcombe PM1, newsprint).

    ROLLSLEUTH=target/release/rollsleuth python3 tests/data/one_sided/make_cases.py [NAME ...]

Each roll has a caliper profile of 15 readings with Gaussian reading noise at the stated
repeatability (seeded), and hardness and diameter surveys at winding and after storage
synthesised from rollsleuth's own forward model (`age --json`) with reading noise (hardness
1.0, diameter 0.1 mm). Invented data: the tests check facts of the trade on them, not the numbers.
"""
import json, os, random, subprocess, sys, tempfile
import yaml

BIN = os.environ.get('ROLLSLEUTH', 'target/release/rollsleuth')
HERE = os.path.dirname(os.path.abspath(__file__))
W, C0, REP = 1800.0, 78.0, 0.5
CASES = {
    # name: (title, caliper shape as a fraction of nominal at x mm, seed)
    'wedge_4pct': ('Caliper wedge, back side 4 % thick', lambda x: 0.04 * x / W, 11),
    'wedge_6pct': ('Caliper wedge, back side 6 % thick', lambda x: 0.06 * x / W, 12),
    'dish_3pct': ('Dished caliper, both edges 3 % thick', lambda x: 0.03 * (2 * x / W - 1) ** 2, 13),
    'dish_5pct': ('Dished caliper, both edges 5 % thick', lambda x: 0.05 * (2 * x / W - 1) ** 2, 16),
    'back_band': ('One band 5 % thick near the back edge', lambda x: 0.05 if abs(x - 1500) <= 100 else 0.0, 14),
    'thick_back_edge': ('Back edge 4 % thick over its outer 250 mm', lambda x: 0.04 if x > W - 250 else 0.0, 15),
}


def make(name, title, shape, seed):
    rng = random.Random(seed)
    pos = [round(W * (i + 0.5) / 15, 1) for i in range(15)]
    vals = [round(C0 * (1 + shape(x)) + rng.gauss(0, REP), 2) for x in pos]
    case = {
        'format': 1, 'case': f'ASH-PM1-{seed:05d}', 'title': f'Ashcombe PM1 newsprint (invented): {title}',
        'complaint': 'none',
        'material': {'grade': 'newsprint', 'caliper': '78 um', 'basis_weight': '48.8 g/m2', 'moisture': '8 %'},
        'roll': {'width': '1800 mm', 'diameter': '1100 mm', 'core_diameter': '102 mm',
                 'core': {'modulus': '3 GPa', 'wall': '13 mm', 'poisson': 0.3}},
        'winding': {'tension': '350 N/m', 'nip': '1.8 kN/m', 'speed': '1500 m/min'},
        'converting': {'tension': '250 N/m'},
        'hardness': {'scale': 'rebound 0-100', 'repeatability': 1.0},
        'profiles': [{'what': 'caliper', 'age': '0 d', 'unit': 'um', 'position_unit': 'mm',
                      'positions': pos, 'values': vals, 'repeatability': f'{REP} um'}],
        'storage': [
            {'duration': '8 d', 'temperature': '18 C', 'rh': '45 %', 'barrel_wrap': 'paper',
             'end_wrap': 'paper', 'stance': 'on_end', 'place': 'Ashcombe mill store'},
            {'duration': '16 d', 'temperature': '22 C', 'rh': '50 %', 'barrel_wrap': 'paper',
             'end_wrap': 'paper', 'stance': 'on_end', 'place': 'Hollins Cross pressroom store'}],
    }
    with tempfile.NamedTemporaryFile('w', suffix='.yaml', delete=False) as f:
        yaml.safe_dump(case, f, sort_keys=False, default_flow_style=None, width=200)
    aged = json.loads(subprocess.run([BIN, 'age', '--json', f.name], capture_output=True,
                                     text=True, check=True).stdout)
    os.unlink(f.name)
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
        h = [round(at(p, [l['hardness_hardness_units'][k] for l in lanes]) + rng.gauss(0, 1.0), 1) for p in hp]
        d = [round(at(p, [l['diameter_m'][k] * 1e3 for l in lanes]) + rng.gauss(0, 0.1), 2) for p in hp]
        case['profiles'].append({'what': 'hardness', 'age': f'{age:g} d', 'position_unit': 'mm', 'positions': hp, 'values': h})
        case['profiles'].append({'what': 'diameter', 'age': f'{age:g} d', 'unit': 'mm', 'position_unit': 'mm', 'positions': hp, 'values': d})
    with open(os.path.join(HERE, f'{name}.yaml'), 'w') as f:
        f.write(f'# Invented roll (Ashcombe, a made-up mill): {title.lower()}; hardness and diameter '
                'surveys synthesised from the model with reading noise (make_cases.py).\n')
        yaml.safe_dump(case, f, sort_keys=False, default_flow_style=None, width=200)


if __name__ == '__main__':
    for name in sys.argv[1:] or CASES:
        make(name, *CASES[name])
        print(name, file=sys.stderr)
