// Reads a dosage instruction as prescribers write it ("1-2 tablets four times a day when
// required", "one at night", "5ml tds") into units per day and an as-needed flag, with
// how much of the text was understood. It does not know products or strengths.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace medload {

enum class Understanding {
  kEmpty,     // no text at all
  kFull,      // every word accounted for
  kPartial,   // a dose and a frequency were found, some words were not understood
  kUnknown,   // no usable units per day ("as directed", or nothing recognised)
};

std::string_view UnderstandingName(Understanding understanding);

struct DosageReading {
  std::optional<double> units_per_day;  // upper value of ranges; PRN: the stated maximum
  bool as_needed = false;               // "when required", "prn", "as needed", ...
  std::string unit;                     // "tablet", "ml", "puff", ... or empty if not said
  Understanding understanding = Understanding::kEmpty;
  std::string note;                     // what was not understood, for explanations
};

// Pure; never fails. Locale-independent.
DosageReading ReadDosageText(std::string_view text);

}  // namespace medload
