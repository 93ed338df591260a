#!/usr/bin/env python3
"""Writes the invented inputs of the Ashby Fen case (README.md): well and bore tables, the
monthly pumping log, recharge by month, bore readings and a land-surface raster finer than
the model grid. Invented data for a demonstration only; run it to regenerate them."""
import csv
import math
import random

random.seed(20150101)
YEARS = range(2015, 2025)
DRY = {2018: 0.35, 2019: 0.55}  # recharge factor of the drought years

# Wells: name, x, y, and a fixed rate for the dairy (the others come from the pumping log).
wells = [("Ashby 1", 5300.0, 4100.0, ""), ("Ashby 2", 5700.0, 3700.0, ""),
         ("Ashby 3", 6100.0, 4300.0, ""), ("Fen dairy", 2900.0, 2500.0, "150")]
with open("wells.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["name", "x", "y", "pumping_rate"])
    w.writerows(wells)

# Pumping log: the town wells' monthly mean rates (m3/d), more in summer and in dry years.
with open("pumping_log.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["date", "Ashby 1", "Ashby 2", "Ashby 3"])
    for y in YEARS:
        for m in range(1, 13):
            summer = 1.0 + 0.45 * math.sin(math.pi * (m - 3) / 6.0) if 4 <= m <= 9 else 0.8
            dry = 1.25 if y in DRY else 1.0
            row = [f"{y}-{m:02d}-01"]
            for base in (1400.0, 1100.0, 900.0):
                row.append(round(base * summer * dry * random.uniform(0.93, 1.07)))
            if y == 2021 and m in (5, 6):
                row[3] = ""  # Ashby 3 out of service: its last logged rate holds (see README)
            w.writerow(row)

# Recharge (m/d): wet winters, none in summer, little in the drought years.
with open("recharge.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["date", "rain"])
    for y in YEARS:
        for m in range(1, 13):
            wet = max(0.0, math.cos(math.pi * (m - 1) / 6.0))
            w.writerow([f"{y}-{m:02d}-01", f"{0.00025 * wet * DRY.get(y, 1.0):.6f}"])

# Bores: name, x, y; readings every two months with gaps, in one table of columns by bore.
bores = [("B-north", 5500.0, 5600.0), ("B-field", 5800.0, 4000.0), ("B-fen", 2500.0, 3100.0)]
with open("bores.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["name", "x", "y"])
    w.writerows(bores)
with open("bore_levels.csv", "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["date"] + [b[0] for b in bores])
    for y in YEARS:
        for m in range(2, 13, 2):
            season = -0.6 * math.sin(math.pi * (m - 3) / 6.0)
            dry = -1.2 if y in DRY else 0.0
            row = [f"{y}-{m:02d}-15"]
            for k, base in enumerate((21.4, 20.1, 19.6)):
                if random.random() < 0.15:
                    row.append("")  # no reading that visit
                else:
                    depth = (2.0 if k == 1 else 0.8) * (season + dry)
                    row.append(f"{base + depth + random.gauss(0.0, 0.08):.2f}")
            w.writerow(row)

# Land surface (m): an ESRI ASCII raster of 100 m pixels, offset from the 200 m model grid, a
# valley along the Ashby Brook falling west; the fen lies low in the south-west.
nx, ny, cell, x0, y0 = 81, 61, 100.0, -50.0, -50.0
with open("land_surface.asc", "w") as f:
    f.write(f"ncols {nx}\nnrows {ny}\nxllcorner {x0}\nyllcorner {y0}\ncellsize {cell}\n")
    f.write("NODATA_value -9999\n")
    for j in range(ny):
        y = y0 + (ny - j - 0.5) * cell
        row = []
        for i in range(nx):
            x = x0 + (i + 0.5) * cell
            valley = 2.5 * min(1.0, abs(y - (3000.0 + 0.1 * x)) / 1500.0)
            fen = -1.5 * math.exp(-((x - 2300.0) ** 2 + (y - 2700.0) ** 2) / 900.0 ** 2)
            row.append(f"{20.8 + 0.0007 * x + valley + fen:.2f}")
        f.write(" ".join(row) + "\n")
