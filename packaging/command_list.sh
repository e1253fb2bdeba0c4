# Sourced by man_page.sh and bash_completion.sh: prints medload's commands, one a line
# ("review", "import dispensing"), from the command list of `medload --help` (each
# command's words are in columns 3 to 27 there).
command_list() {
  "$1" --help | sed -n '/^commands:$/,/^$/p' | sed '1d;$d' | cut -c3-27 | sed 's/ *$//'
}
