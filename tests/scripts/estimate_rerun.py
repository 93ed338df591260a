"""Checks that a fitted model written by `aquiledger estimate` reproduces the fit: the run of
FIT/fitted_model.toml (results in FIT/results) must give, at every measured time of every
target, the simulated value of FIT/target_residuals.csv to rounding (both come from the same
model, read once from the set-up and its multipliers, once from the written values).
    /usr/bin/python3 estimate_rerun.py SETUP.toml FIT [tolerance]
Heads, drawdowns and head differences come from results/observations.csv, flows from
results/budget_steps.csv (a flow target's feature must be the only one of its kind), each
interpolated linearly in time between the written steps as the estimation does."""
import csv
import os
import sys
import tomllib

setup_file, fit = sys.argv[1], sys.argv[2]
tolerance = float(sys.argv[3]) if len(sys.argv) > 3 else 1e-6
setup = tomllib.load(open(setup_file, "rb"))
results = os.path.join(fit, "results")

series = {}  # (bore, column) -> [(time, value)]
for r in csv.DictReader(open(os.path.join(results, "observations.csv"))):
    for col in ("head", "drawdown"):
        series.setdefault((r["observation"], col), []).append((float(r["time"]), float(r[col])))
for r in csv.DictReader(open(os.path.join(results, "budget_steps.csv"))):
    # Net flow from the aquifer into the features of the kind: out - in.
    q = float(r["out_of_aquifer"]) - float(r["into_aquifer"])
    series.setdefault((r["component"], "flow"), []).append((float(r["time"]), q))


def at(key, t):
    pts = series[key]
    if t <= pts[0][0]:
        return pts[0][1]
    for (t0, v0), (t1, v1) in zip(pts, pts[1:]):
        if t <= t1:
            a = (t - t0) / (t1 - t0) if t1 > t0 else 1.0
            return (1 - a) * v0 + a * v1
    return pts[-1][1]


kinds = {}  # feature name -> kind, from the fitted model
model = tomllib.load(open(os.path.join(fit, "fitted_model.toml"), "rb"))
for kind in ("river", "drain", "external_head"):
    entries = model.get(kind, [])
    for i, e in enumerate(entries):
        kinds[e.get("name", f"{kind} {i + 1}")] = (kind, len(entries))

targets = {t["name"]: t for t in setup["target"]}
worst, n = 0.0, 0
for r in csv.DictReader(open(os.path.join(fit, "target_residuals.csv"))):
    t = targets[r["target"]]
    time, simulated = float(r["time"]), float(r["simulated"])
    if t["kind"] == "head":
        v = at((t["bore"], "head"), time)
    elif t["kind"] == "drawdown":
        v = at((t["bore"], "drawdown"), time)
    elif t["kind"] == "head_difference":
        v = at((t["bore"], "head"), time) - at((t["minus"], "head"), time)
    else:
        kind, count = kinds[t["feature"]]
        assert count == 1, f"{t['feature']}: not the only [[{kind}]]; cannot check its flow"
        v = at((kind, "flow"), time)
    scale = max(1.0, abs(simulated))
    worst = max(worst, abs(v - simulated) / scale)
    n += 1
    assert abs(v - simulated) <= tolerance * scale, (r, v)
print(f"fitted model reproduces {n} simulated values; largest difference {worst:.3g} "
      f"(relative to max(1, |value|))")
