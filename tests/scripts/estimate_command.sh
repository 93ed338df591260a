#!/usr/bin/env bash
# `aquiledger estimate` on set-ups it cannot carry out in full: a conductance the fitted model
# cannot scale (given by an array file) still gives the tables, with a warning naming the key,
# and removes an older fitted_model.toml; a bad set-up (a zone on a property the model gives
# without zones, in the Theis set-up of estimate_theis.py) is refused with exit status 1 naming
# file, line and key, and nothing is written. The fits themselves are
# estimate_confined_fit.sh and estimate_water_table_fit.sh.
#   bash estimate_command.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out

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
/usr/bin/python3 "$src/tests/scripts/estimate_theis.py" "$out" 350 2e-4
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
