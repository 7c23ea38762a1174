#!/usr/bin/env python3
"""Lane-count agreement of run.py's outputs: for each pair of lane settings, the rolls whose
finding lists (defects) differ and the defects that differ; the count of findings; the level
rolls' findings; conical rolls found on the wedged rolls.

Usage: python3 benches/lane_count/summarize.py OUT [OUT ...]
"""
import collections, glob, json, os, sys


def load(out):
    rows = collections.defaultdict(dict)
    for f in glob.glob(os.path.join(out, '*.json')):
        name, n = os.path.basename(f)[:-5].rsplit('.', 1)
        d = json.load(open(f))
        rows[name][n] = {x['defect'] for x in d['findings']}
    return rows


for out in sys.argv[1:]:
    r = load(out)
    cells = []
    for a, b in (('def', '40'), ('17', '40'), ('8', '17'), ('def', '17')):
        rolls = sum(1 for c in r if r[c][a] != r[c][b])
        defects = sum(len(r[c][a] ^ r[c][b]) for c in r)
        cells.append(f'{a}~{b}: {rolls} rolls, {defects} defects')
    total = sum(len(v) for c in r for v in r[c].values())
    level = sum(len(v) for c in r if 'level' in c for v in r[c].values())
    wedged = [(c, n) for c in r if 'wedge' in c and 'band' not in c for n in r[c]]
    conical = sum('conical_roll' in r[c][n] for c, n in wedged)
    print(f'{out}: ' + ' | '.join(cells) + f' | findings {total} | on level rolls {level}'
          f' | conical on wedged rolls {conical} of {len(wedged)}')
