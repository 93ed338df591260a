#!/usr/bin/env bash
# The estimation page (estimate.html, docs/report.md "The estimation page") in a real browser:
# the worked case cases/06-larkmoor-calibration is calibrated and its page opened in headless
# Chromium; it must have rendered its three charts (composite scaled sensitivities, weighted
# residuals, objective history), carry its sections, the caution and the estimates of
# estimate.json, and show no NaN. A second, short fit of K and recharge from steady heads
# alone (known not to be separable: Hill and Tiedeman, 2007, sec. 7.2.2) must show the
# not-identifiable warning in its page and its correlation table.
#   bash estimate_browser.sh <aquiledger> <source-dir>
# Prints "SKIPPED: ..." and exits 0 only when Chromium is not installed.
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_chromium
make_scratch tmp
# shellcheck source=../support/browser_page.sh
source "$src/tests/support/browser_page.sh"
case_dir="$src/cases/06-larkmoor-calibration"

"$exe" estimate "$case_dir/setup.toml" -o "$tmp/fit" -q
page="$tmp/fit/estimate.html"
check_page "$page" 3
dom=$page_dom
for heading in "About this calibration" "Estimates" "Correlations" \
  "Composite scaled sensitivities" "Residuals" "Objective history"; do
  if ! grep -q "<h2>$heading" <<<"$dom"; then
    echo "FAILED: no section heading '$heading'" >&2
    exit 1
  fi
done
for text in "never replaces, the judgement of a licensed professional" "Hill and Tiedeman, 2007" \
  "95 % low" "weighted residual" "fitted_model.toml" "No warnings"; do
  if ! grep -qF "$text" <<<"$dom"; then
    echo "FAILED: the page does not say '$text'" >&2
    exit 1
  fi
done
check_visible_text "$dom"
# The table shows the estimates as estimate.json holds them (4 significant digits).
/usr/bin/python3 - "$tmp/fit/estimate.json" "$page" <<'PY'
import json, sys
est = json.load(open(sys.argv[1]))
page = open(sys.argv[2]).read()
for p in est["parameters"]:
    for key in ("value", "lower_95", "upper_95", "css"):
        shown = "%.4g" % p[key]
        assert f"<td>{shown}</td>" in page, (p["name"], key, shown)
PY

# K and recharge from steady heads alone: the warning, in words and in the table.
cat > "$tmp/steady.toml" <<TOML
[estimate]
model = "$case_dir/model.toml"
max_iterations = 3
[[parameter]]
name = "K upland"
property = "k"
zone = 2
form = "value"
start = 4.0
lower = 0.1
upper = 100.0
[[parameter]]
name = "recharge multiplier"
property = "recharge"
lower = 0.1
upper = 5.0
TOML
for b in LM1 LM2 LM3 LM4 LM5 LM6; do
  h=$(grep '^0,' "$case_dir/bores/$b.csv" | cut -d, -f2)
  printf '[[target]]\nname = "%s"\nkind = "head"\nbore = "%s"\ntimes = [0.0]\nvalues = [%s]\n' \
    "$b" "$b" "$h" >> "$tmp/steady.toml"
done
"$exe" estimate "$tmp/steady.toml" -o "$tmp/steady" -q 2> /dev/null
page="$tmp/steady/estimate.html"
check_page "$page" 3
dom=$page_dom
for text in 'Warning: parameters "K upland" and "recharge multiplier" are correlated' \
  "(not identifiable)"; do
  if ! grep -qF "$text" <<<"$dom"; then
    echo "FAILED: the steady-heads page does not say '$text'" >&2
    exit 1
  fi
done
check_visible_text "$dom"
echo "estimate browser: OK"
