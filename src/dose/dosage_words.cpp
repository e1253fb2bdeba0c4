#include "dose/dosage_words.h"

#include <array>

namespace medload {
namespace {

struct NumberWord {
  std::string_view word;
  double value;
};

constexpr std::array kNumberWords = {
    NumberWord{"one", 1},       NumberWord{"two", 2},        NumberWord{"three", 3},
    NumberWord{"four", 4},      NumberWord{"five", 5},       NumberWord{"six", 6},
    NumberWord{"seven", 7},     NumberWord{"eight", 8},      NumberWord{"nine", 9},
    NumberWord{"ten", 10},      NumberWord{"eleven", 11},    NumberWord{"twelve", 12},
    NumberWord{"thirteen", 13}, NumberWord{"fourteen", 14},  NumberWord{"fifteen", 15},
    NumberWord{"sixteen", 16},  NumberWord{"seventeen", 17}, NumberWord{"eighteen", 18},
    NumberWord{"nineteen", 19}, NumberWord{"twenty", 20},    NumberWord{"thirty", 30},
    NumberWord{"forty", 40},    NumberWord{"fifty", 50},     NumberWord{"sixty", 60},
    NumberWord{"seventy", 70},  NumberWord{"eighty", 80},    NumberWord{"ninety", 90},
    NumberWord{"half", 0.5},    NumberWord{"quarter", 0.25},
};

}  // namespace

std::optional<double> NumberWordValue(std::string_view word) {
  for (const NumberWord& entry : kNumberWords) {
    if (entry.word == word) return entry.value;
  }
  return std::nullopt;
}

// Units of time after "every", "in", "q" and before "hourly"; in days.
std::optional<double> TimeUnitDays(std::string_view word) {
  if (word == "hour" || word == "hours" || word == "hr" || word == "hrs" || word == "h") {
    return 1.0 / 24;
  }
  if (word == "minute" || word == "minutes" || word == "min" || word == "mins") {
    return 1.0 / 1440;
  }
  if (word == "day" || word == "days") return 1.0;
  if (word == "week" || word == "weeks" || word == "wk" || word == "wks") return 7.0;
  if (word == "fortnight" || word == "fortnights") return 14.0;
  if (word == "month" || word == "months") return 30.0;
  if (word == "year" || word == "years") return 365.0;
  return std::nullopt;
}

}  // namespace medload
