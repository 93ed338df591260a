#!/usr/bin/env bash
# `aquiledger estimate` end to end on a Theis (1935) pumping test in a 50 m thick water-table
# aquifer with Sy = 0.1 (Theis with S = Sy, the late-time limit of Neuman, 1975; drawdowns
# computed at test time with scipy.special.exp1, estimate_theis.py): the fit gives Sy back
# within 1 % (noise-free) and in the water-table range 0.01..0.3 (common practice). The
# confined fit is estimate_confined_fit.sh.
#
# Grid and steps: widths growing by 1.3 to 1 km (39 x 39 cells) and 100 steps growing by 3 %,
# about 12 s of CPU in Release (the earlier 1.2 to 6 km, 71 x 71, 200 steps by 1.5 %: 67 s, and
# 340 s under the sanitizers). With Sy = 0.1 the drawdown at 1 km stays below e^-35 of that at
# the bores over the 2 days (u = r^2 Sy / (4 T t) > 35), so the far 5 km added nothing: the
# 1 km grid with 200 steps gives the same Sy (-0.35 %) as the 6 km one. Error budget of Sy,
# measured against the 1.2 / 200-step fit (Sy -0.35 %, T +1.7 %):
#   widths by 1.3 instead of 1.2 (100 steps each): +0.53 %;
#   100 steps instead of 200 (widths by 1.2): -0.38 %, first order in the step, so about
#   -0.74 % against the steps' limit;
#   this test's grid and steps together: Sy -0.20 %, T +2.3 % (T is not checked: the thinning
#   of the saturated thickness near the well makes it differ from Theis's by design).
# Each part is below the 1 % check, and a fault in Sy's storage term (a factor in the
# drainable volume) would show far above it.
#   bash estimate_water_table_fit.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

mkdir "$out/wt"
/usr/bin/python3 "$src/tests/scripts/estimate_theis.py" "$out/wt" 350 0.1 water_table \
  --width-growth 1.3 --extent 1000 --steps 100 --step-growth 1.03
"$exe" estimate "$out/wt/setup.toml" -o "$out/wt/fit" -q
/usr/bin/python3 - "$out/wt/fit" <<'PY'
import csv, os, sys
rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(sys.argv[1], "estimated_parameters.csv")))}
sy = float(rows["specific_yield"]["value"])
assert abs(sy / 0.1 - 1) < 0.01, sy
assert 0.01 <= sy <= 0.3, sy  # water-table specific yield range (common practice)
PY
echo "estimate, water-table fit: ok"
