// The import's registry check: dispensings of patients missing from the patients table
// are counted and the first few named, whatever order the patients come in.
#include "store/registry_check.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "medload/store/store.h"

namespace medload {

TEST_SUITE("store/registry_check") {

TEST_CASE("Interleaved patients are counted once each, registered or not, in any order") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  REQUIRE(ExecSql(store->handle(), "INSERT INTO patients (patient_id) VALUES ('P1'), ('P2'), ('P3')").ok());
  RegistryCheck check;
  REQUIRE(check.Prepare(store->handle(), false).ok());
  // File order: each patient's rows scattered, as in a large load written in file order.
  const std::vector<std::string> patients = {"P1", "X9", "P2", "P1", "X8", "X9", "P3", "P2", "X9", "P1", "X7"};
  for (size_t i = 0; i < patients.size(); ++i) REQUIRE(check.Note(patients[i], i + 2).ok());
  ImportSummary summary;
  summary.file = "d.csv";
  REQUIRE(check.Finish(summary).ok());
  CHECK(summary.not_in_registry == 5);           // X9 three times, X8, X7
  CHECK(summary.not_in_registry_patients == 3);  // X9, X8, X7
  CHECK(summary.not_in_registry_examples ==
        std::vector<std::string>{"d.csv:3: patient \"X9\"", "d.csv:6: patient \"X8\"", "d.csv:12: patient \"X7\""});
}

TEST_CASE("A patient registered later in the same FHIR file is looked up again at the end") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  RegistryCheck check;
  REQUIRE(check.Prepare(store->handle(), true).ok());
  REQUIRE(check.Note("P1", 2).ok());
  REQUIRE(check.Note("P2", 3).ok());
  REQUIRE(ExecSql(store->handle(), "INSERT INTO patients (patient_id) VALUES ('P1')").ok());
  REQUIRE(check.Note("P1", 4).ok());  // now registered: remembered as such
  REQUIRE(check.Note("P2", 5).ok());
  REQUIRE(check.Note("P1", 6).ok());
  ImportSummary summary;
  summary.file = "d.ndjson";
  REQUIRE(check.Finish(summary).ok());
  CHECK(summary.not_in_registry == 2);  // P2's two dispensings
  CHECK(summary.not_in_registry_patients == 1);
  CHECK(summary.not_in_registry_examples == std::vector<std::string>{"d.ndjson:3: patient \"P2\""});
}

}  // TEST_SUITE

}  // namespace medload
