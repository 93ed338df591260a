#!/usr/bin/env bash
# The analytical benchmark suite: `aquiledger verify` must exit 0 (every benchmark within its
# tolerance, see docs/verification.md) and write one CSV per comparison plus verify.html.
#   bash verify_suite.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: verify_suite.sh <aquiledger> <source-dir>}
tmpdir=$(mktemp -d)
trap 'rm -rf "$tmpdir"' EXIT

"$exe" verify --out "$tmpdir/out"
for f in theis_profile papadopulos_x hantush_jacob_history step_response_profile dupuit_profile \
         glover_balmer_depletion drainage_history compressibility_skeleton summary; do
  if [[ ! -s "$tmpdir/out/$f.csv" ]]; then
    echo "FAILED: verify wrote no $f.csv" >&2
    exit 1
  fi
done
head -1 "$tmpdir/out/theis_profile.csv" | grep -qx 'x,numerical,analytical,error'
head -1 "$tmpdir/out/theis_history.csv" | grep -qx 't,numerical,analytical,error'
grep -q '<div class="chart"' "$tmpdir/out/verify.html"
# The page renders in a browser when one is installed (report_browser.sh checks the demo
# report the same way and reports a skip when there is none).
if [[ -x /usr/bin/chromium ]]; then
  dom=$(timeout 120 /usr/bin/chromium --headless --no-sandbox --disable-gpu --disable-quic \
    --no-first-run --disable-background-networking --disable-component-update --disable-sync \
    --user-data-dir="$(mktemp -d "$tmpdir/profile.XXXXXX")" --virtual-time-budget=10000 \
    --dump-dom "file://$tmpdir/out/verify.html" 2>/dev/null)
  status=$(grep -o '<p id="render-status">[^<]*' <<<"$dom" | sed 's/.*>//')
  charts=$(grep -o '<div class="chart" id="chart-[0-9]*"' <<<"$dom" | wc -l)
  rendered=$(grep -o '<div class="chart" id="chart-[0-9]*"[^>]*><svg' <<<"$dom" | wc -l)
  echo "verify.html: status '$status', $rendered of $charts charts rendered"
  if [[ "$status" != "ok" || "$charts" -lt 16 || "$rendered" -ne "$charts" ]]; then
    echo "FAILED: verify.html did not render" >&2
    exit 1
  fi
fi
echo "verify suite: OK"
