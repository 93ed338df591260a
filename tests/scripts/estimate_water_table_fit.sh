#!/usr/bin/env bash
# `aquiledger estimate` end to end on a Theis (1935) pumping test in a 50 m thick water-table
# aquifer with Sy = 0.1 (Theis with S = Sy, the late-time limit of Neuman, 1975; drawdowns
# computed at test time with scipy.special.exp1, estimate_theis.py): the fit gives Sy back
# within 1 % (noise-free) and in the water-table range 0.01..0.3 (common practice). The
# confined fit is estimate_confined_fit.sh.
#   bash estimate_water_table_fit.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

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
echo "estimate, water-table fit: ok"
