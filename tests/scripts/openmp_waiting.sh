#!/usr/bin/env bash
# OpenMP threads wait passively unless the user chose a policy (io/cli/openmp_waiting.hpp),
# and the program starts itself again for that before any library initialises. Checked with
# GNU OpenMP's own report of the settings it read (OMP_DISPLAY_ENV=verbose prints
# GOMP_SPINCOUNT, the spins before a waiting thread sleeps: 0 for OMP_WAIT_POLICY=passive,
# 30 billion for active, 300,000 when neither is set; GNU libgomp manual, "GOMP_SPINCOUNT",
# from memory) and the dynamic loader's record of the initialisers it calls (LD_DEBUG=libs,
# glibc's ld.so(8)):
#  1. without either variable, GNU OpenMP is initialised once, with spin count 0, and the
#     first start called no initialiser: one "calling init" of libc, after two "calling
#     preinit" of the program (the first start and the restart);
#  2. OMP_WAIT_POLICY=active and GOMP_SPINCOUNT=77 are kept, with no restart;
#  3. the restarted program has the user's environment and arguments (it checks the demo).
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
make_scratch t
unset OMP_WAIT_POLICY GOMP_SPINCOUNT

# Runs the program with the given environment additions; its stderr in $t/err.
settings() {
  env "$@" OMP_DISPLAY_ENV=verbose LD_DEBUG=libs "$exe" --version >"$t/out" 2>"$t/err" ||
    fail "--version failed with $*: $(cat "$t/err")"
  grep -q '^aquiledger ' "$t/out" || fail "--version printed no version with $*"
}
count() { grep -c -- "$1" "$t/err" || true; }
spin_count() { sed -n "s/^ *GOMP_SPINCOUNT = '\([0-9]*\)'.*/\1/p" "$t/err"; }

settings ONE_OF_THE_USERS=kept
[[ $(count 'OPENMP DISPLAY ENVIRONMENT BEGIN') == 1 ]] ||
  fail "GNU OpenMP initialised $(count 'OPENMP DISPLAY ENVIRONMENT BEGIN') times, expected once"
[[ $(spin_count) == 0 ]] || fail "spin count $(spin_count) without a policy set, expected 0 (passive)"
[[ $(count 'calling preinit: ') == 2 ]] ||
  fail "$(count 'calling preinit: ') starts of the program, expected 2 (one restart)"
[[ $(count 'calling init: .*libc\.so') == 1 ]] ||
  fail "the C library initialised $(count 'calling init: .*libc\.so') times: the restart came late"

settings OMP_WAIT_POLICY=active
[[ $(spin_count) == 30000000000 ]] || fail "OMP_WAIT_POLICY=active not kept: spin count $(spin_count)"
[[ $(count 'calling preinit: ') == 1 ]] || fail "restarted although OMP_WAIT_POLICY was set"
settings GOMP_SPINCOUNT=77
[[ $(spin_count) == 77 ]] || fail "GOMP_SPINCOUNT=77 not kept: spin count $(spin_count)"
[[ $(count 'calling preinit: ') == 1 ]] || fail "restarted although GOMP_SPINCOUNT was set"

# 3. The restarted program keeps the user's environment (LD_DEBUG and OMP_DISPLAY_ENV above
# reached the second start) and its arguments: it checks the demo model.
"$exe" check -q "$src/cases/01-marrow-basin/model.toml" >"$t/out" 2>&1 ||
  fail "check of the demo model failed after the restart: $(cat "$t/out")"
echo "PASS: passive waiting by default, the user's policy kept, one start of every initialiser"
