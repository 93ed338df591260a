"""Writes a synthetic switching basin and, for each seed, an estimation set-up of its heads
with Gaussian noise: the "synthetic twin" test of a calibration (Hill and Tiedeman, 2007,
Effective Groundwater Model Calibration; from memory: data made by the model itself from known
parameter values, plus noise of a stated standard deviation, so that the fit's estimates and
intervals can be compared with the values that made the data).

    /usr/bin/python3 estimate_switching.py AQUILEDGER FOLDER --seeds 1 2 ... [--noise SD]

The basin (invented, 3 km by 2.4 km, 100 m cells): a 20 m thick aquifer whose head starts
4 m above its confining top, held at that head along the west edge, with two K zones (west
and east of x = 1500 m). A well in the east zone pumps 4000 m3/d for 3 days, then the basin
recovers for 7 days. Near the well the head falls below the top, so those cells turn from
confined (storage S) to water-table (storage Sy) and back again as they recover; far from it they
stay confined. Five bores at 100 m to 1.3 km from the well record heads at every step end.

FOLDER/model.toml holds the true values (TRUE below); `aquiledger run` gives the true heads
(observations.csv, at the step ends, so the fit's linear interpolation in time is exact at
the target times). For each seed, FOLDER/seed<N>/setup.toml fits K of both zones, S and Sy
as values, starting a factor 2.4 to 3 away from the truth, to those heads plus Gaussian noise
of standard deviation SD (Python's random.gauss, seed N), with the weights 1 / SD^2. The
true values are written to FOLDER/true_values.csv. Invented data: the check is the coverage
of the intervals (binomial, see estimate_switching_noisy.sh), not these values."""
import argparse
import csv
import pathlib
import random
import subprocess

TRUE = {"k west": 30.0, "k east": 15.0, "storativity": 2.0e-4, "specific_yield": 0.12}
START = {"k west": 12.0, "k east": 40.0, "storativity": 6.0e-4, "specific_yield": 0.05}
BOUNDS = {"k west": (0.1, 1000.0), "k east": (0.1, 1000.0), "storativity": (1.0e-7, 0.05),
          "specific_yield": (0.001, 0.6)}
NROW, NCOL, DX = 24, 30, 100.0
WELL = (2250.0, 1250.0)
BORES = {"SB1": (2350.0, 1250.0), "SB2": (2250.0, 1550.0), "SB3": (1750.0, 1150.0),
         "SB4": (950.0, 1450.0), "SB5": (2850.0, 350.0)}

args = argparse.ArgumentParser()
args.add_argument("exe")
args.add_argument("folder")
args.add_argument("--seeds", type=int, nargs="+", required=True)
args.add_argument("--noise", type=float, default=0.1)
a = args.parse_args()
folder = pathlib.Path(a.folder)

with open(folder / "zones.txt", "w") as f:
    for _ in range(NROW):
        f.write(" ".join("1" if c < NCOL // 2 else "2" for c in range(NCOL)) + "\n")
model = f"""[model]
title = "Synthetic switching basin"
length_unit = "m"
time_unit = "d"
[grid]
nrow = {NROW}
ncol = {NCOL}
dx = {DX}
dy = {DX}
[aquifer]
condition = "switching"
top = 20.0
bottom = 0.0
k = {{ zones = "zones.txt", values = {{ 1 = {TRUE['k west']!r}, 2 = {TRUE['k east']!r} }} }}
storativity = {TRUE['storativity']!r}
specific_yield = {TRUE['specific_yield']!r}
[initial]
head = 24.0
[[period]]
name = "pumping"
length = 3.0
steps = 12
growth = 1.4
[[period]]
name = "recovery"
length = 7.0
steps = 8
growth = 1.4
[[external_head]]
name = "west boundary"
edge = "west"
head = 24.0
conductance = 1000.0
[[well]]
name = "pumped"
x = {WELL[0]}
y = {WELL[1]}
pumping_rate = [4000.0, 0.0]
[output]
fields = "none"
"""
for name, (x, y) in BORES.items():
    model += f'[[observation]]\nname = "{name}"\nx = {x}\ny = {y}\n'
(folder / "model.toml").write_text(model)
subprocess.run([a.exe, "run", str(folder / "model.toml"), "-o", str(folder / "true"), "-q"],
               check=True, stdout=subprocess.DEVNULL)
heads = {}
for r in csv.DictReader(open(folder / "true" / "observations.csv")):
    if float(r["time"]) > 0.0:
        heads.setdefault(r["observation"], []).append((float(r["time"]), float(r["head"])))
with open(folder / "true_values.csv", "w") as f:
    f.write("parameter,true_value\n")
    for name, v in TRUE.items():
        f.write(f"{name},{v!r}\n")

for seed in a.seeds:
    rng = random.Random(seed)
    d = folder / f"seed{seed}"
    d.mkdir()
    text = '[estimate]\nmodel = "../model.toml"\n'
    for name in TRUE:
        prop = "k" if name.startswith("k ") else name
        zone = {"k west": "zone = 1\n", "k east": "zone = 2\n"}.get(name, "")
        lo, hi = BOUNDS[name]
        text += (f'[[parameter]]\nname = "{name}"\nproperty = "{prop}"\n{zone}form = "value"\n'
                 f"start = {START[name]!r}\nlower = {lo!r}\nupper = {hi!r}\n")
    for bore, series in heads.items():
        values = [h + rng.gauss(0.0, a.noise) for _, h in series]
        text += (f'[[target]]\nname = "{bore}"\nkind = "head"\nbore = "{bore}"\n'
                 f"standard_deviation = {a.noise!r}\n"
                 f"times = [{', '.join(repr(t) for t, _ in series)}]\n"
                 f"values = [{', '.join(repr(v) for v in values)}]\n")
    (d / "setup.toml").write_text(text)
