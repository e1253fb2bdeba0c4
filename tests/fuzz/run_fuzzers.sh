#!/usr/bin/env bash
# Runs every libFuzzer target built in BUILD_DIR (the `sanitize` preset: build-sanitize, or
# the lighter `fuzz` preset: build-fuzz) for
# SECONDS each, one after another, each on a copy of its seed corpus in a temporary
# folder (the repository is never written to), with its dictionary when there is one.
# Prints per target the executions done, the corpus size at the end and whether it found
# anything; exits 1 if any target reported a crash, a leak, a timeout or a sanitizer
# report (the inputs that did are copied to BUILD_DIR/fuzz-artifacts/).
#
#   tests/fuzz/run_fuzzers.sh build-sanitize 15    # CI
#   nice -n 10 tests/fuzz/run_fuzzers.sh build-fuzz 300
#   FUZZ_TARGETS="csv_reader resolver" tests/fuzz/run_fuzzers.sh build-fuzz 60
set -uo pipefail

if [ $# -ne 2 ]; then
  echo "usage: $0 BUILD_DIR SECONDS" >&2
  exit 2
fi
build_dir=$(cd "$1" && pwd) || exit 2
seconds=$2
here=$(cd "$(dirname "$0")" && pwd)
targets=${FUZZ_TARGETS:-"csv_reader fhir_reader dosage_text resolver report_config"}

work=$(mktemp -d "${TMPDIR:-/tmp}/medload-fuzz.XXXXXX")
trap 'rm -rf "$work"' EXIT

export ASAN_OPTIONS="${ASAN_OPTIONS:-detect_leaks=1:abort_on_error=1}"
export UBSAN_OPTIONS="${UBSAN_OPTIONS:-print_stacktrace=1:halt_on_error=1}"

failed=0
printf '%-14s %10s %8s %8s  %s\n' target executions seconds corpus result
for target in $targets; do
  binary="$build_dir/${target}_fuzz"
  if [ ! -x "$binary" ]; then
    echo "$target: $binary is missing (build the fuzz preset first)" >&2
    failed=1
    continue
  fi
  corpus="$work/$target/corpus"
  artifacts="$work/$target/artifacts"
  mkdir -p "$corpus" "$artifacts"
  if [ -d "$here/corpus/$target" ]; then cp "$here/corpus/$target"/* "$corpus"/; fi
  dict=()
  if [ -f "$here/$target.dict" ]; then dict=(-dict="$here/$target.dict"); fi
  log="$work/$target/log"
  start=$(date +%s)
  # TMPDIR: targets that need a scratch file write it under the temporary folder.
  TMPDIR="$work/$target" "$binary" "$corpus" "${dict[@]}" -max_total_time="$seconds" \
    -timeout=10 -rss_limit_mb=2048 -print_final_stats=1 -artifact_prefix="$artifacts/" \
    >"$log" 2>&1
  status=$?
  elapsed=$(( $(date +%s) - start ))
  runs=$(sed -n 's/^stat::number_of_executed_units: *//p' "$log" | tail -1)
  files=$(find "$corpus" -type f | wc -l)
  result="nothing found"
  if [ "$status" -ne 0 ] || grep -qE 'ERROR: (AddressSanitizer|LeakSanitizer|libFuzzer)|runtime error:|invariant broken' "$log" ||
     [ -n "$(ls -A "$artifacts")" ]; then
    result="FOUND SOMETHING (exit $status)"
    failed=1
    mkdir -p "$build_dir/fuzz-artifacts"
    cp "$artifacts"/* "$build_dir/fuzz-artifacts/" 2>/dev/null
  fi
  printf '%-14s %10s %8s %8s  %s\n' "$target" "${runs:-?}" "$elapsed" "$files" "$result"
  if [ "$failed" -ne 0 ] && [ "$result" != "nothing found" ]; then
    grep -E 'invariant broken|ERROR:|runtime error:|SUMMARY:' "$log" | head -5 | sed 's/^/    /'
    echo "    (artifacts in $build_dir/fuzz-artifacts/)"
  fi
done
exit "$failed"
