#!/bin/bash
# Checkpoint and resume under the distributed engine (docs/distributed.md, "Checkpoint and
# resume"): a 2-rank run killed with SIGKILL after a complete checkpoint set and resumed
# with --resume gives tables (budgets, observations, features) and field pieces identical
# byte for byte to the uninterrupted 2-rank run with the same --checkpoint-every (each
# checkpoint starts the multigrid solver anew, as a resumed run does); a set resumed on
# another rank count, or for a changed model, is refused with exit status 4.
# usage: kill_and_resume.sh AQUILEDGER SOURCE_DIR MPIRUN
set -euo pipefail
bin=$1 src=$2 mpirun=$3
work=$(mktemp -d)
job=""
trap 'if [[ -n $job ]]; then kill -9 $job 2>/dev/null || true; fi; pkill -9 -f "$work/model.toml" 2>/dev/null || true; rm -rf "$work"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
mpi() { "$mpirun" --allow-run-as-root --oversubscribe -x OMP_NUM_THREADS=1 -np "$1" "${@:2}"; }
cp "$src/tests/data/robust/restart.toml" "$work/model.toml"

mpi 2 "$bin" run "$work/model.toml" -o "$work/full" --engine petsc -q --checkpoint-every 3

mpi 2 "$bin" run "$work/model.toml" -o "$work/part" --engine petsc -q --checkpoint-every 3 &
job=$!
for _ in $(seq 1 6000); do
  [[ -f "$work/part/checkpoint_set.aqck" ]] && break
  sleep 0.01
done
# SIGKILL to the ranks themselves (mpirun cannot pass a signal it never sees on).
pkill -9 -f "$bin run $work/model.toml -o $work/part" || true
wait "$job" 2>/dev/null || true
job=""
[[ -f "$work/part/checkpoint_set.aqck" ]] || fail "no checkpoint set appeared"
[[ ! -f "$work/part/summary.json" ]] || fail "the run finished before it was killed; nothing tested"
echo "killed after a checkpoint set; $(ls "$work/part" | grep -c '_p0000\.vtr$') field pieces of rank 0 on disk"

mpi 2 "$bin" run "$work/model.toml" -o "$work/part" --engine petsc -q --checkpoint-every 3 --resume ||
  fail "resume exited with status $?"
n=0
for f in "$work"/full/*.csv "$work"/full/*.vtr "$work"/full/*.pvtr "$work/full/fields.pvd"; do
  cmp "$f" "$work/part/$(basename "$f")" || fail "$(basename "$f") differs after the resume"
  n=$((n + 1))
done
echo "resumed distributed run identical to the uninterrupted one: $n files compared byte for byte"

# Another rank count is refused, naming both counts.
set +e
msg=$(mpi 1 "$bin" run "$work/model.toml" -o "$work/part" --engine petsc -q --resume 2>&1)
status=$?
set -e
[[ $status -eq 4 ]] || fail "other rank count: exit status $status, expected 4 ($msg)"
grep -q "written by a run on 2 rank(s), this run has 1" <<<"$msg" || fail "other rank count: '$msg'"
echo "other rank count refused: $(grep '^error' <<<"$msg")"

# A changed model is refused.
echo "# edited after the checkpoint" >>"$work/model.toml"
set +e
msg=$(mpi 2 "$bin" run "$work/model.toml" -o "$work/part" --engine petsc -q --resume 2>&1)
status=$?
set -e
[[ $status -eq 4 ]] || fail "changed model: exit status $status, expected 4"
grep -q "changed since the checkpoint" <<<"$msg" || fail "changed model: '$msg'"
[[ $(grep -c '^error' <<<"$msg") -eq 1 ]] || fail "changed model: more than one message: '$msg'"
echo "changed model refused: $(grep '^error' <<<"$msg")"
