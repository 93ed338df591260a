#!/usr/bin/env bash
# `aquiledger drawdown-fit -m numerical`: noise-free Theis (1935) drawdowns computed by
# tests/data/pumping/write_theis_test.py with
# scipy.special.exp1 (s = Q / (4 pi T) E1(r^2 S / (4 T t)); T = 120 m2/d, S = 5e-4,
# Q = 800 m3/d for 1 d, wells at 15 and 60 m, 3 decades) are fitted by the program's own flow
# model on its radial-telescoping grid: T and S come back within 1 % (the discretisation
# budget of docs/pumping-tests.md), and the files and the page name the model.
#   bash drawdown_fit_numerical.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

/usr/bin/python3 "$src/tests/data/pumping/write_theis_test.py" "$out/test.toml" \
  "synthetic Theis test" --well 15 --well 60
"$exe" drawdown-fit "$out/test.toml" -o "$out/fit" > "$out/stdout"
grep -q "numerical" "$out/stdout" || fail "the terminal summary does not name the model"
grep -q "radii of influence" "$out/stdout" || fail "the terminal summary does not state the grid"
/usr/bin/python3 - "$out/fit" <<'PY'
import csv, json, os, sys
d = sys.argv[1]
rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(d, "parameters.csv")))}
# The generating values (scipy.special.exp1 above): within 1 %.
for name, truth in (("transmissivity", 120.0), ("storativity", 5.0e-4)):
    assert rows[name]["model"] == "numerical", rows[name]
    v = float(rows[name]["value"])
    assert abs(v / truth - 1) < 0.01, (name, v)
fit = json.load(open(os.path.join(d, "fit.json")))
assert fit["chosen_model"] == "numerical", fit["chosen_model"]
c = fit["candidates"][0]
assert c["converged"] is True
assert "quarter radial grid" in c["description"], c["description"]
assert [p["name"] for p in c["parameters"]] == ["transmissivity", "storativity"]
series = list(csv.DictReader(open(os.path.join(d, "fit_series.csv"))))
assert len(series) == 48, len(series)
page = open(os.path.join(d, "interpretation.html")).read()
assert "radial-telescoping grid" in page and "quarter radial grid" in page
print("fitted T", rows["transmissivity"]["value"], "S", rows["storativity"]["value"])
PY
echo "drawdown-fit numerical: all checks passed"
