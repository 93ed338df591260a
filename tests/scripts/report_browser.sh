#!/usr/bin/env bash
# The HTML report in a real browser: run the demo basin, write its report, open it in
# headless Chromium and check that every chart container holds a rendered SVG and that the
# page's status marker (set after every Vega view has rendered; script errors are caught
# into it by window.onerror) reads "ok". Also takes a screenshot. The same check runs on
# the page `aquiledger verify` writes.
#   bash report_browser.sh <aquiledger> <source-dir>
# Prints "SKIPPED: ..." and exits 0 only when Chromium is not installed.
set -euo pipefail
exe=${1:?usage: report_browser.sh <aquiledger> <source-dir>}
src=${2:?usage: report_browser.sh <aquiledger> <source-dir>}
chromium=/usr/bin/chromium

if [[ ! -x "$chromium" ]]; then
  echo "SKIPPED: $chromium is not installed (Debian package chromium)"
  exit 0
fi

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

"$exe" run "$src/cases/01-marrow-basin/model.toml" --output "$tmp" --quiet
"$exe" report "$tmp"

browse() {  # browse <page> <extra chromium args...>
  local page=$1
  shift
  local profile
  profile=$(mktemp -d "$tmp/profile.XXXXXX")
  timeout 120 "$chromium" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync \
    --user-data-dir="$profile" --virtual-time-budget=10000 "$@" "file://$page" 2>/dev/null
}

check_page() {  # check_page <page> <minimum charts>
  local page=$1 minimum=$2 dom
  dom=$(browse "$page" --dump-dom)
  local status charts rendered
  status=$(grep -o '<p id="render-status">[^<]*' <<<"$dom" | sed 's/.*>//')
  charts=$(grep -o '<div class="chart" id="chart-[0-9]*"' <<<"$dom" | wc -l)
  # A container rendered by Vega's SVG renderer holds an <svg> element right inside it.
  rendered=$(grep -o '<div class="chart" id="chart-[0-9]*"[^>]*><svg' <<<"$dom" | wc -l)
  echo "$page: status '$status', $rendered of $charts charts rendered"
  if [[ "$status" != "ok" ]]; then
    echo "FAILED: the page's status marker reads '$status'" >&2
    exit 1
  fi
  if ((charts < minimum || rendered != charts)); then
    echo "FAILED: expected at least $minimum charts, all rendered" >&2
    exit 1
  fi
}

# Demo report: 5 periods' budget, storage, imbalance, 3 hydrographs, 2 x 2 maps.
check_page "$tmp/report.html" 10
browse "$tmp/report.html" --window-size=1100,3000 --screenshot="$tmp/report.png" >/dev/null
if [[ ! -s "$tmp/report.png" ]]; then
  echo "FAILED: no screenshot" >&2
  exit 1
fi

echo "report browser: OK"
