#!/usr/bin/env bash
# The dispensing import of one or more medload executables side by side with
# `sqlite3 .import` of the same file, in one hyperfine run, and a check that every
# executable leaves the same store, summary and rejects file. For people measuring the
# import (ctest does not run it); docs/benchmarks.md "Import speed" uses it.
#
#   tests/perf/import_ab.sh --data DIR --work DIR [--runs R] [--check-only] MEDLOAD...
#
# --data DIR    a folder with practices.csv, patients.csv and dispensing.csv (as written by
#               `medload synth` or tests/perf/weekly_shape.py)
# --work DIR    stores, dumps and results (paths without spaces or quotes)
# --runs R      hyperfine runs per command (default 3)
# --check-only  only the output check, no timing
#
# Each timed import goes into a fresh store holding the practices and patients (loaded in
# hyperfine's --prepare step with the same executable, then `sync`). The check imports
# once more with each executable (--rejects, --format json) and compares, between the
# executables: the summary (JSON), the rejects file and a dump of the store with the
# import times blanked. Prints a markdown table: median wall seconds, ratio to
# `sqlite3 .import`, mean user and system CPU seconds. Needs hyperfine, sqlite3 and jq.
set -euo pipefail

data=""; work=""; runs=3; check_only=0; bins=()
while [[ $# -gt 0 ]]; do
  case "$1" in
    --data) data="${2:-}"; shift 2 ;;
    --work) work="${2:-}"; shift 2 ;;
    --runs) runs="${2:-}"; shift 2 ;;
    --check-only) check_only=1; shift ;;
    -h|--help) sed -n '7,13p' "$0" | sed 's/^# \{0,1\}//' >&2; exit 2 ;;
    *) bins+=("$1"); shift ;;
  esac
done
fail() { echo "import_ab.sh: $1" >&2; exit 2; }
[[ -s "$data/dispensing.csv" && -s "$data/patients.csv" && -s "$data/practices.csv" ]] ||
  fail "--data must name a folder with practices.csv, patients.csv and dispensing.csv"
[[ -n "$work" ]] || fail "--work is required"
[[ ${#bins[@]} -ge 1 ]] || fail "name at least one medload executable"
[[ "$runs" =~ ^[1-9][0-9]*$ ]] || fail "--runs needs a whole number >= 1"
for tool in hyperfine sqlite3 jq; do command -v "$tool" >/dev/null || fail "$tool is not installed"; done
mkdir -p "$work"
work="$(cd "$work" && pwd)"; data="$(cd "$data" && pwd)"
for i in "${!bins[@]}"; do
  [[ -x "${bins[$i]}" ]] || fail "not an executable: ${bins[$i]}"
  bins[$i]="$(cd "$(dirname "${bins[$i]}")" && pwd)/$(basename "${bins[$i]}")"
done
for path in "$work" "$data" "${bins[@]}"; do
  [[ "$path" =~ ^[A-Za-z0-9_./+-]+$ ]] || fail "use a path without spaces or quotes: $path"
done

# A fresh store with the registry loaded by executable $1 into $2.
registry() { echo "rm -f $2* && $1 --quiet --db $2 import practices $data/practices.csv >/dev/null && $1 --quiet --db $2 import patients $data/patients.csv >/dev/null && sync"; }

# The check: the same outputs from every executable.
dump() { # medload store out
  sqlite3 "$2" ".mode list" \
    "SELECT 'run', id, kind, outcome, read, imported, duplicates, rejected, not_counted FROM import_runs ORDER BY id;" \
    "SELECT * FROM dispensings ORDER BY id;" \
    "SELECT run_id, line, reason, message, original_row FROM rejected_rows ORDER BY id;" \
    "SELECT * FROM patients ORDER BY patient_id;" "SELECT * FROM practices ORDER BY practice;" \
    "PRAGMA integrity_check;" "SELECT sql FROM sqlite_schema ORDER BY name;" > "$3/store.txt"
}
first=""
for i in "${!bins[@]}"; do
  out="$work/check-$i"; rm -rf "$out"; mkdir -p "$out"
  bash -c "$(registry "${bins[$i]}" "$out/store.db")"
  set +e
  "${bins[$i]}" --quiet --db "$out/store.db" import dispensing "$data/dispensing.csv" --format json \
    --rejects "$out/rejects.csv" > "$out/summary.json" 2> "$out/stderr.txt"
  echo $? > "$out/exit_code"
  set -e
  dump "${bins[$i]}" "$out/store.db" "$out"
  rm -f "$out/store.db"*
  if [[ -z "$first" ]]; then first="$out"; continue; fi
  if diff -rq "$first" "$out" >/dev/null; then
    echo "outputs of ${bins[$i]}: the same as ${bins[0]}" >&2
  else
    echo "outputs of ${bins[$i]}: DIFFER from ${bins[0]} (diff -r $first $out)" >&2
    diff -rq "$first" "$out" >&2 || true
  fi
done
echo "$(jq -r '.read' "$first/summary.json") rows read, $(jq -r '.imported' "$first/summary.json") imported," \
     "$(jq -r '.duplicates' "$first/summary.json") duplicates, $(jq -r '.rejected' "$first/summary.json") rejected" >&2
[[ $check_only -eq 1 ]] && exit 0

json="$work/hyperfine.json"
args=(--runs "$runs" --export-json "$json" --style basic
      --prepare "rm -f $work/sqlite.db* && sync" --command-name "sqlite3 .import"
      "sqlite3 $work/sqlite.db -cmd '.import --csv $data/dispensing.csv t' .quit")
for i in "${!bins[@]}"; do
  args+=(--prepare "$(registry "${bins[$i]}" "$work/import-$i.db")" --command-name "import [$i] ${bins[$i]}"
         "${bins[$i]} --quiet --db $work/import-$i.db import dispensing $data/dispensing.csv")
done
hyperfine "${args[@]}" >&2
rm -f "$work"/import-*.db* "$work"/sqlite.db*

echo
echo "$(( $(grep -c '' "$data/dispensing.csv") - 1 )) rows of $data, $runs runs each; load average at the end: $(cut -d' ' -f1-3 /proc/loadavg)"
echo
echo "| command | median wall s | min-max s | vs sqlite3 .import | user s | system s |"
echo "|---|---|---|---|---|---|"
reference="$(jq -r '.results[0].median' "$json")"
jq -r --argjson ref "$reference" '.results[] | "| \(.command) | \(.median * 100 | round / 100) | \(.min * 100 | round / 100)-\(.max * 100 | round / 100) | \(.median / $ref * 100 | round / 100)x | \(.user * 100 | round / 100) | \(.system * 100 | round / 100) |"' "$json"
