// libFuzzer target: the batch report's JSON config loader (report/report_config.h). The
// input is written to a scratch file in $TMPDIR (else /tmp) and read with
// LoadReportConfig, as `medload report` reads it.
//
// Invariants:
// - the loader never throws; a refusal is an Input status naming the file;
// - an accepted config keeps the documented bounds (title and network not empty, at least
//   one criterion, months 1..240, worklist 1..100000, practices listed once);
// - the normal form (ConfigParameters), written back as a config, reads again to the same
//   normal form: every criterion's key parses back to itself.
#include <unistd.h>

#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <set>
#include <string>

#include <nlohmann/json.hpp>

#include "fuzz/fuzz_check.h"
#include "medload/report/report_config.h"

namespace medload {
namespace {

const std::string& ScratchPath() {
  static const std::string path = [] {
    const char* dir = std::getenv("TMPDIR");
    return std::string(dir != nullptr && *dir != '\0' ? dir : "/tmp") + "/medload_report_config_fuzz_" +
           std::to_string(getpid()) + ".json";
  }();
  return path;
}

void WriteScratch(const uint8_t* data, size_t size) {
  std::FILE* file = std::fopen(ScratchPath().c_str(), "wb");
  FuzzCheck(file != nullptr, "the scratch file opens");
  FuzzCheck(std::fwrite(data, 1, size, file) == size, "the scratch file is written");
  std::fclose(file);
}

// The normal form as a config document: nulls (absent values) dropped and the key file
// (shown as "(set)") put back.
nlohmann::json AsDocument(const ReportConfig& config) {
  nlohmann::json document = ConfigParameters(config);
  if (document["pseudonymise_key"].is_null()) document.erase("pseudonymise_key");
  else document["pseudonymise_key"] = config.pseudonymise_key;
  if (document["digests"].is_null()) {
    document.erase("digests");
  } else {
    nlohmann::json& triggers = document["digests"]["triggers"];
    for (const char* key : {"rise_patients", "rise_percent"}) {
      if (triggers[key].is_null()) triggers.erase(key);
    }
  }
  return document;
}

void CheckAccepted(const ReportConfig& config) {
  FuzzCheck(!config.title.empty() && !config.network.empty(), "title and network are not empty");
  FuzzCheck(!config.criteria.empty(), "there is a criterion");
  FuzzCheck(config.months >= 1 && config.months <= 240, "months is 1..240");
  FuzzCheck(config.worklist_limit >= 1 && config.worklist_limit <= 100000, "worklist limit is 1..100000");
  FuzzCheck(config.suppress_below >= 0 && config.suppress_below <= 1000, "suppression is 0..1000");
  const std::set<std::string> practices(config.practices.begin(), config.practices.end());
  FuzzCheck(practices.size() == config.practices.size(), "a practice is listed once");
  const nlohmann::json parameters = ConfigParameters(config);
  const Result<ReportConfig> again = ReadReportConfig(AsDocument(config), "again.json");
  if (!again.ok()) std::fprintf(stderr, "%s\n", again.status().message().c_str());
  FuzzCheck(again.ok(), "the normal form reads as a config");
  FuzzCheck(ConfigParameters(*again) == parameters, "the normal form reads back to itself");
}

}  // namespace
}  // namespace medload

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace medload;
  WriteScratch(data, size);
  const Result<ReportConfig> config = LoadReportConfig(ScratchPath());
  if (!config.ok()) {
    FuzzCheck(config.status().code() == StatusCode::kInput, "a refusal is an Input status");
    // "FILE: ..." or, for JSON syntax, "FILE:LINE:COLUMN: ...".
    FuzzCheck(StartsWith(config.status().message(), ScratchPath() + ":"), "a refusal names the file");
    return 0;
  }
  CheckAccepted(*config);
  return 0;
}
