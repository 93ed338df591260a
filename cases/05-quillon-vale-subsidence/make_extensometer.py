#!/usr/bin/env python3
"""Writes extensometer.csv, the invented monthly readings of the Sallow Cross extensometer
of the invented Quillon Vale case. Invented data, never a check value.

How they are made: the case is run once without the readings (a copy of model.toml without
its `measured` line, in a temporary folder); the simulated subsidence at the extensometer
(subsidence_points.csv) is interpolated linearly to the first day of every month from
2019-01-01 to 2023-12-01, scaled by 1.08 (the invented ground sinks 8 % more than the model
says, so the residuals show a bias a modeller would look into), given Gaussian noise of
standard deviation 1.5 mm (Python's random.gauss, seed 21: the file is the same on every
run) and rounded to 0.1 mm. Subsidence in metres, positive = the ground has sunk since
2018-01-01 (model time 0).

    python3 make_extensometer.py path/to/aquiledger
"""
import csv
import datetime
import pathlib
import random
import shutil
import subprocess
import sys
import tempfile

here = pathlib.Path(__file__).resolve().parent
exe = sys.argv[1] if len(sys.argv) > 1 else "aquiledger"
start = datetime.date(2018, 1, 1)  # [model].start_date
point = "Sallow Cross extensometer"

with tempfile.TemporaryDirectory() as tmp:
    tmp = pathlib.Path(tmp)
    text = (here / "model.toml").read_text()
    text = "\n".join(l for l in text.splitlines() if not l.startswith("measured = "))
    (tmp / "model.toml").write_text(text + "\n")
    shutil.copy(here / "beds.txt", tmp / "beds.txt")
    subprocess.run([exe, "run", str(tmp / "model.toml"), "-o", str(tmp / "r"), "-q"],
                   check=True, stdout=subprocess.DEVNULL)
    series = [(float(r["time"]), float(r["subsidence"]))
              for r in csv.DictReader(open(tmp / "r" / "subsidence_points.csv"))
              if r["point"] == point]

def simulated(t):
    for (t0, s0), (t1, s1) in zip(series, series[1:]):
        if t0 <= t <= t1:
            return s0 if t1 == t0 else s0 + (t - t0) / (t1 - t0) * (s1 - s0)
    raise ValueError(f"time {t} outside the run")

rng = random.Random(21)
with open(here / "extensometer.csv", "w") as f:
    f.write("date,subsidence\n")  # the header must be the first line
    f.write("# Invented readings of the Sallow Cross extensometer (make_extensometer.py)\n")
    for year in range(2019, 2024):
        for month in range(1, 13):
            day = datetime.date(year, month, 1)
            value = 1.08 * simulated((day - start).days) + rng.gauss(0.0, 0.0015)
            f.write(f"{day.isoformat()},{value:.4f}\n")
