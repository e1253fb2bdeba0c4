#include "medload/report/report.h"

#include <doctest/doctest.h>

#include "report/report_fixture.h"

namespace medload {

TEST_SUITE("report/report") {

TEST_CASE("the latest census date is the last month end covered by the data") {
  StoreSummary summary;
  summary.latest_dispensed = Date::FromCivil(2026, 11, 14);
  CHECK(LatestCensusDate(summary)->ToIso() == "2026-10-31");
  summary.latest_dispensed = Date::FromCivil(2026, 10, 31);
  CHECK(LatestCensusDate(summary)->ToIso() == "2026-10-31");
  summary.latest_dispensed = Date::FromCivil(2026, 1, 3);
  CHECK(LatestCensusDate(summary)->ToIso() == "2025-12-31");
  summary.latest_dispensed.reset();
  CHECK_FALSE(LatestCensusDate(summary).ok());
}

TEST_CASE("a change is given in patients and, from a non-zero count, in percent") {
  const Change rise = ChangeOf(12L, 8L);
  CHECK(*rise.patients == 4);
  CHECK(*rise.percent == doctest::Approx(50.0));
  const Change from_zero = ChangeOf(3L, 0L);
  CHECK(*from_zero.patients == 3);
  CHECK_FALSE(from_zero.percent.has_value());
  CHECK_FALSE(ChangeOf(3L, std::nullopt).patients.has_value());
}

TEST_CASE("the model counts each practice per month and sums the network") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  CHECK(model->on.ToIso() == "2024-06-30");
  REQUIRE(model->dates.size() == 6);
  CHECK(model->dates.front().ToIso() == "2024-01-31");
  CHECK(model->keys == std::vector<std::string>{"acb>=3", "items>=2", "any"});
  REQUIRE(model->practices.size() == 2);
  const ReportSeries& a1 = model->practices[0];
  CHECK(a1.code == "A1");
  CHECK(a1.registered.back() == 8);
  CHECK(a1.counts[0] == std::vector<long>{0, 0, 0, 0, 0, 6});   // acb>=3 from June
  CHECK(a1.counts[1].back() == 8);                               // items>=2: everybody
  CHECK(model->network.registered.back() == 14);
  CHECK(model->network.counts[0].back() == 6);
  CHECK(model->patients_seen == 14);
  CHECK_FALSE(model->previous.has_value());
}

TEST_CASE("each practice's worklist is ranked, limited and made from the same pass") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();
  config.worklist_limit = 3;
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  const Worklist& a1 = model->worklists.at("A1");
  CHECK(a1.patients_meeting == 8);
  CHECK(a1.patients_considered == 8);
  REQUIRE(a1.patients.size() == 3);
  CHECK(a1.patients[0].rank == 1);
  CHECK(a1.patients[0].acb >= 3);  // the ACB patients rank first (docs/measures.md)
  CHECK(a1.patients[0].patient == "ZQ7102");
  CHECK(model->worklists.at(testing::kOddPractice).patients_meeting == 6);
}

TEST_CASE("a practice page's worklist is ordered by the requested criteria, not by rules nobody asked for") {
  testing::ReportPopulation population;
  // One more A1 patient with five medicines that fire several rules (NSAID with an
  // anticoagulant, two NSAIDs, the diuretic-RAS-NSAID triple) but no anticholinergic load:
  // of the requested criteria (acb>=3, items>=2) it meets one.
  std::string rows = "patient_id,practice,dispensed_on,product,quantity,days_supply\n";
  for (const char* product : {"Ibuprofen 400mg tablets", "Naproxen 250mg tablets", "Warfarin 1mg tablets",
                              "Ramipril 5mg capsules", "Furosemide 40mg tablets"}) {
    rows += std::string("ZQ7199,A1,2024-06-01,") + product + ",28,31\n";
  }
  testing::ImportCsv(population.store, InputKind::kPatients,
                     "patient_id,birth_date,sex,practice,registered_from,registered_to\nZQ7199,1930,male,A1,,\n");
  testing::ImportCsv(population.store, InputKind::kDispensing, rows);
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const Worklist& a1 = model->worklists.at("A1");
  REQUIRE(a1.patients.size() == 9);
  for (size_t i = 0; i < 6; ++i) {
    CAPTURE(i);
    CHECK(a1.patients[i].criteria_met.size() == 2);  // the six patients with ACB >= 3 first
  }
  CHECK(a1.patients[6].patient == "ZQ7199");  // then the most items among those meeting one
  CHECK(a1.patients[6].rule_ids.size() >= 2);
  CHECK(a1.patients[6].criteria_met == std::vector<std::string>{"items>=2"});
}

