#!/usr/bin/env bash
# Runs one end-to-end command case. A case is a folder holding:
#   args            the command line after `medload`, shell words; $CASE is the case folder
#   setup           optional: commands (one per line, shell words after `medload`) run first
#   stdin           optional: fed to the command's standard input
#   exit            optional: the expected exit code (default 0)
#   stdout          optional: the exact expected standard output
#   contains        optional: lines that must each appear in standard output or error
# The case runs in a fresh temporary folder (the store is medload.db there).
set -u
medload=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
CASE=$(cd "$2" && pwd)
export CASE
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 2

if [ -f "$CASE/setup" ]; then
  while IFS= read -r line || [ -n "$line" ]; do
    [ -z "$line" ] && continue
    eval "set -- $line"
    "$medload" --quiet "$@" >/dev/null 2>setup.err || { echo "setup failed: $line"; cat setup.err; exit 1; }
  done <"$CASE/setup"
fi

eval "set -- $(cat "$CASE/args")"
if [ -f "$CASE/stdin" ]; then
  "$medload" "$@" <"$CASE/stdin" >out.txt 2>err.txt
else
  "$medload" "$@" </dev/null >out.txt 2>err.txt
fi
code=$?
want=0
[ -f "$CASE/exit" ] && want=$(tr -d '[:space:]' <"$CASE/exit")
status=0
if [ "$code" != "$want" ]; then
  echo "exit code $code, expected $want"; status=1
fi
if [ -f "$CASE/stdout" ] && ! diff -u "$CASE/stdout" out.txt; then
  echo "standard output differs"; status=1
fi
if [ -f "$CASE/contains" ]; then
  while IFS= read -r needle || [ -n "$needle" ]; do
    [ -z "$needle" ] && continue
    if ! grep -qF -- "$needle" out.txt err.txt; then
      echo "missing: $needle"; status=1
    fi
  done <"$CASE/contains"
fi
if [ $status -ne 0 ]; then
  echo "--- stdout"; head -c 4000 out.txt; echo "--- stderr"; head -c 4000 err.txt
fi
exit $status
