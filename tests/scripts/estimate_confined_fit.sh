#!/usr/bin/env bash
# `aquiledger estimate` end to end on a Theis (1935) pumping test in a confined aquifer:
# drawdowns at four bores computed at test time from the Theis solution (scipy.special.exp1,
# estimate_theis.py) with T = 350 m2/d and S = 2e-4; the numerical model on a telescoping grid,
# fitted for K and S, must give them back within 1 % (noise-free), inside the reported 95 %
# intervals, and S in the confined range 1e-5..1e-3 (common practice). The output files have
# the columns of docs/results.md; the fitted model written back (fitted_model.toml) runs and
# gives the fit's simulated drawdowns again (estimate_rerun.py). The water-table fit is
# estimate_water_table_fit.sh, the refusals estimate_command.sh (separate tests, so that
# ctest -j runs them side by side).
#   bash estimate_confined_fit.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

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
echo "estimate, confined fit: ok"
