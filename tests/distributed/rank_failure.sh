#!/bin/bash
# A rank that cannot write its piece of a field file brings the whole distributed run down
# with one message naming the rank and the file, and exit status 3 on every rank, without a
# hang (docs/distributed.md, "Failures"). The piece of rank 1 cannot be written because a
# folder already stands under its name.
# usage: rank_failure.sh AQUILEDGER SOURCE_DIR MPIRUN
set -euo pipefail
bin=$1 src=$2 mpirun=$3
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
mpi=("$mpirun" --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np 2)
mkdir -p "$work/out/fields_0000_p0001.vtr"
set +e
timeout 300 "${mpi[@]}" "$bin" run "$src/tests/data/robust/restart.toml" -o "$work/out" \
  --engine petsc -q > "$work/out.txt" 2> "$work/err.txt"
status=$?
set -e
cat "$work/err.txt"
[ "$status" -ne 124 ] || { echo "FAIL: the run hung"; exit 1; }
[ "$status" -eq 3 ] || { echo "FAIL: exit status $status, expected 3"; exit 1; }
grep -q "error: rank 1 of 2: .*fields_0000_p0001.vtr" "$work/err.txt" ||
  { echo "FAIL: no message naming rank 1 and its piece"; exit 1; }
[ "$(grep -c '^error:' "$work/err.txt")" -eq 1 ] || { echo "FAIL: more than one error message"; exit 1; }
[ ! -e "$work/out/summary.json" ] || { echo "FAIL: a summary was written"; exit 1; }
[ ! -e "$work/out/.aquiledger-run.lock" ] || { echo "FAIL: the lock file outlived the run"; exit 1; }
echo "rank 1's write failure ended the run on both ranks with status 3"
