// The values of number words ("one" .. "ninety", "half", "quarter") and of units of time
// ("hours", "week", "fortnight") in dosage instructions. Private to src/dose. It does not
// read digits (the lexer does) nor dose units (dose_unit.h).
#pragma once

#include <optional>
#include <string_view>

namespace medload {

// The value of a lower-case number word; nullopt for any other word. Pure.
std::optional<double> NumberWordValue(std::string_view word);

// Days in one lower-case unit of time ("hour" 1/24, "week" 7, "month" 30, "year" 365);
// nullopt for any other word. Pure.
std::optional<double> TimeUnitDays(std::string_view word);

}  // namespace medload
