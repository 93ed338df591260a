#!/usr/bin/env bash
# The results folder read back by the names of the results contract (docs/results.md,
# version 2), from a run started in an unrelated folder:
# every file present, every header exact, units in every budget row, totals equal to the sum
# of their components, the balance tables equal to the budget totals, cell counts adding up
# to the active cells, summary.json with the model's absolute path and units. Then the head
# arrays: a second model starts from the written heads (text array and ESRI ASCII grid) and
# reads them back bit for bit; `report` finds the model from any folder and refuses, without
# touching the existing page, when the measured heads cannot be read.
#   bash results_contract.sh <aquiledger> <source-dir>
set -euo pipefail
exe=$(realpath "$1")
src=$(realpath "$2")
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# The model and its measured heads copied, so that one can later be taken away.
mkdir -p "$t/model" "$t/elsewhere"
cp "$src/tests/data/outputs/tessel_vale.toml" "$src/tests/data/outputs/tessel_well_bore.csv" "$t/model/"
cd "$t/elsewhere"
"$exe" run ../model/tessel_vale.toml -o "$t/a" -q >/dev/null

python3 - "$t/a" "$(realpath "$t/model/tessel_vale.toml")" <<'PY'
import csv, json, math, os, re, sys
folder, model_path = sys.argv[1:3]

def table(name):
    with open(os.path.join(folder, name), newline="") as f:
        rows = list(csv.reader(f))
    header, body = rows[0], rows[1:]
    assert all(len(r) == len(header) for r in body), name + ": ragged rows"
    return header, [dict(zip(header, r)) for r in body]

def close(a, b, rel=1e-12, floor=0.0):
    return abs(a - b) <= rel * max(abs(a), abs(b)) + floor

names = set(os.listdir(folder))
for name in ["budget_steps.csv", "budget_periods.csv", "balance_steps.csv", "balance_periods.csv",
             "budget_features.csv", "observations.csv", "summary.json", "fields.pvd",
             "aquifer_properties.vtr", "head_at_365.txt", "head_at_365.asc", "head_at_465.txt",
             "head_at_465.asc", "head_at_525.txt", "head_at_525.asc"]:
    assert name in names, f"{name} missing from {sorted(names)}"
# The version 1 wide tables are gone.
assert not any(n.endswith(("_in", "_out")) for n in table("budget_steps.csv")[0])

# Contract columns, exactly.
steps_header, steps = table("budget_steps.csv")
assert steps_header == "period,step,time,dt,component,into_aquifer,out_of_aquifer,unit".split(",")
periods_header, periods = table("budget_periods.csv")
assert periods_header == \
    "period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit".split(",")
bal_header, balance = table("balance_steps.csv")
assert bal_header == ("period,step,time,dt,into_aquifer,out_of_aquifer,imbalance_percent,"
                      "newton_iterations,cutbacks,confined_cells,water_table_cells,"
                      "dry_cells").split(",")
balp_header, balance_periods = table("balance_periods.csv")
assert balp_header == \
    "period,period_name,start,end,into_aquifer,out_of_aquifer,imbalance_percent".split(",")
feat_header, features = table("budget_features.csv")
assert feat_header == \
    "period,period_name,feature,kind,into_aquifer,out_of_aquifer,unit".split(",")
obs_header, _ = table("observations.csv")
assert obs_header == "observation,period,step,time,head,drawdown".split(",")

# Components: storage by mechanism (compressibilities given, switching aquifer), the
# stresses the model has, then total; every row with its unit.
expected = ["storage_skeleton", "storage_water", "storage_drainage", "fixed_head", "well",
            "recharge", "river", "drain", "total"]
def grouped(rows, key):
    groups = {}
    for r in rows:
        groups.setdefault(key(r), []).append(r)
    return groups
