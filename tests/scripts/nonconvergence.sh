#!/usr/bin/env bash
# A run that cannot converge (tests/data/robust/nonconvergent.toml: period 1 calm, period 2 a
# well far beyond what the aquifer delivers, in one 10 000-day step, two Newton iterations,
# no cut-backs) must stop with exit status 2, name period, step, time and worst cell, and
# leave complete, readable results up to the last converged step (docs/robustness.md).
# Expected counts follow from the model file: period 1 has 2 steps of 5 d, so the results
# hold time 0 and t = 5, 10 d (the step tables the steps at 5 and 10 d); the failing step
# ends at 10 + 10 000 = 10 010 d.
set -euo pipefail
exe=$1
src=$2
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
set +e
"$exe" run "$src/tests/data/robust/nonconvergent.toml" -o "$out/results" -q 2>"$out/stderr"
status=$?
set -e
cat "$out/stderr"
fail() { echo "FAIL: $*"; exit 1; }
[[ $status -eq 2 ]] || fail "exit status $status, expected 2"
msg=$(cat "$out/stderr")
for part in 'period 2' 'step 1' 'time 10010' 'worst cell row [0-9]+, col [0-9]+'; do
  grep -Eq "$part" <<<"$msg" || fail "message does not name '$part'"
done
r=$out/results
lines() { wc -l <"$1"; }
[[ $(lines "$r/balance_steps.csv") -eq 3 ]] || fail "balance_steps.csv: $(lines "$r/balance_steps.csv") lines, expected header + 2"
[[ $(lines "$r/balance_periods.csv") -eq 2 ]] || fail "balance_periods.csv: expected header + period 1"
[[ $(lines "$r/budget_features.csv") -ge 2 ]] || fail "budget_features.csv has no rows"
[[ $(lines "$r/observations.csv") -eq 4 ]] || fail "observations.csv: expected header + 3 rows"
# No temporary file may be left behind.
if ls -A "$r" | grep -q '\.tmp-'; then fail "temporary files left: $(ls -A "$r")"; fi
python3 - "$r" <<'PY'
import csv, json, os, sys
import xml.etree.ElementTree as ET
r = sys.argv[1]
# Every CSV row has as many cells as its header (no torn row).
for name in ("budget_steps.csv", "budget_periods.csv", "balance_steps.csv",
             "balance_periods.csv", "budget_features.csv", "observations.csv"):
    rows = list(csv.reader(open(os.path.join(r, name))))
    assert all(len(row) == len(rows[0]) for row in rows), name + ": ragged rows"
steps = list(csv.DictReader(open(os.path.join(r, "balance_steps.csv"))))
assert [float(s["time"]) for s in steps] == [5.0, 10.0], [s["time"] for s in steps]
# The long step budget: each step's rows end with its total, and only period 1 is there.
budget = list(csv.DictReader(open(os.path.join(r, "budget_steps.csv"))))
assert sorted({float(b["time"]) for b in budget}) == [5.0, 10.0]
assert [b["component"] for b in budget].count("total") == 2
periods = list(csv.DictReader(open(os.path.join(r, "budget_periods.csv"))))
assert {p["period"] for p in periods} == {"1"}, periods
# fields.pvd is valid XML naming only files that exist, at the converged times.
root = ET.parse(os.path.join(r, "fields.pvd")).getroot()
sets = root.findall("./Collection/DataSet")
assert [float(d.get("timestep")) for d in sets] == [0.0, 5.0, 10.0]
for d in sets:
    assert os.path.isfile(os.path.join(r, d.get("file"))), d.get("file")
s = json.load(open(os.path.join(r, "summary.json")))
assert s["converged"] is False, s["converged"]
assert s["steps"] == 2, s["steps"]
assert "period 2" in s["failure"], s["failure"]
print("results complete up to t = 10 d")
PY
echo "nonconvergence: ok"
