#include "medload/core/date.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("core/date") {

TEST_CASE("dates convert between days and the civil calendar") {
  // Source: the Unix epoch is 1970-01-01 (POSIX.1-2017, Base Definitions 4.16).
  CHECK(Date::FromCivil(1970, 1, 1).days() == 0);
  CHECK(Date::FromCivil(2000, 3, 1).days() == 11017);
  CHECK(Date::FromDays(19782).ToIso() == "2024-02-29");
  for (int days = -50000; days < 80000; days += 97) {
    const Date d = Date::FromDays(days);
    CAPTURE(days);
    CHECK(Date::FromCivil(d.year(), d.month(), d.day()) == d);
  }
}

TEST_CASE("only real calendar dates parse") {
  struct Case {
    const char* text;
    DateOrder order;
    const char* iso;  // nullptr: rejected
  };
  const Case cases[] = {
      {"2024-02-29", DateOrder::kIso, "2024-02-29"},
      {"2023-02-29", DateOrder::kIso, nullptr},   // not a leap year (Gregorian rule)
      {"1900-02-29", DateOrder::kIso, nullptr},   // century, not divisible by 400
      {"2000-02-29", DateOrder::kIso, "2000-02-29"},
      {"2024-04-31", DateOrder::kIso, nullptr},
      {"2024-13-01", DateOrder::kIso, nullptr},
      {"2024-1-5", DateOrder::kIso, "2024-01-05"},
      {"20240105", DateOrder::kIso, "2024-01-05"},
      {"2024-03-01T10:15:00Z", DateOrder::kIso, "2024-03-01"},
      {"2024-03-01x", DateOrder::kIso, nullptr},
      {"", DateOrder::kIso, nullptr},
      {"abc", DateOrder::kIso, nullptr},
      {"05/01/2024", DateOrder::kDmy, "2024-01-05"},
      {"05/01/2024", DateOrder::kMdy, "2024-05-01"},
      {"31.12.2023", DateOrder::kDmy, "2023-12-31"},
      {"31/12/2023", DateOrder::kMdy, nullptr},
      {"1/2-2023", DateOrder::kDmy, nullptr},
      {"01/02/23", DateOrder::kDmy, nullptr},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const auto parsed = ParseDate(c.text, c.order);
    if (c.iso == nullptr) {
      CHECK_FALSE(parsed.has_value());
    } else {
      REQUIRE(parsed.has_value());
      CHECK(parsed->ToIso() == c.iso);
    }
  }
}

TEST_CASE("period ends fall on the last day of the month, quarter and year") {
  const Date d = Date::FromCivil(2024, 2, 10);
  CHECK(EndOfMonth(d).ToIso() == "2024-02-29");
  CHECK(EndOfQuarter(d).ToIso() == "2024-03-31");
  CHECK(EndOfQuarter(Date::FromCivil(2024, 11, 1)).ToIso() == "2024-12-31");
  CHECK(EndOfYear(d).ToIso() == "2024-12-31");
}

TEST_CASE("age is completed years, counting the birthday itself") {
  const Date birth = Date::FromCivil(1950, 7, 1);
  CHECK(CompletedYears(birth, Date::FromCivil(2020, 6, 30)) == 69);
  CHECK(CompletedYears(birth, Date::FromCivil(2020, 7, 1)) == 70);
  // A 29 February birthday: completed on 1 March in common years (common practice).
  const Date leap = Date::FromCivil(2000, 2, 29);
  CHECK(CompletedYears(leap, Date::FromCivil(2001, 2, 28)) == 0);
  CHECK(CompletedYears(leap, Date::FromCivil(2001, 3, 1)) == 1);
}

}  // TEST_SUITE

}  // namespace medload
