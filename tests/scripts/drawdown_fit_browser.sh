#!/usr/bin/env bash
# The interpretation page of `drawdown-fit` in a real browser: the invented cases
# (cases/02-*: confined, auto; cases/03-*: delayed yield, Neuman; cases/07-*: screens, Hantush
# 1961 partial penetration, with its screens on the page) are interpreted, their
# interpretation.html opened in headless Chromium, and each page must have rendered its three
# diagnostic charts (log-log with the derivative, semi-log with the Cooper-Jacob line,
# residuals), carry its sections, the caution, the fitted values of fit.json, and no NaN.
#   bash drawdown_fit_browser.sh <aquiledger> <source-dir>
# Prints "SKIPPED: ..." and exits 0 only when Chromium is not installed.
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_chromium
make_scratch tmp
# shellcheck source=../support/browser_page.sh
source "$src/tests/support/browser_page.sh"

for case in 02-hollin-ford-confined-test 03-brackwater-water-table-test \
  07-corvel-moss-partial-penetration-test; do
  out="$tmp/$case"
  "$exe" drawdown-fit "$src/cases/$case/test.toml" -o "$out" -q
  page="$out/interpretation.html"
  check_page "$page" 3
  dom=$page_dom
  for heading in "About this test" "Fitted values" "Model comparison" "What the fit suggests" \
    "Diagnostic plots"; do
    if ! grep -q "<h2>$heading" <<<"$dom"; then
      echo "FAILED: $case: no section heading '$heading'" >&2
      exit 1
    fi
  done
  for text in "never replaces, the judgement of a licensed professional" "Bourdet et al., 1989" \
    "Cooper-Jacob (1946) straight line" "AICc" "95 % low" "correlation of ln p" \
    "to be weighed by a professional"; do
    if ! grep -qF "$text" <<<"$dom"; then
      echo "FAILED: $case: the page does not say '$text'" >&2
      exit 1
    fi
  done
  if [[ $case == 07-* ]]; then
    for text in "Hantush (1961), partially penetrating wells" "piezometer tip at -40 m" \
      "-30 to -38 m" "anisotropy_ratio"; do
      grep -qF -- "$text" <<<"$dom" || { echo "FAILED: $case: no '$text'" >&2; exit 1; }
    done
  fi
  check_visible_text "$dom"
  # The table shows the chosen model's fitted values as fit.json holds them (4 significant
  # digits).
  python3 - "$out/fit.json" "$page" <<'PY'
import json, sys
fit = json.load(open(sys.argv[1]))
page = open(sys.argv[2]).read()
chosen = [c for c in fit["candidates"] if c["model"] == fit["chosen_model"]][0]
for p in chosen["parameters"]:
    for key in ("value", "low_95", "high_95"):
        shown = "%.4g" % p[key]
        assert f"<td>{shown}</td>" in page, (p["name"], key, shown)
PY
done
echo "drawdown-fit browser: OK"
