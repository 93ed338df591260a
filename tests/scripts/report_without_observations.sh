#!/usr/bin/env bash
# A model without observation points writes no observations.csv; its report is still
# written, saying there are no hydrographs (docs/verification.md, report).
set -euo pipefail
exe=$1
src=$2
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
sed '/\[\[observation\]\]/,/^$/d' "$src/tests/data/robust/restart.toml" > "$t/model.toml"
! grep -q observation "$t/model.toml" || { echo "FAIL: the observations were not removed"; exit 1; }
"$exe" run "$t/model.toml" -o "$t/out" -q -t 1
[[ ! -e $t/out/observations.csv ]] || { echo "FAIL: observations.csv written without observations"; exit 1; }
"$exe" report "$t/out" -q || { echo "FAIL: report exited with $?"; exit 1; }
grep -q "no observation points" "$t/out/report.html" || { echo "FAIL: no note in the report"; exit 1; }
echo "report of a model without observations written"
