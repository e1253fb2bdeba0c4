#include "medload/report/report_config.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Result<ReportConfig> Read(const std::string& text) {
  return ReadReportConfig(nlohmann::json::parse(text), "network.json");
}

const char* kMinimal = R"({"title": "T", "network": "N", "criteria": ["items>=10"]})";

}  // namespace

TEST_SUITE("report/report_config") {

TEST_CASE("a minimal config takes the documented defaults") {
  auto config = Read(kMinimal);
  REQUIRE(config.ok());
  CHECK_FALSE(config->on.has_value());  // "latest"
  CHECK(config->months == 13);
  CHECK(config->suppress_below == 0);
  CHECK(config->practices.empty());
  CHECK(config->worklist_limit == 50);
  CHECK_FALSE(config->age_min.has_value());
  CHECK_FALSE(config->reviewed_within_days.has_value());
  CHECK(config->measure.episodes.grace_days == 30);
  CHECK(config->measure.scale == "acb");
  CHECK_FALSE(config->digests.enabled);
  REQUIRE(config->criteria.size() == 1);
  CHECK(config->criteria[0].Key() == "items>=10");
}

TEST_CASE("longitudinal criteria and the exposure years are read, and a pdc class group is worked out") {
  auto config = Read(R"({"title": "T", "network": "N", "exposure_years": 10,
    "criteria": ["falls>=3", "tsdd>=1095", "pdc<0.8:statin", "pdc<0.8"]})");
  REQUIRE(config.ok());
  REQUIRE(config->criteria.size() == 4);
  CHECK(config->criteria[0].Key() == "falls>=3");
  CHECK(config->criteria[1].Key() == "tsdd>=1095");
  CHECK(config->criteria[2].Key() == "pdc<0.8:statin");
  CHECK(config->measure.exposure_years == 10);
  CHECK(config->measure.pdc_groups == std::vector<std::vector<std::string>>{{"statin"}});
  CHECK(ConfigParameters(*config)["exposure_years"] == 10);
}

TEST_CASE("every key of the schema is read") {
  auto config = Read(R"({"title": "T", "network": "N", "on": "2026-10-31", "months": 24,
    "criteria": ["items>=10", "acb>=3", "dbi>=1", "rule:opioid-benzodiazepine"],
    "suppress_below": 5, "practices": ["WV001"], "measure": "lookback", "window": 60,
    "grace_days": 10, "carryover": true, "default_supply_days": 30, "max_supply_days": 90,
    "count_by": "ingredient", "exclude_prn": true, "exclude_route": ["skin"], "scale": "acb",
    "worklist_limit": 10, "pseudonymise_key": "key.txt", "age_min": 65, "reviewed_within": 180,
    "digests": {"from": "a@b.invalid", "to": ["c@d.invalid"], "practice_to": {"WV001": ["e@f.invalid"]},
                "triggers": {"rise_patients": 3, "rise_percent": 12.5, "above_upper_limit": false,
                             "combine": "all"}}})");
  REQUIRE(config.ok());
  CHECK(config->on->ToIso() == "2026-10-31");
  CHECK(config->months == 24);
  CHECK(config->criteria.size() == 4);
  CHECK(config->criteria[3].Key() == "rule:opioid-benzodiazepine");
  CHECK(config->measure.measure == Measure::kLookback);
  CHECK(config->measure.window_days == 60);
  CHECK(config->measure.episodes.carryover);
  CHECK(config->measure.supply.max_supply_days == 90);
  CHECK(config->measure.count_by == CountBy::kIngredient);
  CHECK(config->measure.exclude_routes.size() == 1);
  CHECK(config->worklist_limit == 10);
  CHECK(config->pseudonymise_key == "key.txt");
  CHECK(config->age_min == 65);
  CHECK(config->reviewed_within_days == 180);
  CHECK(ConfigParameters(*config).at("age_min") == 65);
  CHECK(ConfigParameters(*config).at("reviewed_within") == 180);
  CHECK(config->digests.enabled);
  CHECK(config->digests.practice_to.at("WV001").at(0) == "e@f.invalid");
  CHECK(*config->digests.triggers.rise_patients == 3);
  CHECK(*config->digests.triggers.rise_percent == 12.5);
  CHECK_FALSE(config->digests.triggers.above_upper_limit);
  CHECK(config->digests.triggers.all);
  CHECK(ConfigParameters(*config).at("digests").at("triggers").at("combine") == "all");
}

