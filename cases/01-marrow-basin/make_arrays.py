#!/usr/bin/env python3
"""Writes the array files of the Marrow Basin demo (an invented basin, invented data).

Run from this folder: python3 make_arrays.py. The files it writes are committed, so the
case runs without it; it is kept to show how they were made and to change them.
"""
import math

NROW, NCOL = 60, 80


def graded(n, fine_lo, fine_hi, fine, coarse, ratio=1.35):
    """Cell sizes: `fine` inside [fine_lo, fine_hi), growing by `ratio` per cell up to `coarse`."""
    sizes = []
    for i in range(n):
        d = fine_lo - i if i < fine_lo else (i - fine_hi + 1 if i >= fine_hi else 0)
        sizes.append(min(coarse, fine * ratio ** d))
    return sizes


# Finer cells (60 m) around the Calloway well field, 250 m elsewhere.
dx = graded(NCOL, 46, 58, 60.0, 250.0)
dy = graded(NROW, 24, 36, 60.0, 250.0)
x_edges = [0.0]
for w in dx:
    x_edges.append(x_edges[-1] + w)
y_top = sum(dy)
y_edges = [y_top]
for h in dy:
    y_edges.append(y_edges[-1] - h)
xc = [0.5 * (x_edges[j] + x_edges[j + 1]) for j in range(NCOL)]
yc = [0.5 * (y_edges[i] + y_edges[i + 1]) for i in range(NROW)]
W, H = x_edges[-1], y_top


def write_values(name, values_of, comment, fmt="{:.6g}"):
    with open(name, "w") as out:
        out.write("# " + comment + "\n")
        for i in range(NROW):
            out.write(" ".join(fmt.format(values_of(i, j)) for j in range(NCOL)) + "\n")


def inside(i, j):
    """An irregular basin: an ellipse with a wavy rim, cut straight along the lake shore in the west."""
    u = (xc[j] - 0.52 * W) / (0.55 * W)
    v = (yc[i] - 0.5 * H) / (0.47 * H)
    angle = math.atan2(v, u)
    rim = 1.0 + 0.08 * math.sin(3.0 * angle) + 0.05 * math.cos(5.0 * angle + 0.7)
    return u * u + v * v <= rim * rim


with open("dx.txt", "w") as out:
    out.write("# column widths (m), west to east: 60 m around the well field, 250 m elsewhere\n")
    out.write("\n".join("{:.4f}".format(w) for w in dx) + "\n")
with open("dy.txt", "w") as out:
    out.write("# row heights (m), north to south\n")
    out.write("\n".join("{:.4f}".format(h) for h in dy) + "\n")

write_values("active.txt", lambda i, j: 1 if inside(i, j) else 0, "active cells of the Marrow Basin (1 = in the model)", "{:d}")


def lake_shore(i, j):
    """The lake holds the westernmost active cell of each row along the straight west shore
    (the western tenth of the grid); farther east the rim is the basin's no-flow outline."""
    if not inside(i, j) or xc[j] > 0.1 * W:
        return False
    return all(not inside(i, k) for k in range(j))


write_values("lake_shore.txt", lambda i, j: 1 if lake_shore(i, j) else 0, "cells held at the Lake Brindle level (1 = shore cell)", "{:d}")


def creek_y(x):
    """Centre line of the Wyndle Creek valley (the creek polyline in model.toml wanders about it)."""
    return 0.78 * H - 0.2 * H * x / W


def zone(i, j):
    # 3: the gravel channel along Wyndle Creek; 2: silty clay wedge in the south; 1: sands.
    if abs(yc[i] - creek_y(xc[j])) < 600.0:
        return 3
    if yc[i] < 0.22 * H + 0.08 * xc[j]:
        return 2
    return 1


write_values("zones.txt", zone, "K and Sy zones: 1 sands, 2 silty clay wedge, 3 creek gravels", "{:d}")
# The confining bed's base dips gently west, toward Lake Brindle.
write_values("top.txt", lambda i, j: 28.0 + 4.0 * xc[j] / W, "aquifer top (m): base of the confining clay")
# Wyndle Creek stage and bed bottom, sampled at the cells the creek crosses.
write_values("creek_stage.txt", lambda i, j: 36.6 + 3.4 * xc[j] / W, "Wyndle Creek stage (m), falling toward the lake")
write_values("creek_bed.txt", lambda i, j: 35.1 + 3.4 * xc[j] / W, "Wyndle Creek bed bottom (m)")


def near(i, j, x0, y0, rx, ry):
    return ((xc[j] - x0) / rx) ** 2 + ((yc[i] - y0) / ry) ** 2 <= 1.0


write_values("fenwick_springs.txt", lambda i, j: 1 if near(i, j, 0.8 * W, 0.3 * H, 900.0, 600.0) else 0,
             "Fenwick Springs tile drains (1 = drained cell)", "{:d}")
write_values("reedmere_marsh.txt", lambda i, j: 1 if near(i, j, 0.16 * W, 0.47 * H, 1300.0, 1100.0) else 0,
             "Reedmere marsh, where the water table feeds reeds and open water", "{:d}")
for x in (15800.0, 12500.0, 9000.0, 5500.0, 2000.0, 200.0):
    print("creek centre at x = {:.0f}: y = {:.0f}".format(x, creek_y(x)))
print("grid {:.0f} m x {:.0f} m".format(W, H))
