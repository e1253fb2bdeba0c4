#!/usr/bin/env bash
# `cmake --install` of BUILD_DIR into a temporary prefix, then: the installed program finds
# the installed formulary and demo beside itself (not the source tree's), the manual page
# renders with a section per command, and bash completion completes commands and options.
# Usage: check_install.sh BUILD_DIR
set -u
build=$1
prefix=$(mktemp -d)
trap 'rm -rf "$prefix"' EXIT
status=0
fail() { echo "FAIL: $*"; status=1; }

cmake --install "$build" --prefix "$prefix" >"$prefix/install.log" 2>&1 || { cat "$prefix/install.log"; exit 1; }
bin=$prefix/bin/medload
[ -x "$bin" ] || fail "no $bin"

out=$("$bin" formulary check 2>&1)
grep -qF "formulary $prefix/share/medload/formulary: no faults" <<<"$out" || fail "formulary check: $out"

cd "$prefix" || exit 1
"$bin" --quiet demo --out demo-out >demo.txt 2>&1 || fail "demo: $(cat demo.txt)"
[ -f demo-out/index.html ] || fail "the installed demo wrote no index.html"

page=$(MANWIDTH=100 man -l "$prefix/share/man/man1/medload.1" 2>&1)
for section in "NAME" "medload review" "medload import dispensing" "medload formulary rules" "EXIT STATUS"; do
  grep -qF "$section" <<<"$page" || fail "the manual page has no \"$section\""
done

completion=$prefix/share/bash-completion/completions/medload
complete_words() {
  bash -c 'source "$1"; shift; COMP_WORDS=("$@"); COMP_CWORD=$(($# - 1)); _medload; echo "${COMPREPLY[*]}"' _ \
    "$completion" "$@"
}
[ "$(complete_words medload rev)" = "review" ] || fail "medload rev -> $(complete_words medload rev)"
[ "$(complete_words medload review --prac)" = "--practice" ] || fail "review --prac -> $(complete_words medload review --prac)"
[ "$(complete_words medload --db x.db formulary r)" = "rules" ] || fail "formulary r -> $(complete_words medload --db x.db formulary r)"
[ "$(complete_words medload cohort --format h)" = "html" ] || fail "--format h -> $(complete_words medload cohort --format h)"
exit $status
