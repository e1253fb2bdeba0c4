// Days of supply where the quantity is counted in packs, ml or doses and the dosage in
// puffs, sprays, drops or units of insulin: the dosage rule must apply, not the default.
#include <doctest/doctest.h>

#include <optional>
#include <string>

#include "medload/dose/dosage_cache.h"
#include "medload/dose/dosage_text.h"
#include "medload/dose/supply.h"

namespace medload {
namespace {

struct PackCase {
  const char* description;  // as dispensed
  const char* form;         // as the resolver names it
  const char* dose_unit;    // the product's dose unit
  size_t ingredients;
  const char* record_unit;  // "" when the record states none
  double quantity;
  const char* dosage;
  int days;
  SupplyRule rule;
};

constexpr auto kDosage = SupplyRule::kDosageText;
constexpr auto kDefault = SupplyRule::kDefaultDays;

// Each days figure is quantity x what one pack holds / units a day, rounded up
// (docs/dosage-text.md). 20 drops make 1 ml (common practice); doses per device as in
// pack_content.h (from memory).
const PackCase kPackCases[] = {
    // A reliever inhaler dispensed as 1: 200 doses at 2 puffs four times a day = 25 days.
    {"Salbutamol 100micrograms/dose inhaler CFC free 200 dose", "inhaler", "puff", 1, "", 1,
     "2 puffs four times a day when required", 25, kDosage},
    {"Salbutamol 100micrograms/dose inhaler CFC free", "inhaler", "puff", 1, "", 1,
     "2 puffs four times a day when required", 25, kDosage},
    {"Salbutamol 100micrograms/dose inhaler CFC free", "inhaler", "puff", 1, "", 200,
     "2 puffs four times a day when required", 25, kDosage},
    {"Salbutamol 100micrograms/dose inhaler CFC free", "inhaler", "puff", 1, "inhalers", 2,
     "2 puffs qds prn", 50, kDosage},
    // A unit the record states is taken at its word: 1 dose lasts a day.
    {"Salbutamol 100micrograms/dose inhaler CFC free", "inhaler", "puff", 1, "dose", 1,
     "2 puffs four times a day when required", 1, kDosage},
    {"Seretide 125 Evohaler", "inhaler", "puff", 2, "", 1, "two puffs twice a day", 30, kDosage},
    {"Seretide 125 Evohaler", "inhaler", "puff", 2, "", 120, "2 puffs bd", 30, kDosage},
    {"Relvar Ellipta 92micrograms/22micrograms/dose inhalation powder", "inhalation powder",
     "dose", 2, "", 1, "one inhalation once a day", 30, kDosage},
    // Nasal sprays: sprays are doses; each nostril doubles.
    {"Beclometasone 50micrograms/dose nasal spray 200 dose", "nasal spray", "dose", 1, "", 1,
     "two sprays into each nostril twice a day", 25, kDosage},
    {"Fluticasone 50micrograms/dose nasal spray", "nasal spray", "dose", 1, "", 1,
     "2 sprays each nostril once daily", 30, kDosage},
    // Eye and ear drops: 20 drops a ml.
    {"Latanoprost 50micrograms/ml eye drops 2.5ml", "eye drops", "ml", 1, "", 2.5,
     "one drop into both eyes at night", 25, kDosage},
    {"Latanoprost 50micrograms/ml eye drops 2.5ml", "eye drops", "ml", 1, "", 1,
     "1 drop ou nocte", 25, kDosage},
    {"Chloramphenicol 0.5% eye drops 10ml", "eye drops", "ml", 1, "ml", 10,
     "1 drop both eyes qds", 25, kDosage},
    {"Chloramphenicol 0.5% eye drops 10ml", "eye drops", "ml", 1, "bottle", 1,
     "1 drop both eyes qds", 25, kDosage},
    {"Sodium bicarbonate 5% ear drops 10ml", "ear drops", "ml", 1, "", 10, "3 drops into the affected ear twice a day",
     34, kDosage},
    // Insulin: units over the strength's units per ml; pens of 3 ml.
    {"Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", "injection", "ml",
     1, "", 5, "inject 20 units in the morning and 10 units at night", 50, kDosage},
    {"Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", "injection", "ml",
     1, "", 15, "20 units mane 10 units nocte", 50, kDosage},
    {"Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", "injection", "ml",
     1, "pen", 5, "20 units mane 10 units nocte", 50, kDosage},
    {"Humalog 200units/ml KwikPen 3ml pre-filled pen", "injection", "ml", 1, "", 5,
     "10 units tds with meals", 100, kDosage},
    {"insulin glargine 100 UNT/ML Pen Injector", "injection", "ml", 1, "mL", 15,
     "inject 30 units at bedtime", 50, kDosage},
    // Without units per ml the dosage cannot divide the quantity: the default applies.
    {"Lantus SoloStar 3ml pre-filled pen", "injection", "ml", 1, "", 5, "30 units at night", 28,
     kDefault},
    // Tablets: a small quantity of a pack of 28 is tablets, not packs.
    {"Amlodipine 5mg tablets 28 tablet", "tablet", "tablet", 1, "", 7, "one daily", 7, kDosage},
    // A cream: how much one application uses is never written.
    {"Hydrocortisone 1% cream", "cream", "g", 1, "", 30, "apply twice daily", 28, kDefault},
    {"Betnovate", "", "", 1, "", 30, "apply twice daily", 28, kDefault},
};

QuantityUnit UnitOf(const PackCase& c) {
  QuantityUnit unit;
  unit.from_product = std::string(c.record_unit).empty();
  unit.unit = unit.from_product ? c.dose_unit : c.record_unit;
  unit.description = c.description;
  unit.form = c.form;
  unit.ingredient_count = c.ingredients;
  return unit;
}

}  // namespace

TEST_SUITE("dose/supply_packs") {

TEST_CASE("quantities in packs, ml or doses divide puffs, sprays, drops and insulin units") {
  for (const PackCase& c : kPackCases) {
    CAPTURE(c.description);
    CAPTURE(c.record_unit);
    CAPTURE(c.quantity);
    CAPTURE(c.dosage);
    const Supply supply = ComputeSupply(c.quantity, std::nullopt, ReadDosageText(c.dosage),
                                        std::nullopt, SupplyOptions{}, UnitOf(c));
    CAPTURE(supply.note);
    CHECK(supply.days == c.days);
    CHECK(SupplyRuleName(supply.rule) == SupplyRuleName(c.rule));
  }
}

TEST_CASE("a pack content read once by the run's cache gives the same supply as reading it each time") {
  DosageTextCache cache;
  for (const PackCase& c : kPackCases) {
    CAPTURE(c.description);
    QuantityUnit unit = UnitOf(c);
    const Supply fresh = ComputeSupply(c.quantity, std::nullopt, ReadDosageText(c.dosage), std::nullopt,
                                       SupplyOptions{}, unit);
    unit.pack = &cache.Pack(c.description, c.form, c.ingredients);
    const Supply cached = ComputeSupply(c.quantity, std::nullopt, ReadDosageText(c.dosage), std::nullopt,
                                        SupplyOptions{}, unit);
    CHECK(cached.days == fresh.days);
    CHECK(cached.rule == fresh.rule);
    CHECK(cached.note == fresh.note);
  }
}

TEST_CASE("a quantity read in packs says so and keeps the doses it holds") {
  const PackCase& inhaler = kPackCases[1];
  const Supply supply = ComputeSupply(1, std::nullopt, ReadDosageText(inhaler.dosage),
                                      std::nullopt, SupplyOptions{}, UnitOf(inhaler));
  CHECK(supply.note == "the quantity is read in packs of 200 dose");
  REQUIRE(supply.units_dispensed);
  CHECK(*supply.units_dispensed == 200);
  REQUIRE(supply.units_per_day);
  CHECK(*supply.units_per_day == doctest::Approx(8));  // doses a day: what mg per dose applies to
}

TEST_CASE("why insulin units could not divide the quantity is kept") {
  const PackCase& lantus = kPackCases[20];
  const Supply supply = ComputeSupply(lantus.quantity, std::nullopt, ReadDosageText(lantus.dosage),
                                      std::nullopt, SupplyOptions{}, UnitOf(lantus));
  CHECK(supply.note == "the dosage is in units and the units per ml are not known");
  CHECK_FALSE(supply.units_per_day);
}

TEST_CASE("drops convert to ml at twenty a ml for the units per day") {
  QuantityUnit ml;
  ml.unit = "ml";
  const auto per_day = UnitsPerDayOfQuantity(ReadDosageText("1 drop both eyes qds"), ml);
  REQUIRE(per_day);
  CHECK(*per_day == doctest::Approx(8.0 / kDropsPerMl));  // common practice: 20 drops a ml
}

TEST_CASE("per pack units per day divide by what one pack holds") {
  QuantityUnit inhaler;
  inhaler.unit = "inhaler";
  inhaler.description = "Salbutamol 100micrograms/dose inhaler CFC free 200 dose";
  const auto per_day = UnitsPerDayOfQuantity(ReadDosageText("2 puffs qds"), inhaler);
  REQUIRE(per_day);
  CHECK(*per_day == doctest::Approx(8.0 / 200));
}

}  // TEST_SUITE

}  // namespace medload
