#include <doctest/doctest.h>

#include "cohort/population_fixture.h"
#include "medload/cohort/cohort_writer.h"
#include "medload/core/caution.h"

namespace medload {
namespace {

using testing::CountFake;
using testing::D;
using testing::MixedPopulation;

CohortOptions Options() {
  CohortOptions options;
  options.dates = {D(2024, 1, 31), D(2024, 2, 29)};
  options.group_by = GroupBy::kPractice;
  options.criteria = {*ParseCriterion("items=10")};
  return options;
}

TEST_SUITE("cohort/cohort_json") {

TEST_CASE("the cohort JSON has the spec's shape with null for suppressed values") {
  const CohortTally tally = CountFake(MixedPopulation(60), Options());
  const CohortTable table = BuildCohortTable(tally, 1000, 84);  // every non-zero count withheld
  const nlohmann::json document = CohortJson(table, nullptr);
  CHECK(document.at("criteria") == nlohmann::json::array({"items>=10"}));
  CHECK(document.at("caution") == std::string(kCaution));
  CHECK_FALSE(document.contains("tally"));
  const nlohmann::json& row = document.at("rows").at(0);
  CHECK(row.at("date") == "2024-01-31");
  CHECK(row.at("group") == "A01");
  CHECK(row.at("registered").is_number_integer());
  const nlohmann::json& counts = row.at("counts");
  REQUIRE(counts.contains("any"));
  for (const char* key : {"items>=10", "any"}) {
    CAPTURE(key);
    const bool zero = counts.at(key).is_number() && counts.at(key) == 0;
    CHECK((counts.at(key).is_null() || zero));
    CHECK((row.at("rates_per_1000").at(key).is_null() || zero));
  }
}

TEST_CASE("a tally survives a JSON round trip exactly") {
  const CohortTally tally = CountFake(MixedPopulation(120), Options());
  const nlohmann::json document = CohortJson(BuildCohortTable(tally, 0, 84), &tally);
  auto back = TallyFromJson(nlohmann::json::parse(document.dump()), "run.json");
  REQUIRE(back.ok());
  CHECK(back->criteria == tally.criteria);
  CHECK(back->dates == tally.dates);
  CHECK(back->measure == tally.measure);
  CHECK(back->patients == tally.patients);
  CHECK(testing::SameCells(*back, tally));
}

TEST_CASE("the patients counted are named in the JSON and shards counted over other patients do not merge") {
  CohortOptions some = Options();
  some.practices = {"A01"};
  some.shard = ShardSpec{1, 2};
  const CohortTally first = CountFake(MixedPopulation(40), some);
  const nlohmann::json document = CohortJson(BuildCohortTable(first, 0, 84), &first);
  CHECK(document.at("population") == "registered at A01");
  auto back = TallyFromJson(nlohmann::json::parse(document.dump()), "a.json");
  REQUIRE(back.ok());
  CHECK(back->population == "registered at A01");
  CohortOptions every = Options();
  every.shard = ShardSpec{2, 2};
  const CohortTally second = CountFake(MixedPopulation(40), every);
  CHECK(CohortJson(BuildCohortTable(second, 0, 84), nullptr).at("population") == "every registered patient");
  auto merged = MergeTallies({*back, second}, {"a.json", "b.json"});
  REQUIRE_FALSE(merged.ok());
  CHECK(merged.status().message() ==
        "b.json: patients counted (--practice) differ from the first file's; merge only the shards of one cohort run");
}

TEST_CASE("shard outputs read back from JSON merge to the one-run answer") {
  const auto patients = MixedPopulation(300);
  const CohortTally one = CountFake(patients, Options());
  std::vector<CohortTally> shards;
  for (uint32_t k = 1; k <= 3; ++k) {
    CohortOptions options = Options();
    options.shard = ShardSpec{k, 3};
    const CohortTally shard = CountFake(patients, options);
    const std::string text = CohortJson(BuildCohortTable(shard, 0, 84), &shard).dump();
    auto back = TallyFromJson(nlohmann::json::parse(text), "shard.json");
    REQUIRE(back.ok());
    shards.push_back(*back);
  }
  auto merged = MergeTallies(shards, {"1.json", "2.json", "3.json"});
  REQUIRE(merged.ok());
  CHECK(testing::SameCells(*merged, one));
  CHECK(CohortJson(BuildCohortTable(*merged, 0, 84), nullptr).at("rows") ==
        CohortJson(BuildCohortTable(one, 0, 84), nullptr).at("rows"));
}

TEST_CASE("a cohort file without raw counts cannot be merged") {
  const CohortTally tally = CountFake(MixedPopulation(20), Options());
  const nlohmann::json document = CohortJson(BuildCohortTable(tally, 5, 84), nullptr);
  auto back = TallyFromJson(document, "public.json");
  REQUIRE_FALSE(back.ok());
  CHECK(back.status().code() == StatusCode::kInput);
  CHECK(back.status().message().rfind("public.json: /tally: missing", 0) == 0);
}

TEST_CASE("a malformed tally names the member at fault") {
  const CohortTally tally = CountFake(MixedPopulation(20), Options());
  nlohmann::json document = CohortJson(BuildCohortTable(tally, 0, 84), &tally);
  document["tally"]["shard_count"] = "two";
  auto back = TallyFromJson(document, "bad.json");
  REQUIRE_FALSE(back.ok());
  CHECK(back.status().message() == "bad.json: /tally/shard_count: missing or not the expected type");
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
