#!/usr/bin/env bash
# Real-browser check of the report at three network sizes: the demo (3 practices) and the
# demo's patients spread over 13 and 50 practices (spread_network.sh). Headless Chromium
# renders the overviews, a practice page, a cohort page and a timeline; layout_check.js
# then looks, with real
# glyph boxes, for chart text that overlaps or leaves its chart and for pages or tables
# wider than the window: on screen at 1400 px, and with the print rules at the printable
# width of A4 (210 mm less 2 x 12 mm margins = 703 px). Screenshots and a PDF of a
# practice page are kept beside the build.
#   usage: check_report.sh MEDLOAD CHROMIUM OUTPUT_FOLDER [DEMO_DATA_FOLDER]
set -u
medload=$1
chromium=$2
out=$(mkdir -p "$3" && cd "$3" && pwd)
here=$(cd "$(dirname "$0")" && pwd)
data=${4:-$here/../../demo-patients}
flags=(--headless --no-sandbox --disable-gpu --disable-dev-shm-usage --no-first-run --hide-scrollbars
       --user-data-dir="$out/browser-profile" --enable-logging=stderr --v=0)
status=0

demo() {  # demo DATA FOLDER: writes the demo report
  rm -rf "$2"
  "$medload" --quiet demo --data "$1" --out "$2" >"$2.txt" 2>&1 || { echo "demo failed on $1"; cat "$2.txt"; exit 1; }
}
small="$out/browser-demo"
large="$out/browser-demo-50"
demo "$data" "$small"
"$here/spread_network.sh" "$data" "$out/browser-data-50" 50 || { echo "could not spread the demo over 50 practices"; exit 1; }
demo "$out/browser-data-50" "$large"
middle="$out/browser-demo-13"
"$here/spread_network.sh" "$data" "$out/browser-data-13" 13 || { echo "could not spread the demo over 13 practices"; exit 1; }
demo "$out/browser-data-13" "$middle"

# A cohort page of the 50 practices, from a store of the same data.
cohort="$out/browser-cohort-50.html"
rm -f "$out/browser-cohort.db"
for kind in practices patients dispensing reviews; do
  "$medload" --quiet --db "$out/browser-cohort.db" import "$kind" "$out/browser-data-50/$kind.csv" >/dev/null 2>&1 ||
    { echo "import $kind failed"; exit 1; }
done
"$medload" --quiet --db "$out/browser-cohort.db" --format html --output "$cohort" cohort --from 2025-11-01 \
  --to 2026-10-31 --at-least items=10 --at-least acb=3 >/dev/null 2>&1 || { echo "cohort failed"; exit 1; }
timeline="$out/browser-timeline.html"
patient=$(sed -n '2s/,.*//p' "$out/browser-data-50/patients.csv")
"$medload" --quiet --db "$out/browser-cohort.db" --format html --output "$timeline" timeline "$patient" \
  --from 2024-11-01 --to 2026-10-31 --on 2026-10-31 >/dev/null 2>&1 || { echo "timeline failed"; exit 1; }

# The overview renders its charts and banner without console messages.
"$chromium" "${flags[@]}" --dump-dom "file://$small/index.html" >"$out/browser-dom.html" 2>"$out/browser-console.log"
svgs=$(grep -o '<svg' "$out/browser-dom.html" | wc -l)
funnels=$(grep -o 'class="funnel"' "$out/browser-dom.html" | wc -l)
if [ "$svgs" -lt 2 ] || [ "$funnels" -lt 1 ]; then
  echo "the rendered page has $svgs charts and $funnels funnel plots"; status=1
fi
grep -q 'class="caution"' "$out/browser-dom.html" || { echo "no caution banner in the rendered page"; status=1; }
if grep -E 'CONSOLE|Uncaught|Failed to load resource' "$out/browser-console.log"; then
  echo "console messages while rendering the report"; status=1
fi

# layout PAGE WIDTH MODE: runs layout_check.js on a copy of PAGE in a WIDTH px window.
layout() {
  local page=$1 width=$2 mode=$3
  local copy="${page%.html}.check.html"
  awk -v script="$here/layout_check.js" '
    /<\/body>/ { print "<script>"; while ((getline line < script) > 0) print line; print "</script>" }
    { print }' "$page" >"$copy"
  local result
  result=$("$chromium" "${flags[@]}" --window-size="$width,1200" --dump-dom "file://$copy#$mode" 2>>"$out/browser-console.log" |
           sed -n '/<pre id="layout-check">/,/end of layout check/p')
  rm -f "$copy"
  local summary
  summary=$(printf '%s\n' "$result" | sed -n 's/.*<pre id="layout-check">//p' | head -1)
  if [ -z "$summary" ]; then
    echo "$(basename "$page") ($mode, $width px): the layout check did not run"; status=1; return
  fi
  echo "$(basename "$(dirname "$page")")/$(basename "$page") ($mode, $width px): $summary"
  case "$summary" in
    *"faults 0") ;;
    *) printf '%s\n' "$result" | sed '1d;$d' | sed 's/&quot;/"/g; s/&amp;/\&/g; s/&lt;/</g; s/&gt;/>/g'; status=1 ;;
  esac
}
for page in "$small/index.html" "$small/practice-WV001.html" "$middle/index.html" "$large/index.html" \
            "$large/practice-NW07.html" "$cohort" "$timeline"; do
  layout "$page" 1400 screen
  layout "$page" 703 print
done

"$chromium" "${flags[@]}" --window-size=1280,2400 --screenshot="$out/report-screenshot.png" "file://$small/index.html" \
  >/dev/null 2>>"$out/browser-console.log"
"$chromium" "${flags[@]}" --window-size=1280,4000 --screenshot="$out/report-50-screenshot.png" "file://$large/index.html" \
  >/dev/null 2>>"$out/browser-console.log"
"$chromium" "${flags[@]}" --no-pdf-header-footer --print-to-pdf="$out/practice-print.pdf" "file://$large/practice-NW07.html" \
  >/dev/null 2>>"$out/browser-console.log"
for file in report-screenshot.png report-50-screenshot.png practice-print.pdf; do
  [ -s "$out/$file" ] || { echo "$file was not written"; status=1; }
done
[ $status -eq 0 ] && echo "report rendered at 3, 13 and 50 practices without layout faults; screenshots and PDF in $out"
exit $status
