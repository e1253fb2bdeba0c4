#include "medload/burden/patient_pass.h"

#include <doctest/doctest.h>

#include <cstdio>
#include <memory>
#include <stdexcept>
#include <sstream>
#include <thread>

#include "medload/store/importer.h"
#include "store/read_patients.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

void Import(Store& store, InputKind kind, const std::string& csv) {
  std::istringstream in(csv);
  auto summary = ImportStream(store, kind, in, "test.csv", ImportOptions{});
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

std::string PatientId(int p) {
  char id[8];
  std::snprintf(id, sizeof id, "P%04d", p);
  return id;
}

// 700 invented patients (more than several ranges and hand-over batches), each with one
// to four medicines; patient P0007 has an unmatched product. In memory (read by one
// reader), or in a file with a registry row for every other patient and 100 registered
// patients without dispensings (read by two readers on two connections).
struct ManyPatients {
  static constexpr int kPatients = 700;
  std::unique_ptr<TempFolder> folder;
  Store store;
  RunContext analysis;

  explicit ManyPatients(bool in_file = false)
      : folder(in_file ? std::make_unique<TempFolder>() : nullptr),
        store(std::move(Store::Open(in_file ? folder->File("pass.db") : ":memory:").value())),
        analysis(std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, in_file ? &store : nullptr).value())) {
    const char* products[] = {"Amitriptyline 10mg tablets", "Oxybutynin 5mg tablets", "Codeine 30mg tablets",
                              "Ramipril 5mg capsules"};
    std::string rows = "patient_id,dispensed_on,product,quantity,dosage\n";
    for (int p = 0; p < kPatients; ++p) {
      const std::string id = PatientId(p);
      for (int m = 0; m <= p % 4; ++m) {
        rows += id + ",2024-0" + std::to_string(1 + p % 9) + "-0" + std::to_string(m + 1) + "," + products[m] + ",56,1 bd\n";
      }
      if (p == 7) rows += "P0007,2024-01-02,Unheard-of tonic 5ml,100,5ml tds\n";
    }
    Import(store, InputKind::kDispensing, rows);
    if (!in_file) return;
    std::string registry = "patient_id,birth_date,sex,practice\n";
    for (int p = 0; p < kPatients + 100; p += 2) registry += PatientId(p) + ",1940-01-01,F,A1\n";
    for (int p = kPatients; p < kPatients + 100; ++p) registry += PatientId(p) + ",1950-01-01,M,A1\n";
    Import(store, InputKind::kPatients, registry);
  }
};

// What a pass showed the visitor, patient by patient.
struct Visited {
  std::vector<std::string> ids;
  std::vector<size_t> dispensings;
  std::vector<size_t> medicines;
  std::vector<size_t> unmatched;
  // The burden on 30 September 2024 (age 84 for everyone): items, ACB, DBI, rules fired.
  std::vector<std::string> burdens;
};

constexpr Date kOn = Date::FromDays(19996);  // 2024-09-30

std::string Describe(const Burden& burden) {
  return std::to_string(burden.items) + "/" + std::to_string(burden.acb) + "/" +
         std::to_string(burden.dbi) + "/" + std::to_string(burden.rules.size());
}

Visited Pass(ManyPatients& population, PassFacts* facts = nullptr) {
  Visited seen;
  Status status = ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient& patient) {
    seen.ids.push_back(patient.history().patient_id);
    seen.dispensings.push_back(patient.history().dispensings.size());
    seen.medicines.push_back(patient.timeline().medicines.size());
    seen.unmatched.push_back(patient.timeline().unmatched.size());
    seen.burdens.push_back(Describe(patient.Evaluate(kOn, 84)));
    return true;
  }, facts);
  REQUIRE(status.ok());
  return seen;
}

// The same, one patient at a time on this thread, as the store's own pass gives them.
Visited Sequential(ManyPatients& population) {
  Visited seen;
  for (const PatientHistory& history : testing::ReadPatients(population.store)) {
    const Timeline timeline = population.analysis.BuildTimeline(history.dispensings);
    seen.ids.push_back(history.patient_id);
    seen.dispensings.push_back(history.dispensings.size());
    seen.medicines.push_back(timeline.medicines.size());
    seen.unmatched.push_back(timeline.unmatched.size());
    seen.burdens.push_back(Describe(population.analysis.Evaluate(timeline, kOn, 84)));
  }
  return seen;
}

}  // namespace

