#!/usr/bin/env bash
# `aquiledger drawdown-fit` end to end: the noise-free Theis (1935) test with recovery of
# tests/data/pumping/theis_recovery.toml (drawdowns from scipy.special.exp1) gives back
# T = 350 m2/d and S = 2e-4 to 0.5 %; the output files have the columns of
# docs/pumping-tests.md; a bad file is refused with exit status 1 naming file, line and key.
#   bash drawdown_fit.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
make_scratch out

"$exe" drawdown-fit "$src/tests/data/pumping/theis_recovery.toml" -m auto -o "$out/fit" -q
python3 - "$out/fit" <<'PY'
import csv, json, os, sys
d = sys.argv[1]
rows = list(csv.DictReader(open(os.path.join(d, "parameters.csv"))))
assert list(rows[0].keys()) == ["model", "parameter", "value", "low", "high", "unit"]
theis = {r["parameter"]: r for r in rows if r["model"] == "theis"}
# The generating values (tests/data/pumping/theis_recovery.toml, from scipy): to 0.5 %.
for name, truth in (("transmissivity", 350.0), ("storativity", 2.0e-4)):
    v = float(theis[name]["value"])
    assert abs(v / truth - 1) < 0.005, (name, v)
    assert float(theis[name]["low"]) <= v <= float(theis[name]["high"]), name
fit = json.load(open(os.path.join(d, "fit.json")))
assert fit["chosen_model"] == "theis", fit["chosen_model"]
assert fit["automatic_choice"] is True
assert any("confined" in s for s in fit["classification"])
models = [c["model"] for c in fit["candidates"]]
assert models == ["theis", "hantush-jacob", "neuman"], models
series = list(csv.DictReader(open(os.path.join(d, "fit_series.csv"))))
assert list(series[0].keys()) == ["well", "time", "measured", "fitted", "residual", "derivative"]
assert len(series) == 80, len(series)
assert max(abs(float(r["residual"])) for r in series) < 1e-6
PY

# A bad file: file, line and key, exit status 1, nothing written.
sed 's/^distance = 80.0/distance = -80.0/' "$src/tests/data/pumping/theis_recovery.toml" \
  > "$out/bad.toml"
line=$(grep -n '^distance = -80.0' "$out/bad.toml" | cut -d: -f1)
status=0
"$exe" drawdown-fit "$out/bad.toml" -o "$out/bad" -q 2> "$out/err" || status=$?
[[ $status == 1 ]] || fail "bad file: exit status $status, expected 1"
grep -q "bad.toml:$line:.*\[\[well\]\] \"far\".distance" "$out/err" ||
  fail "bad file: no file:line and key in: $(cat "$out/err")"
[[ ! -e $out/bad/fit.json ]] || fail "bad file: fit.json written"
echo "drawdown-fit: all checks passed"