TEST_CASE("config faults name the file, the JSON pointer of the key and the fault") {
  struct Case {
    const char* text;
    const char* message;
  };
  const Case cases[] = {
      {R"([1])", "network.json: /: the config must be a JSON object"},
      {R"({"network": "N", "criteria": ["items>=1"]})", "network.json: /title: is required"},
      {R"({"title": "T", "network": 3, "criteria": ["items>=1"]})", "network.json: /network: must be a string"},
      {R"({"title": "T", "network": "N"})",
       "network.json: /criteria: is required: a list such as [\"items>=10\", \"acb>=3\"]"},
      {R"({"title": "T", "network": "N", "criteria": []})", "network.json: /criteria: needs at least one criterion"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1", 4]})", "network.json: /criteria/1: must be a string"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1", "items>=1"]})",
       "network.json: /criteria/1: \"items>=1\" is given twice"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "on": "2026-02-30"})",
       "network.json: /on: \"2026-02-30\" is not a date (YYYY-MM-DD) or \"latest\""},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "months": 0})",
       "network.json: /months: 0 is outside 1 to 240"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "months": 1.5})",
       "network.json: /months: must be a whole number"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "colour": "red"})",
       "network.json: /colour: is not a known key (see docs/report.md)"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "measure": "sometimes"})",
       "network.json: /measure: \"sometimes\" is not concurrent or lookback"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "exclude_route": ["oral", "nasal-ish"]})",
       "network.json: /exclude_route/1: \"nasal-ish\" is not a known route"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "carryover": "yes"})",
       "network.json: /carryover: must be true or false"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "age_min": -1})",
       "network.json: /age_min: -1 is outside 0 to 150"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "reviewed_within": "6 months"})",
       "network.json: /reviewed_within: must be a whole number"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "practices": ["A", "A"]})",
       "network.json: /practices/1: \"A\" is listed twice"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "digests": {"triggers": {"rise_percent": -2}}})",
       "network.json: /digests/triggers/rise_percent: must be a number above 0"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "digests": {"triggers": {"combine": "both"}}})",
       "network.json: /digests/triggers/combine: \"both\" is not any (one trigger is enough) or all (every trigger "
       "set)"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "digests": {"triggers": {"rise": 2}}})",
       "network.json: /digests/triggers/rise: is not a known key (see docs/report.md)"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "digests": {"from": "a\r\nBcc: x@y"}})",
       "network.json: /digests/from: must be one line"},
      {R"({"title": "T", "network": "N", "criteria": ["items>=1"], "digests": {"practice_to": {"A": "x"}}})",
       "network.json: /digests/practice_to/A: must be a list of strings"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    auto config = Read(c.text);
    REQUIRE_FALSE(config.ok());
    CHECK(config.status().code() == StatusCode::kInput);
    CHECK(config.status().message() == c.message);
  }
}

TEST_CASE("a bad criterion is reported at its index with the criterion parser's reason") {
  auto config = Read(R"({"title": "T", "network": "N", "criteria": ["items>=1", "acb>>3"]})");
  REQUIRE_FALSE(config.ok());
  CHECK(config.status().message().rfind("network.json: /criteria/1: ", 0) == 0);
}

TEST_CASE("a missing config file is an input error naming the path") {
  auto config = LoadReportConfig("/nonexistent/network.json");
  REQUIRE_FALSE(config.ok());
  CHECK(config.status().message() == "/nonexistent/network.json: no such file");
}

TEST_CASE("the normalised parameters fill in every default and hide the key file") {
  auto config = Read(R"({"title": "T", "network": "N", "criteria": ["acb=3"], "pseudonymise_key": "k"})");
  REQUIRE(config.ok());
  const nlohmann::json parameters = ConfigParameters(*config);
  CHECK(parameters.at("on") == "latest");
  CHECK(parameters.at("criteria") == nlohmann::json::array({"acb>=3"}));
  CHECK(parameters.at("grace_days") == 30);
  CHECK(parameters.at("pseudonymise_key") == "(set)");
  CHECK(parameters.at("digests").is_null());
}

TEST_CASE("a config nesting arrays more than 32 levels deep is refused without recursing") {
  // Found by the report_config fuzz target: keeping a copy of a deeply nested document
  // recursed once per level until the stack overflowed.
  const std::string deep = std::string(100000, '[') + std::string(100000, ']');
  auto config = Read(R"({"title": "T", "network": "N", "criteria": ["items>=10"], "scale": )" +
                     deep + "}");
  REQUIRE_FALSE(config.ok());
  CHECK(config.status().message() ==
        "network.json: /: nests arrays and objects more than 32 levels deep");
  // 32 levels are read (and then refused for what they hold, not for their depth).
  auto shallow = Read(R"({"title": "T", "network": "N", "criteria": ["items>=10"], "scale": )" +
                      std::string(31, '[') + std::string(31, ']') + "}");
  REQUIRE_FALSE(shallow.ok());
  CHECK(shallow.status().message() == "network.json: /scale: must be a string");
}

}

}  // namespace medload