by_step = grouped(steps, lambda r: (r["period"], r["step"]))
by_period = grouped(periods, lambda r: r["period"])
assert len(by_step) == len(balance) == 1 + 8 + 5, (len(by_step), len(balance))
assert sorted(by_period) == ["1", "2", "3"] and len(balance_periods) == 3
for groups, unit in ((by_step, "m3/d"), (by_period, "m3")):
    for key, rows in groups.items():
        assert [r["component"] for r in rows] == expected, (key, [r["component"] for r in rows])
        assert all(r["unit"] == unit for r in rows), (key, unit)
        for side in ("into_aquifer", "out_of_aquifer"):
            parts = [float(r[side]) for r in rows[:-1]]
            assert all(p >= 0.0 for p in parts), (key, side)
            assert close(sum(parts), float(rows[-1][side]), 1e-12), (key, side)

# Balance tables: the budget totals, the contract's imbalance; cell counts add up.
summary = json.load(open(os.path.join(folder, "summary.json")))
largest = 0.0
for b in balance:
    total = by_step[(b["period"], b["step"])][-1]
    into, out = float(b["into_aquifer"]), float(b["out_of_aquifer"])
    assert into == float(total["into_aquifer"]) and out == float(total["out_of_aquifer"])
    expected_pct = 0.0 if into == out == 0.0 else 100.0 * (into - out) / ((into + out) / 2)
    assert close(float(b["imbalance_percent"]), expected_pct, 1e-9, 1e-15), b
    largest = max(largest, abs(float(b["imbalance_percent"])))
    counts = [int(b[k]) for k in ("confined_cells", "water_table_cells", "dry_cells")]
    assert sum(counts) == summary["active_cells"], (b, summary["active_cells"])
    assert int(b["newton_iterations"]) >= 1 and int(b["cutbacks"]) >= 0
for b in balance_periods:
    total = by_period[b["period"]][-1]
    assert float(b["into_aquifer"]) == float(total["into_aquifer"])
    assert b["period_name"] == total["period_name"]
assert [b["period_name"] for b in balance_periods] == \
    ["before pumping", "pumping season", "recovery"]

# Period volumes are the steps' rates times their lengths (backward Euler: a step's rate
# holds over the whole step).
for p, rows in by_period.items():
    for k, r in enumerate(rows):
        for side in ("into_aquifer", "out_of_aquifer"):
            v = sum(float(by_step[s][k][side]) * float(by_step[s][k]["dt"])
                    for s in by_step if s[0] == p)
            assert close(v, float(r[side]), 1e-12, 1e-9), (p, r["component"], side, v, r[side])

# Feature rows add up to their component's row, per period, in m3.
kind_of = {"well": "well", "river": "river", "drain": "drain", "fixed_head": "fixed_head",
           "recharge": "recharge"}
for p, rows in by_period.items():
    for r in rows[:-1]:
        if r["component"] not in kind_of:
            continue
        mine = [f for f in features if f["period"] == p and f["kind"] == r["component"]]
        assert mine and all(f["unit"] == "m3" for f in mine)
        for side in ("into_aquifer", "out_of_aquifer"):
            assert close(sum(float(f[side]) for f in mine), float(r[side]), 1e-12), (p, r)

# summary.json: the absolute model path, units, the largest step imbalance.
assert os.path.isabs(summary["model_file"]) and summary["model_file"] == model_path, \
    summary["model_file"]
assert (summary["length_unit"], summary["time_unit"]) == ("m", "d")
assert (summary["volume_unit"], summary["rate_unit"]) == ("m3", "m3/d")
assert summary["largest_imbalance_percent"] == largest
assert not any("discrepancy" in k for k in summary)

# The state field is an integer array in every field file.
pvd = open(os.path.join(folder, "fields.pvd")).read()
files = re.findall(r'file="([^"]+)"', pvd)
assert len(files) == 4, files  # time 0 and three period ends
for name in files:
    head = open(os.path.join(folder, name), "rb").read(4096).decode("latin-1")
    assert re.search(r'<DataArray type="Int32" Name="state"', head), name
print(f"results contract: {len(by_step)} steps x {len(expected)} components, "
      f"{len(balance_periods)} periods, largest imbalance {largest:.2g} %")
PY

