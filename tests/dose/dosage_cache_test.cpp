#include "medload/dose/dosage_cache.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("dose/dosage_cache") {

TEST_CASE("a cached dosage reading equals a fresh reading of the same text") {
  DosageTextCache cache;
  for (const char* text : {"1 bd", "one or two tablets four times a day when required", "5ml tds", "",
                           "as directed"}) {
    const DosageReading fresh = ReadDosageText(text);
    const DosageReading& cached = cache.Read(text);
    CHECK(cached.units_per_day == fresh.units_per_day);
    CHECK(cached.as_needed == fresh.as_needed);
    CHECK(cached.unit == fresh.unit);
    CHECK(cached.understanding == fresh.understanding);
    CHECK(cached.note == fresh.note);
  }
  CHECK(cache.size() == 5);
}

TEST_CASE("a text read twice is stored once") {
  DosageTextCache cache;
  const double first = cache.Read("2 tablets twice daily").units_per_day.value_or(0);
  const double second = cache.Read("2 tablets twice daily").units_per_day.value_or(0);
  CHECK(first == 4);
  CHECK(second == 4);
  CHECK(cache.size() == 1);
}

TEST_CASE("a full cache starts again and still reads correctly") {
  DosageTextCache cache(2);
  cache.Read("1 od");
  cache.Read("1 bd");
  CHECK(cache.size() == 2);
  CHECK(cache.Read("1 tds").units_per_day == 3);
  CHECK(cache.size() == 1);
  CHECK(cache.Read("1 od").units_per_day == 1);
}

TEST_CASE("a description's pack content is read once and equals a fresh reading") {
  DosageTextCache cache(2);
  const char* inhaler = "Salbutamol 100micrograms/dose inhaler CFC free";  // no dose count: the device's usual 200
  const PackContent& first = cache.Pack(inhaler, "inhaler", 1);
  REQUIRE(first.doses.has_value());
  CHECK(*first.doses == 200);  // UsualDosesPerDevice (pack_content.h, from memory)
  const PackContent fresh = SupplyPackContent("Insulin aspart 100units/ml 3ml cartridge", "injection", 1);
  const PackContent& cached = cache.Pack("Insulin aspart 100units/ml 3ml cartridge", "injection", 1);
  CHECK(cached.ml == fresh.ml);
  CHECK(cached.units_per_ml == fresh.units_per_ml);
  CHECK(cached.doses == fresh.doses);
  CHECK(cache.Pack("Ventolin Evohaler 200 dose", "inhaler", 1).doses == 200);  // past capacity: starts again
}

}  // TEST_SUITE

}  // namespace medload
