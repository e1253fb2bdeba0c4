#include <doctest/doctest.h>

#include <optional>
#include <string>
#include <vector>

#include "medload/formulary/resolver.h"

namespace medload {
namespace {

struct Case {
  const char* text;
  std::vector<std::optional<double>> mg_per_unit;  // one per strength found
  std::vector<std::optional<double>> mg_per_day;
};

TEST_SUITE("formulary/strength") {

// Expected values are the arithmetic of the units as written (common practice:
// 1 g = 1000 mg, 1 mg = 1000 micrograms, 1% = 1 g per 100 g or ml = 10 mg per g or ml).
TEST_CASE("strengths are read in every way descriptions write them") {
  const std::vector<Case> cases = {
      {"amlodipine 10mg tablets", {10}, {std::nullopt}},
      {"amlodipine 10 mg tablets", {10}, {std::nullopt}},
      {"levothyroxine 500microgram tablets", {0.5}, {std::nullopt}},
      {"levothyroxine 500micrograms tablets", {0.5}, {std::nullopt}},
      {"levothyroxine 500mcg tablets", {0.5}, {std::nullopt}},
      {"metformin 1g tablets", {1000}, {std::nullopt}},
      {"morphine 5mg/5ml oral solution", {1}, {std::nullopt}},
      {"lactulose 3.35g/5ml oral solution", {670}, {std::nullopt}},
      {"co-codamol 30mg/500mg tablets", {30, 500}, {std::nullopt, std::nullopt}},
      {"co-codamol 30/500 tablets", {30, 500}, {std::nullopt, std::nullopt}},
      {"co-magaldrox 195mg/220mg/5ml suspension", {39, 44}, {std::nullopt, std::nullopt}},
      {"hydrocortisone 0.1% cream", {1}, {std::nullopt}},
      {"clobetasone 20mg/g cream", {20}, {std::nullopt}},
      {"buprenorphine 5micrograms/hour patches", {std::nullopt}, {0.12}},
      {"hyoscine 1mg/72hours patches", {std::nullopt}, {1.0 / 3}},
      {"rivastigmine 4.6mg/24hours patches", {std::nullopt}, {4.6}},
      {"insulin 100units/ml injection", {std::nullopt}, {std::nullopt}},
      {"salbutamol 100micrograms/dose inhaler", {0.1}, {std::nullopt}},
      {"fluticasone 250micrograms/dose / salmeterol 25micrograms/dose inhaler", {0.25, 0.025},
       {std::nullopt, std::nullopt}},
      {"fostair 100micrograms/dose / 6micrograms/dose inhaler", {0.1, 0.006}, {std::nullopt, std::nullopt}},
      {"co-phenotrope 2.5mg/25micrograms tablets", {2.5, 0.025}, {std::nullopt, std::nullopt}},
      {"haloperidol 50mg/1ml injection", {50}, {std::nullopt}},
      {"methotrexate 10mg/0.2ml injection", {50}, {std::nullopt}},
  };
  for (const Case& c : cases) {
    const std::string text = c.text;
    CAPTURE(text);
    const std::vector<Strength> strengths = ParseStrengths(text);
    REQUIRE(strengths.size() == c.mg_per_unit.size());
    for (size_t i = 0; i < strengths.size(); ++i) {
      CAPTURE(i);
      const auto per_unit = strengths[i].MgPerUnit();
      const auto per_day = strengths[i].MgPerDay();
      REQUIRE(per_unit.has_value() == c.mg_per_unit[i].has_value());
      if (per_unit) CHECK(*per_unit == doctest::Approx(*c.mg_per_unit[i]));
      REQUIRE(per_day.has_value() == c.mg_per_day[i].has_value());
      if (per_day) CHECK(*per_day == doctest::Approx(*c.mg_per_day[i]));
    }
  }
}

TEST_CASE("numbers that are not strengths are ignored") {
  for (const char* text : {"28 tablets", "pack of 56", "3ml cartridges", "200 dose inhaler", "adcal-d3 tablets",
                           "vitamin b12 injection", "01/02/2024", "10cm x 10cm", ""}) {
    const std::string value = text;
    CAPTURE(value);
    CHECK(ParseStrengths(value).empty());
  }
}

TEST_CASE("units per ml are kept for insulin, not turned into mg") {
  const std::vector<Strength> strengths = ParseStrengths("insulin aspart 100units/ml");
  REQUIRE(strengths.size() == 1);
  CHECK(strengths[0].unit == StrengthUnit::kUnits);
  CHECK(strengths[0].amount == 100);
  CHECK(strengths[0].per == "ml");
}

TEST_CASE("strengths keep their order and position in the text") {
  const std::vector<Strength> strengths = ParseStrengths("amiloride 5mg / furosemide 40mg");
  REQUIRE(strengths.size() == 2);
  CHECK(strengths[0].amount == 5);
  CHECK(strengths[1].amount == 40);
  CHECK(strengths[0].position < strengths[1].position);
  CHECK_FALSE(strengths[0].bare);
  CHECK(ParseStrengths("200/6 inhaler")[0].bare);
}

TEST_CASE("a strength of zero gives no mg per unit or per day") {
  // Found by the resolver fuzz target: "Amlodipine 0mg tablet" resolved to 0 mg a tablet,
  // a burden of nothing instead of an unknown dose.
  for (const char* text : {"0mg", "0.0mg/5ml", "0micrograms/hour", "0.0000000000000001mg"}) {
    CAPTURE(text);
    const std::vector<Strength> strengths = ParseStrengths(NormaliseText(text));
    REQUIRE(strengths.size() == 1);
    CHECK_FALSE(strengths[0].MgPerUnit());
    CHECK_FALSE(strengths[0].MgPerDay());
  }
  const std::vector<Strength> half = ParseStrengths(NormaliseText("0.5mg"));
  REQUIRE(half.size() == 1);
  CHECK(half[0].MgPerUnit() == 0.5);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
