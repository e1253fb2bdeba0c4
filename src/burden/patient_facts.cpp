#include "medload/burden/patient_facts.h"

#include <algorithm>

namespace medload {

std::optional<int> AgeOn(const std::optional<PatientRecord>& registry, Date on) {
  if (!registry || !registry->birth_date) return std::nullopt;
  return CompletedYears(*registry->birth_date, on);
}

std::optional<std::string> RegisteredPractice(const PatientHistory& history, Date on) {
  if (history.registry) {
    const PatientRecord& row = *history.registry;
    if (row.registered_from && on < *row.registered_from) return std::nullopt;
    if (row.registered_to && *row.registered_to < on) return std::nullopt;
    return row.practice;
  }
  // The first dispensing after `on`; the one before it is the latest on or before `on`.
  const auto after = std::upper_bound(
      history.dispensings.begin(), history.dispensings.end(), on,
      [](Date date, const DispensingRecord& record) { return date < record.dispensed_on; });
  if (after == history.dispensings.begin()) return std::nullopt;
  const DispensingRecord& latest = *(after - 1);
  if (on - latest.dispensed_on >= kUnregisteredActivityDays) return std::nullopt;
  return latest.practice;
}

}  // namespace medload
