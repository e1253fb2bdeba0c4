// `medload report --config FILE --out DIR`: the batch report of a care network.
#include <filesystem>
#include <ostream>

#include "cli/measure_flags.h"
#include "cli/options.h"
#include "cli/progress.h"
#include "medload/burden/run_context.h"
#include "medload/core/clock.h"
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

// The caution as a text footer (demo cannot include format/output.h beside the importer).
void PrintCautionFooter(std::ostream& out) { WriteTextCaution(out); }

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
  const std::string config_path = (*vm)["config"].as<std::string>();
  auto config = LoadReportConfig(config_path);
  if (!config.ok()) return fail(config.status());
  auto store = Store::Open(context.db_path, StoreOptions{30000, true});
  if (!store.ok()) return fail(store.status());
  auto analysis = RunContext::Open(context.formulary_dir, config->measure, &*store);
  // The config's settings (an unknown scale) are named as the config's keys, after its file.
  if (!analysis.ok()) return fail(Status::Usage(config_path + ": " + analysis.status().message()));
  analysis->set_pass_progress(PassProgressPrinter(context, "report"));
  ReportRunOptions run;
  run.out_dir = (*vm)["out"].as<std::string>();
  run.config_dir = std::filesystem::path(config_path).parent_path().string();
  run.generated_at = UtcNow();
  auto outcome = RunReport(*store, *analysis, *config, run);
  if (!outcome.ok()) return fail(ReportFault(outcome.status(), run));
  for (const std::string& warning : outcome->warnings) Warn(context, warning);
  PrintReportOutcome(*context.out, run.out_dir, *config, *outcome);
  WriteTextCaution(*context.out);
  return 0;
}

}  // namespace medload::cli
