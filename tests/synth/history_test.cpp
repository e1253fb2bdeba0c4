#include "medload/synth/history.h"

#include <doctest/doctest.h>

#include "medload/synth/catalogue.h"

namespace medload {

namespace {

const SynthWindow kWindow = MakeWindow(Date::FromCivil(2026, 10, 31), 15);

SynthPatient RegisteredPatient(int age) {
  SynthPatient patient;
  patient.patient_id = "Q0000001";
  patient.age_at_end = age;
  patient.birth_date = Date::FromCivil(2026 - age, 1, 1);
  patient.sex = "female";
  patient.registered_from = Date::FromCivil(2000, 1, 1);
  return patient;
}

CarePlan PlanOf(std::vector<std::string_view> keys) {
  CarePlan plan;
  for (const std::string_view key : keys) {
    PlannedMedicine medicine;
    medicine.product = *FindCatalogueProduct(key);
    medicine.quantity = SynthCatalogue()[medicine.product].quantity;
    plan.medicines.push_back(medicine);
  }
  return plan;
}

// Runs the generator's own pipeline for `count` patients and calls `visit` on each.
template <typename Visit>
void ForGeneratedPatients(uint64_t count, Visit visit) {
  const SynthNetwork network = MakeNetwork(count, 21);
  SynthHistory history;
  for (uint64_t i = 0; i < count; ++i) {
    SynthRandom random = SynthRandom::ForStream(21, i);
    const SynthPatient patient = MakePatient(i, count, 21, network, kWindow, random);
    const CarePlan plan = PlanCare(patient.age_at_end, patient.sex == "female", kWindow.days(),
                                   random);
    BuildHistory(plan, patient, kWindow, random, history);
    visit(patient, plan, history);
  }
}

}  // namespace

TEST_SUITE("synth/history") {

TEST_CASE("a regular medicine is refilled about every 28 days through the window") {
  const CarePlan plan = PlanOf({"amlodipine-5"});
  int checked = 0;
  int prompt_start = 0;
  for (uint64_t seed = 0; seed < 50; ++seed) {
    SynthRandom random(seed);
    SynthHistory history;
    BuildHistory(plan, RegisteredPatient(70), kWindow, random, history);
    const auto& lines = history.dispensings;
    if (lines.size() < 2) continue;  // stopped early: allowed, but rare
    ++checked;
    for (size_t i = 1; i < lines.size(); ++i) {
      const int gap = lines[i].dispensed_on - lines[i - 1].dispensed_on;
      CAPTURE(gap);
      CHECK(gap >= 14);   // early refills: at most 9 days early, moved off Sundays
      CHECK(gap <= 105);  // late refills and gaps: at most 75 days late, off Sundays
    }
    if (lines.front().dispensed_on < kWindow.start + 31) ++prompt_start;
  }
  CHECK(checked > 40);
  CHECK(prompt_start > 40);  // an ongoing repeat is usually due within the first month
}

TEST_CASE("nothing is dispensed outside the registration or on a Sunday") {
  SynthPatient patient = RegisteredPatient(80);
  patient.registered_from = Date::FromCivil(2026, 1, 10);
  patient.registered_to = Date::FromCivil(2026, 6, 20);
  const CarePlan plan = PlanOf({"amlodipine-5", "paracetamol-prn", "glucose-strips", "apixaban-5"});
  for (uint64_t seed = 0; seed < 50; ++seed) {
    SynthRandom random(seed);
    SynthHistory history;
    BuildHistory(plan, patient, kWindow, random, history);
    CHECK_FALSE(history.dispensings.empty());
    for (const SynthDispensing& line : history.dispensings) {
      CHECK(line.dispensed_on >= *patient.registered_from);
      CHECK(line.dispensed_on <= *patient.registered_to);
      // 1970-01-01 was a Thursday, so days % 7 == 3 is a Sunday.
      CHECK(line.dispensed_on.days() % 7 != 3);
    }
  }
}

TEST_CASE("a patient who left before the window gets no dispensing") {
  SynthPatient patient = RegisteredPatient(50);
  patient.registered_to = kWindow.start - 1;
  SynthRandom random(1);
  SynthHistory history;
  history.reviewed_on = kWindow.start;  // cleared by BuildHistory
  BuildHistory(PlanOf({"amlodipine-5"}), patient, kWindow, random, history);
  CHECK(history.dispensings.empty());
  CHECK_FALSE(history.reviewed_on.has_value());
}

TEST_CASE("every generated line is in the window, in date order, with valid values") {
  long lines = 0, with_days = 0, text_only = 0, neither = 0, voided = 0, structured = 0;
  long non_medicines = 0, reviews = 0;
  ForGeneratedPatients(4000, [&](const SynthPatient& patient, const CarePlan&,
                                 const SynthHistory& history) {
    Date previous = kWindow.start;
    for (const SynthDispensing& line : history.dispensings) {
      ++lines;
      CHECK(line.dispensed_on >= kWindow.start);
      CHECK(line.dispensed_on <= kWindow.end);
      CHECK(line.dispensed_on >= previous);
      previous = line.dispensed_on;
      CHECK(line.quantity > 0);
      const CatalogueProduct& product = SynthCatalogue()[line.product];
      if (line.days_supply) {
        CHECK(*line.days_supply > 0);
        CHECK(*line.days_supply == DaysCovered(product, line.quantity));
        ++with_days;
      } else if (line.dosage_text >= 0) {
        ++text_only;
      } else {
        ++neither;
      }
      if (line.dosage_text >= 0) {
        CHECK(static_cast<size_t>(line.dosage_text) < product.dosage->texts.size());
      }
      if (line.structured_dosage) ++structured;
      if (line.voided_copy != 0) ++voided;
      if (product.kind == CatalogueKind::kNonMedicine) ++non_medicines;
    }
    if (history.reviewed_on) {
      ++reviews;
      CHECK(patient.in_registry);
    }
  });
  REQUIRE(lines > 50000);
  const auto share = [&](long count) {
    return static_cast<double>(count) / static_cast<double>(lines);
  };
  CHECK(share(with_days) > 0.55);      // about 62%
  CHECK(share(with_days) < 0.70);
  CHECK(share(text_only) > 0.25);      // about 30%
  CHECK(share(text_only) < 0.36);
  CHECK(share(neither) > 0.02);
  CHECK(share(non_medicines) > 0.01);  // a few per cent
  CHECK(share(non_medicines) < 0.06);
  CHECK(share(voided) > 0.005);        // about 1.5%
  CHECK(share(voided) < 0.03);
  CHECK(structured > 0);
  CHECK(reviews > 20);
}

TEST_CASE("the same stream gives the same history") {
  const CarePlan plan = PlanOf({"co-codamol-30-prn", "sertraline-50", "lactulose"});
  SynthRandom a(9);
  SynthRandom b(9);
  SynthHistory first;
  SynthHistory second;
  BuildHistory(plan, RegisteredPatient(66), kWindow, a, first);
  BuildHistory(plan, RegisteredPatient(66), kWindow, b, second);
  REQUIRE(first.dispensings.size() == second.dispensings.size());
  for (size_t i = 0; i < first.dispensings.size(); ++i) {
    CHECK(first.dispensings[i].dispensed_on == second.dispensings[i].dispensed_on);
    CHECK(first.dispensings[i].product == second.dispensings[i].product);
    CHECK(first.dispensings[i].days_supply == second.dispensings[i].days_supply);
  }
}

}  // TEST_SUITE

}  // namespace medload
