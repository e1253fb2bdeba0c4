#!/usr/bin/env bash
# Output equivalence for refactoring: runs a fixed set of commands with one medload binary
# into a fresh folder, so that two binaries' folders can be compared with `diff -r`.
#
#   tests/perf/same_outputs.sh MEDLOAD OUT        (then: diff -r OUT-before OUT-after)
#
# It runs demo on a fresh store, synth (3000 patients, 15 months, seed 7) and its import,
# review, cohort (by practice, age band, network), meds and timeline for a sample of
# patients, formulary check|lookup|unmatched in every format, report with the demo's
# config, and a few refusals (bad criteria, unknown scale, missing store). Every command's
# standard output, standard error and exit code is kept with the files it wrote; time
# stamps, rates and OUT's own path are blanked. Needs about 10 MB and a minute.
set -uo pipefail
[[ $# -eq 2 && -x "$1" ]] || { sed -n '2,11p' "$0" | sed 's/^# \{0,1\}//' >&2; exit 2; }
bin="$(readlink -f "$1")"; out="$(readlink -m "$2")"
repo="$(cd "$(dirname "$0")/../.." && pwd)"
if [[ -e "$out" && ! -f "$out/.same_outputs" ]]; then
  echo "same_outputs.sh: $out exists and was not made by this script; give a new folder" >&2; exit 2
fi
rm -rf "$out"; mkdir -p "$out"; touch "$out/.same_outputs"; cd "$out"
run() { # name args...
  local name="$1"; shift
  "$bin" "$@" >"$out/cmd/$name.out" 2>"$out/cmd/$name.err"; echo $? >"$out/cmd/$name.rc"
}
mkdir -p cmd work
F="--formulary $repo/formulary"
# demo on a fresh store
(cd work && run demo demo --out "$out/work/demo" $F)
# synthetic network
run synth synth --patients 3000 --months 15 --seed 7 --out "$out/work/net"
db="--db $out/work/net.db"
run imp_practices import practices work/net/practices.csv $db $F
run imp_patients import patients work/net/patients.csv $db $F
run imp_dispensing import dispensing work/net/dispensing.csv $db $F --rejects "$out/work/rejects.csv"
run imp_dispensing_again import dispensing work/net/dispensing.csv $db $F --format json
[ -f work/net/reviews.csv ] && run imp_reviews import reviews work/net/reviews.csv $db $F
last=$(tail -n +2 work/net/dispensing.csv | cut -d, -f4 | sort | tail -1)
[ -n "$last" ] || last=2026-03-31
echo "$last" > cmd/last_date
crit=(--at-least items=8 --at-least acb=3 --at-least dbi=1 --rule opioid-gabapentinoid)
for f in text csv json html; do
  run review_$f review --on "$last" "${crit[@]}" --format $f $db $F
  run review_lim_$f review --on "$last" --at-least items=5 --age-min 70 --limit 40 --format $f $db $F
  run cohort_practice_$f cohort --from 2025-01-01 --to "$last" "${crit[@]}" --by practice --format $f $db $F
  run cohort_age_$f cohort --from 2025-01-01 --to "$last" --at-least items=10 --by age-band --suppress-below 5 --format $f $db $F
  run cohort_on_$f cohort --on "$last" --at-least acb=3 --by network --format $f $db $F
  run formulary_check_$f formulary check --format $f $F
  run formulary_lookup_$f formulary lookup "amitriptyline 10mg tablets" --format $f $F
  run formulary_lookup2_$f formulary lookup "zzz unknownium 5mg" --format $f $F
  run formulary_unmatched_$f formulary unmatched --format $f $db $F
done
run review_bad review --on "$last" --at-least zzz=3 $db $F
run review_pseudo review --on "$last" --at-least items=8 --pseudonymise /nonexistent-key $db $F
pts=$(tail -n +2 work/net/dispensing.csv | cut -d, -f2 | sort -u | awk 'NR%300==1')
for p in $pts; do
  for f in text csv json html; do
    run timeline_range_${p}_$f timeline "$p" --from 2026-01-01 --to "$last" --format $f $db $F
    run meds_${p}_$f meds "$p" --on "$last" --format $f $db $F
    run timeline_${p}_$f timeline "$p" --format $f --on "$last" $db $F
  done
  run timeline_${p}_svg timeline "$p" --format svg --on "$last" $db $F
done
# report with a config
cp "$repo/demo-patients/network.json" work/network.json
run report report --config work/network.json --out "$out/work/report" $db $F
printf '{"title":"t","network":"N","on":"latest","months":3,"criteria":["items>=10"],"scale":"nosuch"}' > work/bad_scale.json
run report_bad_scale report --config work/bad_scale.json --out "$out/work/report_bad" $db $F
printf '{"title":"t","network":"N","on":"latest","months":3,"criteria":["items>=10"],"grace_days":-4}' > work/bad_grace.json
run report_bad_grace report --config work/bad_grace.json --out "$out/work/report_bad2" $db $F
run meds_bad_scale meds X --on "$last" --scale nosuch $db $F
run review_bad_scale review --on "$last" --at-least items=3 --scale nosuch $db $F
run usage_bad review --nosuchflag $db $F
run missing_store review --on "$last" --at-least items=3 --db "$out/work/none.db" $F
rm -f work/*.db work/*.db-* work/demo/*.db work/demo/*.db-*
find . -name '*.db*' -delete
# blank timestamps
grep -rlE '[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}' . | while read -r f; do
  sed -i -E 's/[0-9]{4}-[0-9]{2}-[0-9]{2}T[0-9]{2}:[0-9]{2}:[0-9]{2}(\.[0-9]+)?Z?/TIMESTAMP/g' "$f"
done
sed -i -E 's/in [0-9.]+ s \([0-9]+ rows\/s\)/in SECONDS s (RATE rows\/s)/' cmd/synth.err
grep -rlF "$out" . | while read -r f; do sed -i "s#$out#OUT#g" "$f"; done
echo "ran $(ls cmd/*.rc | wc -l) commands into $out"
