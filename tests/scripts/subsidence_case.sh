#!/usr/bin/env bash
# The invented subsidence case (cases/05-quillon-vale-subsidence): the clay interbeds release
# water permanently only while the heads fall below every earlier head, never take it back,
# and the budget closes; in the recovery years the heads rise and only the elastic part of
# the beds takes water back (docs/subsidence.md).
#   bash subsidence_case.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: subsidence_case.sh <aquiledger> <source-dir>}
src=${2:?usage: subsidence_case.sh <aquiledger> <source-dir>}
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
"$exe" run "$src/cases/05-quillon-vale-subsidence/model.toml" -o "$out/r" -q >/dev/null
python3 - "$out/r" "$src/cases/05-quillon-vale-subsidence/extensometer.csv" <<'PY'
import csv, sys
folder = sys.argv[1]
rows = list(csv.DictReader(open(f"{folder}/budget_periods.csv")))
def volume(period, component, column):
    return sum(float(r[column]) for r in rows
               if int(r["period"]) == period and r["component"] == component)
# Periods: 1 steady, 2-4 dry years, 5-6 recovery years (model.toml).
for p in range(2, 7):
    # Permanent compaction is never undone: nothing goes back into the beds' inelastic part.
    assert volume(p, "interbed_permanent", "out_of_aquifer") == 0.0, p
for p in (2, 3, 4):  # the heads fall below every earlier head: permanent release
    assert volume(p, "interbed_permanent", "into_aquifer") > 0.0, p
for p in (5, 6):  # the heads recover: no permanent release
    assert volume(p, "interbed_permanent", "into_aquifer") == 0.0, p
# ... and the elastic part of the beds takes water back as they rise in the first year.
assert volume(5, "interbed_recoverable", "out_of_aquifer") > 0.0
# Budget closure at every step (model format contract: below 1e-6 percent).
for r in csv.DictReader(open(f"{folder}/balance_steps.csv")):
    assert abs(float(r["imbalance_percent"])) < 1e-6, r
# The bore at the well field: lowest at the end of the dry years, higher after recovery.
heads = {}
for r in csv.DictReader(open(f"{folder}/observations.csv")):
    if r["observation"] == "Sallow Cross bore":
        heads[(int(r["period"]), int(r["step"]))] = float(r["head"])
end_dry = max(k for k in heads if k[0] == 4)
end_run = max(heads)
assert heads[end_run] > heads[end_dry] + 1.0, (heads[end_dry], heads[end_run])
# The extensometer (docs/results.md, subsidence_points.csv): a row per step plus time 0,
# dates from the start date, zero at time 0, sinking through the dry years.
points = list(csv.DictReader(open(f"{folder}/subsidence_points.csv")))
n_steps = sum(1 for _ in csv.DictReader(open(f"{folder}/balance_steps.csv")))
assert len(points) == 1 + n_steps, (len(points), n_steps)
assert all(r["point"] == "Sallow Cross extensometer" for r in points)
assert points[0]["date"] == "2018-01-01" and float(points[0]["subsidence"]) == 0.0
series = [(float(r["time"]), float(r["subsidence"]), int(r["period"])) for r in points]
dry = [s for t, s, p in series if 2 <= p <= 4]
assert all(b >= a for a, b in zip(dry, dry[1:])) and dry[-1] > 0.0, dry
# Residuals: simulated interpolated linearly in time minus measured, for every reading
# inside the run (the readings are invented: only the arithmetic is checked).
measured = [l.split(",") for l in open(sys.argv[2]) if l[:1].isdigit()]
residuals = list(csv.DictReader(open(f"{folder}/subsidence_residuals.csv")))
assert len(residuals) == len(measured) == 60, (len(residuals), len(measured))
def simulated(t):
    for (t0, s0, _), (t1, s1, _) in zip(series, series[1:]):
        if t0 < t <= t1:
            return s0 + (t - t0) / (t1 - t0) * (s1 - s0)
    raise AssertionError(t)
for r, (date, value) in zip(residuals, measured):
    assert r["date"] == date, (r, date)
    assert float(r["measured"]) == float(value)
    assert abs(float(r["simulated"]) - simulated(float(r["time"]))) < 1e-12
    assert abs(float(r["residual"]) - (float(r["simulated"]) - float(value))) < 1e-15
PY
# The same valley with two thick clay beds per cell that drain slowly (model_delay_beds.toml,
# docs/subsidence.md "Delay beds"): their permanent release is never taken back, the budget
# still closes at every step, and the terminal table has the delay beds' columns.
"$exe" run "$src/cases/05-quillon-vale-subsidence/model_delay_beds.toml" -o "$out/d" >"$out/d.txt"
grep -q "slow, lost" "$out/d.txt"
python3 - "$out/d" "$out/r" <<'PY'
import csv, sys
folder, plain = sys.argv[1:3]
rows = list(csv.DictReader(open(f"{folder}/budget_periods.csv")))
def volume(period, component, column):
    return sum(float(r[column]) for r in rows
               if int(r["period"]) == period and r["component"] == component)
for p in range(2, 7):
    assert volume(p, "delay_bed_permanent", "out_of_aquifer") == 0.0, p
for p in (2, 3, 4):  # the dry years drive the beds below their preconsolidation heads
    assert volume(p, "delay_bed_permanent", "into_aquifer") > 0.0, p
for r in csv.DictReader(open(f"{folder}/balance_steps.csv")):
    assert abs(float(r["imbalance_percent"])) < 1e-6, r
# More clay that gives water: the bore at the well field falls less than without the beds.
def bore(folder):
    heads = {}
    for r in csv.DictReader(open(f"{folder}/observations.csv")):
        if r["observation"] == "Sallow Cross bore":
            heads[(int(r["period"]), int(r["step"]))] = float(r["head"])
    return heads[max(k for k in heads if k[0] == 4)]
assert bore(folder) > bore(plain), (bore(folder), bore(plain))
PY
echo "subsidence case: all checks passed"
