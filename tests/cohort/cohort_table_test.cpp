#include "medload/cohort/cohort_table.h"

#include <doctest/doctest.h>

#include "cohort/population_fixture.h"

namespace medload {
namespace {

using testing::D;

// One group on one date: 40 registered (all aged 70-74), counts 3 (items), 12 (acb), 12 (any).
CohortTally OneCell() {
  CohortTally tally;
  tally.criteria = {"items>=10", "acb>=3"};
  tally.dates = {D(2024, 1, 31)};
  tally.group_by = GroupBy::kPractice;
  CohortCell cell;
  cell.registered = 40;
  cell.registered_by_band[14] = 40;
  cell.counts = {3, 12, 12};
  cell.counts_by_band.assign(3, {});
  cell.counts_by_band[0][14] = 3;
  cell.counts_by_band[1][14] = 12;
  cell.counts_by_band[2][14] = 12;
  tally.groups["A01"] = {cell};
  return tally;
}

TEST_SUITE("cohort/cohort_table") {

TEST_CASE("rates are per 1000 registered") {
  const CohortTable table = BuildCohortTable(OneCell(), 0, 84);
  REQUIRE(table.rows.size() == 1);
  const CohortRow& row = table.rows[0];
  CHECK(table.keys == std::vector<std::string>{"items>=10", "acb>=3", "any"});
  CHECK(row.registered == 40);
  CHECK(row.values[0].count == 3);
  CHECK(*row.values[0].rate == doctest::Approx(75.0));   // 3 / 40 * 1000
  CHECK(*row.values[1].rate == doctest::Approx(300.0));  // 12 / 40 * 1000
  // One age band only: the standardised rate is the crude rate.
  REQUIRE(row.values[1].standardised.has_value());
  CHECK(row.values[1].standardised->rate == doctest::Approx(300.0));
}

TEST_CASE("a count below the suppression threshold and its rates are null") {
  const CohortTable table = BuildCohortTable(OneCell(), 5, 84);
  const CohortRow& row = table.rows[0];
  CHECK_FALSE(row.values[0].count.has_value());  // 3 < 5
  CHECK_FALSE(row.values[0].rate.has_value());
  CHECK_FALSE(row.values[0].standardised.has_value());
  CHECK(row.values[1].count == 12);               // 12 >= 5 stays
  CHECK(row.registered == 40);                    // list sizes are not suppressed
}

TEST_CASE("a group with nobody registered on a date has null rates") {
  CohortTally tally = OneCell();
  tally.dates.push_back(D(2024, 2, 29));
  CohortCell empty;
  empty.counts = {0, 0, 0};
  empty.counts_by_band.assign(3, {});
  tally.groups["A01"].push_back(empty);
  const CohortTable table = BuildCohortTable(tally, 0, 84);
  REQUIRE(table.rows.size() == 2);
  CHECK(table.rows[1].values[2].count == 0);
  CHECK_FALSE(table.rows[1].values[2].rate.has_value());
  CHECK_FALSE(table.rows[1].values[2].standardised.has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
