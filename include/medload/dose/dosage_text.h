// Reads a dosage instruction as prescribers write it ("1-2 tablets four times a day when
// required", "one at night", "5ml tds", "2 stat then 1 daily") into units per day, the
// stages of a changing dose and an as-needed flag, with how much of the text was
// understood. It does not know products or strengths.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

enum class Understanding {
  kEmpty,     // no text at all
  kFull,      // every word accounted for
  kPartial,   // a dose and a frequency were found, some words were not understood
  kUnknown,   // no usable units per day ("as directed", or nothing recognised)
};

std::string_view UnderstandingName(Understanding understanding);

// One stage of a changing dose: a loading dose, a step of a taper or of a step-up.
struct DoseStage {
  double units_per_day = 0;  // >= 0; 0 after "then stop"
  std::optional<int> days;   // how long the stage lasts (>= 1); empty: open-ended
};

struct DosageReading {
  // Upper value of ranges; as needed: the stated maximum. For a staged instruction, the
  // first stage's units per day (the dose on the day of dispensing), never the highest.
  std::optional<double> units_per_day;
  bool as_needed = false;               // "when required", "prn", "as needed", "up to", ...
  // Some dose or frequency counted in units_per_day (or a stage) is the upper value of a
  // range ("1-2 tablets", "one or two", "once or twice daily"): more than may be taken.
  bool range_upper = false;
  std::string unit;                     // "tablet", "ml", "puff", ... or empty if not said
  Understanding understanding = Understanding::kEmpty;
  std::string note;                     // what was not understood, for explanations
  // Two or more stages in the order they are taken when the text changes the dose on
  // stated days ("3 a day for 7 days then 2 a day for 7 days then 1 a day"); the last
  // stage is open-ended (it continues while quantity remains). Empty otherwise. Present
  // only when units_per_day is, and stages.front().units_per_day == *units_per_day.
  std::vector<DoseStage> stages;
};

// Pure; never fails. Locale-independent.
DosageReading ReadDosageText(std::string_view text);

// The units per day in force on day `day` of a supply (0 = the day of dispensing): the
// stage that covers that day, the last stage after them all, units_per_day when the
// reading has no stages. nullopt when the reading has no units per day or day < 0.
std::optional<double> UnitsPerDayOnDay(const DosageReading& reading, int day);

// The same for stages alone (an empty list gives nullopt). Pure.
std::optional<double> UnitsPerDayOnDay(const std::vector<DoseStage>& stages, int day);

}  // namespace medload
