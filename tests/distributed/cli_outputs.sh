#!/bin/bash
# `aquiledger run --engine petsc` under mpirun against the serial run of the same model: the
# same tables, summary and fields (tests/distributed/compare_results.py), and exit 2 with the
# tables kept when Newton cannot converge.
# usage: cli_outputs.sh AQUILEDGER SOURCE_DIR MPIRUN RANKS
set -euo pipefail
bin=$1 src=$2 mpirun=$3 ranks=$4
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
mpi=("$mpirun" --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np "$ranks")

# The worked case: switching aquifer, steady start, every kind of boundary, observations.
model=$src/cases/01-marrow-basin/model.toml
"$bin" run "$model" -o "$work/serial" -q
"${mpi[@]}" "$bin" run "$model" -o "$work/distributed" --engine petsc -q
/usr/bin/python3 "$src/tests/distributed/compare_results.py" "$work/serial" "$work/distributed"

# Subsidence points (case 05): the distributed run samples the owned cells of each rank and
# sums them; the series agrees with the serial one to 1e-8 m (compare_results.py's head
# tolerance; its small budget rows differ by more than compare_results.py allows).
sub=$src/cases/05-quillon-vale-subsidence/model.toml
"$bin" run "$sub" -o "$work/sub_serial" -q
"${mpi[@]}" "$bin" run "$sub" -o "$work/sub_distributed" --engine petsc -q
/usr/bin/python3 - "$work/sub_serial/subsidence_points.csv" "$work/sub_distributed/subsidence_points.csv" <<'PY'
import csv, sys
a, b = (list(csv.DictReader(open(f))) for f in sys.argv[1:])
assert len(a) == len(b) > 1, (len(a), len(b))
for ra, rb in zip(a, b):
    assert ra["point"] == rb["point"] and ra["time"] == rb["time"], (ra, rb)
    assert abs(float(ra["subsidence"]) - float(rb["subsidence"])) <= 1e-8, (ra, rb)
PY

# The HTML report maps the parallel field sets (.pvtr), read as one grid each: the head map
# of the last output time (1275 d, the demo's end) is on the page.
"$bin" report "$work/distributed" --out "$work/report.html" > /dev/null
grep -q "Maps at time 1275 d" "$work/report.html"
grep -q "Head at time 1275 d" "$work/report.html"

# Non-convergence: exit status 2 on every rank, the tables up to the last converged step.
set +e
"${mpi[@]}" "$bin" run "$src/tests/data/robust/nonconvergent.toml" -o "$work/bad" --engine petsc -q 2> "$work/bad.err"
status=$?
set -e
cat "$work/bad.err"
[ "$status" -eq 2 ] || { echo "expected exit status 2, got $status"; exit 1; }
grep -q "did not converge\|linear solver failed" "$work/bad.err"
# Period 1 (two steps) converged: its two steps are in the table.
[ "$(wc -l < "$work/bad/balance_steps.csv")" -eq 3 ] || { echo "balance_steps.csv:"; cat "$work/bad/balance_steps.csv"; exit 1; }
[ ! -e "$work/bad/summary.json" ] || grep -q '"converged": false' "$work/bad/summary.json"

# More ranks than grid rows (nonconvergent.toml has 5): a usage error naming both counts.
if [ "$ranks" -eq 2 ]; then
  set +e
  "$mpirun" --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np 6 "$bin" run \
    "$src/tests/data/robust/nonconvergent.toml" -o "$work/many" --engine petsc -q 2> "$work/many.err"
  status=$?
  set -e
  [ "$status" -eq 64 ] || { echo "expected exit status 64 for 6 ranks on 5 rows, got $status"; exit 1; }
  grep -q "6 ranks for 5 rows" "$work/many.err"
fi
echo "distributed run matches the serial run"
