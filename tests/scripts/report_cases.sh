#!/usr/bin/env bash
# The report in three variants of the demo basin (docs/report.md):
#  1. a well asked for more than its drying cell gives: the well-shortfall table holds the
#     asked volume (rate x period length, from the model) and the delivered volume of
#     budget_features.csv, and the converted-cell counts agree with balance_steps.csv;
#  2. measured heads all after the run ends: `check` warns, the page says no statistics;
#  3. bores without measured heads: the page says the model is not compared.
#   bash report_cases.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: report_cases.sh <aquiledger> <source-dir>}
src=${2:?usage: report_cases.sh <aquiledger> <source-dir>}
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() {
  echo "FAIL: $*" >&2
  exit 1
}
# The page's visible text, tags removed, one space between words.
page_text() { perl -0pe 's/<script.*?<\/script>//gs; s/<[^>]*>/ /g; s/\s+/ /g' "$1"; }

copy_demo() {  # copy_demo <folder>
  mkdir -p "$1"
  cp "$src"/cases/01-marrow-basin/*.toml "$src"/cases/01-marrow-basin/*.txt \
    "$src"/cases/01-marrow-basin/*.csv "$1"/
}

# 1. Tarn farm asked for 30000 m3/d in the drought season (period 4, 180 d): its cell drains.
copy_demo "$t/shortfall"
sed -i 's/^pumping_rate = \[0.0, 900.0, 0.0, 1200.0, 0.0, 900.0\]/pumping_rate = [0.0, 900.0, 0.0, 30000.0, 0.0, 900.0]/' \
  "$t/shortfall/model.toml"
grep -q '30000.0' "$t/shortfall/model.toml" || fail "the Tarn farm rate was not changed"
"$exe" run "$t/shortfall/model.toml" -o "$t/shortfall/out" -q
"$exe" report "$t/shortfall/out" -q
text=$(page_text "$t/shortfall/out/report.html")
delivered=$(awk -F, '$3 == "Tarn farm" && $1 == 4 { printf "%.0f", $6 - $5 }' \
  "$t/shortfall/out/budget_features.csv")
asked=5400000 # 30000 m3/d x 180 d
((delivered < asked)) || fail "the drained well delivered $delivered of $asked m3; no shortfall to show"
group() { perl -pe '1 while s/^(-?\d+)(\d{3})/$1,$2/' <<<"$1"; }
row="Tarn farm 4 drought season $(group $asked) $(group "$delivered") $(group $((asked - delivered)))"
grep -qF "$row" <<<"$text" || fail "no shortfall row '$row' in the page"
grep -q "Every well delivered" <<<"$text" && fail "the page says every well delivered"
# Converted cells: the range of each count over the steps, read back from balance_steps.csv.
counts=$(awk -F, 'NR == 1 { for (i = 1; i <= NF; ++i) c[$i] = i; next }
  { for (k = 0; k < 3; ++k) { n = split("confined_cells water_table_cells dry_cells", name, " ");
      v = $c[name[k + 1]]; if (NR == 2 || v < lo[k]) lo[k] = v; if (NR == 2 || v > hi[k]) hi[k] = v } }
  END { for (k = 0; k < 3; ++k) printf "%s %s ", lo[k], hi[k] }' "$t/shortfall/out/balance_steps.csv")
read -r clo chi wlo whi dlo dhi <<<"$counts"
((whi > 0)) || fail "no cell turned to a water table; the case shows no conversion"
range() { if [[ $1 == "$2" ]]; then echo "$1 throughout"; else echo "from $1 to $2"; fi; }
expected="Active cells confined: $(range "$clo" "$chi"); with a water table: $(range "$wlo" "$whi"); dry: $(range "$dlo" "$dhi")."
grep -qF "$expected" <<<"$text" || fail "no '$expected' in the page"

# 2. Measured heads at 5000 and 5100 d, after the run's end at 1275 d.
copy_demo "$t/outside"
printf 'time,head\n# invented readings, after the run ends\n5000,40.0\n5100,39.5\n' \
  >"$t/outside/calloway_bore.csv"
"$exe" check "$t/outside/model.toml" >"$t/outside/check.txt"
grep -q "none of the 2 measured heads of Calloway bore .*falls inside the run (time 0 to 1275 d)" \
  "$t/outside/check.txt" || fail "check gives no warning for measured heads outside the run"
"$exe" run "$t/outside/model.toml" -o "$t/outside/out" -q
"$exe" report "$t/outside/out" -q
text=$(page_text "$t/outside/out/report.html")
grep -qF "None of the 2 measured heads falls inside the run (time 0 to 1275 d)" <<<"$text" ||
  fail "the page does not say the measured heads fall outside the run"
grep -q "scaled RMSE" <<<"$text" && fail "a statistics table although nothing could be compared"

# 3. No measured heads at all.
copy_demo "$t/none"
sed -i '/^measured = /d' "$t/none/model.toml"
grep -q '^measured' "$t/none/model.toml" && fail "the measured heads were not removed"
"$exe" run "$t/none/model.toml" -o "$t/none/out" -q
"$exe" report "$t/none/out" -q
text=$(page_text "$t/none/out/report.html")
grep -qF "No measured heads were given for the bores" <<<"$text" ||
  fail "the page does not say that no measured heads were given"
for page in shortfall outside none; do
  if grep -qiw -e nan -e undefined <<<"$(page_text "$t/$page/out/report.html")"; then
    fail "the $page page shows 'nan' or 'undefined'"
  fi
done
echo "report: well shortfall, converted cells, measured heads outside the run and none"
