#!/usr/bin/env python3
"""Writes the array files of the invented Quillon Vale case: beds.txt, the total thickness
(m) of clay interbeds in each cell, thickest (14 m) under the valley floor around the
Sallow Cross well field and thinning to none at the valley sides. Invented data."""
import math

nrow, ncol, d = 30, 40, 250.0
cx, cy = 20 * d, 15 * d  # centre of the clay body (m)
with open("beds.txt", "w") as f:
    for r in range(nrow):
        y = (nrow - r - 0.5) * d  # row 1 is the north edge
        row = []
        for c in range(ncol):
            x = (c + 0.5) * d
            dist = math.hypot((x - cx) / 4000.0, (y - cy) / 2500.0)
            row.append(f"{max(0.0, 14.0 * (1.0 - dist)):.2f}")
        f.write(" ".join(row) + "\n")
