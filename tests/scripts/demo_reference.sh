#!/usr/bin/env bash
# The demo basin against its reference figures (cases/01-marrow-basin/reference/figures.csv):
# every budget volume per period and component, every bore's head at each period's end, the
# count of water-table cells at each period's end, and the budget's closure. A regression
# guard, not a validation (the closed-form checks are `aquiledger verify` and the solver
# tests): it says when a change moves the demo's answers, so that the change is a choice.
# Tolerances, stated per figure in the file: volumes 1e-6 relative (the Newton stopping rule
# closes every cell's balance far tighter, so summation order, threads or another BLAS move
# them by orders of magnitude less); heads 1e-4 m; cell counts exact; the largest imbalance
# below 1e-6 % (the program's own promise, README).
#   bash demo_reference.sh <aquiledger> <source-dir>            compare
#   bash demo_reference.sh <aquiledger> <source-dir> --write    rewrite the figures after a
#                                                               change whose effect is wanted
set -euo pipefail
exe=$(realpath "$1")
src=$(realpath "$2")
mode=${3:-compare}
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
"$exe" run "$src/cases/01-marrow-basin/model.toml" -o "$t/demo" -q >/dev/null
python3 - "$t/demo" "$src/cases/01-marrow-basin/reference/figures.csv" "$mode" <<'PY'
import csv, json, os, sys
folder, reference, mode = sys.argv[1:4]

def rows(name):
    with open(os.path.join(folder, name), newline="") as f:
        return list(csv.DictReader(f))

figures = []  # (figure, value, tolerance kind, tolerance, unit)
for r in rows("budget_periods.csv"):
    for side in ("into_aquifer", "out_of_aquifer"):
        figures.append((f"period {r['period']} {r['component']} {side}", float(r[side]),
                        "relative", 1e-6, r["unit"]))
ends = {int(r["period"]): float(r["end"]) for r in rows("budget_periods.csv")}
for r in rows("observations.csv"):
    if int(r["period"]) in ends and float(r["time"]) == ends[int(r["period"])]:
        figures.append((f"period {r['period']} end head {r['observation']}", float(r["head"]),
                        "absolute", 1e-4, "m"))
steps = rows("balance_steps.csv")
for p, end in ends.items():
    last = [r for r in steps if int(r["period"]) == p and float(r["time"]) == end]
    if last:
        figures.append((f"period {p} end water_table_cells", float(last[0]["water_table_cells"]),
                        "absolute", 0.0, "cells"))

if mode == "--write":
    os.makedirs(os.path.dirname(reference), exist_ok=True)
    with open(reference, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["figure", "value", "tolerance_kind", "tolerance", "unit"])
        for fig, v, kind, tol, unit in figures:
            w.writerow([fig, repr(v), kind, tol, unit])
    print(f"wrote {len(figures)} figures to {reference}")
    sys.exit(0)

with open(reference, newline="") as f:
    expected = {r["figure"]: r for r in csv.DictReader(f)}
got = {fig: (v, kind, tol, unit) for fig, v, kind, tol, unit in figures}
bad = []
for fig, r in expected.items():
    if fig not in got:
        bad.append(f"{fig}: missing from this run's results")
        continue
    v, ref, tol = got[fig][0], float(r["value"]), float(r["tolerance"])
    err = abs(v - ref) / abs(ref) if r["tolerance_kind"] == "relative" and ref != 0 else abs(v - ref)
    if err > tol:
        bad.append(f"{fig}: {v!r} {r['unit']}, reference {ref!r} (off by {err:.3g}, allowed {tol:g})")
for fig in got:
    if fig not in expected:
        bad.append(f"{fig}: new in this run, not in the reference")
summary = json.load(open(os.path.join(folder, "summary.json")))
if not summary["converged"] or summary["largest_imbalance_percent"] > 1e-6:
    bad.append(f"largest imbalance {summary['largest_imbalance_percent']} % (at most 1e-6 %)")
if bad:
    print("FAIL: the demo's answers moved:\n  " + "\n  ".join(bad))
    print("If the change is meant, rewrite the figures with --write and say why in the commit.")
    sys.exit(1)
print(f"demo reference: {len(expected)} figures within their tolerances")
PY
