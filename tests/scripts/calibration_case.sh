#!/usr/bin/env bash
# The worked calibration case cases/06-larkmoor-calibration end to end: its invented inputs
# are what its documented script makes (make_inputs.py run again on a copy gives the same
# files), `aquiledger estimate setup.toml` calibrates it, every parameter's invented true
# value lies inside its reported 95 % interval (the case's own consistency: the measurements
# are the true model's plus the stated noise; the outside references are the Theis tests),
# and the fitted model written back reproduces the fit's simulated values. Prints the wall
# time of the calibration (a figure, not a check).
#   bash calibration_case.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
make_scratch out
case_dir="$src/cases/06-larkmoor-calibration"

# The documented script makes exactly the committed inputs.
cp -r "$case_dir" "$out/case"
rm -rf "$out/case/results" "$out/case/estimate"
/usr/bin/python3 "$out/case/make_inputs.py" "$exe" > /dev/null
for f in zones.txt setup.toml true_values.csv bores/LM1.csv bores/LM6.csv; do
  cmp -s "$case_dir/$f" "$out/case/$f" || fail "make_inputs.py does not give $f again"
done

start=$(date +%s%N)
"$exe" estimate "$case_dir/setup.toml" -o "$out/fit" > "$out/estimate.txt" || {
  cat "$out/estimate.txt"; fail "estimate failed"; }
end=$(date +%s%N)
/usr/bin/python3 - "$out/fit" "$case_dir/true_values.csv" <<'PY'
import csv, json, os, sys
d, truth = sys.argv[1], {r["parameter"]: float(r["true_value"]) for r in csv.DictReader(open(sys.argv[2]))}
est = json.load(open(os.path.join(d, "estimate.json")))
assert est["converged"] is True, est["warnings"]
rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(d, "estimated_parameters.csv")))}
assert set(rows) == set(truth), (rows.keys(), truth.keys())
for name, true in truth.items():
    r = rows[name]
    lo, hi = float(r["lower_95"]), float(r["upper_95"])
    assert lo <= true <= hi, f"{name}: true {true} outside the 95 % interval {lo} .. {hi}"
    assert r["at_bound"] == "false", r
print("true values inside the 95 % intervals:",
      ", ".join(f"{n} {float(rows[n]['value']):.4g} ({float(rows[n]['lower_95']):.4g} .. "
                f"{float(rows[n]['upper_95']):.4g})" for n in truth))
PY
"$exe" run "$out/fit/fitted_model.toml" -q > /dev/null || fail "the fitted model did not run"
/usr/bin/python3 "$src/tests/scripts/estimate_rerun.py" "$case_dir/setup.toml" "$out/fit" 1e-9
echo "calibration of cases/06-larkmoor-calibration: $(( (end - start) / 1000000 )) ms wall"
echo "calibration case: ok"
