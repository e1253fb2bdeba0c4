// Calendar dates without a time of day, as a count of days since 1970-01-01, with
// parsing in the three accepted orders and ISO output. Dates are proleptic Gregorian;
// no time zones are involved anywhere in the tool.
#pragma once

#include <compare>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace medload {

class Date {
 public:
  constexpr Date() = default;
  // The date `days` days after 1970-01-01 (negative before it).
  static constexpr Date FromDays(int32_t days) { return Date(days); }
  // REQUIRES: a real calendar date (see IsValidCivil).
  static Date FromCivil(int year, int month, int day);

  constexpr int32_t days() const { return days_; }
  int year() const;
  int month() const;
  int day() const;

  constexpr Date operator+(int32_t n) const { return Date(days_ + n); }
  constexpr Date operator-(int32_t n) const { return Date(days_ - n); }
  constexpr int32_t operator-(Date other) const { return days_ - other.days_; }
  constexpr auto operator<=>(const Date&) const = default;

  // YYYY-MM-DD.
  std::string ToIso() const;

 private:
  constexpr explicit Date(int32_t days) : days_(days) {}
  int32_t days_ = 0;
};

// The order of day, month and year in an input date (`--date-format`).
enum class DateOrder { kIso, kDmy, kMdy };

// True if year-month-day names a real day (1 <= month <= 12, day within that month,
// leap years by the Gregorian rule) and 1800 <= year <= 2200.
bool IsValidCivil(int year, int month, int day);

// A date's calendar fields.
struct CivilDate {
  int year;
  int month;
  int day;
};

// The calendar fields of `date` in one step (what year(), month() and day() give).
CivilDate ToCivil(Date date);

// Parses `text` in the given order. ISO accepts YYYY-MM-DD (and YYYYMMDD); dmy and mdy
// accept '/', '-' or '.' separators and a four-digit year. A trailing time of day in an
// ISO date-time (`2024-03-01T10:00:00Z`) is ignored. Returns nullopt for anything that is
// not a real calendar date.
std::optional<Date> ParseDate(std::string_view text, DateOrder order = DateOrder::kIso);

// The last day of the month, quarter or year that contains `date`.
Date EndOfMonth(Date date);
Date EndOfQuarter(Date date);
Date EndOfYear(Date date);

// Completed years between `birth` and `on` (0 if `on` is before the birthday).
int CompletedYears(Date birth, Date on);

}  // namespace medload
