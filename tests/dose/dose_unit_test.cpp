#include "medload/dose/dose_unit.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("dose/dose_unit") {

TEST_CASE("unit spellings reduce to one canonical name and a factor") {
  struct Case {
    const char* text;
    const char* name;
    double factor;
  };
  // Common practice: British dispensing and prescribing spellings; the 5 ml medicine
  // spoon is the standard oral dosing spoon (common practice); 1 g = 1000 mg and
  // 1 microgram = 0.001 mg (SI).
  const Case cases[] = {
      {"tablet", "tablet", 1},        {"Tablets", "tablet", 1},     {"TABS", "tablet", 1},
      {"tablet(s)", "tablet", 1},     {"{tbl}", "tablet", 1},       {"caps", "capsule", 1},
      {"capsule", "capsule", 1},      {"mL", "ml", 1},              {"millilitres", "ml", 1},
      {"L", "ml", 1000},              {"5ml spoonful", "ml", 5},    {"5 ml spoonfuls", "ml", 5},
      {"2.5ml spoon", "ml", 2.5},     {"spoonful", "ml", 5},        {"puffs", "puff", 1},
      {"inhalation", "puff", 1},      {"actuations", "puff", 1},    {"doses", "dose", 1},
      {"drops", "drop", 1},           {"sachets", "sachet", 1},     {"patches", "patch", 1},
      {"application", "application", 1}, {"suppositories", "suppository", 1},
      {"pessaries", "pessary", 1},    {"lozenge", "lozenge", 1},    {"pastilles", "pastille", 1},
      {"sprays", "spray", 1},         {"units", "unit", 1},         {"IU", "unit", 1},
      {"mg", "mg", 1},                {"g", "mg", 1000},            {"grams", "mg", 1000},
      {"micrograms", "mg", 0.001},    {"mcg", "mg", 0.001},         {" ampoules ", "ampoule", 1},
      {"vial", "vial", 1},            {"enema", "enema", 1},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const auto unit = ReadDoseUnit(c.text);
    REQUIRE(unit);
    CHECK(unit->name == c.name);
    CHECK(unit->factor == doctest::Approx(c.factor));
  }
}

TEST_CASE("text that is not a known unit gives no unit") {
  for (const char* text : {"", "  ", "bottle", "pack", "5ml", "0ml spoon", "500ml spoon",
                           "5 ml tablet", "tablet tablet", "{}", "(s)", "\xC2\xB5g"}) {
    CAPTURE(text);
    CHECK_FALSE(ReadDoseUnit(text));
  }
}

TEST_CASE("tablets and capsules and puffs and doses are the same dose unit") {
  CHECK(SameDoseUnit("tablet", "tablet"));
  CHECK(SameDoseUnit("tablet", "capsule"));
  CHECK(SameDoseUnit("capsule", "tablet"));
  CHECK(SameDoseUnit("puff", "dose"));
  CHECK_FALSE(SameDoseUnit("ml", "drop"));
  CHECK_FALSE(SameDoseUnit("tablet", "mg"));
  CHECK_FALSE(SameDoseUnit("puff", "spray"));
}

}  // TEST_SUITE

}  // namespace medload
