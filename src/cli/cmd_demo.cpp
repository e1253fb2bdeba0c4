// `medload demo [--out DIR]`: the bundled invented network (demo-patients/) loaded into a
// fresh temporary store, then a network worklist, the cohort table and the report.
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <ostream>
#include <sstream>

#include "cli/measure_flags.h"
#include "cli/options.h"
#include "medload/burden/run_context.h"
#include "medload/core/clock.h"
#include "medload/report/report_config.h"
#include "medload/report/report_files.h"
#include "medload/report/report_writer.h"
#include "medload/review/worklist.h"
#include "medload/review/worklist_writer.h"
#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload::cli {

void PrintReportOutcome(std::ostream& out, const std::string& dir, const ReportConfig& config,
                        const ReportOutcome& outcome);
std::function<void(long)> ReportProgressLine(const Context& context);
void PrintCautionFooter(std::ostream& out);

namespace {

namespace fs = std::filesystem;

// A temporary folder for the demo's store, removed with its contents on destruction.
class ScratchFolder {
 public:
  ScratchFolder() {
    std::string pattern = (fs::temp_directory_path() / "medload-demo-XXXXXX").string();
    if (mkdtemp(pattern.data()) != nullptr) path_ = pattern;
  }
  ~ScratchFolder() {
    std::error_code ignored;
    if (!path_.empty()) fs::remove_all(path_, ignored);
  }
  ScratchFolder(const ScratchFolder&) = delete;
  ScratchFolder& operator=(const ScratchFolder&) = delete;
  const std::string& path() const { return path_; }

 private:
  std::string path_;
};

Status ImportDemo(Store& store, const fs::path& data) {
  const std::pair<InputKind, const char*> files[] = {{InputKind::kPractices, "practices.csv"},
                                                     {InputKind::kPatients, "patients.csv"},
                                                     {InputKind::kDispensing, "dispensing.csv"},
                                                     {InputKind::kReviews, "reviews.csv"}};
  for (const auto& [kind, name] : files) {
    auto summary = ImportFile(store, kind, (data / name).string(), ImportOptions{});
    if (!summary.ok()) return summary.status();
    if (summary->rolled_back) return Status::Rejected((data / name).string() + ": too many rows rejected");
  }
  return Status::Ok();
}

// The network worklist on the report's census date, as CSV and HTML in `dir`.
Status WriteNetworkWorklist(Store& store, RunContext& analysis, const ReportConfig& config, Date on,
                            const fs::path& dir) {
  WorklistOptions options;
  options.on = on;
  options.criteria = config.criteria;
  options.remember_run = false;
  auto worklist = BuildWorklist(store, analysis, options);
  if (!worklist.ok()) return worklist.status();
  // Through the report folder's writer: never through a symbolic link, and owner-only,
  // as the worklist names patients.
  auto folder = ReportFolder::Open(dir.string());
  if (!folder.ok()) return folder.status();
  std::ostringstream csv;
  WriteWorklistCsv(csv, *worklist);
  std::ostringstream html;
  WriteWorklistHtml(html, *worklist, config.network + ": review worklist on " + on.ToIso());
  if (Status status = folder->WriteFile("network-worklist.csv", csv.str()); !status.ok()) {
    return status;
  }
  return folder->WriteFile("network-worklist.html", html.str());
}

}  // namespace

int RunDemo(Context& context, const std::vector<std::string>& args) {
  po::options_description options("demo options");
  options.add_options()("out", po::value<std::string>()->default_value("medload-demo"),
                        "the folder to write the demo into (default ./medload-demo)")(
      "data", po::value<std::string>()->default_value(MEDLOAD_SOURCE_DEMO),
      "the demo data folder (practices.csv, patients.csv, dispensing.csv, reviews.csv, network.json)");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload demo [--out DIR]", options, {}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  const fs::path data = (*vm)["data"].as<std::string>();
  const std::string out = (*vm)["out"].as<std::string>();
  auto config = LoadReportConfig((data / "network.json").string());
  if (!config.ok()) return fail(config.status());
  ScratchFolder scratch;
  if (scratch.path().empty()) return fail(Status::Input("cannot create a temporary folder for the demo store"));
  auto store = Store::Open((fs::path(scratch.path()) / "demo.db").string());
  if (!store.ok()) return fail(store.status());
  if (!context.quiet) *context.err << "medload: demo: loading " << data.string() << " into a temporary store\n";
  if (Status status = ImportDemo(*store, data); !status.ok()) return fail(status);
  auto analysis = RunContext::Open(context.formulary_dir, config->measure, &*store);
  if (!analysis.ok()) return fail(analysis.status());
  ReportRunOptions run;
  run.out_dir = out;
  run.config_dir = data.string();
  run.generated_at = UtcNow();
  run.progress = ReportProgressLine(context);
  auto outcome = RunReport(*store, *analysis, *config, run);
  if (!outcome.ok()) return fail(ReportFault(outcome.status(), run));
  if (Status status = WriteNetworkWorklist(*store, *analysis, *config, outcome->on, out); !status.ok()) {
    return fail(status);
  }
  *context.out << "medload demo: an invented network, invented practices and invented patients.\n";
  PrintReportOutcome(*context.out, out, *config, *outcome);
  *context.out << "Network worklist: " << (fs::path(out) / "network-worklist.html").string() << " and .csv\n"
               << "Cohort table: " << (fs::path(out) / "cohort.csv").string() << " (also cohort.json)\n";
  PrintCautionFooter(*context.out);
  return 0;
}

}  // namespace medload::cli