TEST_SUITE("burden/patient_pass") {

TEST_CASE("the pass visits every patient once, in store order, with the same timelines as one thread") {
  for (const bool in_file : {false, true}) {
    CAPTURE(in_file);
    ManyPatients population(in_file);
    PassFacts facts;
    const Visited seen = Pass(population, &facts);
    const Visited expected = Sequential(population);
    REQUIRE(seen.ids.size() == static_cast<size_t>(ManyPatients::kPatients + (in_file ? 100 : 0)));
    CHECK(seen.ids == expected.ids);
    CHECK(seen.dispensings == expected.dispensings);
    CHECK(seen.medicines == expected.medicines);
    CHECK(seen.unmatched == expected.unmatched);
    CHECK(seen.burdens == expected.burdens);
    CHECK(seen.medicines[0] == 1);
    CHECK(seen.medicines[3] == 4);
    CHECK(seen.unmatched[7] == 1);
    // Dispensing dates run up to September (patient numbers 8, 17, ... ; fourth medicine).
    CHECK(facts.practice_spans == population.store.PracticeDataSpans().value());
    CHECK(facts.latest_dispensed == Date::FromCivil(2024, 9, 4));
  }
}

TEST_CASE("the first pass packs each history; later passes read the copy and show the same") {
  for (const bool in_file : {false, true}) {
    CAPTURE(in_file);
    ManyPatients population(in_file);
    CHECK_FALSE(population.store.PackedHistoriesCurrent().value());
    const Visited first = Pass(population);
    CHECK(population.store.PackedHistoriesCurrent().value());
    const Visited second = Pass(population);
    const Visited expected = Sequential(population);  // the dispensings table, one thread
    CHECK(first.ids == expected.ids);
    CHECK(second.ids == expected.ids);
    CHECK(second.dispensings == expected.dispensings);
    CHECK(second.medicines == expected.medicines);
    CHECK(second.unmatched == expected.unmatched);
    CHECK(second.burdens == expected.burdens);
    CHECK(first.burdens == expected.burdens);
    // A new dispensing makes the copy stale; the next pass packs again and shows it.
    Import(population.store, InputKind::kDispensing,
           "patient_id,dispensed_on,product,quantity,dosage\nP0000,2024-09-01,Oxybutynin 5mg tablets,56,1 bd\n");
    CHECK_FALSE(population.store.PackedHistoriesCurrent().value());
    const Visited after = Pass(population);
    CHECK(population.store.PackedHistoriesCurrent().value());
    CHECK(after.medicines[0] == 2);
    CHECK(after.burdens == Sequential(population).burdens);
  }
}

TEST_CASE("the visitor runs on the caller's thread") {
  for (const bool in_file : {false, true}) {
    ManyPatients population(in_file);
    const std::thread::id caller = std::this_thread::get_id();
    int elsewhere = 0;
    REQUIRE(ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient&) {
              if (std::this_thread::get_id() != caller) ++elsewhere;
              return true;
            }).ok());
    CHECK(elsewhere == 0);
  }
}

TEST_CASE("a visitor that returns false stops the pass, and the result is Ok") {
  for (const bool in_file : {false, true}) {
    ManyPatients population(in_file);
    int visited = 0;
    Status status = ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient&) {
      return ++visited < 300;
    });
    CHECK(status.ok());
    CHECK(visited == 300);
  }
}

TEST_CASE("a visitor that throws stops the readers, and the exception reaches the caller") {
  for (const bool in_file : {false, true}) {
    ManyPatients population(in_file);
    int visited = 0;
    CHECK_THROWS_WITH(static_cast<void>(ForEachPatientTimeline(population.store, population.analysis,
                                                               [&](PassPatient&) {
                                                                 if (++visited == 450) {
                                                                   throw std::runtime_error("visitor failed");
                                                                 }
                                                                 return true;
                                                               })),
                      "visitor failed");
    CHECK(visited == 450);
    // The store is usable afterwards: the pass's snapshot and peers are gone.
    CHECK_FALSE(population.store.InSnapshot());
    CHECK(Pass(population).ids.size() >= static_cast<size_t>(ManyPatients::kPatients));
  }
}

TEST_CASE("a timeline is built only for a patient whose visitor asks for it") {
  ManyPatients population;
  int built = 0;
  REQUIRE(ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient& patient) {
            if (patient.history().patient_id.back() == '0') {
              const Timeline& first = patient.timeline();
              const Timeline& again = patient.timeline();
              CHECK(&first == &again);
              ++built;
            }
            return true;
          }).ok());
  CHECK(built == ManyPatients::kPatients / 10);
}

TEST_CASE("resolutions made during the pass are saved in the store when it ends") {
  ManyPatients population(true);
  const std::string key = population.analysis.ResolutionKey();
  CHECK_FALSE(population.store.CachedResolution("Codeine 30mg tablets", "", "", key)->has_value());
  Pass(population);
  CHECK(population.store.CachedResolution("Codeine 30mg tablets", "", "", key)->has_value());
  CHECK(population.store.CachedResolution("Unheard-of tonic 5ml", "", "", key)->has_value());
}

TEST_CASE("a pass inside the caller's snapshot reads that snapshot and saves nothing until it ends") {
  ManyPatients population(true);
  const std::string key = population.analysis.ResolutionKey();
  size_t visited = 0;
  {
    Result<StoreSnapshot> snapshot = population.store.BeginSnapshot();
    REQUIRE(snapshot.ok());
    REQUIRE(population.store.Summary().ok());  // the snapshot's view is fixed here
    // Another connection imports a new patient meanwhile.
    Result<Store> other = Store::Open(population.store.path());
    REQUIRE(other.ok());
    Import(*other, InputKind::kDispensing, "patient_id,dispensed_on,product,quantity\nP9999,2024-02-01,Ramipril 5mg capsules,28\n");
    visited = Pass(population).ids.size();
    CHECK_FALSE(population.store.CachedResolution("Codeine 30mg tablets", "", "", key)->has_value());
  }
  CHECK(visited == static_cast<size_t>(ManyPatients::kPatients + 100));
  population.analysis.SaveResolutions();
  CHECK(population.store.CachedResolution("Codeine 30mg tablets", "", "", key)->has_value());
  CHECK(Pass(population).ids.size() == visited + 1);
}

}  // TEST_SUITE

}  // namespace medload
