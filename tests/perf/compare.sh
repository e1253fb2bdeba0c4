#!/usr/bin/env bash
# Whole-process comparison of medload's heavy commands against `sqlite3 .import` of the
# same dispensing file, for people measuring performance (ctest does not run it).
#
#   tests/perf/compare.sh --rows N --medload PATH --work DIR [--runs R] [--shape S]
#                         [--duckdb MODULES]
#
# --rows N      approximate dispensing rows; `medload synth --patients N/19.2 --months 12`
#               (52,000 patients gave 1,000,213 rows). The data set is generated once
#               into DIR/data-PATIENTS and reused when present.
# --medload     the medload executable to measure (a Release build)
# --work DIR    where the data, the stores and the results go
# --runs R      hyperfine runs per command (default 3)
# --shape S     synth (the default) or weekly: tests/perf/weekly_shape.py --rows N into
#               DIR/weekly-N (another column order, extra columns, few days supplies,
#               about 400 rows a patient)
# --duckdb M    a folder where `npm install @duckdb/node-api` was run: also times DuckDB
#               running tests/perf/duckdb_cohort.sql on the CSV files (duckdb_cohort.cjs)
#
# In one hyperfine run (so that every command meets the same machine load) it times:
#   sqlite3 .import --csv of dispensing.csv into a fresh database (the reference),
#   medload import dispensing into a fresh store (practices and patients loaded in
#     hyperfine's --prepare step, not timed),
#   medload cohort over the last 12 month-ends the data covers,
#   medload review on the last of them (--limit 50),
#   the same review when the packed copy must be packed whole first (as after the first
#     import, or an update; its state row is removed in hyperfine's --prepare step),
#   medload import dispensing and then the cohort on that fresh store (which packs),
#   with --duckdb, DuckDB's cohort from the CSV files (node, 2 threads),
# cohorts and reviews with --at-least items=10 --at-least acb=3; the cohort and reviews
# against a store loaded (and packed) once, the first cohort against the fresh store.
# Then it takes each command's peak resident memory with /usr/bin/time -f "%M" (one more
# run each) and prints a markdown table. Needs hyperfine, sqlite3, jq, GNU date and awk.
# The machine's load changes every figure: note it (uptime) beside the table.
set -euo pipefail

rows=""
medload=""
work=""
runs=3
shape=synth
duckdb=""

usage() {
  sed -n '5,19p' "$0" | sed 's/^# \{0,1\}//' >&2
  exit 2
}

while [[ $# -gt 0 ]]; do
  case "$1" in
    --rows) rows="${2:-}"; shift 2 ;;
    --medload) medload="${2:-}"; shift 2 ;;
    --work) work="${2:-}"; shift 2 ;;
    --runs) runs="${2:-}"; shift 2 ;;
    --shape) shape="${2:-}"; shift 2 ;;
    --duckdb) duckdb="${2:-}"; shift 2 ;;
    -h|--help) usage ;;
    *) echo "compare.sh: unknown argument: $1" >&2; usage ;;
  esac
done

fail() { echo "compare.sh: $1" >&2; usage; }
[[ "$rows" =~ ^[0-9]+$ && "$rows" -ge 20 ]] || fail "--rows needs a whole number >= 20"
[[ "$runs" =~ ^[0-9]+$ && "$runs" -ge 1 ]] || fail "--runs needs a whole number >= 1"
[[ -n "$medload" && -x "$medload" ]] || fail "--medload must name an executable"
[[ -n "$work" ]] || { echo "compare.sh: --work is required" >&2; usage; }
[[ "$shape" == synth || "$shape" == weekly ]] || fail "--shape is synth or weekly"
if [[ -n "$duckdb" ]]; then
  [[ -d "$duckdb/node_modules/@duckdb/node-api" ]] || fail "--duckdb must name a folder with node_modules/@duckdb/node-api"
  command -v node >/dev/null || { echo "compare.sh: node is not installed" >&2; exit 2; }
  duckdb="$(cd "$duckdb" && pwd)"