TEST_CASE("age_min narrows both the counts and the worklists, and reviewed_within only the worklists") {
  // Everybody has the birth year 1940, read as 1 July 1940: 83 on 2024-06-30.
  testing::ReportPopulation population;
  testing::ImportCsv(population.store, InputKind::kReviews, "patient_id,reviewed_on\nZQ7102,2024-05-15\n");
  ReportConfig config = testing::TestConfig();
  config.reviewed_within_days = 90;
  auto reviewed = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(reviewed.ok());
  const Worklist& a1 = reviewed->worklists.at("A1");
  CHECK(a1.patients_meeting == 7);
  CHECK(a1.excluded_recent_review == 1);
  CHECK(reviewed->practices[0].counts[2].back() == 8);  // "any" still counts the reviewed patient
  config.reviewed_within_days = 30;                        // the review is 46 days before
  auto older = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(older.ok());
  CHECK(older->worklists.at("A1").patients[0].patient == "ZQ7102");
  CHECK(older->worklists.at("A1").patients[0].last_reviewed == Date::FromCivil(2024, 5, 15));

  ReportConfig aged = testing::TestConfig();
  aged.age_min = 84;
  auto none = BuildReportModel(population.store, population.analysis, aged, {}, {});
  REQUIRE(none.ok());
  CHECK(none->practices[0].registered.back() == 0);
  CHECK(none->worklists.at("A1").patients.empty());
  CHECK(none->worklists.at("A1").patients_considered == 0);
  aged.age_min = 83;
  auto all = BuildReportModel(population.store, population.analysis, aged, {}, {});
  REQUIRE(all.ok());
  CHECK(all->practices[0].registered.back() == 8);
  CHECK(all->worklists.at("A1").patients_meeting == 8);
  CHECK(ReportRunKey(*all).find("|age_min=83") != std::string::npos);
}

TEST_CASE("a practice page marks the patients who were not on its list in the previous report") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();
  config.criteria = {*ParseCriterion("acb>=3")};
  config.on = Date::FromCivil(2024, 6, 30);
  auto june = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(june.ok());
  CHECK_FALSE(june->worklists.at("A1").has_previous_run);
  CHECK(june->listed.at("A1").size() == 6);
  // Saved as if it were May's report, listing only ZQ7102 and ZQ7103.
  nlohmann::json payload = ReportRunPayload(*june);
  payload["on"] = "2024-05-31";
  payload["listed"]["A1"] = {"ZQ7102", "ZQ7103"};
  REQUIRE(population.store.SaveRun("report", ReportRunKey(*june), "2024-05-31", payload.dump()).ok());
  auto again = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(again.ok());
  const Worklist& a1 = again->worklists.at("A1");
  CHECK(a1.has_previous_run);
  long marked = 0;
  for (const WorklistEntry& row : a1.patients) {
    CAPTURE(row.patient);
    CHECK(row.is_new == (row.patient != "ZQ7102" && row.patient != "ZQ7103"));
    marked += row.is_new ? 1 : 0;
  }
  CHECK(marked == 4);
}

TEST_CASE("worklist identifiers are replaced when a pseudonymiser is given") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(),
                                [](const std::string& id) { return "PX-" + std::string(id.rbegin(), id.rend()); }, {});
  REQUIRE(model.ok());
  CHECK(model->worklists.at("A1").patients[0].patient == "PX-2017QZ");
}

TEST_CASE("the configured practices restrict the report and an unknown one is refused") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();
  config.practices = {"A1"};
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  REQUIRE(model->practices.size() == 1);
  CHECK(model->network.registered.back() == 8);
  config.practices = {"ZZ9"};
  auto refused = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE_FALSE(refused.ok());
  CHECK(refused.status().message() ==
        "the config's /practices: practice \"ZZ9\" is not in the store (known: A1, B/../<b>)");
  config.practices = {"a1"};
  auto lower = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE_FALSE(lower.ok());
  CHECK(lower.status().message() == "the config's /practices: practice \"a1\" is not in the store; codes are "
                                    "case-sensitive: did you mean \"A1\"? (known: A1, B/../<b>)");
}

TEST_CASE("a saved run payload reads back as the previous report") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const auto previous = ParsePreviousReport(ReportRunPayload(*model).dump());
  REQUIRE(previous.has_value());
  CHECK(previous->on.ToIso() == "2024-06-30");
  CHECK(previous->counts.at("A1") == std::vector<long>{6, 8, 8});
  CHECK_FALSE(ParsePreviousReport("{\"on\": 3}").has_value());
}

TEST_CASE("progress is reported with the number of patients read") {
  testing::ReportPopulation population;
  long last = 0;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {},
                                [&](long patients) { last = patients; });
  REQUIRE(model.ok());
  CHECK(last == 14);
}

}

}  // namespace medload
