#!/usr/bin/env bash
# Runs, as written, every command line that starts with "medload " inside a fenced block
# of README.md, DEVELOPERS.md and docs/*.md, in a fresh folder per file holding the demo
# data (demo-patients/) and a store loaded from it, with `medload` the program built.
# A block preceded by a line "<!-- examples not run: REASON -->" is skipped (the reason is
# required). A command is expected to exit 0, or N when the line ends "# exit N".
# Lines ending in a backslash continue on the next line. Usage: run_examples.sh MEDLOAD SOURCE_DIR
set -u
medload=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
source_dir=$(cd "$2" && pwd)
status=0
total=0

# Prints the commands of one Markdown file, one a line, prefixed by their line number.
commands_of() {
  awk '
    /^<!-- examples not run:/ {
      if ($0 !~ /^<!-- examples not run: [^ ].*-->$/) { printf "BADMARK %d\n", NR }
      skip_next = 1; next
    }
    /^```/ {
      if (!in_block) { in_block = 1; skipping = skip_next } else { in_block = 0; skipping = 0 }
      skip_next = 0; next
    }
    { if (!in_block) skip_next = 0 }
    in_block && !skipping {
      line = $0
      if (pending != "") { line = pending " " line; pending = "" }
      if (line ~ /\\$/) { sub(/\\$/, "", line); pending = line; next }
      if (line ~ /^medload /) printf "%d %s\n", NR, line
    }
  ' "$1"
}

for doc in "$source_dir/README.md" "$source_dir/DEVELOPERS.md" "$source_dir"/docs/*.md; do
  name=${doc#"$source_dir"/}
  work=$(mktemp -d)
  ln -s "$source_dir/demo-patients" "$work/demo-patients"
  (
    cd "$work" || exit 1
    for kind in practices patients dispensing reviews; do
      "$medload" --quiet import "$kind" demo-patients/$kind.csv >/dev/null || exit 1
    done
  ) || { echo "$name: loading the demo failed"; status=1; }
  while read -r line_number command; do
    if [ "$line_number" = "BADMARK" ]; then
      echo "$name:$command: an \"examples not run\" mark needs a reason"
      status=1
      continue
    fi
    want=0
    if [[ $command =~ \#\ exit\ ([0-9]+)[[:space:]]*$ ]]; then want=${BASH_REMATCH[1]}; fi
    total=$((total + 1))
    (cd "$work" && medload() { "$medload" "$@"; } && eval "$command") >"$work/out.txt" 2>"$work/err.txt"
    code=$?
    if [ "$code" != "$want" ]; then
      echo "$name:$line_number: exit $code, expected $want: $command"
      head -c 1500 "$work/err.txt"
      status=1
    fi
  done < <(commands_of "$doc")
  rm -rf "$work"
done
echo "$total documented commands run"
[ "$total" -gt 0 ] || status=1
exit $status
