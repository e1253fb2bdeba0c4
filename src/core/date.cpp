#include "medload/core/date.h"

#include <charconv>
#include <cstdio>

namespace medload {
namespace {

// Days from civil and back: the proleptic Gregorian algorithms of H. Hinnant,
// "chrono-Compatible Low-Level Date Algorithms" (public domain).
int32_t DaysFromCivil(int y, int m, int d) {
  y -= m <= 2 ? 1 : 0;
  const int era = (y >= 0 ? y : y - 399) / 400;
  const int yoe = y - era * 400;
  const int doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const int doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + doe - 719468;
}

CivilDate CivilFromDays(int32_t z) {
  z += 719468;
  const int era = (z >= 0 ? z : z - 146096) / 146097;
  const int doe = z - era * 146097;
  const int yoe = (doe - doe / 1460 + doe / 36524 - doe / 146096) / 365;
  const int doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
  const int mp = (5 * doy + 2) / 153;
  const int d = doy - (153 * mp + 2) / 5 + 1;
  const int m = mp + (mp < 10 ? 3 : -9);
  const int y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return {y, m, d};
}

bool IsLeap(int y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

int DaysInMonth(int y, int m) {
  static constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  return m == 2 && IsLeap(y) ? 29 : kDays[m - 1];
}

// Reads an unsigned number of 1..max_digits digits at `pos`; advances `pos`.
std::optional<int> ReadNumber(std::string_view text, size_t& pos, size_t min_digits,
                              size_t max_digits) {
  size_t end = pos;
  while (end < text.size() && end - pos < max_digits && text[end] >= '0' && text[end] <= '9') {
    ++end;
  }
  if (end - pos < min_digits) return std::nullopt;
  int value = 0;
  std::from_chars(text.data() + pos, text.data() + end, value);
  pos = end;
  return value;
}

bool IsSeparator(char c) { return c == '-' || c == '/' || c == '.'; }

std::optional<Date> Build(int y, int m, int d) {
  if (!IsValidCivil(y, m, d)) return std::nullopt;
  return Date::FromCivil(y, m, d);
}

std::optional<Date> ParseIso(std::string_view text) {
  size_t pos = 0;
  if (text.size() >= 8 && text.find('-') == std::string_view::npos) {  // YYYYMMDD
    auto ymd = ReadNumber(text, pos, 8, 8);
    if (!ymd || pos != text.size()) return std::nullopt;
    return Build(*ymd / 10000, *ymd / 100 % 100, *ymd % 100);
  }
  auto y = ReadNumber(text, pos, 4, 4);
  if (!y || pos >= text.size() || text[pos++] != '-') return std::nullopt;
  auto m = ReadNumber(text, pos, 1, 2);
  if (!m || pos >= text.size() || text[pos++] != '-') return std::nullopt;
  auto d = ReadNumber(text, pos, 1, 2);
  if (!d) return std::nullopt;
  // An ISO date-time: the date part counts, the time of day does not.
  if (pos != text.size() && text[pos] != 'T' && text[pos] != ' ') return std::nullopt;
  return Build(*y, *m, *d);
}

std::optional<Date> ParseDayMonth(std::string_view text, bool day_first) {
  size_t pos = 0;
  auto a = ReadNumber(text, pos, 1, 2);
  if (!a || pos >= text.size() || !IsSeparator(text[pos])) return std::nullopt;
  const char sep = text[pos++];
  auto b = ReadNumber(text, pos, 1, 2);
  if (!b || pos >= text.size() || text[pos++] != sep) return std::nullopt;
  auto y = ReadNumber(text, pos, 4, 4);
  if (!y || pos != text.size()) return std::nullopt;
  return day_first ? Build(*y, *b, *a) : Build(*y, *a, *b);
}

}  // namespace

Date Date::FromCivil(int year, int month, int day) { return Date(DaysFromCivil(year, month, day)); }
int Date::year() const { return CivilFromDays(days_).year; }
int Date::month() const { return CivilFromDays(days_).month; }
int Date::day() const { return CivilFromDays(days_).day; }

std::string Date::ToIso() const {
  const CivilDate c = CivilFromDays(days_);
  char buffer[16];
  std::snprintf(buffer, sizeof buffer, "%04d-%02d-%02d", c.year, c.month, c.day);
  return buffer;
}

bool IsValidCivil(int year, int month, int day) {
  return year >= 1800 && year <= 2200 && month >= 1 && month <= 12 && day >= 1 &&
         day <= DaysInMonth(year, month);
}

std::optional<Date> ParseDate(std::string_view text, DateOrder order) {
  switch (order) {
    case DateOrder::kIso: return ParseIso(text);
    case DateOrder::kDmy: return ParseDayMonth(text, true);
    case DateOrder::kMdy: return ParseDayMonth(text, false);
  }
  return std::nullopt;
}

Date EndOfMonth(Date date) {
  const CivilDate c = CivilFromDays(date.days());
  return Date::FromCivil(c.year, c.month, DaysInMonth(c.year, c.month));
}

Date EndOfQuarter(Date date) {
  const CivilDate c = CivilFromDays(date.days());
  const int last_month = (c.month - 1) / 3 * 3 + 3;
  return Date::FromCivil(c.year, last_month, DaysInMonth(c.year, last_month));
}

Date EndOfYear(Date date) { return Date::FromCivil(date.year(), 12, 31); }

int CompletedYears(Date birth, Date on) {
  const CivilDate b = CivilFromDays(birth.days());
  const CivilDate o = CivilFromDays(on.days());
  int years = o.year - b.year;
  if (o.month < b.month || (o.month == b.month && o.day < b.day)) --years;
  return years < 0 ? 0 : years;
}

CivilDate ToCivil(Date date) { return CivilFromDays(date.days()); }

}  // namespace medload
