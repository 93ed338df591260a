#!/usr/bin/env bash
# One run at a time per output folder (docs/robustness.md): a second run into a folder that
# a live run is writing is refused with exit status 3 and a message naming the other run's
# process and host, before it writes anything; a lock left by a killed run is taken over.
set -euo pipefail
exe=$1
src=$2
t=$(mktemp -d)
first=""
trap 'if [[ -n $first ]]; then kill -9 "$first" 2>/dev/null || true; fi; rm -rf "$t"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
cp "$src/tests/data/robust/restart.toml" "$t/model.toml"
lock="$t/out/.aquiledger-run.lock"
wait_for_lock() {
  for _ in $(seq 1 3000); do
    [[ -s $lock ]] && return 0
    sleep 0.01
  done
  fail "no lock file appeared"
}

# The first run is paused while it holds the lock, so the second certainly meets it.
"$exe" run "$t/model.toml" --threads 1 -q -o "$t/out" &
first=$!
wait_for_lock
kill -STOP "$first"
set +e
msg=$("$exe" run "$t/model.toml" --threads 1 -q -o "$t/out" 2>&1)
status=$?
set -e
kill -CONT "$first"
[[ $status -eq 3 ]] || fail "second run: exit status $status, expected 3 ($msg)"
grep -q "in use by another aquiledger run (process $first on host $(hostname)" <<<"$msg" ||
  fail "second run: message '$msg'"
echo "second run refused: $(head -1 <<<"$msg")"
wait "$first" || fail "the first run failed"
first=""
[[ ! -e $lock ]] || fail "the lock file outlived the run"
[[ -f $t/out/summary.json ]] || fail "the first run's results are missing"

# A run killed outright leaves its lock file; the next run takes it over and says so.
"$exe" run "$t/model.toml" --threads 1 -o "$t/out" >/dev/null 2>&1 &
first=$!
wait_for_lock
kill -9 "$first"
wait "$first" 2>/dev/null || true
first=""
[[ -s $lock ]] || fail "the killed run left no lock file to take over"
msg=$("$exe" run "$t/model.toml" --threads 1 -o "$t/out" 2>&1 >/dev/null) || fail "run after a kill failed: $msg"
grep -q "took over the output folder's lock left by a run that ended early (process" <<<"$msg" ||
  fail "no note of the stale lock: '$msg'"
echo "stale lock taken over: $msg"
