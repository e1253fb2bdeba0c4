// Facts about a patient on a census date that do not depend on medicines: their age
// (docs/measures.md) and the practice whose registered list they are on (the cohort
// denominator rule of docs/cohort.md), from one patient's registry row and history. Pure.
#pragma once

#include <optional>
#include <string>

#include "medload/core/date.h"
#include "medload/store/store.h"

namespace medload {

// Age in completed years on `on` from a registry row, if its birth date is known (a birth
// year alone is read as 1 July of that year by the patient reader).
std::optional<int> AgeOn(const std::optional<PatientRecord>& registry, Date on);

// Days that a dispensing keeps a patient without a registry row on a practice's list: a
// dispensing in the 365 days ending on the census date D counts (D-364 to D inclusive,
// counted like the lookback window); one 365 days before D does not.
inline constexpr int kUnregisteredActivityDays = 365;

// The practice at which the patient counts as registered on `on`, or nullopt when they are
// not registered that day.
// - With a registry row: its practice, when registered_from <= on <= registered_to (an
//   absent bound is open).
// - Without one: the practice of their latest counting dispensing on or before `on`, when
//   that dispensing is in the kUnregisteredActivityDays days ending on `on`. That practice may
//   be the empty string when the record did not name one.
// REQUIRES: history.dispensings in date order (as Store::Patients gives them).
std::optional<std::string> RegisteredPractice(const PatientHistory& history, Date on);

}  // namespace medload
