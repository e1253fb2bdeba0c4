#include "medload/core/census_note.h"

namespace medload {

std::optional<std::string> CensusBeyondDataNote(Date on, std::optional<Date> latest_dispensed) {
  if (!latest_dispensed || on <= *latest_dispensed) return std::nullopt;
  const int32_t days = on - *latest_dispensed;
  return "the census date " + on.ToIso() + " is " + std::to_string(days) + (days == 1 ? " day" : " days") +
         " after the latest dispensing loaded (" + latest_dispensed->ToIso() +
         "): medicines dispensed since then are missing, so counts may be too low";
}

}  // namespace medload
