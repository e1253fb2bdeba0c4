#include "medload/synth/catalogue.h"

#include <doctest/doctest.h>

#include "medload/dose/dosage_text.h"

#include <cctype>
#include <set>
#include <string>

namespace medload {

namespace {

const CatalogueProduct& Product(std::string_view key) {
  const std::optional<size_t> index = FindCatalogueProduct(key);
  REQUIRE(index.has_value());
  return SynthCatalogue()[*index];
}

bool HasDigit(std::string_view text) {
  for (const char c : text) {
    if (std::isdigit(static_cast<unsigned char>(c)) != 0) return true;
  }
  return false;
}

}  // namespace

TEST_SUITE("synth/catalogue") {

TEST_CASE("every catalogue product has a unique key, a quantity, a unit and a dosage") {
  std::set<std::string_view> keys;
  for (const CatalogueProduct& product : SynthCatalogue()) {
    CAPTURE(product.key);
    CHECK(keys.insert(product.key).second);
    CHECK_FALSE(product.description.empty());
    CHECK_FALSE(product.unit.empty());
    CHECK(product.quantity > 0);
    REQUIRE(product.dosage != nullptr);
    CHECK_FALSE(product.dosage->texts.empty());
    CHECK_FALSE(product.medicine.empty());
    const auto position = static_cast<size_t>(&product - SynthCatalogue().data());
    CHECK(FindCatalogueProduct(product.key) == std::optional<size_t>(position));
  }
  CHECK(SynthCatalogue().size() > 120);
  CHECK_FALSE(FindCatalogueProduct("no-such-product").has_value());
}

TEST_CASE("medicine descriptions name a strength and start with a capital letter") {
  // British generic descriptions ("Amlodipine 5mg tablets"): common practice. Compound
  // powders are described without a strength.
  for (const CatalogueProduct& product : SynthCatalogue()) {
    if (product.kind != CatalogueKind::kMedicine) continue;
    CAPTURE(product.description);
    CHECK(std::isupper(static_cast<unsigned char>(product.description.front())) != 0);
    if (product.description.find("compound") == std::string_view::npos) {
      CHECK(HasDigit(product.description));
    }
  }
}

TEST_CASE("non-medicines are appliances with no days supply and a few are in the catalogue") {
  int count = 0;
  for (const CatalogueProduct& product : SynthCatalogue()) {
    if (product.kind != CatalogueKind::kNonMedicine) continue;
    ++count;
    CAPTURE(product.key);
    CHECK(product.use == CatalogueUse::kAppliance);
    CHECK(product.repeat_days > 0);
    CHECK_FALSE(DaysCovered(product, product.quantity).has_value());
  }
  CHECK(count >= 5);
}

TEST_CASE("units per day use the top of a range and the stated maximum when required") {
  // docs/dosage-text.md: a dose range uses its upper value; as-needed uses the stated maximum.
  CHECK(UnitsPerDay(*Product("paracetamol-prn").dosage) == doctest::Approx(8));
  CHECK(UnitsPerDay(*Product("amlodipine-5").dosage) == doctest::Approx(1));
  CHECK(UnitsPerDay(*Product("metformin-500").dosage) == doctest::Approx(4));
  CHECK(UnitsPerDay(*Product("fentanyl-patch").dosage) == doctest::Approx(1.0 / 3));
  CHECK(UnitsPerDay(*Product("alendronic-acid").dosage) == doctest::Approx(1.0 / 7));
  CHECK_FALSE(UnitsPerDay(*Product("insulin-glargine").dosage).has_value());
}

TEST_CASE("days covered round the quantity over the daily use up") {
  // docs/dosage-text.md: s = ceil(quantity / units_per_day).
  CHECK(DaysCovered(Product("amlodipine-5"), 28) == 28);
  CHECK(DaysCovered(Product("amlodipine-5"), 56) == 56);
  CHECK(DaysCovered(Product("paracetamol-prn"), 100) == 13);
  CHECK(DaysCovered(Product("lactulose"), 500) == 17);
  CHECK(DaysCovered(Product("fentanyl-patch"), 10) == 30);
  CHECK(DaysCovered(Product("alendronic-acid"), 4) == 28);
  CHECK(DaysCovered(Product("prednisolone"), 30) == 5);
  CHECK(DaysCovered(Product("amoxicillin"), 21) == 7);
  // Stated days scale with the quantity; unknown stays unknown.
  CHECK(DaysCovered(Product("latanoprost"), 2.5) == 28);
  CHECK(DaysCovered(Product("insulin-glargine"), 30) == 56);
  CHECK_FALSE(DaysCovered(Product("hydrocortisone-cream"), 30).has_value());
}

TEST_CASE("regular medicines last between a week and three months per usual quantity") {
  for (const CatalogueProduct& product : SynthCatalogue()) {
    if (product.use != CatalogueUse::kRegular) continue;
    CAPTURE(product.key);
    const std::optional<int> days = DaysCovered(product, product.quantity);
    REQUIRE(days.has_value());
    CHECK(*days >= 7);
    CHECK(*days <= 90);
  }
}

TEST_CASE("as-needed regimens are marked as needed in their structure and words") {
  for (const CatalogueProduct& product : SynthCatalogue()) {
    if (product.use != CatalogueUse::kAsNeeded) continue;
    CAPTURE(product.key);
    CHECK(product.dosage->as_needed);
    CHECK(product.repeat_days > 0);
  }
}

TEST_CASE("structured regimens have a dose unit and a dose range in order") {
  for (const CatalogueProduct& product : SynthCatalogue()) {
    const CatalogueDosage& dosage = *product.dosage;
    if (!UnitsPerDay(dosage)) continue;
    CAPTURE(product.key);
    CHECK_FALSE(dosage.dose_unit.empty());
    CHECK(dosage.dose_low > 0);
    CHECK(dosage.dose_low <= dosage.dose_high);
    CHECK(dosage.period >= 1);
  }
}

TEST_CASE("every text of a structured regimen reads as the regimen's units per day") {
  // The texts are written the ways British prescribers write them (common practice); the
  // dosage-text reader is the project's own, so the days supply it derives from a line
  // without one agrees with the days supply the generator states on other lines.
  int texts = 0;
  for (const CatalogueProduct& product : SynthCatalogue()) {
    const std::optional<double> per_day = UnitsPerDay(*product.dosage);
    if (!per_day) continue;
    for (const std::string_view text : product.dosage->texts) {
      CAPTURE(product.key);
      CAPTURE(text);
      const DosageReading reading = ReadDosageText(text);
      REQUIRE(reading.units_per_day.has_value());
      // A loading dose ("two on day one then one daily") is read in stages: the regimen's
      // units per day is the stage that continues.
      const double read = reading.stages.empty() ? *reading.units_per_day
                                                 : reading.stages.back().units_per_day;
      CHECK(read == doctest::Approx(*per_day));
      CHECK(reading.as_needed == product.dosage->as_needed);
      ++texts;
    }
  }
  CHECK(texts > 300);
}

TEST_CASE("controlled drugs are supplied for 30 days or less") {
  // Good practice for Schedule 2-4 controlled drugs: 30 days' supply at most (common
  // practice).
  int controlled = 0;
  for (const CatalogueProduct& product : SynthCatalogue()) {
    if (!product.controlled) continue;
    ++controlled;
    CAPTURE(product.key);
    const std::optional<int> days = DaysCovered(product, product.quantity);
    REQUIRE(days.has_value());
    CHECK(*days <= 30);
  }
  CHECK(controlled >= 10);
}

}  // TEST_SUITE

}  // namespace medload
