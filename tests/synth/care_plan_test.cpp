#include "medload/synth/care_plan.h"

#include <doctest/doctest.h>

#include <set>

#include "medload/synth/catalogue.h"

namespace medload {

namespace {

// Average planned repeats and the share with ten or more, for `count` patients of `age`.
struct Load {
  double mean = 0;
  double ten_or_more = 0;
};

Load LoadAt(int age, bool female, int count) {
  long total = 0;
  int heavy = 0;
  for (int i = 0; i < count; ++i) {
    SynthRandom random = SynthRandom::ForStream(2024, static_cast<uint64_t>(i));
    const CarePlan plan = PlanCare(age, female, 456, random);
    total += static_cast<long>(plan.medicines.size());
    if (plan.medicines.size() >= 10) ++heavy;
  }
  return {static_cast<double>(total) / count, static_cast<double>(heavy) / count};
}

// The share of `count` plans of patients aged 75 holding a medicine of each list.
double ShareWithBoth(const std::set<std::string_view>& first, const std::set<std::string_view>& second,
                     int count, bool two_of_first = false) {
  int both = 0;
  for (int i = 0; i < count; ++i) {
    SynthRandom random = SynthRandom::ForStream(31, static_cast<uint64_t>(i));
    const CarePlan plan = PlanCare(75, i % 2 == 0, 456, random);
    int in_first = 0, in_second = 0;
    for (const PlannedMedicine& planned : plan.medicines) {
      const std::string_view medicine = SynthCatalogue()[planned.product].medicine;
      in_first += first.count(medicine) > 0 ? 1 : 0;
      in_second += second.count(medicine) > 0 ? 1 : 0;
    }
    if (two_of_first ? in_first >= 2 : (in_first > 0 && in_second > 0)) ++both;
  }
  return static_cast<double>(both) / count;
}

const std::set<std::string_view> kRasBlockers = {"ramipril", "lisinopril", "perindopril", "losartan", "candesartan"};
const std::set<std::string_view> kOpioids = {"codeine", "co-codamol", "co-dydramol", "tramadol", "morphine",
                                             "oxycodone", "fentanyl", "buprenorphine"};
const std::set<std::string_view> kHypnotics = {"zopiclone", "diazepam", "temazepam"};
const std::set<std::string_view> kAnticoagulants = {"apixaban", "edoxaban", "rivaroxaban", "warfarin"};
const std::set<std::string_view> kAntiplatelets = {"aspirin", "clopidogrel"};

}  // namespace

TEST_SUITE("synth/care_plan") {

TEST_CASE("combinations the rules look for are planned for a few older patients, none for many") {
  // Plausible shares for patients aged 75, rounded and from memory: dual RAS blockade is
  // rare since ONTARGET (Yusuf et al. 2008) and the MHRA's 2014 advice; an opioid with a
  // hypnotic and an anticoagulant with an antiplatelet each for a few in a hundred.
  const double dual_ras = ShareWithBoth(kRasBlockers, {}, 4000, true);
  CHECK(dual_ras > 0);
  CHECK(dual_ras < 0.01);
  const double opioid_hypnotic = ShareWithBoth(kOpioids, kHypnotics, 4000);
  CHECK(opioid_hypnotic > 0.005);
  CHECK(opioid_hypnotic < 0.05);
  const double anticoagulant_antiplatelet = ShareWithBoth(kAnticoagulants, kAntiplatelets, 4000);
  CHECK(anticoagulant_antiplatelet > 0.002);
  CHECK(anticoagulant_antiplatelet < 0.03);
}

TEST_CASE("every product a care plan or course names is in the catalogue") {
  for (const CareCondition& condition : SynthConditions()) {
    CAPTURE(condition.name);
    REQUIRE_FALSE(condition.steps.empty());
    for (const CareStep& step : condition.steps) {
      CHECK(step.per_10000 > 0);
      for (const CareOption& option : step.options) {
        CAPTURE(option.product);
        CHECK(FindCatalogueProduct(option.product).has_value());
        CHECK(option.weight > 0);
        if (!option.companion.empty()) CHECK(FindCatalogueProduct(option.companion).has_value());
      }
    }
    for (const CareExtraCourse& extra : condition.extra_courses) {
      CHECK(FindCatalogueProduct(extra.product).has_value());
    }
  }
  for (const CareCourse& course : SynthCourses()) {
    CAPTURE(course.product);
    REQUIRE(FindCatalogueProduct(course.product).has_value());
    CHECK(SynthCatalogue()[*FindCatalogueProduct(course.product)].use == CatalogueUse::kCourse);
  }
}

TEST_CASE("a plan never holds the same medicine twice and repeats are not courses") {
  for (uint64_t i = 0; i < 3000; ++i) {
    SynthRandom random = SynthRandom::ForStream(1, i);
    const CarePlan plan = PlanCare(60 + static_cast<int>(i % 40), i % 2 == 0, 365, random);
    std::set<std::string_view> medicines;
    for (const PlannedMedicine& medicine : plan.medicines) {
      const CatalogueProduct& product = SynthCatalogue()[medicine.product];
      CAPTURE(product.key);
      CHECK(medicines.insert(product.medicine).second);
      CHECK(product.use != CatalogueUse::kCourse);
      CHECK(medicine.quantity >= product.quantity);
      if (product.controlled) CHECK(medicine.quantity == product.quantity);  // 30 days at most
      CHECK(medicine.condition < SynthConditions().size());
    }
  }
}

TEST_CASE("courses fall inside the window in day order") {
  for (uint64_t i = 0; i < 2000; ++i) {
    SynthRandom random = SynthRandom::ForStream(2, i);
    const CarePlan plan = PlanCare(static_cast<int>(i % 95), i % 3 == 0, 200, random);
    int previous = -1;
    for (const PlannedCourse& course : plan.courses) {
      CHECK(course.day >= 0);
      CHECK(course.day < 200);
      CHECK(course.day >= previous);
      previous = course.day;
      CHECK(SynthCatalogue()[course.product].use == CatalogueUse::kCourse);
    }
  }
}

TEST_CASE("older patients are planned more medicines and some reach ten or more") {
  const Load child = LoadAt(8, true, 3000);
  const Load adult = LoadAt(40, false, 3000);
  const Load older = LoadAt(75, true, 3000);
  const Load oldest = LoadAt(88, false, 3000);
  CHECK(child.mean < adult.mean);
  CHECK(adult.mean < older.mean);
  CHECK(older.mean < oldest.mean);
  CHECK(child.ten_or_more == 0);
  // Polypharmacy of ten or more medicines is common in the very old (Guthrie et al. 2015,
  // BMC Med 13:74); the generator aims for a plausible share, not a published one.
  CHECK(older.ten_or_more > 0.05);
  CHECK(oldest.ten_or_more > 0.10);
  CHECK(oldest.ten_or_more < 0.50);
}

TEST_CASE("the same random stream gives the same plan") {
  SynthRandom a = SynthRandom::ForStream(77, 5);
  SynthRandom b = SynthRandom::ForStream(77, 5);
  const CarePlan first = PlanCare(81, true, 456, a);
  const CarePlan second = PlanCare(81, true, 456, b);
  REQUIRE(first.medicines.size() == second.medicines.size());
  for (size_t i = 0; i < first.medicines.size(); ++i) {
    CHECK(first.medicines[i].product == second.medicines[i].product);
    CHECK(first.medicines[i].quantity == second.medicines[i].quantity);
  }
  CHECK(first.courses.size() == second.courses.size());
  CHECK(first.conditions == second.conditions);
}

TEST_CASE("prostate conditions are never planned for women") {
  size_t prostate = SynthConditions().size();
  for (size_t c = 0; c < SynthConditions().size(); ++c) {
    if (SynthConditions()[c].name == "benign prostatic hyperplasia") prostate = c;
  }
  REQUIRE(prostate < SynthConditions().size());
  int men_with_it = 0;
  for (uint64_t i = 0; i < 2000; ++i) {
    SynthRandom women = SynthRandom::ForStream(3, i);
    const CarePlan plan = PlanCare(80, true, 365, women);
    for (const size_t c : plan.conditions) CHECK(c != prostate);
    SynthRandom men = SynthRandom::ForStream(4, i);
    for (const size_t c : PlanCare(80, false, 365, men).conditions) {
      if (c == prostate) ++men_with_it;
    }
  }
  CHECK(men_with_it > 200);
}

}  // TEST_SUITE

}  // namespace medload
