#!/bin/sh
# Writes medload's manual page (roff, section 1) from the program's own --help texts, so
# that the page says what the program does: man_page.sh MEDLOAD OUT.
set -eu
medload=$1
out=$2
here=$(dirname "$0")
. "$here/command_list.sh"

# Text as roff without interpretation: backslashes as \e, a leading dot or quote guarded.
escape() { sed -e 's/\\/\\e/g' -e "s/^\([.']\)/\\\\\&\1/"; }

version=$("$medload" --version | sed 's/^medload //')
summary=$("$medload" --help | sed -n '1,2p' | tr '\n' ' ' | sed -e 's/^medload [^:]*: //' -e 's/[. ]*$//')
{
  printf '.TH MEDLOAD 1 "" "medload %s" "User Commands"\n' "$version"
  printf '.SH NAME\nmedload \\- %s\n' "$(printf '%s' "$summary" | escape)"
  printf '.SH SYNOPSIS\n.B medload\n[global options] COMMAND [options]\n'
  printf '.SH DESCRIPTION\n.nf\n'
  "$medload" --help | escape
  printf '.fi\n.SH COMMANDS\n'
  command_list "$medload" | while IFS= read -r words; do
    printf '.SS "medload %s"\n.nf\n' "$words"
    # shellcheck disable=SC2086  # the command's words are separate arguments
    "$medload" $words --help | escape
    printf '.fi\n'
  done
  printf '.SH EXIT STATUS\n0 success; 1 usage error; 2 input or configuration error; 3 data rejected (the import was rolled back).\n'
  printf '.SH FILES\n.TP\n.I PREFIX/share/medload/formulary\nthe bundled formulary tables (--formulary DIR for others)\n'
  printf '.TP\n.I PREFIX/share/medload/demo-patients\nthe invented demo network that medload demo loads\n'
  printf '.TP\n.I medload.db\nthe store, in the working directory unless --db PATH\n'
  printf '.SH SEE ALSO\nThe documentation in the source tree: README.md and docs/.\n'
} >"$out"
