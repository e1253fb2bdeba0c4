#!/usr/bin/env bash
# One store per shard against one store of the whole network, on a data folder holding
# practices.csv, patients.csv, dispensing.csv and reviews.csv: each file imported with
# --shard K/N into store K, whose import summary must add up (read = imported +
# duplicates + rejected + other shards); the merged shard cohorts (census dates from
# "latest") byte for byte the whole store's cohort; each shard's review worklist the
# whole worklist's rows of its patients (ranks aside) with the same notes.
#
#   tests/examples/shard_stores.sh MEDLOAD DATA_DIR SHARDS FROM CRITERION
set -euo pipefail
medload="$1"
data="$2"
shards="$3"
from="$4"
criterion="$5"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
fail() { echo "shard_stores: $*" >&2; exit 1; }

# The import summary's CSV rows (after the caution line and the header) must add up.
check_adds_up() {
  awk -F, 'NR > 2 && $1 != "total" {
      if ($7 != $8 + $9 + $10 + $NF) { print "read " $7 " != " $8 "+" $9 "+" $10 "+" $NF " in " FILENAME; bad = 1 }
    } END { exit bad }' "$1" || fail "counts do not add up in $1"
}

for kind in practices patients dispensing reviews; do
  "$medload" --quiet --db "$work/whole.db" import "$kind" "$data/$kind.csv" >/dev/null
  for ((k = 1; k <= shards; k++)); do
    "$medload" --quiet --db "$work/shard-$k.db" --format csv --output "$work/import-$k-$kind.csv" \
      import "$kind" "$data/$kind.csv" --shard "$k/$shards"
    check_adds_up "$work/import-$k-$kind.csv"
  done
done

# Cohort: every shard's store resolves "latest" as the whole store does; the merge equals one run.
merge=()
for ((k = 1; k <= shards; k++)); do
  "$medload" --quiet --db "$work/shard-$k.db" --format json --output "$work/cohort-$k.json" \
    cohort --from "$from" --to latest --at-least "$criterion"
  merge+=("$work/cohort-$k.json")
done
"$medload" --quiet --format csv --output "$work/merged.csv" cohort --merge "${merge[@]}" --suppress-below 5
"$medload" --quiet --db "$work/whole.db" --format csv --output "$work/whole.csv" \
  cohort --from "$from" --to latest --at-least "$criterion" --suppress-below 5
diff "$work/whole.csv" "$work/merged.csv" || fail "the merged shard cohorts differ from one run (diff above)"

# Review: the same notes (data coverage and all), and the whole list's rows shared out.
review() {
  "$medload" --quiet --db "$1" --format csv review --on latest --at-least "$criterion" >"$2"
  grep '^"#' "$2" | grep -v '^"# summary:' >"$2.notes" || true
  grep -v '^"#' "$2" | tail -n +2 | cut -d, -f2- >"$2.rows" || true
}
review "$work/whole.db" "$work/review-whole.csv"
: >"$work/review-shards.rows"
for ((k = 1; k <= shards; k++)); do
  review "$work/shard-$k.db" "$work/review-$k.csv"
  diff "$work/review-whole.csv.notes" "$work/review-$k.csv.notes" || fail "shard $k's review notes differ (diff above)"
  cat "$work/review-$k.csv.rows" >>"$work/review-shards.rows"
done
sort "$work/review-whole.csv.rows" >"$work/whole.sorted"
sort "$work/review-shards.rows" >"$work/shards.sorted"
[ -s "$work/whole.sorted" ] || fail "the review selected nobody: nothing was compared"
diff "$work/whole.sorted" "$work/shards.sorted" || fail "the shards' review rows differ from the whole list's (diff above)"
echo "shard_stores: $shards shard stores give the cohort and the review of one store"
