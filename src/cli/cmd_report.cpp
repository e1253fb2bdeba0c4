// `medload report --config FILE --out DIR`: the batch report of a care network.
#include <filesystem>
#include <ostream>

#include "cli/measure_flags.h"
#include "cli/options.h"
#include "cli/progress.h"
#include "medload/burden/run_context.h"
#include "medload/core/caution.h"
#include "medload/core/clock.h"
#include "medload/format/json_text.h"
#include "medload/format/output.h"
#include "medload/report/report_config.h"
#include "medload/report/report_writer.h"
#include "medload/store/store.h"

namespace medload::cli {

// Shared with `demo`: prints where the report is, what it covered, and the caution.
void PrintReportOutcome(std::ostream& out, const std::string& dir, const ReportConfig& config,
                        const ReportOutcome& outcome) {
  out << "Report \"" << config.title << "\" for " << config.network << ", census date " << outcome.on.ToIso()
      << ": " << outcome.practices << " practices, " << outcome.digests.size() << " digest message(s).\n"
      << "Open " << (std::filesystem::path(dir) / "index.html").string() << "\n";
  for (const std::string& code : outcome.digests) out << "  digest for " << code << "\n";
}

// Shared with `demo`: the same as JSON, with the caution.
nlohmann::json ReportOutcomeJson(const std::string& dir, const ReportConfig& config, const ReportOutcome& outcome) {
  return {{"folder", dir},
          {"index", (std::filesystem::path(dir) / "index.html").string()},
          {"title", config.title},
          {"network", config.network},
          {"census_date", outcome.on.ToIso()},
          {"practices", outcome.practices},
          {"digests", outcome.digests},
          {"files", outcome.files},
          {"warnings", outcome.warnings},
          {"caution", std::string(kCaution)}};
}

// Shared with `demo`: a command that writes its files into a folder prints a summary in
// text or JSON; other formats are refused before anything is written.
Status CheckSummaryFormat(const Context& context, const std::string& command) {
  if (context.format == Format::kText || context.format == Format::kJson) return Status::Ok();
  return Status::Usage(command + " writes its files (HTML, CSV, JSON) into a folder; its summary on standard output is "
                                 "text or json");
}

// The caution as a text footer (demo cannot include format/output.h beside the importer).
void PrintCautionFooter(std::ostream& out) { WriteTextCaution(out); }

namespace {

// The one Usage fault of RunContext::Open, an unknown scale, came from the config: it is
// a config fault (exit 2) naming the file and the key, `FILE: /scale: "x" is not a scale
// in ...`, like every other config fault.
Status ConfigSettingFault(const std::string& config_path, const Status& status) {
  if (status.code() != StatusCode::kUsage) return status;
  std::string_view fault = status.message();
  if (fault.substr(0, 6) == "scale ") fault.remove_prefix(6);
  return Status::Input(config_path + ": /scale: " + std::string(fault) + "; set \"scale\" to one of them");
}

}  // namespace

int RunReportCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("report options");
  options.add_options()("config", po::value<std::string>(), "the report's JSON config (docs/report.md)")(
      "out", po::value<std::string>(), "the folder to write the report into (created if missing)");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload report --config FILE --out DIR", options, {}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  if (vm->count("config") == 0U) return fail(Status::Usage("--config FILE is required"));
  if (vm->count("out") == 0U) return fail(Status::Usage("--out DIR is required"));
  if (Status status = CheckSummaryFormat(context, "report"); !status.ok()) return fail(status);
  const std::string config_path = (*vm)["config"].as<std::string>();
  auto config = LoadReportConfig(config_path);
  if (!config.ok()) return fail(config.status());
  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return fail(store.status());
  auto analysis = RunContext::Open(context.formulary_dir, config->measure, &*store);
  if (!analysis.ok()) return fail(ConfigSettingFault(config_path, analysis.status()));
  analysis->set_pass_progress(PassProgressPrinter(context, "report"));
  ReportRunOptions run;
  run.out_dir = (*vm)["out"].as<std::string>();
  run.config_dir = std::filesystem::path(config_path).parent_path().string();
  run.generated_at = UtcNow();
  auto outcome = RunReport(*store, *analysis, *config, run);
  if (!outcome.ok()) return fail(ReportFault(outcome.status(), run));
  for (const std::string& warning : outcome->warnings) Warn(context, warning);
  if (context.format == Format::kJson) {
    *context.out << JsonText(ReportOutcomeJson(run.out_dir, *config, *outcome)) << "\n";
    return 0;
  }
  PrintReportOutcome(*context.out, run.out_dir, *config, *outcome);
  WriteTextCaution(*context.out);
  return 0;
}

}  // namespace medload::cli
