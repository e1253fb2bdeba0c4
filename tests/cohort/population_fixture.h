// Small invented populations for the cohort tests: patient histories made by hand or by
// a fixed pseudo-random recipe, with a stand-in for the burden (items per patient).
#pragma once

#include <map>
#include <string>
#include <vector>

#include "medload/cohort/cohort.h"

namespace medload::testing {

inline Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

struct FakePatient {
  PatientHistory history;
  int items = 0;   // the burden stand-in: items on every date
  int acb = 0;
};

inline FakePatient Registered(std::string id, std::string practice, std::optional<Date> birth,
                              std::optional<Date> from, std::optional<Date> to, int items,
                              std::string sex = "female") {
  FakePatient patient;
  patient.history.patient_id = id;
  PatientRecord row;
  row.patient_id = std::move(id);
  row.practice = std::move(practice);
  row.birth_date = birth;
  row.sex = std::move(sex);
  row.registered_from = from;
  row.registered_to = to;
  patient.history.registry = row;
  patient.items = items;
  return patient;
}

inline FakePatient Unregistered(std::string id, std::string practice, Date dispensed, int items) {
  FakePatient patient;
  patient.history.patient_id = id;
  DispensingRecord record;
  record.patient_id = std::move(id);
  record.practice = std::move(practice);
  record.dispensed_on = dispensed;
  patient.history.dispensings.push_back(record);
  patient.items = items;
  return patient;
}

// A fixed population of `size` patients over three practices in two networks, with ages,
// sexes, registration spans and burdens spread by a linear congruential recipe.
inline std::vector<FakePatient> MixedPopulation(int size) {
  std::vector<FakePatient> patients;
  uint32_t state = 12345;
  auto next = [&state](uint32_t below) {
    state = state * 1103515245U + 12345U;
    return (state >> 8) % below;
  };
  const char* practices[] = {"A01", "B02", "C03"};
  const char* sexes[] = {"female", "male", "other", ""};
  for (int i = 0; i < size; ++i) {
    const std::string id = "P" + std::to_string(1000 + i);
    const std::string practice = practices[next(3)];
    const int items = static_cast<int>(next(16));
    if (next(10) == 0) {
      patients.push_back(Unregistered(id, practice, D(2023, 6, 1) + static_cast<int32_t>(next(300)), items));
    } else {
      std::optional<Date> birth;
      if (next(20) != 0) birth = D(1920 + static_cast<int>(next(100)), 1 + static_cast<int>(next(12)), 1);
      std::optional<Date> from;
      std::optional<Date> to;
      if (next(4) == 0) from = D(2024, 1, 1) + static_cast<int32_t>(next(120));
      if (next(5) == 0) to = D(2024, 1, 1) + static_cast<int32_t>(next(120));
      patients.push_back(Registered(id, practice, birth, from, to, items, sexes[next(4)]));
    }
    patients.back().acb = static_cast<int>(next(6));
  }
  return patients;
}

// Counts `patients` with `options`, the burden stand-in giving each patient's items.
inline CohortTally CountFake(const std::vector<FakePatient>& patients, const CohortOptions& options,
                             int* evaluations = nullptr) {
  const std::map<std::string, std::string> networks = {
      {"A01", "North"}, {"B02", "North"}, {"C03", "South"}};
  CohortCounter counter(options, networks, "test measure");
  for (const FakePatient& patient : patients) {
    counter.Add(patient.history, [&](Date on, std::optional<int>) {
      if (evaluations != nullptr) ++*evaluations;
      Burden burden;
      burden.on = on;
      burden.items = patient.items;
      burden.acb = patient.acb;
      return burden;
    });
  }
  return counter.Take();
}

inline bool SameCells(const CohortTally& a, const CohortTally& b) {
  if (a.groups.size() != b.groups.size()) return false;
  for (const auto& [group, cells] : a.groups) {
    const auto other = b.groups.find(group);
    if (other == b.groups.end() || other->second.size() != cells.size()) return false;
    for (size_t d = 0; d < cells.size(); ++d) {
      const CohortCell& x = cells[d];
      const CohortCell& y = other->second[d];
      if (x.registered != y.registered || x.counts != y.counts ||
          x.registered_by_band != y.registered_by_band || x.counts_by_band != y.counts_by_band) {
        return false;
      }
    }
  }
  return true;
}

}  // namespace medload::testing
