// For tests: every stored patient through the store's cursor (Store::Patients), in the
// order and with the content that the patient pass reads them.
#pragma once

#include <doctest/doctest.h>

#include <vector>

#include "medload/store/store.h"

namespace medload::testing {

// Copies of every patient's history, in patient_id order.
inline std::vector<PatientHistory> ReadPatients(const Store& store) {
  std::vector<PatientHistory> patients;
  Result<PatientCursor> cursor = store.Patients();
  REQUIRE(cursor.ok());
  PatientHistory history;
  for (;;) {
    Result<bool> more = cursor->Next(history);
    REQUIRE(more.ok());
    if (!*more) break;
    patients.push_back(history);
  }
  return patients;
}

}  // namespace medload::testing
