#include "medload/core/data_coverage.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

TEST_SUITE("core/data_coverage") {

TEST_CASE("a date is without figures before the data, short-history in its first days, beyond after") {
  // Data from 2025-01-01 to 2025-12-31; history 84 days: 2025-01-01 .. 2025-03-25 is the
  // short-history window (84 days), 2025-03-26 is the first full day.
  const DataSpan span{D(2025, 1, 1), D(2025, 12, 31)};
  struct Case {
    Date on;
    DataState state;
  };
  const Case cases[] = {
      {D(2024, 12, 31), DataState::kNoData},       {D(2025, 1, 1), DataState::kShortHistory},
      {D(2025, 3, 25), DataState::kShortHistory},  {D(2025, 3, 26), DataState::kFull},
      {D(2025, 12, 31), DataState::kFull},          {D(2026, 1, 1), DataState::kBeyondData},
  };
  for (const Case& c : cases) {
    CAPTURE(c.on.ToIso());
    CHECK(DataStateOn(span, c.on, 84) == c.state);
  }
  CHECK(DataStateOn(std::nullopt, D(2025, 6, 1), 84) == DataState::kNoData);
  // A young extract that has also stopped: short history wins (no change against it).
  CHECK(DataStateOn(DataSpan{D(2025, 1, 1), D(2025, 1, 20)}, D(2025, 1, 31), 84) == DataState::kShortHistory);
  CHECK(DataStateOn(DataSpan{D(2025, 1, 1), D(2025, 6, 20)}, D(2025, 6, 30), 84) == DataState::kBeyondData);
}

TEST_CASE("the short-history window defaults to 84 days or the grace when longer") {
  // 84 days: the usual look-back of prescribing studies (Guthrie et al. 2015, BMC Med
  // 13:74: an 84-day look-back for polypharmacy).
  CHECK(DefaultHistoryDays(30) == 84);
  CHECK(DefaultHistoryDays(90) == 90);
}

TEST_CASE("figures are shown except without data; changes only against full or beyond-data dates") {
  CHECK_FALSE(HasFigures(DataState::kNoData));
  CHECK(HasFigures(DataState::kShortHistory));
  CHECK_FALSE(Comparable(DataState::kShortHistory));
  CHECK_FALSE(Comparable(DataState::kNoData));
  CHECK(Comparable(DataState::kFull));
  CHECK(Comparable(DataState::kBeyondData));
}

TEST_CASE("spans widen with each dispensing and merge by practice") {
  PracticeSpans spans;
  AddToSpans(spans, "P1", D(2025, 3, 1));
  AddToSpans(spans, "P1", D(2025, 1, 5));
  AddToSpans(spans, "P2", D(2025, 2, 1));
  PracticeSpans other;
  AddToSpans(other, "P1", D(2025, 4, 1));
  AddToSpans(other, "P3", D(2025, 1, 1));
  MergeSpans(spans, other);
  REQUIRE(spans.size() == 3);
  CHECK(spans.at("P1") == DataSpan{D(2025, 1, 5), D(2025, 4, 1)});
  CHECK(spans.at("P2") == DataSpan{D(2025, 2, 1), D(2025, 2, 1)});
  CHECK(spans.at("P3") == DataSpan{D(2025, 1, 1), D(2025, 1, 1)});
}

TEST_CASE("each state but full has a plain note naming the practice and the dates") {
  const DataSpan span{D(2025, 1, 1), D(2025, 10, 28)};
  CHECK(DataStateNote("P1", DataState::kFull, span, D(2025, 6, 30), 84) == std::nullopt);
  CHECK(DataStateNote("P1", DataState::kNoData, span, D(2024, 12, 31), 84) ==
        "2024-12-31 is before practice P1's data begin (2025-01-01), so there are no figures for it");
  CHECK(DataStateNote("P1", DataState::kNoData, std::nullopt, D(2024, 12, 31), 84) ==
        "2024-12-31: practice P1's data hold no dispensing, so there are no figures");
  CHECK(DataStateNote("P1", DataState::kShortHistory, span, D(2025, 1, 31), 84) ==
        "2025-01-31 is within the first 84 days of practice P1's data (from 2025-01-01): supplies dispensed "
        "before then are missing, so figures may be too low");
  CHECK(DataStateNote("", DataState::kBeyondData, span, D(2025, 10, 31), 84) ==
        "2025-10-31 is 3 days after the latest dispensing in the dispensing data (2025-10-28): supplies and tails "
        "running on that date count, but refills collected since are not loaded");
  CHECK(DataStateNote("P1", DataState::kBeyondData, span, D(2025, 10, 29), 84)->find(" is 1 day after ") !=
        std::string::npos);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
