#include "medload/report/report_writer.h"

#include <algorithm>
#include <filesystem>
#include <sstream>

#include "medload/burden/run_context.h"
#include "medload/cohort/cohort_writer.h"
#include "medload/core/caution.h"
#include "medload/core/clock.h"
#include "medload/format/json_text.h"
#include "medload/report/digest.h"
#include "medload/report/report_files.h"
#include "medload/report/report_pages.h"
#include "medload/review/pseudonym.h"
#include "medload/review/worklist_writer.h"

namespace medload {
namespace {

using nlohmann::json;

json DataJson(const StoreSummary& data) {
  return {{"earliest_dispensed", data.earliest_dispensed ? json(data.earliest_dispensed->ToIso()) : json(nullptr)},
          {"latest_dispensed", data.latest_dispensed ? json(data.latest_dispensed->ToIso()) : json(nullptr)},
          {"practices", data.practices},
          {"patients", data.patients},
          {"dispensings", data.dispensings},
          {"counting_dispensings", data.counting_dispensings},
          {"not_counting_dispensings", data.not_counting_dispensings},
          {"reviews", data.reviews},
          {"import_runs", data.import_runs},
          {"rejected_rows", data.rejected_rows}};
}

Result<std::map<std::string, PracticeFiles>> FileNames(const ReportModel& model) {
  std::map<std::string, PracticeFiles> files;
  for (const ReportSeries& s : model.practices) {
    auto stem = SafeFileStem(s.code);
    if (!stem.ok()) return Status::Input("practice code " + stem.status().message());
    files[s.code] = PracticeFiles{"practice-" + *stem + ".html", "worklist-" + *stem + ".csv",
                                  "digests/" + *stem + ".eml"};
  }
  return files;
}

// Writes one file and records its name.
struct Writer {
  const ReportFolder& folder;
  std::vector<std::string>& written;
  Status Put(const std::string& name, const std::string& content) {
    written.push_back(name);
    return folder.WriteFile(name, content);
  }
};

Status WriteCohortFiles(const ReportModel& model, Writer& writer) {
  const CohortTable table = ReportCohortTable(model);
  std::ostringstream csv;
  WriteCohortCsv(csv, table);
  if (Status s = writer.Put("cohort.csv", csv.str()); !s.ok()) return s;
  return writer.Put("cohort.json", JsonText(CohortJson(table, nullptr)) + "\n");
}

Status WritePractices(const ReportModel& model, const std::map<std::string, PracticeFiles>& files,
                      Writer& writer, std::vector<std::string>& digests) {
  for (size_t i = 0; i < model.practices.size(); ++i) {
    const ReportSeries& s = model.practices[i];
    const PracticeFiles& names = files.at(s.code);
    if (Status st = writer.Put(names.page, PracticeHtml(model, i, names)); !st.ok()) return st;
    std::ostringstream csv;
    WriteWorklistCsv(csv, ReportWorklist(model, s.code));
    if (Status st = writer.Put(names.worklist, csv.str()); !st.ok()) return st;
    if (const auto digest = BuildDigest(model, i, names.page)) {
      if (Status st = writer.Put(names.digest, FormatDigest(*digest)); !st.ok()) return st;
      digests.push_back(s.code);
    }
  }
  return Status::Ok();
}

}  // namespace

json RunJson(const ReportModel& model, const std::vector<std::string>& files, const std::string& generated_at) {
  json dates = json::array();
  for (const Date date : model.dates) dates.push_back(date.ToIso());
  size_t worklist_rows = 0;
  for (const auto& [code, worklist] : model.worklists) worklist_rows += worklist.patients.size();
  return {{"medload_version", MEDLOAD_VERSION},
          {"generated_at", generated_at},
          {"parameters", ConfigParameters(model.config)},
          {"census_date", model.on.ToIso()},
          {"census_dates", dates},
          {"measure", model.measure},
          {"formulary_checksum", model.formulary_checksum},
          {"data", DataJson(model.data)},
          {"rows", {{"patients_visited", model.patients_seen},
                    {"practices", model.practices.size()},
                    {"worklist_rows", worklist_rows}}},
          {"previous_report", model.previous ? json(model.previous->on.ToIso()) : json(nullptr)},
          {"files", files},
          {"warnings", ReportWarnings(model)},
          {"caution", std::string(kCaution)}};
}

Result<ReportOutcome> WriteReport(const ReportModel& model, const std::string& out_dir,
                                  const std::string& generated_at) {
  auto folder = ReportFolder::Open(out_dir);
  if (!folder.ok()) return folder.status();
  auto files = FileNames(model);
  if (!files.ok()) return files.status();
  if (Status s = folder->MakeSubfolder("digests"); !s.ok()) return s;
  if (Status s = folder->RemoveFiles("digests", ".eml"); !s.ok()) return s;
  ReportOutcome outcome;
  outcome.on = model.on;
  outcome.practices = model.practices.size();
  outcome.warnings = ReportWarnings(model);
  Writer writer{*folder, outcome.files};
  if (Status s = WriteCohortFiles(model, writer); !s.ok()) return s;
  if (Status s = WritePractices(model, *files, writer, outcome.digests); !s.ok()) return s;
  if (Status s = writer.Put("index.html", IndexHtml(model, *files, outcome.digests)); !s.ok()) return s;
  outcome.files.push_back("run.json");
  std::sort(outcome.files.begin(), outcome.files.end());
  std::sort(outcome.digests.begin(), outcome.digests.end());
  if (Status s = folder->WriteFile("run.json", JsonText(RunJson(model, outcome.files, generated_at)) + "\n"); !s.ok()) {
    return s;
  }
  return outcome;
}

Result<ReportOutcome> RunReport(Store& store, RunContext& analysis, const ReportConfig& config,
                                const ReportRunOptions& options) {
  std::function<std::string(const std::string&)> pseudonymise;
  std::optional<Pseudonymiser> keyed;
  if (!config.pseudonymise_key.empty()) {
    std::filesystem::path key = config.pseudonymise_key;
    if (key.is_relative() && !options.config_dir.empty()) key = std::filesystem::path(options.config_dir) / key;
    auto loaded = Pseudonymiser::FromKeyFile(key.string());
    if (!loaded.ok()) return loaded.status();
    keyed = std::move(*loaded);
    pseudonymise = [&keyed](const std::string& id) { return keyed->Pseudonym(id); };
  }
  // One snapshot for every read of the model: imports committing meanwhile cannot make
  // run.json's data counts disagree with the pass over the patients.
  Result<ReportModel> model = Status::Input("store: no snapshot");
  if (Status packed = store.RefreshPackedHistories(); !packed.ok()) return packed;
  {
    auto snapshot = store.BeginSnapshot();
    if (!snapshot.ok()) return snapshot.status();
    model = BuildReportModel(store, analysis, config, pseudonymise, options.progress);
  }
  analysis.SaveResolutions();  // those made inside the snapshot, for the next run
  if (!model.ok()) return model.status();
  auto outcome = WriteReport(*model, options.out_dir, options.generated_at);
  if (!outcome.ok()) return outcome.status();
  if (Status s = store.SaveRun("report", ReportRunKey(*model), model->on.ToIso(), JsonText(ReportRunPayload(*model), -1));
      !s.ok()) {
    return s;
  }
  SaveCountedFigures(store, model->census_cache);
  return outcome;
}

}  // namespace medload
