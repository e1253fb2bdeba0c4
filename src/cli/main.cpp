// medload's entry point: splits the global options from the command and its own
// options, opens the output, runs the command and returns its exit code.
#include <unistd.h>

#include <csignal>

#include <algorithm>
#include <fstream>
#include <iostream>
#include <string>
#include <string_view>
#include <vector>

#include "cli/context.h"
#include "cli/install_paths.h"
#include "medload/core/caution.h"
#include "medload/format/private_file.h"

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
    std::cerr << "medload: " << error << "\n";
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
    std::cerr << "medload: unknown command \"" << args[0] << "\"; 'medload --help' lists them\n";
    return kExitUsage;
  }
  std::ofstream file;
  if (!context.output_path.empty() && context.output_path != "-") {
    if (Status status = PrepareOutputFile(context.output_path, OutputAccess(*command)); !status.ok()) {
      std::cerr << "medload: " << status.message() << "\n";
      return kExitInput;
    }
    file.open(context.output_path, std::ios::binary | std::ios::trunc);
    if (!file) {
      std::cerr << "medload: cannot write " << context.output_path << "\n";
      return kExitInput;
    }
    context.out = &file;
  }
  const std::vector<std::string> rest(args.begin() + static_cast<long>(words_used), args.end());
  const int code = command->run(context, rest);
  context.out->flush();
  if (file.is_open() && !file) {
    std::cerr << "medload: writing " << context.output_path << " failed\n";
    return kExitInput;
  }
  return code;
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
