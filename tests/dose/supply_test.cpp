#include "medload/dose/supply.h"

#include <doctest/doctest.h>

#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

DosageReading PerDay(double units, std::string unit = "", bool as_needed = false) {
  DosageReading reading;
  reading.units_per_day = units;
  reading.unit = std::move(unit);
  reading.as_needed = as_needed;
  reading.understanding = Understanding::kFull;
  return reading;
}

const SupplyOptions kDefaults{};

QuantityUnit Unit(std::string unit, std::optional<double> mg_per_unit = std::nullopt) {
  QuantityUnit quantity_unit;
  quantity_unit.unit = std::move(unit);
  quantity_unit.mg_per_unit = mg_per_unit;
  return quantity_unit;
}

}  // namespace

TEST_SUITE("dose/supply") {

TEST_CASE("supply rule names are the spelled names used in outputs") {
  CHECK(SupplyRuleName(SupplyRule::kRecordDaysSupply) == "days_supply");
  CHECK(SupplyRuleName(SupplyRule::kDosageText) == "dosage");
  CHECK(SupplyRuleName(SupplyRule::kProductDefault) == "product_default");
  CHECK(SupplyRuleName(SupplyRule::kDefaultDays) == "default");
}

TEST_CASE("the record's days supply comes first even when the dosage gives a rate") {
  const Supply supply = ComputeSupply(56, 14, PerDay(1), 90, kDefaults);
  CHECK(supply.days == 14);
  CHECK(supply.rule == SupplyRule::kRecordDaysSupply);
  REQUIRE(supply.units_per_day);
  CHECK(*supply.units_per_day == doctest::Approx(1));  // kept for the dose measures
}

TEST_CASE("the dosage rate comes second and is rounded up to whole days") {
  // 28 tablets at 1.5 a day last 18.67 days: 19 (docs/dosage-text.md: ceil).
  const Supply supply = ComputeSupply(28, std::nullopt, PerDay(1.5), 90, kDefaults);
  CHECK(supply.days == 19);
  CHECK(supply.rule == SupplyRule::kDosageText);
  CHECK_FALSE(supply.capped);
}

TEST_CASE("the product default comes third and the option default last") {
  const DosageReading unknown = ReadDosageText("as directed");
  const Supply product = ComputeSupply(1, std::nullopt, unknown, 84, kDefaults);
  CHECK(product.days == 84);
  CHECK(product.rule == SupplyRule::kProductDefault);
  const Supply fallback =
      ComputeSupply(1, std::nullopt, unknown, std::nullopt, SupplyOptions{21, 180});
  CHECK(fallback.days == 21);
  CHECK(fallback.rule == SupplyRule::kDefaultDays);
}

TEST_CASE("zero or negative days supply and quantity fall through to the next rule") {
  CHECK(ComputeSupply(28, 0, PerDay(1), std::nullopt, kDefaults).rule == SupplyRule::kDosageText);
  CHECK(ComputeSupply(0, -3, PerDay(1), 30, kDefaults).rule == SupplyRule::kProductDefault);
  CHECK(ComputeSupply(28, std::nullopt, PerDay(0), 0, kDefaults).rule == SupplyRule::kDefaultDays);
}

TEST_CASE("every rule is capped at the maximum supply days") {
  const SupplyOptions options{28, 90};
  const Supply record = ComputeSupply(1, 365, PerDay(1), std::nullopt, options);
  CHECK(record.days == 90);
  CHECK(record.capped);
  CHECK(record.rule == SupplyRule::kRecordDaysSupply);
  const Supply dosage = ComputeSupply(1000, std::nullopt, PerDay(0.5), std::nullopt, options);
  CHECK(dosage.days == 90);
  CHECK(dosage.capped);
  const Supply huge = ComputeSupply(1e300, std::nullopt, PerDay(1e-9), std::nullopt, options);
  CHECK(huge.days == 90);
  const Supply product = ComputeSupply(1, std::nullopt, DosageReading{}, 120, options);
  CHECK(product.days == 90);
  CHECK(product.capped);
  const Supply fallback =
      ComputeSupply(1, std::nullopt, DosageReading{}, std::nullopt, SupplyOptions{200, 90});
  CHECK(fallback.days == 90);
  CHECK(fallback.capped);
}

TEST_CASE("days are at least one whatever the options") {
  CHECK(ComputeSupply(1, std::nullopt, PerDay(8), std::nullopt, kDefaults).days == 1);
  const DosageReading none;
  CHECK(ComputeSupply(1, std::nullopt, none, std::nullopt, SupplyOptions{0, 0}).days == 1);
  CHECK(ComputeSupply(1, std::nullopt, none, std::nullopt, SupplyOptions{-5, -5}).days == 1);
}

TEST_CASE("the oral solution worked example lasts 30 days") {
  // Source: QI-Core MedicationDispense example (references.md): 450 mL at 5 mL three
  // times a day = 450 / 15 = 30 days.
  const Supply supply =
      ComputeSupply(450, std::nullopt, ReadDosageText("5ml three times a day"), std::nullopt,
                    kDefaults, Unit("mL", std::nullopt));
  CHECK(supply.days == 30);
  CHECK(supply.rule == SupplyRule::kDosageText);
}

TEST_CASE("a 5 ml spoon dose divides a quantity in ml") {
  // 300 ml at two 5 ml spoonfuls three times a day (30 ml a day) = 10 days.
  const Supply from_text = ComputeSupply(300, std::nullopt,
                                         ReadDosageText("two 5ml spoonfuls three times a day"),
                                         std::nullopt, kDefaults, Unit("ml", std::nullopt));
  CHECK(from_text.days == 10);
  // A reading that kept the spoon as its unit converts too: 6 spoonfuls = 30 ml a day.
  const Supply from_unit = ComputeSupply(300, std::nullopt, PerDay(6, "5ml spoonful"),
                                         std::nullopt, kDefaults, Unit("ml", std::nullopt));
  CHECK(from_unit.days == 10);
  REQUIRE(from_unit.units_per_day);
  CHECK(*from_unit.units_per_day == doctest::Approx(30));
}

TEST_CASE("an as-needed maximum gives the shortest supply") {
  // 32 tablets, "max 8 in 24 hours" as needed: at most 8 a day, so 4 days.
  const DosageReading prn =
      ReadDosageText("1-2 tablets every 4-6 hours when required, max 8 in 24 hours");
  CHECK(prn.as_needed);
  const Supply supply = ComputeSupply(32, std::nullopt, prn, std::nullopt, kDefaults,
                                      Unit("tablet", std::nullopt));
  CHECK(supply.days == 4);
  CHECK(supply.rule == SupplyRule::kDosageText);
}

TEST_CASE("a dose in mg divides by the strength or falls through without it") {
  const DosageReading mg = ReadDosageText("500mg three times a day");  // 1500 mg a day
  const Supply with_strength = ComputeSupply(84, std::nullopt, mg, std::nullopt, kDefaults,
                                             Unit("tablet", 250.0));
  CHECK(with_strength.days == 14);  // 84 x 250 mg / 1500 mg a day
  REQUIRE(with_strength.units_per_day);
  CHECK(*with_strength.units_per_day == doctest::Approx(6));
  const Supply without = ComputeSupply(84, std::nullopt, mg, 28, kDefaults,
                                       Unit("tablet", std::nullopt));
  CHECK(without.rule == SupplyRule::kProductDefault);
  CHECK(without.note == "the dosage is in mg and the strength per unit is not known");
  CHECK_FALSE(without.units_per_day);
}

TEST_CASE("units that do not relate fall through and ones used as the same dose unit divide") {
  const Supply puffs = ComputeSupply(10, std::nullopt, PerDay(8, "puff"), std::nullopt, kDefaults,
                                     Unit("ml", std::nullopt));
  CHECK(puffs.rule == SupplyRule::kDefaultDays);
  CHECK(puffs.note == "the dosage is in puff and the quantity in ml");
  const Supply capsules = ComputeSupply(56, std::nullopt, PerDay(2, "tablet"), std::nullopt,
                                        kDefaults, Unit("capsules", std::nullopt));
  CHECK(capsules.days == 28);
  const Supply unknown = ComputeSupply(56, std::nullopt, PerDay(2, "tablet"), std::nullopt,
                                       kDefaults, Unit("kit", std::nullopt));
  CHECK(unknown.rule == SupplyRule::kDefaultDays);
  CHECK(unknown.note == "unit \"kit\" is not known");
  const Supply bottle = ComputeSupply(1, std::nullopt, PerDay(2, "tablet"), std::nullopt,
                                      kDefaults, Unit("bottle", std::nullopt));
  CHECK(bottle.rule == SupplyRule::kDefaultDays);
  CHECK(bottle.note == "the quantity is in packs (\"bottle\") and what one holds is not known");
  const Supply grams = ComputeSupply(30, std::nullopt, PerDay(2000, "mg"), std::nullopt,
                                     kDefaults, Unit("g", std::nullopt));
  CHECK(grams.days == 15);  // 30 g at 2 g a day
}

TEST_CASE("administrations a day count one unit each only for single-unit forms") {
  // Common practice: "twice a day" of tablets, capsules, patches or suppositories means
  // one each time; of a liquid, an inhaler or a cream it says nothing about the amount.
  DosageReading twice;
  twice.units_per_day = 2;
  twice.unit = std::string(kAdministrationUnit);
  struct Case {
    const char* unit;
    std::optional<double> per_day;
  };
  const Case cases[] = {{"tablet", 2},         {"capsules", 2},     {"{tbl}", 2},  {"patch", 2},
                        {"suppository", 2},    {"sachet", 2},       {"ml", std::nullopt},
                        {"puff", std::nullopt}, {"g", std::nullopt}, {"", std::nullopt},
                        {"5ml spoonful", std::nullopt}};
  for (const Case& c : cases) {
    CAPTURE(c.unit);
    CHECK(UnitsPerDayOfQuantity(twice, Unit(c.unit, 10.0)) == c.per_day);
  }
  std::string why;
  CHECK_FALSE(UnitsPerDayOfQuantity(twice, Unit("mL", std::nullopt), &why));
  CHECK(why ==
        "the dosage gives a frequency without a dose, and the quantity is not counted in tablets, capsules or "
        "other single units (it is in \"mL\")");
}

TEST_CASE("a structured dose in mg, g or micrograms reaches the strength through its unit") {
  // 600 mg every 8 hours of 600 mg tablets: 3 tablets a day, 90 tablets last 30 days.
  DispensingRecord record;
  record.structured_units_per_day = 1800;
  record.structured_unit = "mg";
  const DosageReading mg = ReadRecordDosage(record);
  CHECK(mg.unit == "mg");
  const Supply supply = ComputeSupply(90, std::nullopt, mg, std::nullopt, kDefaults, Unit("tablet", 600.0));
  CHECK(supply.days == 30);
  REQUIRE(supply.units_per_day);
  CHECK(*supply.units_per_day == doctest::Approx(3));
  // Without the strength the amount a day stays unknown, and says why.
  const Supply unknown = ComputeSupply(90, std::nullopt, mg, std::nullopt, kDefaults, Unit("tablet"));
  CHECK_FALSE(unknown.units_per_day);
  CHECK(unknown.note == "the dosage is in mg and the strength per unit is not known");
  // An empty unit is the quantity's own (a dose stated without a unit).
  record.structured_unit.clear();
  record.structured_units_per_day = 2;
  CHECK(*UnitsPerDayOfQuantity(ReadRecordDosage(record), Unit("tablet", 600.0)) == doctest::Approx(2));
}

TEST_CASE("a record's structured dosage is preferred over its text") {
  DispensingRecord record;
  record.dosage = "one tablet daily";
  CHECK(*ReadRecordDosage(record).units_per_day == doctest::Approx(1));
  record.structured_units_per_day = 3;
  record.structured_as_needed = true;
  const DosageReading structured = ReadRecordDosage(record);
  CHECK(*structured.units_per_day == doctest::Approx(3));
  CHECK(structured.as_needed);
  record.structured_units_per_day.reset();
  CHECK(ReadRecordDosage(record).as_needed);  // the flag still counts with the text
}

}  // TEST_SUITE

}  // namespace medload
