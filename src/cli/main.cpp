// medload's entry point: splits the global options from the command and its own
// options, opens the output, runs the command and returns its exit code.
#include <unistd.h>

#include <csignal>

#include <algorithm>
#include <iostream>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "cli/context.h"
#include "cli/install_paths.h"
#include "medload/core/caution.h"
#include "medload/format/output_file.h"
#include "medload/format/private_file.h"
#include "medload/format/shown_text.h"

namespace medload::cli {
namespace {

void PrintHelp(std::ostream& out) {
  out << "medload " MEDLOAD_VERSION
         ": concurrent medicines, anticholinergic and sedative burden, review worklists\n"
         "and practice cohort counts from dispensing records.\n\n"
         "usage: medload [global options] COMMAND [options]\n\n"
         "global options:\n"
         "  --db PATH          the store (default medload.db in the working directory)\n"
         "  --formulary DIR    the formulary tables (default: the bundled formulary, in\n"
         "                     share/medload/formulary beside the installed program)\n"
         "  --format FORMAT    text, csv, json or html (timeline also svg); default text\n"
         "  --output FILE      write the result to FILE (default standard output)\n"
         "  --quiet            no progress or notes on standard error\n"
         "  --help, --version\n\n"
         "commands:\n";
  for (const Command& command : Commands()) {
    std::string words = command.words;
    words.resize(std::max<size_t>(words.size(), 25), ' ');
    out << "  " << words << " " << command.summary << "\n";
  }
  out << "\n'medload COMMAND --help' shows a command's options.\n\n" << kCautionLine << "\n";
}

bool ParseFormat(std::string_view text, Format& format) {
  if (text == "text") format = Format::kText;
  else if (text == "csv") format = Format::kCsv;
  else if (text == "json") format = Format::kJson;
  else if (text == "html") format = Format::kHtml;
  else if (text == "svg") format = Format::kSvg;
  else return false;
  return true;
}

// Takes the global options out of `args` (anywhere in the line) into `context`.
// Returns false with a message on a bad value.
bool TakeGlobalOptions(std::vector<std::string>& args, Context& context, std::string& error,
                       bool& help, bool& version) {
  std::vector<std::string> rest;
  for (size_t i = 0; i < args.size(); ++i) {
    std::string arg = args[i];
    std::string value;
    bool has_inline_value = false;
    if (const size_t eq = arg.find('='); arg.rfind("--", 0) == 0 && eq != std::string::npos) {
      value = arg.substr(eq + 1);
      arg = arg.substr(0, eq);
      has_inline_value = true;
    }
    const bool takes_value =
        arg == "--db" || arg == "--formulary" || arg == "--format" || arg == "--output";
    if (takes_value) {
      if (!has_inline_value) {
        if (i + 1 >= args.size()) {
          error = "option " + arg + " needs a value";
          return false;
        }
        value = args[++i];
      }
      if (arg == "--db") context.db_path = value;
      if (arg == "--formulary") context.formulary_dir = value;
      if (arg == "--output") context.output_path = value;
      if (arg == "--format" && !ParseFormat(value, context.format)) {
        error = "--format \"" + value + "\" is not one of text, csv, json, html, svg";
        return false;
      }
    } else if (arg == "--quiet") {
      context.quiet = true;
    } else if (arg == "--version") {
      version = true;
    } else if (arg == "--help" || arg == "-h") {
      help = true;
      rest.push_back(args[i]);
    } else {
      rest.push_back(args[i]);
    }
  }
  args = std::move(rest);
  return true;
}

// Who may read the command's --output file: commands whose output names patients (meds,
// timeline, review, import with its rejected-row messages) write it owner-only;
// practice- and network-level commands leave it to the umask.
FileAccess OutputAccess(const Command& command) {
  const std::string_view words = command.words;
  for (const std::string_view shared : {"cohort", "report", "formulary", "synth", "demo"}) {
    if (words.rfind(shared, 0) == 0) return FileAccess::kShared;
  }
  return FileAccess::kOwnerOnly;
}

// The longest command whose words start `args`, or nullptr.
const Command* FindCommand(const std::vector<std::string>& args, size_t& words_used) {
  const Command* best = nullptr;
  for (const Command& command : Commands()) {
    std::vector<std::string> words;
    std::string_view all = command.words;
    for (size_t start = 0; start < all.size();) {
      size_t end = all.find(' ', start);
      if (end == std::string_view::npos) end = all.size();
      words.emplace_back(all.substr(start, end - start));
      start = end + 1;
    }
    if (words.size() > args.size()) continue;
    if (!std::equal(words.begin(), words.end(), args.begin())) continue;
    if (best == nullptr || words.size() > words_used) {
      best = &command;
      words_used = words.size();
    }
  }
  return best;
}

// Puts --output in place once the command has written its result; a command that wrote
// nothing (it failed first) leaves the previous file as it was.
int FinishOutput(OutputFile& file, const Context& context, int code, std::ostream& err) {
  if (file.bytes_written() == 0) {
    if (code != 0) err << "medload: " << context.output_path << " was left as it was\n";
    file.Discard();
    return code;
  }
  if (Status status = file.Commit(); !status.ok()) {
    err << "medload: " << status.message() << "\n";
    return kExitInput;
  }
  return code;
}

// Runs `command` with diagnostics, and results in the text format, shown through
// ShownTextBuffer (control characters and bidi controls from data or file names are
// escaped, never sent to the terminal), and with --output written to a temporary file
// beside it (OutputFile), so that a failed or killed command leaves the previous file.
int RunWithOutput(const Command& command, Context& context, const std::vector<std::string>& args) {
  ShownTextBuffer err_filter(std::cerr.rdbuf());
  std::ostream err(&err_filter);
  context.err = &err;
  std::optional<OutputFile> file;
  if (!context.output_path.empty() && context.output_path != "-") {
    Result<OutputFile> opened = OutputFile::Open(context.output_path, OutputAccess(command));
    if (!opened.ok()) {
      err << "medload: " << opened.status().message() << "\n";
      return kExitInput;
    }
    file.emplace(std::move(opened.value()));
  }
  std::ostream& target = file ? file->stream() : std::cout;
  int code = 0;
  {
    ShownTextBuffer text_filter(target.rdbuf());
    std::ostream text(&text_filter);
    context.out = context.format == Format::kText ? &text : &target;
    code = command.run(context, args);
    context.out->flush();
  }  // the filter passes on its last bytes here
  context.out = &target;
  target.flush();
  return file ? FinishOutput(*file, context, code, err) : code;
}

int Main(int argc, char** argv) {
  // Past a file size limit (RLIMIT_FSIZE) a write should fail with EFBIG, which the store
  // reports as a full disk and rolls back, rather than kill the process.
  std::signal(SIGXFSZ, SIG_IGN);
  std::vector<std::string> args(argv + 1, argv + argc);
  Context context;
  context.formulary_dir = BundledFormulary();
  context.out = &std::cout;
  context.err = &std::cerr;
  context.err_is_terminal = ::isatty(STDERR_FILENO) == 1;
  std::string error;
  bool help = false;
  bool version = false;
  if (!TakeGlobalOptions(args, context, error, help, version)) {
    std::cerr << "medload: " << ShownText(error) << "\n";
    return kExitUsage;
  }
  if (version) {
    std::cout << "medload " MEDLOAD_VERSION "\n";
    return 0;
  }
  if (args.empty() || (help && args.size() == 1 && args[0].rfind("-", 0) == 0)) {
    PrintHelp(help ? std::cout : std::cerr);
    return help ? 0 : kExitUsage;
  }
  size_t words_used = 0;
  const Command* command = FindCommand(args, words_used);
  if (command == nullptr) {
    std::cerr << "medload: unknown command \"" << ShownText(args[0]) << "\"; 'medload --help' lists them\n";
    return kExitUsage;
  }
  const std::vector<std::string> rest(args.begin() + static_cast<long>(words_used), args.end());
  return RunWithOutput(*command, context, rest);
}

}  // namespace

int ExitCodeOf(const Status& status) {
  switch (status.code()) {
    case StatusCode::kOk: return 0;
    case StatusCode::kUsage: return kExitUsage;
    case StatusCode::kInput: return kExitInput;
    case StatusCode::kRejected: return kExitRejected;
  }
  return kExitInput;
}

Status AsFlagFault(const Status& status) {
  if (status.ok()) return status;
  return status.code() == StatusCode::kUsage ? Status::Usage("--" + status.message()) : Status::Input("--" + status.message());
}

int Fail(const Context& context, const Status& status) {
  *context.err << "medload: " << status.message() << "\n";
  return ExitCodeOf(status);
}

}  // namespace medload::cli

int main(int argc, char** argv) { return medload::cli::Main(argc, argv); }
