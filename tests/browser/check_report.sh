#!/usr/bin/env bash
# Real-browser check of the demo report: writes the demo into a folder, opens index.html
# in headless Chromium, checks that the page rendered its charts without console errors,
# and keeps a screenshot beside the build.
#   usage: check_report.sh MEDLOAD CHROMIUM OUTPUT_FOLDER [DEMO_DATA_FOLDER]
set -u
medload=$1
chromium=$2
out=$(mkdir -p "$3" && cd "$3" && pwd)
demo="$out/browser-demo"
rm -rf "$demo"
data_args=()
[ $# -ge 4 ] && data_args=(--data "$4")
"$medload" --quiet demo --out "$demo" "${data_args[@]}" >"$out/browser-demo.txt" 2>&1 || { echo "demo failed"; cat "$out/browser-demo.txt"; exit 1; }
page="file://$demo/index.html"
flags=(--headless --no-sandbox --disable-gpu --disable-dev-shm-usage --no-first-run
       --user-data-dir="$out/browser-profile" --enable-logging=stderr --v=0)
"$chromium" "${flags[@]}" --dump-dom "$page" >"$out/browser-dom.html" 2>"$out/browser-console.log"
status=0
svgs=$(grep -o '<svg' "$out/browser-dom.html" | wc -l)
funnels=$(grep -o 'class="funnel"' "$out/browser-dom.html" | wc -l)
if [ "$svgs" -lt 2 ] || [ "$funnels" -lt 1 ]; then
  echo "the rendered page has $svgs charts and $funnels funnel plots"; status=1
fi
grep -q 'class="caution"' "$out/browser-dom.html" || { echo "no caution banner in the rendered page"; status=1; }
if grep -E 'CONSOLE|Uncaught|Failed to load resource' "$out/browser-console.log"; then
  echo "console messages while rendering the report"; status=1
fi
"$chromium" "${flags[@]}" --hide-scrollbars --window-size=1280,2400 \
  --screenshot="$out/report-screenshot.png" "$page" >/dev/null 2>>"$out/browser-console.log"
[ -s "$out/report-screenshot.png" ] || { echo "no screenshot was written"; status=1; }
[ $status -eq 0 ] && echo "report rendered: $svgs charts; screenshot $out/report-screenshot.png"
exit $status
