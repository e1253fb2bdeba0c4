// The batch report's configuration file (docs/report.md): a JSON object naming the
// network, census date, history length, criteria, suppression, practices, measure options,
// worklist size, pseudonymisation key and digest triggers. Reading validates every key and
// names a fault by its JSON pointer; it does not open the store or the key file.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/burden/criteria.h"
#include "medload/burden/measure_options.h"
#include "medload/core/date.h"
#include "medload/core/status.h"

namespace medload {

// When a practice gets a digest message: a criterion (or "any") crosses the triggers that
// are set, any one of them (the default) or all of them together ("combine": "all").
struct DigestTriggers {
  std::optional<long> rise_patients;    // "rise_patients": count up by at least N
  std::optional<double> rise_percent;   // "rise_percent": count up by at least X percent
  bool above_upper_limit = true;        // "above_upper_limit": rate above the 99.8% limit
  bool all = false;                     // "combine": "any" (false, default) or "all" (true)
};

struct DigestConfig {
  bool enabled = false;                 // true when the config has a "digests" object
  std::string from = "medload <medload@localhost>";   // "from": the From header
  std::vector<std::string> default_to;  // "to": recipients of every practice's digest
  std::map<std::string, std::vector<std::string>> practice_to;  // "practice_to": per practice
  DigestTriggers triggers;              // "triggers"
};

struct ReportConfig {
  std::string title;                    // "title": heads every page (required)
  std::string network;                  // "network": the care network's name (required)
  std::optional<Date> on;               // "on": census date; nullopt = "latest"
  int months = 13;                      // "months": census dates in the trend (1-240)
  std::vector<Criterion> criteria;      // "criteria": at least one
  long suppress_below = 0;              // "suppress_below": withhold counts 1..N-1
  std::vector<std::string> practices;   // "practices": empty = every practice
  // "age_min": count and list only patients aged at least N on each date (an unknown age
  // is left out, and the practice pages say how many); nullopt = every age.
  std::optional<int> age_min;
  // "reviewed_within": leave out of the worklists patients with a completed review in the
  // DAYS days ending on the census date (the counts still include them); nullopt = none.
  std::optional<int> reviewed_within_days;
  MeasureOptions measure;               // "measure", "window", "grace_days", ...
  size_t worklist_limit = 50;           // "worklist_limit": rows on each practice page
  std::string pseudonymise_key;         // "pseudonymise_key": key file; empty = none
  DigestConfig digests;                 // "digests"
  nlohmann::json source;                // the document as read (for run.json)
};

// Reads a config document. `file` names the file in messages:
// `network.json: /criteria/1: "acb>>3" is not a criterion (...)`. Unknown keys are
// refused (a misspelt key would otherwise be ignored). Relative key-file paths are kept
// as written; the caller resolves them against the config's folder.
Result<ReportConfig> ReadReportConfig(const nlohmann::json& document, const std::string& file);

// Reads and parses the file at `path`; Input when missing, unreadable or not JSON.
Result<ReportConfig> LoadReportConfig(const std::string& path);

// The config's parameters in a normal form (every default filled in), for run.json.
nlohmann::json ConfigParameters(const ReportConfig& config);

}  // namespace medload
