#include "medload/cohort/series.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

TEST_SUITE("cohort/series") {

TEST_CASE("a monthly series gives every month end from the month of --from to that of --to") {
  auto dates = SeriesDates(D(2024, 1, 15), D(2024, 3, 1), SeriesStep::kMonth);
  REQUIRE(dates.ok());
  // 2024 is a leap year: February ends on the 29th (Gregorian rule, common practice).
  CHECK(*dates == std::vector<Date>{D(2024, 1, 31), D(2024, 2, 29), D(2024, 3, 31)});
}

TEST_CASE("February ends on the 28th in a common year") {
  auto dates = SeriesDates(D(2023, 2, 1), D(2023, 2, 1), SeriesStep::kMonth);
  REQUIRE(dates.ok());
  CHECK(*dates == std::vector<Date>{D(2023, 2, 28)});
}

TEST_CASE("a quarterly series gives quarter ends across a year boundary") {
  auto dates = SeriesDates(D(2023, 11, 10), D(2024, 5, 2), SeriesStep::kQuarter);
  REQUIRE(dates.ok());
  CHECK(*dates == std::vector<Date>{D(2023, 12, 31), D(2024, 3, 31), D(2024, 6, 30)});
}

TEST_CASE("a yearly series gives 31 December of each year") {
  auto dates = SeriesDates(D(2021, 6, 1), D(2023, 1, 1), SeriesStep::kYear);
  REQUIRE(dates.ok());
  CHECK(*dates == std::vector<Date>{D(2021, 12, 31), D(2022, 12, 31), D(2023, 12, 31)});
}

TEST_CASE("a series whose end is before its start is a usage error") {
  auto dates = SeriesDates(D(2024, 3, 1), D(2024, 1, 1), SeriesStep::kMonth);
  REQUIRE_FALSE(dates.ok());
  CHECK(dates.status().code() == StatusCode::kUsage);
  CHECK(dates.status().message() == "the series ends on 2024-01-01, before its start 2024-03-01");
}

TEST_CASE("a series longer than the limit is refused") {
  auto dates = SeriesDates(D(2000, 1, 1), D(2024, 1, 1), SeriesStep::kMonth, 12);
  CHECK_FALSE(dates.ok());
}

TEST_CASE("series steps parse from their names and back") {
  for (const char* name : {"month", "quarter", "year"}) {
    CAPTURE(name);
    auto step = ParseSeriesStep(name);
    REQUIRE(step.has_value());
    CHECK(SeriesStepName(*step) == name);
  }
  CHECK_FALSE(ParseSeriesStep("week").has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