# Head arrays: the text array has the grid's rows of the grid's columns; the .asc header
# matches the grid (the reader refuses any other).
[[ $(grep -vc '^#' "$t/a/head_at_465.txt") -eq 12 ]] || fail "head_at_465.txt: not 12 rows"
head -6 "$t/a/head_at_465.asc" | tr -s ' ' | paste -sd' ' | grep -q \
  "^ncols 15 nrows 12 xllcorner 2000 yllcorner 5000 cellsize 100 NODATA_value -9999$" ||
  fail "head_at_465.asc header: $(head -6 "$t/a/head_at_465.asc" | paste -sd' ')"

# A scenario started from the heads at the end of the pumping season, once from each file:
# its heads at time 0 are the written ones, bit for bit (shortest round-trip numbers), and
# after the recovery period they agree with the first run's heads at 525 d: the same
# equations from the same state. Only the Newton iteration path may differ (the first run
# arrives at 465 d through its earlier steps), and each run stops within the head
# tolerance (1e-5 m, [solver] head_tolerance default), so they agree to that tolerance.
for kind in asc txt; do
  sed -e 's/^steady = true$/head = { file = "..\/a\/head_at_465.'$kind'" }/' \
      -e '/^\[\[period\]\]$/,$d' "$t/model/tessel_vale.toml" > "$t/model/scenario_$kind.toml"
  cat >> "$t/model/scenario_$kind.toml" <<'TOML'
[[period]]
name = "recovery"
length = 60.0
steps = 5
growth = 1.2

[[fixed_head]]
name = "Lake Orrin shore"
edge = "west"
head = 21.0

[[recharge]]
name = "rain"
rate = 0.0004

[[well]]
name = "Tessel 1"
x = 3050.0
y = 5650.0
pumping_rate = 0.0

[[river]]
name = "Hollin Brook"
polyline = [[3450.0, 6150.0], [3450.0, 5050.0]]
stage = 21.5
bed_bottom = 20.5
bed = { k = 0.5, thickness = 1.0, width = 5.0 }

[[drain]]
name = "Vale Farm tiles"
cells = [[2, 12], [2, 13], [3, 12]]
elevation = 21.8
conductance = 200.0

[output]
head_arrays = [0.0, 60.0]
TOML
  "$exe" run "$t/model/scenario_$kind.toml" -o "$t/b_$kind" -q >/dev/null
  cmp <(grep -v '^#' "$t/a/head_at_465.txt") <(grep -v '^#' "$t/b_$kind/head_at_0.txt") ||
    fail "heads read from head_at_465.$kind differ from those written"
  python3 - "$t/a/head_at_525.txt" "$t/b_$kind/head_at_60.txt" <<'PY'
import sys
a, b = ([[float(v) for v in l.split()] for l in open(p) if not l.startswith("#")] for p in sys.argv[1:])
worst = max(abs(x - y) for ra, rb in zip(a, b) for x, y in zip(ra, rb))
assert len(a) == len(b) == 12 and worst <= 1e-5, worst
print(f"scenario from the written heads: largest head difference after 60 d {worst:.2g} m")
PY
done

# report: from another folder the model is found through summary.json.
cd "$t"
"$exe" report a >"$t/report.out" || fail "report exit status $?"
grep -q "1 observations with measured heads" "$t/report.out" || fail "report: $(cat "$t/report.out")"
before=$(sha256sum "$t/a/report.html")
# The measured heads it should show are gone: exit 1, the earlier page untouched.
mv "$t/model/tessel_well_bore.csv" "$t/model/moved.csv"
set +e
"$exe" report a 2>"$t/report.err" >/dev/null
status=$?
set -e
[[ $status -eq 1 ]] || fail "report without its measured heads: exit $status, expected 1"
grep -q "tessel_well_bore.csv" "$t/report.err" || fail "report error names no file: $(cat "$t/report.err")"
[[ "$(sha256sum "$t/a/report.html")" == "$before" ]] || fail "the earlier report was overwritten"
"$exe" report a --without-model -q || fail "report --without-model"
echo "results_contract: ok"
