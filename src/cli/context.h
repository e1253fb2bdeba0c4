// What every command receives from the command line's global options: the store and
// formulary paths, the output format and stream, and the error stream. Private to cli/.
#pragma once

#include <ostream>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/status.h"

namespace medload::cli {

// The process exit codes (README, "Exit codes"): the library's Status codes are not
// exit codes; ExitCodeOf maps them.
inline constexpr int kExitUsage = 1;     // a bad option or argument
inline constexpr int kExitInput = 2;     // input or configuration error
inline constexpr int kExitRejected = 3;  // too many rows rejected: the import was rolled back

enum class Format { kText, kCsv, kJson, kHtml, kSvg };

struct Context {
  std::string db_path = "medload.db";  // --db
  std::string formulary_dir;           // --formulary (default: the bundled formulary/)
  Format format = Format::kText;       // --format
  std::string output_path;             // --output (empty: standard output)
  bool quiet = false;                  // --quiet: no progress or notes on standard error
  bool err_is_terminal = false;        // standard error is a terminal: progress lines show
  std::ostream* out = nullptr;         // where results go
  std::ostream* err = nullptr;         // diagnostics and progress
};

// Writes "medload: warning: TEXT" on the error stream, unless --quiet.
inline void Warn(const Context& context, std::string_view text) {
  if (!context.quiet) *context.err << "medload: warning: " << text << "\n";
}

// The exit code for `status`: 0 when ok, else kExitUsage, kExitInput or kExitRejected.
int ExitCodeOf(const Status& status);

// Writes "medload: MESSAGE" on the error stream and returns ExitCodeOf(status).
int Fail(const Context& context, const Status& status);

// A library fault about a setting, named as the command-line flag it came from: the
// status with "--" before its message (which starts with the setting's name).
Status AsFlagFault(const Status& status);

// A command: its words ("import dispensing"), a one-line summary, and its entry point.
// `args` are the tokens after the command words, global options removed. Returns the
// process exit code (README, "Exit codes").
struct Command {
  const char* words;
  const char* summary;
  int (*run)(Context& context, const std::vector<std::string>& args);
};

// The registered commands, in help order (commands.cpp).
const std::vector<Command>& Commands();

}  // namespace medload::cli
