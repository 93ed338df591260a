#!/usr/bin/env bash
# `aquiledger drawdown-fit` with screens: drawdowns around a partially penetrating well from
# image sinks integrated by scipy (tests/data/pumping/write_partial_penetration_test.py,
# independent of the program's Hantush (1961) series) give back T = 200 m2/d, S = 2e-4 and
# K_z / K_r = 0.2 to 0.5 %; `auto` chooses Hantush (1961); the files and the page show the
# screens; the ratio held; the numerical model refuses partial screens (exit status 1).
#   bash drawdown_fit_screens.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
make_scratch out

/usr/bin/python3 "$src/tests/data/pumping/write_partial_penetration_test.py" "$out/screens.toml"
"$exe" drawdown-fit "$out/screens.toml" -m auto -o "$out/fit" -q
python3 - "$out/fit" <<'PY'
import csv, json, os, sys
d = sys.argv[1]
fit = json.load(open(os.path.join(d, "fit.json")))
assert fit["chosen_model"] == "hantush-partial-penetration", fit["chosen_model"]
models = [c["model"] for c in fit["candidates"]]
assert models == ["theis", "hantush-partial-penetration", "hantush-jacob", "neuman"], models
assert fit["screens"] == {"aquifer_top": -5, "aquifer_bottom": -35,
                          "pumped": {"top": -5, "bottom": -15}, "anisotropy_ratio": "fit"}, \
    fit["screens"]
assert fit["wells"][0]["screen"] == {"piezometer_tip": -30}, fit["wells"][0]
assert fit["wells"][1]["screen"] == {"top": -20, "bottom": -26}, fit["wells"][1]
rows = list(csv.DictReader(open(os.path.join(d, "parameters.csv"))))
pp = {r["parameter"]: r for r in rows if r["model"] == "hantush-partial-penetration"}
# The generating values of write_partial_penetration_test.py: to 0.5 %.
for name, truth in (("transmissivity", 200.0), ("storativity", 2.0e-4),
                    ("anisotropy_ratio", 0.2)):
    v = float(pp[name]["value"])
    assert abs(v / truth - 1) < 0.005, (name, v)
    assert float(pp[name]["low"]) <= v <= float(pp[name]["high"]), name
assert pp["anisotropy_ratio"]["unit"] == "-"
page = open(os.path.join(d, "interpretation.html")).read()
for text in ("Hantush (1961), partially penetrating wells", "piezometer tip at -30 m",
             "-20 to -26 m", "K_z / K_r fitted", "anisotropy_ratio"):
    assert text in page, text
# The semi-log chart's late line: Cooper and Jacob's (1946) plus Hantush's (1961) late
# partial-penetration constant, so at each well's last drawdown of the pumping step it lies on
# the (noise-free) data, within 1 %; Theis's line alone misses by the constant.
import math, re
from collections import defaultdict
points = defaultdict(list)
for name, x, y in re.findall(r'\{"s":"([^"]+)","x":([-0-9.e+]+),"y":([-0-9.e+]+),"i":\d+\}', page):
    points[name].append((float(x), float(y)))
lines = [n[:-len(": Cooper-Jacob line")] for n in points if n.endswith(": Cooper-Jacob line")]
assert len(lines) == len(fit["wells"]), lines
for well in lines:
    line = sorted(points[well + ": Cooper-Jacob line"])
    tm, sm = [p for p in sorted(points[well + ": drawdown"]) if p[0] <= line[-1][0]][-1]
    (ta, sa), (tb, sb) = [p for p in line if p[0] <= tm][-1], [p for p in line if p[0] >= tm][0]
    s_line = sa if tb == ta else sa + (sb - sa) * math.log(tm / ta) / math.log(tb / ta)
    assert abs(s_line / sm - 1) < 0.01, (well, tm, sm, s_line)
PY

# The ratio held: T and S alone.
/usr/bin/python3 "$src/tests/data/pumping/write_partial_penetration_test.py" "$out/held.toml" 0.2
"$exe" drawdown-fit "$out/held.toml" -m hantush-partial-penetration -o "$out/held" -q
python3 - "$out/held" <<'PY'
import csv, os, sys
rows = list(csv.DictReader(open(os.path.join(sys.argv[1], "parameters.csv"))))
assert [r["parameter"] for r in rows] == ["transmissivity", "storativity"], rows
assert abs(float(rows[0]["value"]) / 200.0 - 1) < 0.005, rows[0]
PY

# The numerical model is two-dimensional: it refuses partial screens, nothing written.
status=0
"$exe" drawdown-fit "$out/screens.toml" -m numerical -o "$out/numerical" -q 2> "$out/err" ||
  status=$?
[[ $status == 1 ]] || fail "numerical with screens: exit status $status, expected 1"
grep -q "two-dimensional" "$out/err" || fail "numerical with screens: $(cat "$out/err")"
[[ ! -e $out/numerical/fit.json ]] || fail "numerical with screens: fit.json written"
echo "drawdown-fit with screens: all checks passed"
