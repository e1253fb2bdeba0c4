// The batch report of a care network (docs/report.md): one pass over the store builds a
// finished model (monthly counts per practice and for the network, every practice's
// worklist on the census date, the previous report's counts), and writers turn it into the
// report folder. It does not parse the config (report_config.h) or format pages itself
// (report_pages.h, digest.h).
#pragma once

#include <functional>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "medload/cohort/cohort.h"
#include "medload/core/data_coverage.h"
#include "medload/report/census_cache.h"
#include "medload/report/report_config.h"
#include "medload/review/worklist.h"
#include "medload/store/store.h"

namespace medload {

class RunContext;

// One practice (or the network total) over the census dates.
struct ReportSeries {
  std::string code;                       // practice code; the network name for the total
  std::string name;                       // practice name (may be empty)
  std::optional<long> list_size;          // from the practices table, if given
  std::vector<long> registered;           // per census date
  std::vector<std::vector<long>> counts;  // [key][date]: criteria in config order, then "any"
  // Data coverage per census date (data_coverage.h). A practice without figures on a date
  // adds nothing to the network total that day; the total's own state is kNoData when no
  // practice has figures, else kShortHistory / kBeyondData when any practice counted is.
  std::vector<DataState> data;
  // Practices left out of the network total on each date for want of data (total only).
  std::vector<long> practices_without_data;
};

// The counts of the previous report run (dated before this census date), per practice.
struct PreviousReport {
  Date on;
  std::map<std::string, std::vector<long>> counts;  // practice -> per key
  // practice -> its data coverage then; practices missing here (reports saved before
  // coverage was kept) count as comparable.
  std::map<std::string, DataState> data;
  // practice -> the patients on its whole list then (before the limit, real identifiers);
  // nullopt for reports saved before lists were kept (nobody is marked new then).
  std::optional<std::map<std::string, std::set<std::string>>> listed;
};

struct ReportModel {
  ReportConfig config;
  Date on;                                  // the census date (config "on" or "latest")
  std::vector<Date> dates;                  // month ends, oldest first; the last is `on`
  std::vector<std::string> keys;            // criterion keys, then "any"
  std::vector<ReportSeries> practices;      // sorted by code
  ReportSeries network;                     // the sum of `practices`
  std::map<std::string, Worklist> worklists;  // practice -> worklist on `on` (top N)
  // practice -> every patient meeting a criterion, in review order, before the limit and
  // pseudonyms: saved with the run (in the store only) to mark "new on the list" next time.
  std::map<std::string, std::vector<std::string>> listed;
  std::optional<PreviousReport> previous;   // the last report before `on`, if any
  CohortTally tally;                        // the cohort counts behind the series
  StoreSummary data;                        // provenance
  std::string formulary_checksum;
  std::string measure;                      // the measure options in words
  int history_days = 84;                    // the short-history window (HistoryDays)
  long patients_seen = 0;                   // patients visited in the pass
  // Of them, by registered practice ("" when none), those whose histories were cut to
  // their latest `history_bound` dispensings (Store::history_bound).
  std::map<std::string, long> capped_patients;
  size_t history_bound = 0;
  // The census figures served from the store and those counted, to save after the run
  // (census_cache.h). Changes nothing the report shows.
  CensusCache census_cache;
};

// Called every so many patients with the number visited so far (progress on stderr).
using ReportProgress = std::function<void(long patients)>;

// The census date of "latest": the last month end on or before the latest dispensing.
// Input failure when the store holds no dispensing.
Result<Date> LatestCensusDate(const StoreSummary& summary);

// Builds the model in one ordered pass over the store: each patient's timeline is built
// once and evaluated on every census date they are registered on; on the census date
// the same burden feeds the practice's worklist. Input failure on a storage error, a
// practice in config.practices that the store does not know, or an unknown rule id.
// `pseudonymise` (may be empty) replaces patient identifiers in the worklists after
// ranking (review/pseudonym.h).
Result<ReportModel> BuildReportModel(const Store& store, RunContext& analysis,
                                     const ReportConfig& config,
                                     const std::function<std::string(const std::string&)>& pseudonymise,
                                     const ReportProgress& progress);

// The key under which report runs are saved in the store ("since the last report"):
// the network name, the criteria keys, the measure and age_min when set.
std::string ReportRunKey(const ReportModel& model);
// The payload saved for this run in the store: {"on", "keys", "counts": {practice: [per
// key]}, "data": {practice: coverage}, "listed": {practice: [patient ids]}}.
nlohmann::json ReportRunPayload(const ReportModel& model);
// Reads the previous report's payload (as saved above). nullopt when malformed.
std::optional<PreviousReport> ParsePreviousReport(const std::string& payload);

// A change in patients between two dates.
struct Change {
  std::optional<long> patients;  // now - before
  std::optional<double> percent; // 100 * (now - before) / before; absent when before = 0
};

// The change of a series' count for `key` on the last census date against `back` dates
// earlier: empty when that date is outside the series, or either date is not Comparable
// (no figures, or short history), or either count is withheld (below `suppress_below`).
Change SeriesChange(const ReportSeries& series, size_t key, size_t back, long suppress_below);

// The change of `now` against `before`, when both are known.
Change ChangeOf(std::optional<long> now, std::optional<long> before);

}  // namespace medload
