#!/usr/bin/env bash
# `aquiledger estimate` end to end on a Theis (1935) pumping test: drawdowns at four bores
# computed at test time from the Theis solution (scipy.special.exp1, estimate_theis.py) with
# T = 350 m2/d and S = 2e-4; the numerical model on a telescoping grid, fitted for K and S,
# must give them back within 1 % (noise-free), inside the reported 95 % intervals, and S in
# the confined range 1e-5..1e-3 (common practice). The same test in a 50 m thick water-table
# aquifer with Sy = 0.1 (Theis with S = Sy, the late-time limit of Neuman, 1975) gives Sy back
# within 1 % and in the water-table range 0.01..0.3 (common practice). The output files have the columns of
# docs/results.md; the fitted model written back (fitted_model.toml) runs and gives the fit's
# simulated drawdowns again (estimate_rerun.py). A bad set-up is refused with exit status 1 naming file, line and key, and
# nothing is written.
#   bash estimate_command.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: estimate_command.sh <aquiledger> <source-dir>}
src=${2:?usage: estimate_command.sh <aquiledger> <source-dir>}
if ! /usr/bin/python3 -c "import scipy.special" 2>/dev/null; then
  echo "SKIPPED: /usr/bin/python3 has no scipy (python3-scipy)"
  exit 0
fi
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

/usr/bin/python3 "$src/tests/scripts/estimate_theis.py" "$out" 350 2e-4
"$exe" estimate "$out/setup.toml" -o "$out/fit" -q
/usr/bin/python3 - "$out/fit" <<'PY'
import csv, json, os, sys
d = sys.argv[1]
rows = list(csv.DictReader(open(os.path.join(d, "estimated_parameters.csv"))))
assert list(rows[0].keys()) == ["parameter", "property", "form", "value", "lower_95", "upper_95",
                                "css", "at_bound", "start", "lower", "upper"], rows[0].keys()
p = {r["parameter"]: r for r in rows}
b = 10.0  # aquifer thickness of estimate_theis.py: T = K b
T = float(p["k"]["value"]) * b
S = float(p["storativity"]["value"])
assert abs(T / 350.0 - 1) < 0.01, T
assert abs(S / 2.0e-4 - 1) < 0.01, S
assert 1e-5 <= S <= 1e-3, S  # confined storativity range (common practice)
for r in rows:
    assert float(r["lower_95"]) <= float(r["value"]) <= float(r["upper_95"]), r
    assert r["at_bound"] == "false", r
res = list(csv.DictReader(open(os.path.join(d, "target_residuals.csv"))))
assert list(res[0].keys()) == ["target", "kind", "time", "measured", "simulated", "residual",
                               "weight", "weighted_residual"]
est = json.load(open(os.path.join(d, "estimate.json")))
assert est["converged"] is True
assert est["n_measurements"] == len(res)
h = est["objective_history"]
assert all(h[i + 1] <= h[i] for i in range(len(h) - 1)), h
corr = list(csv.DictReader(open(os.path.join(d, "parameter_correlation.csv"))))
assert abs(float(corr[0]["k"]) - 1.0) < 1e-12
PY
# The fitted model written back runs and reproduces the fit's simulated values to rounding.
grep -q '^# Fitted model written by aquiledger' "$out/fit/fitted_model.toml" || fail "no header"
"$exe" run "$out/fit/fitted_model.toml" > "$out/fit/run.log" || fail "the fitted model did not run"
/usr/bin/python3 "$src/tests/scripts/estimate_rerun.py" "$out/setup.toml" "$out/fit" 1e-9

mkdir "$out/wt"
/usr/bin/python3 "$src/tests/scripts/estimate_theis.py" "$out/wt" 350 0.1 water_table
"$exe" estimate "$out/wt/setup.toml" -o "$out/wt/fit" -q
/usr/bin/python3 - "$out/wt/fit" <<'PY'
import csv, os, sys
rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(sys.argv[1], "estimated_parameters.csv")))}
sy = float(rows["specific_yield"]["value"])
assert abs(sy / 0.1 - 1) < 0.01, sy
assert 0.01 <= sy <= 0.3, sy  # water-table specific yield range (common practice)
PY

# A conductance the fitted model cannot scale (given by an array file): the tables are written,
# the warning names the key and the factor, and an older fitted_model.toml is removed.
mkdir "$out/unscalable"
cat > "$out/unscalable/model.toml" <<'TOML'
[grid]
nrow = 3
ncol = 3
dx = 10.0
dy = 10.0
[aquifer]
condition = "confined"
top = 10.0
bottom = 0.0
k = 5.0
specific_storage = 1.0e-4
[initial]
head = 9.0
[[period]]
length = 10.0
steps = 4
[[drain]]
name = "ditch"
cells = [[2, 2]]
elevation = 8.0
conductance = { file = "conductance.txt" }
[[observation]]
name = "B1"
x = 5.0
y = 5.0
TOML
printf '1 1 1\n1 2 1\n1 1 1\n' > "$out/unscalable/conductance.txt"
cat > "$out/unscalable/setup.toml" <<'TOML'
[estimate]
model = "model.toml"
[[parameter]]
name = "ditch bed"
property = "drain_conductance"
lower = 0.01
upper = 100.0
[[target]]
name = "B1"
kind = "head"
bore = "B1"
times = [2.5, 5.0, 10.0]
values = [8.9, 8.8, 8.75]
TOML
mkdir "$out/unscalable/fit"
echo "# stale" > "$out/unscalable/fit/fitted_model.toml"
"$exe" estimate "$out/unscalable/setup.toml" -o "$out/unscalable/fit" -q 2> "$out/unscalable/err.txt" \
  || { cat "$out/unscalable/err.txt"; fail "an unscalable conductance failed the estimate"; }
grep -q 'warning: no fitted model written: \[\[drain\]\] 1.conductance is given by a file' \
  "$out/unscalable/err.txt" || { cat "$out/unscalable/err.txt"; fail "no warning naming the key"; }
[ -s "$out/unscalable/fit/estimated_parameters.csv" ] || fail "no tables written"
[ ! -e "$out/unscalable/fit/fitted_model.toml" ] || fail "a stale fitted model was left"

# A bad set-up: file, line and key, exit status 1, nothing written.
sed 's/^name = "k"$/name = "k"\nzone = 3/' "$out/setup.toml" > "$out/bad.toml"
set +e
"$exe" estimate "$out/bad.toml" -o "$out/bad" 2> "$out/err.txt"
rc=$?
set -e
[ "$rc" -eq 1 ] || fail "exit status $rc for a bad set-up"
grep -q 'bad.toml:[0-9]*:[0-9]*: error: \[\[parameter\]\] "k".zone: the model gives \[aquifer\].k without zones' "$out/err.txt" \
  || { cat "$out/err.txt"; fail "message without file, line and key"; }
[ ! -e "$out/bad" ] || fail "a refused set-up left an output folder"
echo "estimate command: ok"
