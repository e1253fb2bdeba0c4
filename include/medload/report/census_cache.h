// Census figures saved in the store between report runs (docs/report.md, "Saved census
// figures"): a report takes a census date's per-practice counts from the store instead of
// evaluating every patient on it, only while nothing they depend on has changed, and saves
// those it counted. It decides what is served; it never changes what a report says.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "medload/cohort/cohort.h"
#include "medload/core/date.h"
#include "medload/core/status.h"
#include "medload/report/report_config.h"
#include "medload/store/store.h"

namespace medload {

class RunContext;

// The figures served to this run, and those it counted, to save after it.
struct CensusCache {
  std::string settings_key;               // CensusSettingsKey
  DataMarks marks;                        // the data the run reads
  std::map<Date, DateFigures> served;     // census date -> figures taken from the store
  std::vector<std::pair<Date, DateFigures>> counted;  // figures this run counted
  long damaged = 0;                       // entries not served: digest or layout wrong
};

// The key of everything a census date's counts depend on apart from the dispensings:
// the criteria and age_min, every measure option, the formulary checksum with medload's
// and the resolver's versions, the store's history bound and the registry's digest.
std::string CensusSettingsKey(const ReportConfig& config, const RunContext& analysis,
                              const std::string& registry_digest, size_t history_bound);

// The saved figures as JSON text; `keys` counts per cell (criteria, then "any").
std::string FiguresJson(Date on, const DateFigures& figures);
// The figures back from FiguresJson's text: nullopt unless it is well formed, for date
// `on`, with `keys` counts (and per-band counts) in every cell.
std::optional<DateFigures> ParseFigures(const std::string& text, Date on, size_t keys);

// Reads (inside the run's snapshot) the entries saved under the run's key and serves those
// for `dates` other than `on` whose figures are intact and whose date no dispensing
// added, updated or deleted since they were counted touches (a date on or after the
// earliest such dispensing is counted again). Input failure on a storage error.
Result<CensusCache> OpenCensusCache(const Store& store, const ReportConfig& config, const RunContext& analysis,
                                    const std::vector<Date>& dates, Date on);

// Saves the figures the run counted, after its snapshot; best effort: a store that cannot
// be written only loses them (the next run counts again).
void SaveCountedFigures(Store& store, const CensusCache& cache);

}  // namespace medload
