// The point-in-time rule, checked on whole commands: every figure for a date D depends
// only on records dispensed on or before D, so a store holding the data cut off after D
// gives the same review, cohort and meds output for D as a store holding everything.
#include <doctest/doctest.h>

#include <algorithm>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "cli/medload_process.h"
#include "medload/core/date.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

using nlohmann::json;

ProcessResult Run(const std::vector<std::string>& args, const ProcessOptions& options) {
  ProcessResult result = RunMedload(args, options);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  return result;
}

// The dispensing CSV keeping only rows dispensed on or before `on` (the date is the fourth
// field of the synthetic files, which quote no field before it).
std::string CutOff(const std::string& csv, Date on) {
  std::istringstream in(csv);
  std::string line, kept;
  std::getline(in, line);
  kept = line + "\n";
  while (std::getline(in, line)) {
    size_t field = 0;
    for (int commas = 0; commas < 3; ++commas) field = line.find(',', field) + 1;
    if (line.substr(field, 10) <= on.ToIso()) kept += line + "\n";
  }
  return kept;
}

// What may differ with later data is only whether a date is after a practice's latest
// dispensing ("beyond the data", which later data undo): that marking and its notes are
// taken out; everything else must be equal.
void DropBeyondData(json& value) {
  if (value.is_object()) {
    for (auto& [key, item] : value.items()) DropBeyondData(item);
    return;
  }
  if (value.is_array()) {
    json kept = json::array();
    for (json& item : value) {
      if (item.is_string() && (item.get<std::string>().find("latest dispensing") != std::string::npos ||
                               item.get<std::string>() == "practice data beyond-data")) {
        continue;
      }
      DropBeyondData(item);
      kept.push_back(item);
    }
    value = kept;
    return;
  }
  if (value.is_string() && value.get<std::string>() == "beyond-data") value = "full";
}

json Normalised(const std::string& text) {
  json document = json::parse(text);
  DropBeyondData(document);
  // A cohort's raw tally (for merging shards) also records facts about the store read: how
  // many patients it holds and each practice's latest dispensing. Not figures for the date.
  if (document.contains("tally")) {
    document["tally"].erase("patients");
    for (auto& [practice, span] : document["tally"]["coverage"]["spans"].items()) span.erase(1);
  }
  return document;
}

// Imports the synthetic practices, patients and reviews and `dispensing` into `db`.
void Load(const TempFolder& folder, const ProcessOptions& run, const std::string& db,
          const std::string& dispensing) {
  for (const char* kind : {"practices", "patients", "reviews"}) {
    Run({"--quiet", "--db", db, "import", kind, folder.File(std::string("synth/") + kind + ".csv")}, run);
  }
  Run({"--quiet", "--db", db, "import", "dispensing", dispensing}, run);
}

// The outputs for one date: review, a cohort series ending on it, a network cohort on it,
// and meds of the first listed patients.
std::vector<std::pair<std::string, std::string>> Outputs(const ProcessOptions& run, const std::string& db, Date on,
                                                         const std::vector<std::string>& measure,
                                                         std::vector<std::string>& patients) {
  auto with = [&](std::vector<std::string> args) {
    std::vector<std::string> all = {"--quiet", "--format", "json", "--db", db};
    all.insert(all.end(), args.begin(), args.end());
    all.insert(all.end(), measure.begin(), measure.end());
    return Run(all, run).out;
  };
  // The series ends on the last month end on or before D (series dates are month ends, so
  // a later --to would ask for a date after D).
  const Date from = on - 200;
  const Date to = EndOfMonth(on) == on ? on : Date::FromCivil(on.year(), on.month(), 1) - 1;
  std::vector<std::pair<std::string, std::string>> outputs;
  outputs.emplace_back("review", with({"review", "--on", on.ToIso(), "--at-least", "items=4", "--at-least", "acb=2",
                                       "--at-least", "dbi=0.5"}));
  outputs.emplace_back("cohort series", with({"cohort", "--from", from.ToIso(), "--to", to.ToIso(), "--at-least",
                                              "items=4", "--at-least", "dbi=0.5"}));
  outputs.emplace_back("cohort network", with({"cohort", "--on", on.ToIso(), "--by", "network", "--at-least",
                                               "acb=2"}));
  if (patients.empty()) {
    const json review = json::parse(outputs.front().second);
    for (const json& row : review.at("patients")) {
      if (patients.size() < 4) patients.push_back(row.at("patient").get<std::string>());
    }
  }
  for (const std::string& patient : patients) {
    outputs.emplace_back("meds " + patient, with({"meds", patient, "--on", on.ToIso()}));
  }
  return outputs;
}

}  // namespace

TEST_SUITE("cli/point_in_time") {

TEST_CASE("outputs for a date are the same on data cut off after that date as on the whole data") {
  // Product specification, "Point in time": loading later records never changes a figure
  // for D. Random dates (not only month ends) over two synthetic networks and four ways of
  // measuring.
  const std::vector<std::vector<std::string>> measures = {
      {}, {"--carryover"}, {"--grace-days", "0"}, {"--measure", "lookback", "--window", "60"}};
  std::mt19937 random(20261202);
  for (const char* seed : {"3", "11"}) {
    CAPTURE(seed);
    TempFolder folder;
    const ProcessOptions run = InFolder(folder.File(""));
    Run({"--quiet", "synth", "--patients", "250", "--months", "14", "--seed", seed, "--out", "synth"}, run);
    Load(folder, run, "full.db", folder.File("synth/dispensing.csv"));
    const std::string dispensing = ReadWholeFile(folder.File("synth/dispensing.csv"));
    // Data from 2025-09-01 to 2026-10-31 (synth's default end): dates from mid-October on,
    // latest first, so that the full store's saved review runs never precede a date checked.
    std::vector<Date> dates;
    std::uniform_int_distribution<int> day(0, 380);
    for (int i = 0; i < 3; ++i) dates.push_back(Date::FromCivil(2025, 10, 15) + day(random));
    std::sort(dates.rbegin(), dates.rend());
    for (size_t d = 0; d < dates.size(); ++d) {
      const Date on = dates[d];
      CAPTURE(on.ToIso());
      const std::string cut_db = "cut" + std::to_string(d) + ".db";
      Load(folder, run, cut_db, folder.Write("cut.csv", CutOff(dispensing, on)));
      const std::vector<std::string>& measure = measures[(d + (seed[0] == '3' ? 0 : 1)) % measures.size()];
      CAPTURE(measure.empty() ? std::string("default") : measure.front());
      std::vector<std::string> patients;
      const auto full = Outputs(run, "full.db", on, measure, patients);
      REQUIRE(patients.size() == 4);  // the check covers meds of listed patients
      const auto cut = Outputs(run, cut_db, on, measure, patients);
      REQUIRE(full.size() == cut.size());
      for (size_t i = 0; i < full.size(); ++i) {
        CAPTURE(full[i].first);
        CHECK(Normalised(full[i].second) == Normalised(cut[i].second));
      }
    }
  }
}

}  // TEST_SUITE

}  // namespace medload
