#!/usr/bin/env bash
# Checkpoint and restart (docs/robustness.md): a run killed with SIGKILL after its first
# checkpoint and resumed with --resume must give results identical, bit for bit, to an
# uninterrupted run (every CSV, every .vtr, fields.pvd; summary.json apart from its wall-time
# keys). A checkpoint of another model file, a damaged checkpoint and a missing one are
# refused with exit status 4.
set -euo pipefail
exe=$1
src=$2
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
cp "$src/tests/data/robust/restart.toml" "$t/model.toml"
run() { "$exe" run "$t/model.toml" --threads 2 -q "$@"; }

run -o "$t/full"

# Started directly (not through the function) so that $! is the program itself.
"$exe" run "$t/model.toml" --threads 2 -q -o "$t/part" --checkpoint-every 3 &
pid=$!
for _ in $(seq 1 3000); do
  [[ -f "$t/part/checkpoint.aqck" ]] && break
  sleep 0.01
done
kill -9 "$pid" 2>/dev/null || true
wait "$pid" 2>/dev/null || true
[[ -f "$t/part/checkpoint.aqck" ]] || fail "no checkpoint appeared"
[[ ! -f "$t/part/summary.json" ]] || fail "the run finished before it was killed; nothing tested"
echo "killed after the first checkpoint; $(ls "$t/part" | grep -c '^fields_.*vtr$') field files on disk"

run -o "$t/part" --checkpoint-every 3 --resume || fail "resume exited with status $?"

n=0
for f in "$t"/full/*.csv "$t"/full/*.vtr "$t/full/fields.pvd"; do
  cmp "$f" "$t/part/$(basename "$f")" || fail "$(basename "$f") differs after the resume"
  n=$((n + 1))
done
[[ $(ls "$t/part" | grep -c '\.vtr$') -eq $(ls "$t/full" | grep -c '\.vtr$') ]] || fail "field file count differs"
python3 - "$t/full/summary.json" "$t/part/summary.json" <<'PY'
import json, sys
a, b = (json.load(open(p)) for p in sys.argv[1:3])
for s in (a, b):
    for key in [k for k in s if k.endswith("seconds")]:
        del s[key]
assert a == b, {k: (a[k], b.get(k)) for k in a if a[k] != b.get(k)}
PY
echo "resumed run identical to the uninterrupted one: $n files compared byte for byte, summary equal"

# A checkpoint that does not belong to the model file is refused.
echo "# edited after the checkpoint" >>"$t/model.toml"
set +e
msg=$(run -o "$t/part" --resume 2>&1)
status=$?
set -e
[[ $status -eq 4 ]] || fail "changed model: exit status $status, expected 4"
grep -q "changed since the checkpoint" <<<"$msg" || fail "changed model: message '$msg'"
echo "changed model refused: $msg" | head -1

# A damaged checkpoint and a missing one are refused too.
cp "$src/tests/data/robust/restart.toml" "$t/model.toml"
head -c 1000 "$t/part/checkpoint.aqck" >"$t/part/cut" && mv "$t/part/cut" "$t/part/checkpoint.aqck"
set +e
msg=$(run -o "$t/part" --resume 2>&1); status=$?
set -e
[[ $status -eq 4 ]] && grep -q "damaged" <<<"$msg" || fail "damaged checkpoint: status $status, '$msg'"
set +e
msg=$(run -o "$t/none" --resume 2>&1); status=$?
set -e
[[ $status -eq 4 ]] && grep -q "no checkpoint" <<<"$msg" || fail "missing checkpoint: status $status, '$msg'"
echo "kill_and_resume: ok"
