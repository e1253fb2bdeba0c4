// Assembles the recognised items of a dosage instruction into groups of doses taken
// together, one group per stage ("then" starts the next), and works out each group's
// units per day. Private to src/dose. It does not decide how the groups make stages or
// a reading (dosage_text.cpp does).
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "dose/dosage_items.h"

namespace medload {

struct GroupReading {
  std::optional<double> units_per_day;  // nullopt: no usable dose and frequency
  std::string_view unit;                // canonical (static storage); empty when not said
  std::optional<double> days;           // "for 7 days"; the first one written
  bool one_off = false;                 // a dose on one day only ("2 stat", "on day 1")
  bool stop = false;                    // "then stop": nothing is taken from here on
  bool has_dose = false;                // an amount, a timing or a maximum was written
  bool range_upper = false;             // units_per_day counts the upper value of a range
};

struct AssembledDosage {
  std::vector<GroupReading> groups;  // in the order written; at least one
  bool as_needed = false;
  bool as_directed = false;
  bool variable = false;   // the dose changes by a rule not written out ("reduce by")
  bool doubtful = false;   // something was assumed or left out: at best partial
  bool left_out = false;   // a dose without a frequency was not counted
  std::vector<std::string> unknown;  // words not understood, as written
  std::vector<std::string> notes;    // distinct, in order
};

// Pure.
AssembledDosage AssembleDosageItems(const std::vector<Item>& items);

}  // namespace medload
