#!/usr/bin/env python3
"""Writes the invented inputs of the invented Larkmoor calibration case: zones.txt, the
measured heads of the six bores (bores/LM*.csv), the Pellow Brook gain record inside
setup.toml, and true_values.csv. Invented data, never a check value.

How they are made: a "true" Larkmoor (model.toml with the invented true values of TRUE
below in place of the modeller's first guess, and without its `measured` lines) is run once
in a temporary folder with the given aquiledger. Its heads at the bores (observations.csv)
and the brook's net gain from the aquifer (out - in of the `river` rows of budget_steps.csv;
the brook is the model's only river) are interpolated linearly to the reading times of
TIMES, then given Gaussian noise (Python's random.gauss, seed SEED, so the files are the
same on every run): standard deviation HEAD_SD for heads, FLOW_SD for the gain, the same
values the set-up's weights state. Heads are rounded to 1 mm and the gain to 1 m3/d.

    python3 make_inputs.py path/to/aquiledger
"""
import csv
import pathlib
import random
import subprocess
import sys
import tempfile

here = pathlib.Path(__file__).resolve().parent
exe = sys.argv[1] if len(sys.argv) > 1 else "aquiledger"

# The invented truth the measurements come from; setup.toml starts from model.toml's guess.
TRUE = {"K valley sands": 20.0, "K upland": 3.0, "specific yield": 0.08,
        "recharge multiplier": 0.75, "brook bed multiplier": 2.0}
SEED = 6
HEAD_SD = 0.05   # m, reading error of a dipped bore (common practice: a few cm)
FLOW_SD = 150.0  # m3/d, gauging error of the brook's gain
TIMES = [0.0] + [45.0 + 30.0 * k for k in range(18)]  # d: before pumping, then monthly
BORES = ["LM1", "LM2", "LM3", "LM4", "LM5", "LM6"]
NROW, NCOL, ZONE1_COLS = 40, 50, 22  # zone 1 (valley sands): the western 22 columns

with open(here / "zones.txt", "w") as f:
    f.write("# K zones of Larkmoor: 1 valley sands (west), 2 upland silty sands (east)\n")
    for _ in range(NROW):
        f.write(" ".join("1" if c < ZONE1_COLS else "2" for c in range(NCOL)) + "\n")


def swap(text, old, new):
    assert text.count(old) == 1, old
    return text.replace(old, new)


model = (here / "model.toml").read_text()
model = swap(model, "values = { 1 = 8.0, 2 = 4.0 }",
             f"values = {{ 1 = {TRUE['K valley sands']}, 2 = {TRUE['K upland']} }}")
model = swap(model, "specific_yield = 0.2", f"specific_yield = {TRUE['specific yield']}")
m = TRUE["recharge multiplier"]
model = swap(model, "rate = [0.0006, 0.0003, 0.0006]",
             f"rate = [{0.0006 * m}, {0.0003 * m}, {0.0006 * m}]")
model = swap(model, "bed_conductance = 5.0",
             f"bed_conductance = {5.0 * TRUE['brook bed multiplier']}")
model = "\n".join(l for l in model.splitlines() if not l.startswith("measured = ")) + "\n"

with tempfile.TemporaryDirectory() as tmp:
    tmp = pathlib.Path(tmp)
    (tmp / "model.toml").write_text(model)
    (tmp / "zones.txt").write_text((here / "zones.txt").read_text())
    subprocess.run([exe, "run", str(tmp / "model.toml"), "-o", str(tmp / "r"), "-q"],
                   check=True, stdout=subprocess.DEVNULL)
    heads = {}
    for r in csv.DictReader(open(tmp / "r" / "observations.csv")):
        heads.setdefault(r["observation"], []).append((float(r["time"]), float(r["head"])))
    gain = []
    for r in csv.DictReader(open(tmp / "r" / "budget_steps.csv")):
        if r["component"] == "river":
            gain.append((float(r["time"]), float(r["out_of_aquifer"]) - float(r["into_aquifer"])))
    # Time 0 is the steady state of the first period (before pumping), which its one steady
    # step keeps: its gain is that step's.
    gain.insert(0, (0.0, gain[0][1]))


def at(series, t):
    for (t0, v0), (t1, v1) in zip(series, series[1:]):
        if t0 <= t <= t1:
            return v0 if t1 == t0 else v0 + (t - t0) / (t1 - t0) * (v1 - v0)
    raise ValueError(f"time {t} outside the run")


rng = random.Random(SEED)
(here / "bores").mkdir(exist_ok=True)
for b in BORES:
    with open(here / "bores" / f"{b}.csv", "w") as f:
        f.write("time,head\n")
        f.write(f"# Invented readings of bore {b}, Larkmoor (make_inputs.py); m, days\n")
        for t in TIMES:
            f.write(f"{t:g},{at(heads[b], t) + rng.gauss(0.0, HEAD_SD):.3f}\n")
record = [(t, round(at(gain, t) + rng.gauss(0.0, FLOW_SD))) for t in TIMES]

parameters = [
    ("K valley sands", 'property = "k"\nzone = 1\nform = "value"\nstart = 8.0\nlower = 0.5\n'
                       "upper = 200.0"),
    ("K upland", 'property = "k"\nzone = 2\nform = "value"\nstart = 4.0\nlower = 0.1\n'
                 "upper = 100.0"),
    ("specific yield", 'property = "specific_yield"\nform = "value"\nstart = 0.2\n'
                       "lower = 0.01\nupper = 0.4"),
    ("recharge multiplier", 'property = "recharge"\nlower = 0.1\nupper = 5.0'),
    ("brook bed multiplier", 'property = "river_conductance"\nfeature = "Pellow Brook"\n'
                             "lower = 0.01\nupper = 100.0"),
]
with open(here / "setup.toml", "w") as f:
    f.write("# Calibration of the invented Larkmoor case (README.md): K of both zones, the\n"
            "# specific yield, a recharge multiplier and a multiplier of the brook's bed\n"
            "# conductance, fitted to six bores' heads and the brook's gain record.\n"
            "# Written by make_inputs.py; the record below is invented data.\n"
            "#     aquiledger estimate setup.toml\n\n"
            '[estimate]\nmodel = "model.toml"\nmax_iterations = 30\n')
    for name, body in parameters:
        f.write(f'\n[[parameter]]\nname = "{name}"\n{body}\n')
    for b in BORES:
        f.write(f'\n[[target]]\nname = "{b} heads"\nkind = "head"\nbore = "{b}"   '
                f"# its measured file, bores/{b}.csv\nstandard_deviation = {HEAD_SD}\n")
    f.write('\n[[target]]\nname = "Pellow Brook gain"\nkind = "flow"           '
            "# out of the aquifer into the brook, m3/d\n"
            'feature = "Pellow Brook"\n'
            f"times = [{', '.join(f'{t:g}' for t, _ in record)}]\n"
            f"values = [{', '.join(str(v) for _, v in record)}]\n"
            f"standard_deviation = {FLOW_SD}\n")
with open(here / "true_values.csv", "w") as f:
    f.write("parameter,true_value\n")
    for name, v in TRUE.items():
        f.write(f"{name},{v}\n")
print(f"wrote zones.txt, bores/*.csv, setup.toml and true_values.csv in {here}")
