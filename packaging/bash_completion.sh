#!/bin/sh
# Writes bash completion for medload from the program's own --help texts (commands, and
# each command's options): bash_completion.sh MEDLOAD OUT.
set -eu
medload=$1
out=$2
here=$(dirname "$0")
. "$here/command_list.sh"

options_of() {
  # shellcheck disable=SC2086  # the command's words are separate arguments
  "$medload" $1 --help | grep -o '^  --[a-z0-9-]*' | sed 's/^ *//' | tr '\n' ' ' | sed 's/ $//'
}
commands=$(command_list "$medload")
first_words=$(printf '%s\n' "$commands" | cut -d' ' -f1 | sort -u | tr '\n' ' ' | sed 's/ $//')
{
  cat <<'HEAD'
# bash completion for medload, written from its --help texts by packaging/bash_completion.sh.
_medload() {
  local cur=${COMP_WORDS[COMP_CWORD]}
  local prev=${COMP_WORDS[COMP_CWORD-1]}
  local global="--db --formulary --format --output --quiet --help --version"
  case $prev in
    --format) COMPREPLY=($(compgen -W "text csv json html svg" -- "$cur")); return ;;
    --db|--output|--config|--columns|--rejects|--pseudonymise|--key) COMPREPLY=($(compgen -f -- "$cur")); return ;;
    --formulary|--out|--data|--into) COMPREPLY=($(compgen -d -- "$cur")); return ;;
  esac
  # The command's words typed so far; global options and their values are skipped.
  local i word command=""
  for ((i = 1; i < COMP_CWORD; i++)); do
    word=${COMP_WORDS[i]}
    case $word in
      --db|--formulary|--format|--output) ((i++)); continue ;;
      -*) continue ;;
    esac
    if [[ -z $command ]]; then
      command=$word
    elif [[ $command == import || $command == formulary ]]; then
      command="$command $word"
      break
    else
      break
    fi
  done
  local opts=""
  case $command in
HEAD
  printf '    "") COMPREPLY=($(compgen -W "%s $global" -- "$cur")); return ;;\n' "$first_words"
  for first in import formulary; do
    subs=$(printf '%s\n' "$commands" | sed -n "s/^$first //p" | tr '\n' ' ' | sed 's/ $//')
    printf '    %s) COMPREPLY=($(compgen -W "%s" -- "$cur")); return ;;\n' "$first" "$subs"
  done
  printf '%s\n' "$commands" | while IFS= read -r words; do
    printf '    "%s") opts="%s" ;;\n' "$words" "$(options_of "$words")"
  done
  cat <<'TAIL'
  esac
  if [[ $cur == -* ]]; then
    COMPREPLY=($(compgen -W "$opts $global" -- "$cur"))
  else
    COMPREPLY=($(compgen -f -- "$cur"))
  fi
}
complete -F _medload medload
TAIL
} >"$out"
