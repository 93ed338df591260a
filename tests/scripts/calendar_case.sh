#!/usr/bin/env bash
# The Ashby Fen case (cases/04-ashby-fen-monthly): 120 calendar months built from CSV tables
# and a raster. Every step's budget closes below 1e-6 percent (model format contract); each
# month's pumped volume equals the log's mean rate times the month's days (the "mean" rule of
# docs/model-format.md: a value holds until the next row); a blank log cell keeps the last
# rate; every table carries dates.
#   bash calendar_case.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: calendar_case.sh <aquiledger> <source-dir>}
src=${2:?usage: calendar_case.sh <aquiledger> <source-dir>}
t=$(mktemp -d)
trap 'rm -rf "$t"' EXIT
fail() {
  echo "FAIL: $*" >&2
  exit 1
}
case_dir="$src/cases/04-ashby-fen-monthly"
"$exe" check "$case_dir/model.toml" -q || fail "check refused the case"
"$exe" run "$case_dir/model.toml" -o "$t/out" -q
out="$t/out"

head -1 "$out/balance_periods.csv" | grep -qx \
  'period,period_name,start,end,into_aquifer,out_of_aquifer,imbalance_percent,start_date,end_date' ||
  fail "balance_periods.csv header: $(head -1 "$out/balance_periods.csv")"
[[ $(($(wc -l <"$out/balance_periods.csv") - 1)) == 120 ]] || fail "not 120 monthly periods"
grep -q '^1,month 2015-01,0,31,.*,2015-01-01,2015-02-01$' "$out/balance_periods.csv" ||
  fail "January 2015 is not period 1 from 2015-01-01 to 2015-02-01"
grep -q '^120,month 2024-12,3622,3653,.*,2024-12-01,2025-01-01$' "$out/balance_periods.csv" ||
  fail "December 2024 is not period 120 (day 3622 to 3653)"
worst=$(awk -F, 'NR > 1 { v = $7 < 0 ? -$7 : $7; if (v > m) m = v } END { printf "%.3g", m }' \
  "$out/balance_steps.csv")
awk -v w="$worst" 'BEGIN { exit !(w < 1e-6) }' || fail "a step's imbalance is $worst percent"

# volume <period> <well>: out_of_aquifer of the well in that period (m3).
volume() { awk -F, -v p="$1" -v w="$2" '$1 == p && $3 == w { print $6 }' "$out/budget_features.csv"; }
# logged <date> <column>: the log's rate (m3/d).
logged() {
  awk -F, -v d="$1" -v c="$2" 'NR == 1 { for (i = 1; i <= NF; i++) if ($i == c) k = i }
    $1 == d { print $k }' "$case_dir/pumping_log.csv"
}
same() {  # same <a> <b> <what>: equal to 1e-12 relative
  awk -v a="$1" -v b="$2" 'BEGIN { d = a - b; if (d < 0) d = -d; exit !(d <= 1e-12 * b) }' ||
    fail "$3: $1 against $2"
}
# March 2017 is period 27 (31 days); May 2021 is period 77, Ashby 3's cell blank there.
same "$(volume 27 'Ashby 1')" "$(awk -v r="$(logged 2017-03-01 'Ashby 1')" 'BEGIN { print r * 31 }')" \
  "Ashby 1 in March 2017"
same "$(volume 38 'Ashby 2')" "$(awk -v r="$(logged 2018-02-01 'Ashby 2')" 'BEGIN { print r * 28 }')" \
  "Ashby 2 in February 2018"
[[ -z $(logged 2021-05-01 'Ashby 3') ]] || fail "the log's May 2021 cell of Ashby 3 is not blank"
same "$(volume 77 'Ashby 3')" "$(awk -v r="$(logged 2021-04-01 'Ashby 3')" 'BEGIN { print r * 31 }')" \
  "Ashby 3 in May 2021 (blank: April's rate holds)"
same "$(volume 5 'Fen dairy')" 4650 "the dairy in May 2015 (150 m3/d x 31 d)"

head -1 "$out/observations.csv" | grep -qx 'observation,period,step,time,head,drawdown,date' ||
  fail "observations.csv has no date column"
grep -q '"start_date": "2015-01-01"' "$out/summary.json" || fail "summary.json has no start_date"
"$exe" report "$out" -q
grep -q 'Depth to water below the land surface' "$out/report.html" ||
  fail "the report has no depth-to-water map"
echo "calendar case: 120 months, largest step imbalance $worst %, logged volumes exact"
