#include "medload/burden/patient_pass.h"

#include <doctest/doctest.h>

#include <cstdio>
#include <sstream>
#include <thread>

#include "medload/store/importer.h"

namespace medload {
namespace {

void Import(Store& store, InputKind kind, const std::string& csv) {
  std::istringstream in(csv);
  auto summary = ImportStream(store, kind, in, "test.csv", ImportOptions{});
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

// 700 invented patients (more than several hand-over batches), each with one to four
// medicines; patient P0007 has an unmatched product.
struct ManyPatients {
  Store store = std::move(Store::Open(":memory:").value());
  Analysis analysis = std::move(Analysis::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());
  static constexpr int kPatients = 700;

  ManyPatients() {
    const char* products[] = {"Amitriptyline 10mg tablets", "Oxybutynin 5mg tablets", "Codeine 30mg tablets",
                              "Ramipril 5mg capsules"};
    std::string rows = "patient_id,dispensed_on,product,quantity,dosage\n";
    for (int p = 0; p < kPatients; ++p) {
      char id[8];
      std::snprintf(id, sizeof id, "P%04d", p);
      for (int m = 0; m <= p % 4; ++m) rows += std::string(id) + ",2024-01-0" + std::to_string(m + 1) + "," + products[m] + ",56,1 bd\n";
      if (p == 7) rows += "P0007,2024-01-02,Unheard-of tonic 5ml,100,5ml tds\n";
    }
    Import(store, InputKind::kDispensing, rows);
  }
};

TEST_SUITE("burden") {

TEST_CASE("the two-thread pass visits every patient once, in store order, with the same timelines as one thread") {
  ManyPatients population;
  std::vector<std::string> ids;
  std::vector<size_t> medicines;
  std::vector<size_t> unmatched;
  Status status = ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient& patient) {
    ids.push_back(patient.history().patient_id);
    medicines.push_back(patient.timeline().medicines.size());
    unmatched.push_back(patient.timeline().unmatched.size());
    return true;
  });
  REQUIRE(status.ok());
  REQUIRE(ids.size() == static_cast<size_t>(ManyPatients::kPatients));

  size_t i = 0;
  Status sequential = population.store.ForEachPatient([&](const PatientHistory& history) {
    CHECK(ids[i] == history.patient_id);
    const Timeline timeline = population.analysis.BuildTimeline(history.dispensings);
    CHECK(medicines[i] == timeline.medicines.size());
    CHECK(unmatched[i] == timeline.unmatched.size());
    ++i;
    return true;
  });
  REQUIRE(sequential.ok());
  CHECK(i == ids.size());
  CHECK(medicines[0] == 1);
  CHECK(medicines[3] == 4);
  CHECK(unmatched[7] == 1);
}

TEST_CASE("the visitor runs on one thread that is not the caller's") {
  ManyPatients population;
  const std::thread::id caller = std::this_thread::get_id();
  std::vector<std::thread::id> seen;
  REQUIRE(ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient&) {
            if (seen.empty() || seen.back() != std::this_thread::get_id()) seen.push_back(std::this_thread::get_id());
            return true;
          }).ok());
  REQUIRE(seen.size() == 1);
  CHECK(seen[0] != caller);
}

TEST_CASE("a visitor that returns false stops the pass, and the result is Ok") {
  ManyPatients population;
  int visited = 0;
  Status status = ForEachPatientTimeline(population.store, population.analysis, [&](PassPatient&) {
    return ++visited < 300;
  });
  CHECK(status.ok());
  CHECK(visited == 300);
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

}  // TEST_SUITE

}  // namespace
}  // namespace medload
