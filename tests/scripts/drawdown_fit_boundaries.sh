#!/usr/bin/env bash
# `aquiledger drawdown-fit` with [[boundary]] lines: noise-free drawdowns beside a barrier
# 60 m east and a recharge line 90 m south of the pumped well, computed by
# tests/data/pumping/write_theis_test.py as Theis (1935)
# with scipy.special.exp1 plus the image wells of the method of images (Ferris et al., 1962,
# USGS Water-Supply Paper 1536-E): (120, 0) for the barrier (+), (0, -180) for the recharge
# line (-), and (120, -180), the image of each image (sign the product, -). T = 120 m2/d,
# S = 5e-4, Q = 800 m3/d for 1 d, wells at 15 m bearing 45 and 40 m bearing 270, 3 decades.
# The numerical model gives T and S back within 1 %
# (docs/pumping-tests.md, "Straight lines and zones") and the description names the whole
# grid and the lines. A closed form refuses the lines, and a well beyond the barrier
# is refused with file, line and key, nothing written.
#   bash drawdown_fit_boundaries.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

/usr/bin/python3 "$src/tests/data/pumping/write_theis_test.py" "$out/test.toml" \
  "synthetic test between two lines" --well 15:45 --well 40:270 --barrier 60:90 --recharge 90:180
# The whole fit: 14.3 s CPU (45 s wall at load 4 to 6) at commit bf6e3ac, 26 coarse runs and 11
# fine ones on a 67 x 71 whole grid (the 7 min 32 s wall of an earlier stop are not seen any
# more); docs/pumping-tests.md, "Straight lines and zones".
"$exe" drawdown-fit "$out/test.toml" -o "$out/fit" > "$out/stdout"
/usr/bin/python3 - "$out/fit" <<'PY2'
import csv, json, os, sys
d = sys.argv[1]
rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(d, "parameters.csv")))}
for name, truth in (("transmissivity", 120.0), ("storativity", 5.0e-4)):
    v = float(rows[name]["value"])
    assert abs(v / truth - 1) < 0.01, (name, v)
c = json.load(open(os.path.join(d, "fit.json")))["candidates"][0]
assert c["converged"] is True
for words in ("whole radial grid", "a barrier at 60", "a recharge line at 90"):
    assert words in c["description"], c["description"]
print("fitted T", rows["transmissivity"]["value"], "S", rows["storativity"]["value"])
PY2
# The closed forms refuse the lines, naming the numerical model.
sed 's/model = "numerical"/model = "theis"/' "$out/test.toml" > "$out/theis.toml"
if "$exe" drawdown-fit "$out/theis.toml" -o "$out/theis" > "$out/theis.out" 2>&1; then
  fail "a closed form accepted [[boundary]] lines"
fi
grep -q "numerical model only" "$out/theis.out" || fail "$(cat "$out/theis.out")"

# The first well moved beyond the barrier (80 m east of the pumped well, the line at 60 m).
/usr/bin/python3 -c 'import sys; t = sys.stdin.read(); print(t.replace("distance = 15.0\nbearing = 45.0", "distance = 80.0\nbearing = 90.0"), end="")' \
  < "$out/test.toml" > "$out/beyond.toml"
if "$exe" drawdown-fit "$out/beyond.toml" -o "$out/beyond" > "$out/beyond.out" 2>&1; then
  fail "a well beyond the barrier was accepted"
fi
line=$(grep -n "bearing = 90.0$" "$out/beyond.toml" | sed -n 2p | cut -d: -f1)
grep -q "beyond.toml:$line:.*\[\[well\]\] \"at 15 m\".bearing: .*on or beyond it" "$out/beyond.out" ||
  fail "the error does not name file, line and key: $(cat "$out/beyond.out")"
[[ ! -e "$out/beyond" ]] || fail "files were written for a refused test"
echo "drawdown-fit boundaries: all checks passed"
