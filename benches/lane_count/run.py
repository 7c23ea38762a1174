#!/usr/bin/env python3
"""Diagnose every roll of a folder at the default lanes and at 8, 17 and 40 lanes.

Usage: python3 benches/lane_count/run.py BIN CASES OUT [--new-ids]
Writes OUT/<roll>.<lanes>.json (lanes: def, 8, 17, 40), two runs at a time. --new-ids appends
"-B" to every case id first (the noise draws are seeded from the case id, so this redraws them).
"""
import os, re, shutil, subprocess, sys, tempfile
from concurrent.futures import ThreadPoolExecutor

binp, cases, out = sys.argv[1:4]
os.makedirs(out, exist_ok=True)
src = cases
if '--new-ids' in sys.argv:
    src = tempfile.mkdtemp()
    for f in os.listdir(cases):
        if f.endswith('.yaml'):
            text = open(os.path.join(cases, f)).read()
            open(os.path.join(src, f), 'w').write(re.sub(r'^case: (.*)$', r'case: \1-B', text, flags=re.M))
jobs = [(f[:-5], n) for f in sorted(os.listdir(src)) if f.endswith('.yaml') for n in ('def', '8', '17', '40')]


def run(job):
    name, n = job
    cmd = [binp, 'diagnose', os.path.join(src, name + '.yaml'), '--json', '-q']
    if n != 'def':
        cmd += ['--set', f'lanes.count={n}']
    r = subprocess.run(cmd, capture_output=True)
    open(os.path.join(out, f'{name}.{n}.json'), 'wb').write(r.stdout)


with ThreadPoolExecutor(2) as ex:
    list(ex.map(run, jobs))
if src != cases:
    shutil.rmtree(src)
