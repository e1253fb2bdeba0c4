// Turns a patient's care plan into dated dispensing lines inside the window and the
// patient's registration: repeats with early and late refills, gaps, stops, dose
// changes, irregular as-needed refills, courses, and a structured medication review that
// may stop a medicine. It decides what each line records (days supply, dosage text);
// it does not format anything (record_writer.h does).
#pragma once

#include <optional>
#include <vector>

#include "medload/core/date.h"
#include "medload/synth/care_plan.h"
#include "medload/synth/population.h"
#include "medload/synth/random.h"

namespace medload {

struct SynthDispensing {
  Date dispensed_on;
  size_t product = 0;               // index into SynthCatalogue()
  double quantity = 0;              // > 0
  std::optional<int> days_supply;   // as the line records it; absent on many lines
  int dosage_text = -1;             // index into the product's dosage texts; -1: none written
  bool structured_dosage = false;   // FHIR only: also carry timing and doseAndRate
  // FHIR only: 0 none; 1 or 2 when the pharmacy first sent this line and then voided it,
  // so that an extra copy with status "entered-in-error" (1) or "cancelled" (2) precedes it.
  int voided_copy = 0;
};

struct SynthHistory {
  std::vector<SynthDispensing> dispensings;  // in date order
  std::optional<Date> reviewed_on;           // a completed structured medication review
};

// Fills `history` (cleared first) for one patient. Every line falls inside the window
// and inside [registered_from, registered_to] where those are set.
void BuildHistory(const CarePlan& plan, const SynthPatient& patient, const SynthWindow& window,
                  SynthRandom& random, SynthHistory& history);

}  // namespace medload
