// The invented care network of the synthetic data: its practices, the age and sex mix of
// its registered lists, and one invented patient at a time (opaque id, birth date, sex,
// practice, registration). All names are invented; nothing here describes real people or
// places. It does not decide anyone's medicines (care_plan.h does).
#pragma once

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "medload/core/date.h"
#include "medload/synth/random.h"

namespace medload {

struct SynthPractice {
  std::string code;  // "WV001", "WV002", ...: an invented code scheme
  std::string name;  // an invented name
  int weight = 100;  // relative list size
};

struct SynthNetwork {
  std::string name;
  std::vector<SynthPractice> practices;
};

// The network for a data set of `patients` patients: one practice per about 7,500
// patients and never fewer than 3, with uneven list sizes fixed by `seed`.
// REQUIRES: patients >= 1.
SynthNetwork MakeNetwork(uint64_t patients, uint64_t seed);

// The period the data covers: whole months, from the first day of the first month to
// the last day of the month that contains `end`.
struct SynthWindow {
  Date start;
  Date end;
  int days() const { return end - start + 1; }
};
// REQUIRES: months >= 1.
SynthWindow MakeWindow(Date end, int months);

// One band of the age mix: the share of the registered list in it (per 1,000) and the
// share of women in the band (per 1,000).
struct AgeBand {
  int min_age;
  int max_age;
  int per_1000;
  int female_per_1000;
};

// The age and sex mix used, youngest band first; shares sum to 1,000. About 18.5% are
// aged 65 or over. See docs/synthetic-data.md for where the figures come from.
std::span<const AgeBand> SynthAgeBands();

struct SynthPatient {
  uint64_t index = 0;          // 0-based position in the data set
  std::string patient_id;      // "Q" and 7 digits (9 above 5 million patients), not sequential
  Date birth_date;
  bool birth_year_only = false;  // the registry gives only the year
  std::string sex;             // "female", "male" or (rarely) "unknown"
  size_t practice = 0;         // index into SynthNetwork::practices
  int age_at_end = 0;          // completed years on the window's last day
  std::optional<Date> registered_from;  // absent for a few legacy rows
  std::optional<Date> registered_to;    // set when the patient left or died
  // False for a temporary resident: dispensed to for a short stay, but on no list.
  bool in_registry = true;
};

// The opaque id of patient `index` of `patients`: a keyed permutation, so ids are unique
// within a data set and look unrelated to each other. REQUIRES: index < patients.
std::string SynthPatientId(uint64_t index, uint64_t patients, uint64_t seed);

// Draws patient `index` from `random` (the patient's own stream).
SynthPatient MakePatient(uint64_t index, uint64_t patients, uint64_t seed,
                         const SynthNetwork& network, const SynthWindow& window,
                         SynthRandom& random);

}  // namespace medload
