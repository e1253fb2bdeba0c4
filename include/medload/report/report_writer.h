// Writes the report folder from a finished model: index.html, a page and a worklist CSV
// per practice, cohort.csv, cohort.json, digests/*.eml and run.json; and the whole run
// (model, files, saved run) for the report and demo commands. Nothing is written outside
// the folder; the only time stamp in any file is run.json's "generated_at".
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "medload/core/status.h"
#include "medload/report/report.h"
#include "medload/report/report_config.h"

namespace medload {

class RunContext;
class Store;

struct ReportOutcome {
  std::vector<std::string> files;    // written, relative to the folder, sorted
  std::vector<std::string> digests;  // practice codes that got a digest, sorted
  Date on;                           // the census date used
  size_t practices = 0;
  std::vector<std::string> warnings;  // ReportWarnings: also in run.json and the pages
};

// run.json: version, generated_at, parameters, formulary checksum, census dates, data
// date range and row counts, previous report date, files, and "warnings" (ReportWarnings).
nlohmann::json RunJson(const ReportModel& model, const std::vector<std::string>& files,
                       const std::string& generated_at);

// Writes every file of the report into `out_dir` (created if missing). Input failure when
// the folder cannot be written, a practice code cannot be made a file name, or a path
// inside it is a symbolic link. Stale digests from an earlier run are removed first.
Result<ReportOutcome> WriteReport(const ReportModel& model, const std::string& out_dir,
                                  const std::string& generated_at);

struct ReportRunOptions {
  std::string out_dir;                         // --out
  std::string config_dir;                      // relative pseudonymise_key paths start here
  std::string generated_at;                    // UTC date-time for run.json
  std::function<void(long patients)> progress; // may be empty
};

// The whole report: builds the model (one pass), writes the folder, and saves this run's
// counts in the store so that the next report can say what changed "since the last
// report" (a re-run on the same census date replaces it).
Result<ReportOutcome> RunReport(Store& store, RunContext& analysis, const ReportConfig& config,
                                const ReportRunOptions& options);

}  // namespace medload
