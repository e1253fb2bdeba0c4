#!/usr/bin/env bash
# A monthly increment against a full re-import, for people measuring performance (ctest
# does not run it).
#
#   tests/perf/increment.sh --rows N --medload PATH --work DIR [--runs R]
#
# --rows N      approximate dispensing rows of 12 months; `medload synth --patients
#               N/19.2 --months 13 --seed 7` writes 13, generated once into DIR/inc-PATIENTS
# --medload     the medload executable to measure (a Release build)
# --work DIR    where the data, the stores and the results go (paths without spaces)
# --runs R      hyperfine runs per command (default 3)
#
# The first 12 months of dispensing.csv are the store as it was (base.csv), the latest
# month the increment (month.csv). In one hyperfine run it times:
#   a full re-import (practices, patients, reviews, all 13 months of dispensing into a
#     fresh store) and then `medload report` over 12 month-ends;
#   the increment: month.csv imported into a copy of the 12-month store (imported, packed
#     and reported on once, untimed, as last month's run left it; the copy made in
#     --prepare), then the same report, which packs again only the histories of the
#     patients the month touched and takes the 11 older census dates' figures from those
#     last month's report saved;
#   the same increment with the whole copy packed again (the copy's state row removed in
#     --prepare), as every packing did before packing only touched patients.
# Then each command's peak resident memory (/usr/bin/time -f %M, one more run each) and a
# markdown table. Needs hyperfine, sqlite3, jq and awk.
set -euo pipefail

rows="" medload="" work="" runs=3
usage() { sed -n '5,10p' "$0" | sed 's/^# \{0,1\}//' >&2; exit 2; }
while [[ $# -gt 0 ]]; do
  case "$1" in
    --rows) rows="${2:-}"; shift 2 ;;
    --medload) medload="${2:-}"; shift 2 ;;
    --work) work="${2:-}"; shift 2 ;;
    --runs) runs="${2:-}"; shift 2 ;;
    *) echo "increment.sh: unknown argument: $1" >&2; usage ;;
  esac
done
[[ "$rows" =~ ^[0-9]+$ && "$rows" -ge 20 ]] || usage
[[ "$runs" =~ ^[0-9]+$ && "$runs" -ge 1 ]] || usage
[[ -n "$medload" && -x "$medload" && -n "$work" ]] || usage
for tool in hyperfine sqlite3 jq awk /usr/bin/time; do
  command -v "$tool" >/dev/null || { echo "increment.sh: $tool is not installed" >&2; exit 2; }
done
medload="$(cd "$(dirname "$medload")" && pwd)/$(basename "$medload")"
mkdir -p "$work"
work="$(cd "$work" && pwd)"
for path in "$medload" "$work"; do
  [[ "$path" =~ ^[A-Za-z0-9_./+-]+$ ]] || { echo "increment.sh: a path without spaces: $path" >&2; exit 2; }
done

patients=$(( (rows * 10 + 96) / 192 ))
(( patients >= 1 )) || patients=1
data="$work/inc-$patients"
if [[ ! -s "$data/month.csv" ]]; then
  echo "generating $patients patients, 13 months into $data" >&2
  rm -rf "$data" "$data.partial"
  "$medload" --quiet synth --patients "$patients" --months 13 --seed 7 --out "$data.partial" >/dev/null
  # dispensed_on is the fourth field; the fields before it are plain identifiers.
  latest="$(awk -F, 'NR > 1 && $4 > max { max = $4 } END { print substr(max, 1, 7) }' \
    "$data.partial/dispensing.csv")"
  awk -F, -v m="$latest" -v dir="$data.partial" 'NR == 1 { print > (dir "/base.csv");
    print > (dir "/month.csv"); next }
    { print > (dir "/" (substr($4, 1, 7) == m ? "month" : "base") ".csv") }' \
    "$data.partial/dispensing.csv"
  network="$(awk -F, 'NR == 2 { print $3 }' "$data.partial/practices.csv")"
  printf '{"title": "Increment benchmark", "network": "%s", "on": "latest", "months": 12,
  "criteria": ["items>=10", "acb>=3"]}\n' "$network" > "$data.partial/report.json"
  mv "$data.partial" "$data"
fi
all_rows=$(( $(wc -l < "$data/dispensing.csv") - 1 ))
month_rows=$(( $(wc -l < "$data/month.csv") - 1 ))

run="$work/inc-run"
mkdir -p "$run"
ml="$medload --quiet"
echo "loading the 12-month store" >&2
rm -f "$run/base.db"*
for kind in practices patients reviews; do
  "$medload" --quiet --db "$run/base.db" import "$kind" "$data/$kind.csv" >/dev/null
done
"$medload" --quiet --db "$run/base.db" import dispensing "$data/base.csv" >/dev/null
"$medload" --quiet --db "$run/base.db" store pack >/dev/null
# Last month's report, as the monthly run had it: the census figures it saves in the store
# are what this month's report may serve (docs/report.md, "Saved census figures").
"$medload" --quiet --db "$run/base.db" report --config "$data/report.json" --out "$run/base-out" >/dev/null
sqlite3 "$run/base.db" 'PRAGMA wal_checkpoint(TRUNCATE)' >/dev/null

report="$ml --db $run/DB report --config $data/report.json --out $run/out"
cmd_full="for kind in practices patients reviews dispensing; do
  $ml --db $run/full.db import \$kind $data/\$kind.csv >/dev/null || exit 1; done &&
  ${report//DB/full.db}"
cmd_month="$ml --db $run/inc.db import dispensing $data/month.csv >/dev/null && ${report//DB/inc.db}"
prepare_full="rm -rf $run/full.db* $run/out && sync"
prepare_month="rm -rf $run/inc.db* $run/out && cp $run/base.db $run/inc.db && sync"
prepare_whole="$prepare_month && sqlite3 $run/inc.db 'DELETE FROM packed_histories_state' && sync"

names=("full re-import + report" "monthly increment + report" "monthly increment + report, whole packing")
commands=("$cmd_full" "$cmd_month" "$cmd_month")
prepares=("$prepare_full" "$prepare_month" "$prepare_whole")
json="$run/hyperfine.json"
args=(--runs "$runs" --export-json "$json" --style basic)
for i in "${!commands[@]}"; do
  args+=(--prepare "${prepares[$i]}" --command-name "${names[$i]}" "${commands[$i]}")
done
hyperfine "${args[@]}" >&2

peaks=()
for i in "${!commands[@]}"; do
  bash -c "${prepares[$i]}"
  /usr/bin/time -f "%M" -o "$run/peak.txt" bash -c "${commands[$i]}" >/dev/null
  peaks+=("$(tail -n 1 "$run/peak.txt")")
done

echo
echo "$all_rows dispensing rows in 13 months ($patients patients), the latest month $month_rows rows;" \
     "$runs runs each; load average: $(cut -d' ' -f1-3 /proc/loadavg)"
echo
echo "| command | median wall s | peak MB (largest process) | vs full re-import + report | CPU s |"
echo "|---|---|---|---|---|"
reference="$(jq -r '.results[0].median' "$json")"
for i in "${!commands[@]}"; do
  jq -r --arg name "${names[$i]}" --arg kb "${peaks[$i]}" --argjson ref "$reference" \
    ".results[$i] | \"| \(\$name) | \(.median * 100 | round / 100) | \(\$kb | tonumber / 1024 | round) |\
 \(.median / \$ref * 100 | round / 100)x | \(.user + .system | . * 100 | round / 100) |\"" "$json"
done
