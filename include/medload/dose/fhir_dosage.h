// Reads a FHIR R4 Dosage element (as found in MedicationDispense.dosageInstruction) into
// the same DosageReading as the text parser: units per day, as-needed flag, unit. It
// reads one structured instruction; it does not resolve the medication or its strength.
#pragma once

#include <nlohmann/json.hpp>

#include "medload/dose/dosage_text.h"

namespace medload {

// One Dosage element. Units per day = dose x frequency per day, where the dose is
// doseAndRate[0].doseQuantity.value or doseAndRate[0].doseRange.high.value, and the
// frequency is timing.repeat frequencyMax (else frequency, else 1) per period (the
// shorter `period`, not periodMax) in periodUnit s|min|h|d|wk|mo|a, else the number of
// repeat.when / repeat.timeOfDay entries per day, else a timing.code (BID, TID, ...).
// As needed: asNeededBoolean true or an asNeededCodeableConcept; then maxDosePerPeriod
// (numerator / denominator, per day) is the units per day when given. When the
// structure lacks a dose or a frequency, `text` is read with ReadDosageText instead;
// when that gives no units per day either and the timing gives a frequency but there is
// no dose, the result is that many administrations a day in unit kAdministrationUnit
// (understanding kPartial). A dose unit this module does not know stays as written.
// Never throws: a value of the wrong JSON type is ignored and named in `note`; a reading
// with nothing usable has understanding kUnknown (kEmpty for an empty object).
DosageReading ReadFhirDosage(const nlohmann::json& dosage);

// A whole dosageInstruction array. Elements with the same `sequence` (absent counts as
// one group) are concurrent and their units per day add up; different sequences follow
// one another in sequence order as the stages of a changing dose, each lasting its
// timing.repeat.boundsDuration (a sequence without one continues and ends the stages),
// with the first stage's units per day, as ReadDosageText does for text. An empty or
// non-array value gives understanding kEmpty.
DosageReading ReadFhirDosageList(const nlohmann::json& dosage_instructions);

}  // namespace medload
