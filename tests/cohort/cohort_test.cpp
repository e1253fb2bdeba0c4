#include "medload/cohort/cohort.h"
#include "medload/cohort/cohort_table.h"

#include <doctest/doctest.h>

#include "cohort/population_fixture.h"

namespace medload {
namespace {

using testing::CountFake;
using testing::D;
using testing::FakePatient;
using testing::MixedPopulation;
using testing::Registered;
using testing::Unregistered;

CohortOptions Options(std::vector<Date> dates, GroupBy group_by) {
  CohortOptions options;
  options.dates = std::move(dates);
  options.group_by = group_by;
  options.criteria = {*ParseCriterion("items=10"), *ParseCriterion("acb=3")};
  return options;
}

// The hand-worked population: three month ends, two practices.
std::vector<FakePatient> HandPopulation() {
  return {
      // Registered from 29 February: counted in February and March only.
      Registered("P01", "A01", D(1950, 3, 1), D(2024, 2, 29), std::nullopt, 12),
      // Registration ends on 31 January: counted in January only.
      Registered("P02", "A01", D(1980, 5, 5), std::nullopt, D(2024, 1, 31), 4),
      // Birth year only, stored as 1 July 1954 (docs/input-formats.md): 69 in all three months.
      Registered("P03", "B02", D(1954, 7, 1), std::nullopt, std::nullopt, 10),
      // No registry row: dispensed 364 days before 31 January, inside the 365 days ending
      // on it (counts then, not later).
      Unregistered("P04", "B02", D(2023, 2, 1), 11),
      // No birth date: counted, but not in the standardised population.
      Registered("P05", "A01", std::nullopt, std::nullopt, std::nullopt, 0),
  };
}

const std::vector<Date> kMonths = {D(2024, 1, 31), D(2024, 2, 29), D(2024, 3, 31)};

TEST_SUITE("cohort/cohort") {

TEST_CASE("a hand-worked population gives the expected registered and counts per practice") {
  int evaluations = 0;
  const CohortTally tally = CountFake(HandPopulation(), Options(kMonths, GroupBy::kPractice),
                                      &evaluations);
  REQUIRE(tally.groups.size() == 2);
  const auto& a01 = tally.groups.at("A01");
  const auto& b02 = tally.groups.at("B02");
  // January: A01 has P02 and P05; B02 has P03 and P04 (both at 10 or more items).
  CHECK(a01[0].registered == 2);
  CHECK(a01[0].counts[0] == 0);
  CHECK(b02[0].registered == 2);
  CHECK(b02[0].counts[0] == 2);
  // February and March: A01 has P01 (12 items) and P05; B02 has P03 only.
  for (size_t d = 1; d < 3; ++d) {
    CAPTURE(d);
    CHECK(a01[d].registered == 2);
    CHECK(a01[d].counts[0] == 1);
    CHECK(a01[d].counts[2] == 1);  // any
    CHECK(b02[d].registered == 1);
    CHECK(b02[d].counts[0] == 1);
  }
  // The burden is asked for once per registered patient-date and never otherwise.
  CHECK(evaluations == 4 + 3 + 3);
  CHECK(tally.patients == 5);
}

TEST_CASE("counting only some practices leaves the others' patients out of every date") {
  CohortOptions options = Options(kMonths, GroupBy::kNone);
  options.practices = {"B02"};
  const CohortTally tally = CountFake(HandPopulation(), options);
  REQUIRE(tally.groups.size() == 1);
  const auto& all = tally.groups.at("all");
  // January: B02 has P03 and P04; February and March: P03 only (see the hand-worked case).
  CHECK(all[0].registered == 2);
  CHECK(all[0].counts[0] == 2);
  CHECK(all[1].registered == 1);
  CHECK(all[2].registered == 1);
  CHECK(tally.population == "registered at B02");
}

TEST_CASE("a minimum age counts only patients of a known age at least that old on each date") {
  CohortOptions options = Options(kMonths, GroupBy::kPractice);
  options.age_min = 69;
  const CohortTally tally = CountFake(HandPopulation(), options);
  // P01 (born 1950-03-01) is 73 and P03 (1 July 1954) 69 on every date; P02 (born 1980)
  // is too young; P04 and P05 have no known age and are left out.
  CHECK(tally.groups.at("A01")[1].registered == 1);
  CHECK(tally.groups.at("B02")[0].registered == 1);
  CHECK(tally.groups.at("A01")[0].registered == 0);
  CHECK(tally.population == "aged 69 or more");
}

TEST_CASE("the population in words lists the practices once, sorted, then the minimum age") {
  CohortOptions options;
  CHECK(DescribePopulation(options).empty());
  options.practices = {"B02", "A01", "B02"};
  options.age_min = 65;
  CHECK(DescribePopulation(options) == "registered at A01, B02; aged 65 or more");
}

TEST_CASE("any counts a patient meeting several criteria once") {
  std::vector<FakePatient> patients = {
      Registered("P01", "A01", D(1940, 1, 1), std::nullopt, std::nullopt, 12)};
  patients[0].acb = 4;
  patients.push_back(Registered("P02", "A01", D(1940, 1, 1), std::nullopt, std::nullopt, 2));
  patients[1].acb = 3;
  const CohortTally tally = CountFake(patients, Options({D(2024, 1, 31)}, GroupBy::kNone));
  const CohortCell& cell = tally.groups.at("all")[0];
  CHECK(cell.counts == std::vector<long>{1, 2, 2});
}

TEST_CASE("ages and ESP bands follow the birth date, with a birth year read as 1 July") {
  // Born "1954": 1 July 1954. On 30 June 2024 aged 69 (ESP band 65-69), on 31 July 70.
  const std::vector<FakePatient> patients = {
      Registered("P03", "B02", D(1954, 7, 1), std::nullopt, std::nullopt, 10)};
  const CohortTally tally =
      CountFake(patients, Options({D(2024, 6, 30), D(2024, 7, 31)}, GroupBy::kAgeBand));
  CHECK(tally.groups.at("65-74")[0].registered_by_band[13] == 1);
  CHECK(tally.groups.at("65-74")[1].registered_by_band[14] == 1);
  CHECK(tally.groups.at("65-74")[1].counts_by_band[0][14] == 1);
}

TEST_CASE("patients without a birth date count in the crude figures only") {
  const CohortTally tally = CountFake(HandPopulation(), Options(kMonths, GroupBy::kPractice));
  const CohortCell& january = tally.groups.at("A01")[0];
  long banded = 0;
  for (const long n : january.registered_by_band) banded += n;
  CHECK(january.registered == 2);
  CHECK(banded == 1);
}

TEST_CASE("the whole equals the sum of its practices") {
  const std::vector<FakePatient> patients = MixedPopulation(400);
  const CohortTally whole = CountFake(patients, Options(kMonths, GroupBy::kNone));
  const CohortTally practices = CountFake(patients, Options(kMonths, GroupBy::kPractice));
  REQUIRE(whole.groups.size() == 1);
  for (size_t d = 0; d < kMonths.size(); ++d) {
    CAPTURE(d);
    const CohortCell& all = whole.groups.at("all")[d];
    long registered = 0;
    std::vector<long> counts(3, 0);
    std::array<long, kEspBands> bands{};
    for (const auto& [group, cells] : practices.groups) {
      registered += cells[d].registered;
      for (size_t k = 0; k < 3; ++k) counts[k] += cells[d].counts[k];
      for (size_t b = 0; b < kEspBands; ++b) bands[b] += cells[d].registered_by_band[b];
    }
    CHECK(all.registered > 0);
    CHECK(registered == all.registered);
    CHECK(counts == all.counts);
    CHECK(bands == all.registered_by_band);
  }
}

TEST_CASE("N shards merged equal one run") {
  const std::vector<FakePatient> patients = MixedPopulation(400);
  const CohortOptions options = Options(kMonths, GroupBy::kNetwork);
  const CohortTally one = CountFake(patients, options);
  std::vector<CohortTally> shards;
  std::vector<std::string> names;
  for (uint32_t k = 1; k <= 4; ++k) {
    CohortOptions shard_options = options;
    shard_options.shard = ShardSpec{k, 4};
    shards.push_back(CountFake(patients, shard_options));
    names.push_back("shard" + std::to_string(k) + ".json");
    CHECK(shards.back().patients < one.patients);
  }
  auto merged = MergeTallies(shards, names);
  REQUIRE(merged.ok());
  CHECK(merged->complete());
  CHECK(merged->patients == one.patients);
  CHECK(testing::SameCells(*merged, one));
}

TEST_CASE("a merge refuses a shard given twice and tallies of different runs") {
  const std::vector<FakePatient> patients = MixedPopulation(50);
  CohortOptions options = Options(kMonths, GroupBy::kPractice);
  options.shard = ShardSpec{1, 2};
  const CohortTally first = CountFake(patients, options);
  auto twice = MergeTallies({first, first}, {"a.json", "b.json"});
  REQUIRE_FALSE(twice.ok());
  CHECK(twice.status().code() == StatusCode::kInput);
  CHECK(twice.status().message() ==
        "b.json: shard 1/2 is already in an earlier file; each shard may be merged once");
  CohortOptions other = options;
  other.shard = ShardSpec{2, 2};
  other.dates = {D(2024, 1, 31)};
  auto mismatch = MergeTallies({first, CountFake(patients, other)}, {"a.json", "c.json"});
  REQUIRE_FALSE(mismatch.ok());
  CHECK(mismatch.status().message() ==
        "c.json: census dates differ from the first file's; merge only the shards of one "
        "cohort run");
}

TEST_CASE("a merge of some shards only is marked incomplete") {
  const std::vector<FakePatient> patients = MixedPopulation(50);
  CohortOptions options = Options(kMonths, GroupBy::kPractice);
  options.shard = ShardSpec{1, 3};
  const CohortTally first = CountFake(patients, options);
  options.shard = ShardSpec{3, 3};
  auto merged = MergeTallies({first, CountFake(patients, options)}, {"a", "b"});
  REQUIRE(merged.ok());
  CHECK_FALSE(merged->complete());
  CHECK(merged->shards == std::set<uint32_t>{1, 3});
}

TEST_CASE("a group leaves out, on each date, the practices whose data have not begun") {
  // A01's data begin on 2024-01-05, B02's on 2024-03-10. By none: January and February
  // count A01 only (B02's registered patients are not in the denominator); March counts
  // both and is short-history (B02's data are days old). By practice: B02 has no figures
  // before March (null, never 0).
  auto patient = [](std::string id, std::string practice, std::optional<Date> dispensed) {
    FakePatient fake = Registered(id, practice, D(1950, 1, 1), std::nullopt, std::nullopt, 12);
    if (dispensed) {
      DispensingRecord record;
      record.patient_id = id;
      record.practice = practice;
      record.dispensed_on = *dispensed;
      fake.history.dispensings.push_back(record);
    }
    return fake;
  };
  const std::vector<FakePatient> patients = {patient("X", "A01", D(2024, 1, 5)), patient("Y", "A01", std::nullopt),
                                             patient("Z", "B02", D(2024, 3, 10)), patient("W", "B02", std::nullopt)};
  auto count = [&](GroupBy group_by) {
    CohortCounter counter(Options({D(2024, 1, 31), D(2024, 2, 29), D(2024, 3, 31)}, group_by), {}, "test");
    for (const FakePatient& fake : patients) {
      counter.See(fake.history);
      counter.Add(fake.history, [&](Date on, std::optional<int>) {
        Burden burden;
        burden.on = on;
        const bool any = !fake.history.dispensings.empty() && fake.history.dispensings.front().dispensed_on <= on;
        burden.items = any ? fake.items : 0;
        return burden;
      });
    }
    return BuildCohortTable(counter.Take(), 0, 84);
  };
  const CohortTable all = count(GroupBy::kNone);
  REQUIRE(all.rows.size() == 3);
  CHECK(all.rows[0].registered == 2);
  CHECK(all.rows[0].practices_without_data == 1);
  CHECK(*all.rows[0].values[0].count == 1);
  CHECK(*all.rows[0].values[0].rate == doctest::Approx(500));
  CHECK(all.rows[0].data == DataState::kShortHistory);  // A01's data are 26 days old
  CHECK(all.rows[1].registered == 2);
  CHECK(all.rows[2].registered == 4);
  CHECK(all.rows[2].practices_without_data == 0);
  CHECK(*all.rows[2].values[0].count == 2);
  CHECK(all.rows[2].data == DataState::kShortHistory);
  const CohortTable by_practice = count(GroupBy::kPractice);
  REQUIRE(by_practice.rows.size() == 6);
  const CohortRow& b02_january = by_practice.rows[1];
  CHECK(b02_january.group == "B02");
  CHECK(b02_january.data == DataState::kNoData);
  CHECK(b02_january.registered == 2);
  CHECK_FALSE(b02_january.values[0].count.has_value());
  CHECK_FALSE(b02_january.values[0].rate.has_value());
  CHECK(by_practice.rows[5].data == DataState::kShortHistory);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
