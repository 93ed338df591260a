#!/bin/bash
# Each rank reads and checks only its band of rows of the per-cell inputs (docs/distributed.md,
# "Reading by row band"). A bad value in the rows of rank 1 alone stops both ranks with exit
# status 1 and one message, the serial engine's own (file, line, key, value, what was
# expected); a bad value in rank 0's rows likewise. Every rank still reads each array file
# to its end: a short line anywhere is found by every rank and printed once.
# usage: band_errors.sh AQUILEDGER MPIRUN
set -euo pipefail
bin=$1 mpirun=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
mpi=("$mpirun" --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np 2)

# 6 rows x 4 columns: rank 0 owns rows 1-3, rank 1 rows 4-6 (row_split).
write_model() {
  cat > "$1/model.toml" <<'TOML'
[grid]
nrow = 6
ncol = 4
dx = 100.0
dy = 100.0

[aquifer]
top = 20.0
bottom = 0.0
k = { file = "k.txt" }
condition = "confined"
specific_storage = 1.0e-5

[initial]
head = 10.0

[[period]]
name = "one"
length = 10.0
steps = 2

[[fixed_head]]
name = "west"
edge = "west"
head = 10.0

[[well]]
name = "w"
x = 250.0
y = 250.0
pumping_rate = 100.0
TOML
}

# check CASE BAD_ROW BAD_LINE_TEXT: the k file with row BAD_ROW (1-based) replaced.
check() {
  local name=$1 row=$2 text=$3 d="$work/$1"
  mkdir -p "$d"
  write_model "$d"
  : > "$d/k.txt"
  for r in 1 2 3 4 5 6; do
    if [ "$r" -eq "$row" ]; then echo "$text" >> "$d/k.txt"; else echo "5 5 5 5" >> "$d/k.txt"; fi
  done
  set +e
  "$bin" run "$d/model.toml" -o "$d/serial" -q 2> "$d/serial.err"
  local serial=$?
  timeout 300 "${mpi[@]}" "$bin" run "$d/model.toml" -o "$d/dist" --engine petsc -q \
    > "$d/dist.out" 2> "$d/dist.err"
  local status=$?
  set -e
  cat "$d/dist.err"
  [ "$serial" -eq 1 ] || { echo "FAIL $name: serial exit $serial, expected 1"; exit 1; }
  [ "$status" -eq 1 ] || { echo "FAIL $name: distributed exit $status, expected 1"; exit 1; }
  # mpirun adds its own notes about a non-zero exit; keep the program's lines (diagnostics
  # naming a file of the model's folder, and the count of errors).
  grep -E "^$d/|^[0-9]+ errors?: the model was not run\.$" "$d/dist.err" > "$d/dist.lines" || true
  diff "$d/serial.err" "$d/dist.lines" ||
    { echo "FAIL $name: the distributed run's message differs from the serial one"; exit 1; }
  [ "$(grep -c "$d/k.txt" "$d/dist.lines")" -eq 1 ] ||
    { echo "FAIL $name: not exactly one message naming the file"; exit 1; }
  [ ! -e "$d/dist/summary.json" ] || { echo "FAIL $name: a run started"; exit 1; }
}

check rank1 5 "5 5 -2 5"      # row 5 (rank 1's): a negative conductivity
grep -q "k.txt:5: error: \[aquifer\].k: value -2 at row 5, column 3" "$work/rank1/dist.lines" ||
  { echo "FAIL: the message does not name line 5, the key, the value and the cell"; exit 1; }
check rank0 2 "5 0 5 5"       # row 2 (rank 0's)
check short 6 "5 5 5"         # a short line: every rank finds it
echo "a bad value in one rank's rows stopped both ranks with one message and exit status 1"
