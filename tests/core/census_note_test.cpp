#include "medload/core/census_note.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

TEST_SUITE("core/census_note") {

TEST_CASE("a census date after the latest dispensing gives a warning with the gap in days") {
  const auto note = CensusBeyondDataNote(D(2026, 12, 31), D(2026, 10, 31));
  REQUIRE(note.has_value());
  CHECK(*note == "the census date 2026-12-31 is 61 days after the latest dispensing loaded (2026-10-31): "
                 "medicines dispensed since then are missing, so counts may be too low");
  const auto one_day = CensusBeyondDataNote(D(2026, 11, 1), D(2026, 10, 31));
  REQUIRE(one_day.has_value());
  CHECK(one_day->find(" is 1 day after ") != std::string::npos);
}

TEST_CASE("a census date on or before the latest dispensing, or an empty store, gives no warning") {
  CHECK_FALSE(CensusBeyondDataNote(D(2026, 10, 31), D(2026, 10, 31)).has_value());
  CHECK_FALSE(CensusBeyondDataNote(D(2026, 1, 31), D(2026, 10, 31)).has_value());
  CHECK_FALSE(CensusBeyondDataNote(D(2026, 12, 31), std::nullopt).has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
