#!/usr/bin/env bash
# What the command line tells the user: `check` shows each feature's row and column span and
# warns when `edge` cells lie far from the grid's edge (an irregular active mask) and when a
# transient period is left at one step; each warning is printed once; -q leaves only errors
# and the final line; every command's help lists its exit codes, 64 included.
#   bash cli_messages.sh <aquiledger> <source-dir>
set -euo pipefail
exe=$1
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

# An L-shaped valley (invented): rows 1-4 active in columns 1-8, rows 5-8 only in columns
# 6-8, so the west edge of rows 5-8 lies 500 m (5 of 8 columns) inside the grid's west edge.
cat > "$t/active.txt" <<'EOF'
1 1 1 1 1 1 1 1
1 1 1 1 1 1 1 1
1 1 1 1 1 1 1 1
1 1 1 1 1 1 1 1
0 0 0 0 0 1 1 1
0 0 0 0 0 1 1 1
0 0 0 0 0 1 1 1
0 0 0 0 0 1 1 1
EOF
cat > "$t/model.toml" <<'EOF'
[model]
title = "L-shaped valley"

[grid]
nrow = 8
ncol = 8
dx = 100.0
dy = 100.0
active = { file = "active.txt" }

[aquifer]
top = 20.0
bottom = 0.0
k = 5.0
condition = "confined"
specific_storage = 1.0e-5

[initial]
head = 25.0

[[period]]
name = "one long step"
length = 30.0

[[fixed_head]]
name = "west side"
edge = "west"
head = 25.0

[[well]]
name = "farm well"
x = 650.0
y = 150.0
pumping_rate = 100.0
EOF
"$exe" check "$t/model.toml" >"$t/out" 2>"$t/err" || fail "check exit $?"
cat "$t/out" "$t/err" >"$t/all"
# Span of the edge placement: every row, columns 1 to 6.
grep -q 'fixed_head "west side".*8 cells (rows 1-8, columns 1-6)' "$t/all" ||
  fail "no span for the west side: $(grep 'west side' "$t/all")"
grep -q 'well "farm well".*row 7, column 7' "$t/all" || fail "well cell not shown"
# The far edge cells: 4 of 8 lie 500 m inside (more than a tenth of the 800 m width).
[[ $(grep -c '4 of the 8 cells of edge = "west" lie more than 80 m' "$t/all") -eq 1 ]] ||
  fail "far edge warning not printed exactly once: $(cat "$t/all")"
[[ $(grep -c 'a transient period in a single time step' "$t/all") -eq 1 ]] ||
  fail "single-step warning not printed exactly once"
grep -q 'The model is valid (2 warnings)' "$t/out" || fail "final line: $(tail -1 "$t/out")"

# -q: the final line only.
"$exe" check "$t/model.toml" -q >"$t/quiet" 2>&1
[[ $(wc -l <"$t/quiet") -eq 1 ]] || fail "check -q printed: $(cat "$t/quiet")"
"$exe" run "$t/model.toml" -o "$t/results" -q >"$t/quiet" 2>&1
[[ $(wc -l <"$t/quiet") -eq 1 ]] || fail "run -q printed: $(cat "$t/quiet")"

# A run prints each warning once too.
"$exe" run "$t/model.toml" -o "$t/results" >"$t/run" 2>&1
[[ $(grep -c 'a transient period in a single time step' "$t/run") -eq 1 ]] ||
  fail "run printed the warning $(grep -c 'single time step' "$t/run") times"

# Help: every command lists its exit codes, 64 (usage) included; a usage error returns 64.
for cmd in check run verify report; do
  "$exe" "$cmd" --help >"$t/help"
  grep -q 'Exit status' "$t/help" || fail "$cmd --help lists no exit status"
  grep -q '64 the command line was wrong' "$t/help" || fail "$cmd --help omits 64"
done
"$exe" --help | grep -q '64 the command line was wrong' || fail "--help omits 64"
set +e
"$exe" check >/dev/null 2>&1
status=$?
set -e
[[ $status -eq 64 ]] || fail "check without a model: exit $status, expected 64"
echo "cli_messages: ok"
