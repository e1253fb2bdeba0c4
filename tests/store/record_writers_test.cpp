#include "store/record_writers.h"

#include <doctest/doctest.h>

#include "medload/store/store.h"

namespace medload {
namespace {

// A store with one import run row for the writers to point at.
struct Fixture {
  Fixture() {
    Result<Store> opened = Store::Open(":memory:");
    REQUIRE(opened.ok());
    store.emplace(std::move(opened.value()));
    REQUIRE(ExecSql(store->handle(),
                    "INSERT INTO import_runs (id, kind, file, started) VALUES (1, 'test', 'f', 'now')")
                .ok());
  }
  std::optional<Store> store;
  WriteSource source{1, "f.csv"};
};

DispensingRecord Dispense(const char* id, const char* status) {
  DispensingRecord record;
  record.record_id = id;
  record.patient_id = "P1";
  record.dispensed_on = Date::FromCivil(2024, 1, 2);
  record.product = "Amlodipine 5mg tablets";
  record.quantity = 28;
  record.status = status;
  return record;
}

}  // namespace

TEST_SUITE("store/record_writers") {

TEST_CASE("a dispensing is new once, then a duplicate") {
  Fixture fixture;
  DispensingWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  CHECK(*writer.Write(Dispense("R1", ""), 2, false) == WriteOutcome::kImported);
  CHECK(*writer.Write(Dispense("R1", ""), 3, false) == WriteOutcome::kDuplicate);
  CHECK(*writer.Write(Dispense("R2", ""), 4, false) == WriteOutcome::kImported);
  CHECK(fixture.store->Summary()->dispensings == 2);
}

TEST_CASE("a record id stored with other content is a conflict and changes nothing") {
  Fixture fixture;
  DispensingWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  REQUIRE(*writer.Write(Dispense("R1", ""), 2, false) == WriteOutcome::kImported);
  struct Case {
    const char* change;
    void (*apply)(DispensingRecord&);
  };
  const Case cases[] = {
      {"patient", [](DispensingRecord& r) { r.patient_id = "P2"; }},
      {"date", [](DispensingRecord& r) { r.dispensed_on = Date::FromCivil(2024, 1, 3); }},
      {"product", [](DispensingRecord& r) { r.product = "Sertraline 50mg tablets"; }},
      {"quantity", [](DispensingRecord& r) { r.quantity = 56; }},
      {"days supply", [](DispensingRecord& r) { r.days_supply = 28; }},
  };
  for (const Case& c : cases) {
    CAPTURE(c.change);
    DispensingRecord record = Dispense("R1", "");
    c.apply(record);
    CHECK(*writer.Write(record, 5, true) == WriteOutcome::kConflict);
    CHECK(writer.conflict() == "\"f\" line 2");
  }
  DispensingRecord spelled = Dispense("R1", "");
  spelled.product = "  AMLODIPINE 5mg  Tablets ";
  CHECK(*writer.Write(spelled, 6, false) == WriteOutcome::kDuplicate);
  CHECK(fixture.store->DispensingsOf("P1")->size() == 1);
  CHECK(fixture.store->DispensingsOf("P2")->empty());
}

TEST_CASE("a re-sent dispense with a new status updates only when asked to") {
  Fixture fixture;
  DispensingWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  REQUIRE(*writer.Write(Dispense("M1", "completed"), 1, true) == WriteOutcome::kImported);
  CHECK(*writer.Write(Dispense("M1", "entered-in-error"), 2, false) == WriteOutcome::kDuplicate);
  CHECK(fixture.store->DispensingsOf("P1")->size() == 1);
  CHECK(*writer.Write(Dispense("M1", "entered-in-error"), 2, true) == WriteOutcome::kUpdated);
  CHECK(fixture.store->DispensingsOf("P1")->empty());
  CHECK(*writer.Write(Dispense("M1", "entered-in-error"), 2, true) == WriteOutcome::kDuplicate);
}

TEST_CASE("a registry row is new, then a duplicate, then updated when a field changes") {
  Fixture fixture;
  PatientWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  PatientRecord patient;
  patient.patient_id = "P1";
  patient.birth_date = Date::FromCivil(1940, 7, 1);
  patient.birth_year_only = true;
  patient.sex = "female";
  CHECK(*writer.Write(patient) == WriteOutcome::kImported);
  CHECK(*writer.Write(patient) == WriteOutcome::kDuplicate);
  patient.registered_to = Date::FromCivil(2024, 1, 31);
  CHECK(*writer.Write(patient) == WriteOutcome::kUpdated);
  CHECK((*fixture.store->PatientOf("P1"))->registered_to->ToIso() == "2024-01-31");
  patient.birth_year_only = false;
  CHECK(*writer.Write(patient) == WriteOutcome::kUpdated);
}

TEST_CASE("a practice's list size change is an update") {
  Fixture fixture;
  PracticeWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  PracticeRecord practice{"A1", "Ash Row", "North", std::nullopt};
  CHECK(*writer.Write(practice) == WriteOutcome::kImported);
  CHECK(*writer.Write(practice) == WriteOutcome::kDuplicate);
  practice.list_size = 9000;
  CHECK(*writer.Write(practice) == WriteOutcome::kUpdated);
  CHECK(fixture.store->Practices()->front().list_size == 9000);
}

TEST_CASE("a review is stored once per patient and date") {
  Fixture fixture;
  ReviewWriter writer;
  REQUIRE(writer.Prepare(fixture.store->handle(), fixture.source).ok());
  CHECK(*writer.Write({"P1", Date::FromCivil(2024, 1, 2)}) == WriteOutcome::kImported);
  CHECK(*writer.Write({"P1", Date::FromCivil(2024, 1, 2)}) == WriteOutcome::kDuplicate);
  CHECK(*writer.Write({"P1", Date::FromCivil(2024, 1, 3)}) == WriteOutcome::kImported);
}

}  // TEST_SUITE

}  // namespace medload
