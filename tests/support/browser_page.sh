# Shared by the browser tests (tests/scripts/*_browser.sh): open a page in headless Chromium
# and check that it rendered. Source it after setting $tmp (a scratch folder) and $chromium.
#   browse <page> <extra chromium args...>   prints what Chromium prints (e.g. --dump-dom)
#   check_page <page> <minimum charts> [extra chromium args...]
#                                            the status marker reads "ok" and every chart
#                                            container holds a rendered SVG; exits 1 otherwise.
#                                            Extra arguments go to the same Chromium start
#                                            (--screenshot=FILE takes the page's picture too)
#                                            Leaves the rendered DOM in `page_dom`, so a script
#                                            reads the page once (each Chromium start costs
#                                            several seconds, more under the sanitizers)
#   check_visible_text <dom>                 no "nan", "undefined" or "error:" in visible text

browse() {
  local page=$1
  shift
  local profile
  profile=$(mktemp -d "$tmp/profile.XXXXXX")
  timeout 120 "$chromium" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync \
    --user-data-dir="$profile" --virtual-time-budget=10000 "$@" "file://$page" 2>/dev/null
}

check_page() {
  local page=$1 minimum=$2 dom
  shift 2
  dom=$(browse "$page" --dump-dom "$@")
  page_dom=$dom
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

check_visible_text() {
  # Scripts (the Vega library among them) and the hidden status marker left out.
  local visible
  visible=$(perl -0pe 's/<script.*?<\/script>//gs; s/<p id="render-status"[^>]*>[^<]*//; s/<[^>]*>/ /g' <<<"$1")
  if grep -qiw -e 'nan' -e 'error:' -e 'undefined' <<<"$visible"; then
    echo "FAILED: the rendered page shows 'nan', 'undefined' or an error" >&2
    exit 1
  fi
}
