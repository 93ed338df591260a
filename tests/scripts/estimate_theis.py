"""Writes a Theis (1935) pumping test as an aquiledger model and estimation set-up: a confined
aquifer on a telescoping grid, one well, drawdowns at bores on cell centres computed here from
the Theis solution s = Q / (4 pi T) E1(r^2 S / (4 T t)) with scipy.special.exp1.
    /usr/bin/python3 estimate_theis.py FOLDER T S [water_table] [--noise SD --seed N]
        [--width-growth G --extent L --steps N --step-growth G]
Writes FOLDER/model.toml and FOLDER/setup.toml (fitting K and storativity as values). With
--noise, every drawdown gets Gaussian noise of standard deviation SD (m; Python's
random.gauss with the given seed) and the targets' standard deviation is SD; the grid and
the time steps may be made coarser for quick repeated fits (defaults: widths growing by 1.2
to 6 km, 200 steps growing by 1.5 %). With
water_table, the aquifer is a 50 m thick water-table one and S stands for the specific yield:
the drawdowns (under 1 m) stay a small part of the saturated thickness, where the Theis
solution with S = Sy describes the late response of an unconfined aquifer (Neuman, 1975,
Water Resour. Res. 11(2) 329-342, late-time limit)."""
import argparse
import math
import random

from scipy.special import exp1

args = argparse.ArgumentParser()
args.add_argument("folder")
args.add_argument("T", type=float)
args.add_argument("S", type=float)
args.add_argument("kind", nargs="?", default="confined", choices=["confined", "water_table"])
args.add_argument("--noise", type=float, default=0.0)
args.add_argument("--seed", type=int, default=1)
args.add_argument("--width-growth", type=float, default=1.2)
args.add_argument("--extent", type=float, default=6000.0)
args.add_argument("--steps", type=int, default=200)
args.add_argument("--step-growth", type=float, default=1.015)
a = args.parse_args()
folder, T, S = a.folder, a.T, a.S
water_table = a.kind == "water_table"
rng = random.Random(a.seed)
b, Q = (50.0 if water_table else 10.0), 1000.0  # aquifer thickness (m) and pumping (m3/d)
prop = "specific_yield" if water_table else "storativity"
# Telescoping widths: 2 m at the well, growing by 1.2 to 6 km either side (the Theis drawdown
# there stays below 1e-3 of that at the nearest bore over the 2 days).
half, w, total = [], 2.0, 1.0
while total < a.extent:
    w *= a.width_growth
    half.append(w)
    total += w
widths = half[::-1] + [2.0] + half
n = len(widths)
x0 = -sum(half) - 1.0
centres, x = [], x0
for wd in widths:
    centres.append(x + wd / 2)
    x += wd
# Bores east of the well at the cell centres nearest these radii.
bores = []
for r in (15.0, 40.0, 100.0, 250.0):
    c = min((c for c in centres if c > 0), key=lambda c: abs(c - r))
    bores.append(c)
times = [0.2 * 1.25**k for k in range(0, 11) if 0.2 * 1.25**k <= 2.0]
fmt = lambda v: repr(float(v))
with open(f"{folder}/model.toml", "w") as f:
    f.write(f"""[model]
title = "Theis test"
[grid]
nrow = {n}
ncol = {n}
dx = [{", ".join(map(fmt, widths))}]
dy = [{", ".join(map(fmt, widths))}]
origin = [{x0}, {x0}]
[aquifer]
{'' if water_table else 'top = 0.0'}
bottom = {-b}
k = 5.0
condition = "{'water_table' if water_table else 'confined'}"
{prop} = {0.05 if water_table else 1.0e-3}
[initial]
head = 0.0
[[period]]
length = 2.0
steps = {a.steps}
growth = {a.step_growth}
[[well]]
name = "pumped"
x = 0.0
y = 0.0
pumping_rate = {Q}
""")
    for i, r in enumerate(bores):
        f.write(f'[[observation]]\nname = "bore {i + 1}"\nx = {r!r}\ny = 0.0\n')
with open(f"{folder}/setup.toml", "w") as f:
    f.write(f"""[estimate]
model = "model.toml"
[[parameter]]
name = "k"
property = "k"
form = "value"
start = 5.0
lower = 0.01
upper = 1000.0
[[parameter]]
name = "{prop}"
property = "{prop}"
form = "value"
start = 1.0e-3
lower = 1.0e-7
upper = 0.5
""")
    for i, r in enumerate(bores):
        s = [Q / (4 * math.pi * T) * exp1(r * r * S / (4 * T * t)) for t in times]
        s = [v + rng.gauss(0.0, a.noise) for v in s] if a.noise > 0 else s
        f.write(f'[[target]]\nname = "bore {i + 1}"\nkind = "drawdown"\nbore = "bore {i + 1}"\n')
        if a.noise > 0:
            f.write(f"standard_deviation = {a.noise!r}\n")
        f.write(f"times = [{', '.join(map(fmt, times))}]\nvalues = [{', '.join(map(fmt, s))}]\n")
