#!/usr/bin/env bash
# The HTML report in a real browser: run the demo basin, write its report, open it in
# headless Chromium and check that every chart container holds a rendered SVG and that the
# page's status marker (set after every Vega view has rendered; script errors are caught
# into it by window.onerror) reads "ok". Also takes a screenshot. The same check runs on
# the page `aquiledger verify` writes, and on the subsidence case's page (cases/05).
#   bash report_browser.sh <aquiledger> <source-dir>
# Prints "SKIPPED: ..." and exits 0 only when Chromium is not installed.
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_chromium
make_scratch tmp

"$exe" run "$src/cases/01-marrow-basin/model.toml" --output "$tmp" --quiet
"$exe" report "$tmp"

# shellcheck source=../support/browser_page.sh
source "$src/tests/support/browser_page.sh"

# Demo report: volumes and mean rates, storage, imbalance, converted cells, 3 hydrographs,
# calibration scatter and residual map, and the 4 maps at the last output time.
# The screenshot (checked at the end) in the same Chromium start: Chromium 156 writes both the
# DOM and the picture of one load (one start less; each costs seconds, more under the
# sanitizers' load).
check_page "$tmp/report.html" 14 --window-size=1100,9000 --screenshot="$tmp/report.png"
dom=$page_dom
for heading in "About this run" "Stress periods" "Water budget by stress period" "Mass balance" \
  "Cells converted between confined, water table and dry" "Well shortfall" \
  "Hydrographs at the bores" "Calibration: simulated against measured heads" "Maps at time"; do
  if ! grep -q "<h2>$heading" <<<"$dom"; then
    echo "FAILED: no section heading '$heading'" >&2
    exit 1
  fi
done
check_visible_text "$dom"
# --maps-at: every output time maps; a bad value writes nothing and exits 64.
"$exe" report "$tmp" --maps-at all --out "$tmp/all.html" --quiet
check_page "$tmp/all.html" 20
set +e
"$exe" report "$tmp" --maps-at 12x --out "$tmp/bad.html" --quiet 2>/dev/null
status=$?
set -e
if ((status != 64)) || [[ -e "$tmp/bad.html" ]]; then
  echo "FAILED: --maps-at 12x gave status $status (expected 64, no page)" >&2
  exit 1
fi
# Subsidence (cases/05, interbeds and an extensometer with measured readings): the series
# chart with its residual table and the subsidence map at the end of the dry years (1460 d)
# and of the run (2190 d) render; the demo above (no interbeds) has neither.
for heading in "Subsidence at the subsidence points"; do
  if grep -q "<h2>$heading" <<<"$dom"; then
    echo "FAILED: section '$heading' on the page of a model without interbeds" >&2
    exit 1
  fi
done
if grep -q "Subsidence (total lowering" <<<"$dom"; then
  echo "FAILED: a subsidence map on the page of a model without interbeds" >&2
  exit 1
fi
"$exe" run "$src/cases/05-quillon-vale-subsidence/model.toml" --output "$tmp/sub" --quiet
"$exe" report "$tmp/sub" --maps-at 1460,2190 --quiet
check_page "$tmp/sub/report.html" 18
sub_dom=$page_dom
check_visible_text "$sub_dom"
for text in "<h2>Subsidence at the subsidence points" \
  "Subsidence at Sallow Cross extensometer (60 measured values, 60 inside the run)" \
  "Subsidence (total lowering of the land surface" "<th>measured values used</th>"; do
  if ! grep -qF "$text" <<<"$sub_dom"; then
    echo "FAILED: the subsidence page lacks '$text'" >&2
    exit 1
  fi
done
if (($(grep -o "Subsidence (total lowering of the land surface" <<<"$sub_dom" | wc -l) != 2)); then
  echo "FAILED: expected a subsidence map at each of the 2 --maps-at times" >&2
  exit 1
fi
# The subsidence page's screenshot only when asked for (one Chromium start less); the demo's,
# taken with its check above, is always checked.
if [[ -n "${REPORT_SCREENSHOT:-}" ]]; then
  browse "$tmp/sub/report.html" --window-size=1100,12000 --screenshot="$tmp/subsidence.png" >/dev/null
  cp "$tmp/subsidence.png" "${REPORT_SCREENSHOT%.png}-subsidence.png"
fi

if [[ -n "${REPORT_SCREENSHOT:-}" ]]; then cp "$tmp/report.png" "$REPORT_SCREENSHOT"; fi
if [[ ! -s "$tmp/report.png" ]]; then
  echo "FAILED: no screenshot" >&2
  exit 1
fi

echo "report browser: OK"