fi
here="$(cd "$(dirname "$0")" && pwd)"
for tool in hyperfine sqlite3 jq awk /usr/bin/time; do
  command -v "$tool" >/dev/null || { echo "compare.sh: $tool is not installed" >&2; exit 2; }
done

medload="$(cd "$(dirname "$medload")" && pwd)/$(basename "$medload")"
mkdir -p "$work"
work="$(cd "$work" && pwd)"
# The commands are strings handed to hyperfine's shell and to sqlite3's own parser.
for path in "$medload" "$work" "$here" ${duckdb:+"$duckdb"}; do
  [[ "$path" =~ ^[A-Za-z0-9_./+-]+$ ]] || fail "use a path without spaces or quotes: $path"
done

# N / 19.2 patients, rounded to the nearest whole patient.
patients=$(( (rows * 10 + 96) / 192 ))
(( patients >= 1 )) || patients=1
data="$work/data-$patients"
[[ "$shape" == weekly ]] && data="$work/weekly-$rows"
csv="$data/dispensing.csv"

if [[ -s "$csv" && -s "$data/patients.csv" && -s "$data/practices.csv" ]]; then
  echo "reusing $data" >&2
elif [[ "$shape" == weekly ]]; then
  rm -rf "$data.partial"
  python3 "$here/weekly_shape.py" --rows "$rows" --out "$data.partial" >&2
  rm -rf "$data"
  mv "$data.partial" "$data"
else
  echo "generating $patients patients, 12 months into $data" >&2
  # Into a side folder first, so that an interrupted run leaves nothing to reuse.
  rm -rf "$data.partial"
  "$medload" --quiet synth --patients "$patients" --months 12 --seed 7 --out "$data.partial" \
    >/dev/null
  rm -rf "$data"
  mv "$data.partial" "$data"
fi
data_rows=$(( $(wc -l < "$csv") - 1 ))
[[ "$shape" == weekly ]] && patients=$(( $(wc -l < "$data/patients.csv") - 1 ))

# The last 12 month-ends the data covers: D2 is the last month-end on or before the
# latest dispensing date, D1 the month-end eleven months before it.
# The dispensed_on column by its header (no quoted comma comes before it in either shape).
read -r first_day last_day < <(awk -F, 'NR == 1 { for (i = 1; i <= NF; i++) { h = tolower($i);
  gsub(/[ -]/, "_", h); if (h == "dispensed_on") c = i } next }
  { if (min == "" || $c < min) min = $c; if ($c > max) max = $c } END { print min, max }' "$csv")
month_end() { date -d "$(date -d "$1" +%Y-%m-01) +1 month -1 day" +%F; }
d2="$(month_end "$last_day")"
[[ "$d2" == "$last_day" ]] || d2="$(date -d "$(date -d "$last_day" +%Y-%m-01) -1 day" +%F)"
d1="$(month_end "$(date -d "$(date -d "$d2" +%Y-%m-01) -11 months" +%F)")"
if [[ "$d1" < "$first_day" ]]; then
  echo "note: the data start on $first_day, after the first census date $d1" >&2
fi
echo "$data_rows dispensing rows from $first_day to $last_day; census dates $d1 to $d2" >&2

run="$work/run"
mkdir -p "$run"
q() { printf '%q' "$1"; }
ml="$(q "$medload") --quiet"
sqlite_db="$(q "$run/sqlite.db")"
import_db="$(q "$run/import.db")"
store_db="$(q "$run/store.db")"
criteria="--at-least items=10 --at-least acb=3"

# Every prepare step ends with `sync`, so that no command is timed while the kernel is
# still writing out the files of the one before (a 1M-row import leaves ~400 MB to write).
prepare_sqlite="rm -f $sqlite_db* && sync"
prepare_import="rm -f $import_db* &&
  $ml --db $import_db import practices $(q "$data/practices.csv") >/dev/null &&
  $ml --db $import_db import patients $(q "$data/patients.csv") >/dev/null && sync"
