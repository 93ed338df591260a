# shellcheck shell=bash disable=SC2034  # exe and src are for the sourcing script
# The start the end-to-end scripts of tests/scripts share. ctest runs each as
#   bash <script> <aquiledger> <source-dir>
# and a script begins with
#   set -euo pipefail
#   # shellcheck source=../support/script_start.sh
#   source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
# which sets `exe` and `src` from those two arguments (a usage message when one is missing)
# and defines:
#   skip_unless_scipy      prints "SKIPPED: ..." and exits 0 when /usr/bin/python3 has no scipy
#   skip_unless_chromium   the same when Chromium is not installed; sets `chromium`
#   make_scratch NAME      a new scratch folder in variable NAME, removed when the script exits
#   fail MESSAGE...        prints "FAIL: MESSAGE" and exits 1
# A skipped script exits 0 and ctest reports it skipped (SKIP_REGULAR_EXPRESSION,
# tests/CMakeLists.txt).
exe=${1:?usage: ${0##*/} <aquiledger> <source-dir>}
src=${2:?usage: ${0##*/} <aquiledger> <source-dir>}

skip_unless_scipy() {
  if ! /usr/bin/python3 -c "import scipy.special" 2>/dev/null; then
    echo "SKIPPED: /usr/bin/python3 has no scipy (python3-scipy)"
    exit 0
  fi
}

skip_unless_chromium() {
  chromium=/usr/bin/chromium
  if [[ ! -x "$chromium" ]]; then
    echo "SKIPPED: $chromium is not installed (Debian package chromium)"
    exit 0
  fi
}

make_scratch() {
  local dir
  dir=$(mktemp -d)
  printf -v "$1" '%s' "$dir"
  # shellcheck disable=SC2064  # the folder's name is fixed now, on purpose
  trap "rm -rf '$dir'" EXIT
}

fail() {
  echo "FAIL: $*"
  exit 1
}