cmd_sqlite="sqlite3 $sqlite_db -cmd '.import --csv $(q "$csv") t' .quit"
cmd_import="$ml --db $import_db import dispensing $(q "$csv")"
cmd_cohort="$ml --db $store_db cohort --from $d1 --to $d2 $criteria"
cmd_review="$ml --db $store_db review --on $d2 $criteria --limit 50"
cmd_first_cohort="$cmd_import >/dev/null && $ml --db $import_db cohort --from $d1 --to $d2 $criteria"
cmd_duckdb="node $(q "$here/duckdb_cohort.cjs") --modules $(q "$duckdb") --data $(q "$data") --from $d1 --to $d2"

# The store the cohort and review read: loaded once per medload build and data set.
stamp="$(sha256sum "$medload" | cut -c1-16) $data"
if [[ ! -s "$run/store.db" || "$(cat "$run/store.stamp" 2>/dev/null)" != "$stamp" ]]; then
  echo "loading the store for cohort and review" >&2
  rm -f "$run/store.db"* "$run/store.stamp"
  for kind in practices patients dispensing reviews; do
    [[ -s "$data/$kind.csv" ]] || continue
    "$medload" --quiet --db "$run/store.db" import "$kind" "$data/$kind.csv" >/dev/null
  done
  # The first pass after an import packs the histories: once here, untimed.
  "$medload" --quiet --db "$run/store.db" review --on "$d2" --at-least items=1 --limit 1 >/dev/null
  echo "$stamp" > "$run/store.stamp"
fi

names=("sqlite3 .import (reference)" "medload import dispensing" "medload cohort (12 month-ends)"
       "medload review (one date)" "medload review, whole copy packed first"
       "medload import + first cohort")
commands=("$cmd_sqlite" "$cmd_import" "$cmd_cohort" "$cmd_review" "$cmd_review" "$cmd_first_cohort")
# Removing the packed copy's state row is what an update of a dispensing does to it: the
# whole copy is packed again.
prepare_unpacked="sqlite3 $store_db 'DELETE FROM packed_histories_state' && sync"
prepares=("$prepare_sqlite" "$prepare_import" "sync" "sync" "$prepare_unpacked" "$prepare_import")
if [[ -n "$duckdb" ]]; then
  names+=("DuckDB cohort from the CSV files")
  commands+=("$cmd_duckdb")
  prepares+=("sync")
fi

json="$run/hyperfine.json"
hyperfine_args=(--runs "$runs" --export-json "$json" --style basic)
for i in "${!commands[@]}"; do
  hyperfine_args+=(--prepare "${prepares[$i]}" --command-name "${names[$i]}" "${commands[$i]}")
done
hyperfine "${hyperfine_args[@]}" >&2

# Peak resident memory: one more run of each, after its prepare step.
peaks=()
for i in "${!commands[@]}"; do
  bash -c "${prepares[$i]}"
  /usr/bin/time -f "%M" -o "$run/peak.txt" bash -c "${commands[$i]}" >/dev/null
  peaks+=("$(tail -n 1 "$run/peak.txt")")
done

echo
echo "$data_rows dispensing rows ($patients patients, $first_day to $last_day), $runs runs each;" \
     "cohort $d1 to $d2 by month, review on $d2; load average: $(cut -d' ' -f1-3 /proc/loadavg)"
echo
echo "| command | median wall s | peak MB | vs sqlite3 import | per row µs |"
echo "|---|---|---|---|---|"
reference="$(jq -r '.results[0].median' "$json")"
for i in "${!commands[@]}"; do
  median="$(jq -r ".results[$i].median" "$json")"
  awk -v name="${names[$i]}" -v m="$median" -v ref="$reference" -v kb="${peaks[$i]}" \
      -v n="$data_rows" 'BEGIN { printf "| %s | %.2f | %.1f | %.2fx | %.2f |\n",
      name, m, kb / 1024, m / ref, m * 1e6 / n }'
done
# CPU time tells more than wall time on a loaded machine.
echo
printf 'CPU s (user + system, mean of the runs):'
for i in "${!commands[@]}"; do
  jq -r ".results[$i] | \" \\(.command): \\(.user + .system | . * 100 | round / 100)\"" "$json" |
    tr -d '\n'
  (( i + 1 < ${#commands[@]} )) && printf ';'
done
echo
