#include <doctest/doctest.h>

#include <string>

#include "formulary/formulary_fixture.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

TEST_SUITE("formulary/resolution_json") {

TEST_CASE("a resolution survives a round trip through its JSON string") {
  for (const char* text : {"Co-codamol 30mg/500mg tablets", "Fentanyl 25micrograms/hour transdermal patches",
                           "Softpore dressing 10cm x 10cm", "Frobozz 10mg tablets",
                           "Frobazine 10mg and paracetamol 500mg tablets", "Oxybutinin 5mg tabs"}) {
    const std::string description = text;
    CAPTURE(description);
    const ResolvedProduct original = Resolve(testing::BundledFormulary(), description);
    auto parsed = ParseResolution(SerialiseResolution(original));
    REQUIRE(parsed.ok());
    CHECK(parsed->match == original.match);
    CHECK(parsed->match_detail == original.match_detail);
    CHECK(parsed->form == original.form);
    CHECK(parsed->dose_unit == original.dose_unit);
    CHECK(parsed->route == original.route);
    CHECK(parsed->non_medicine == original.non_medicine);
    CHECK(parsed->default_supply_days == original.default_supply_days);
    CHECK(parsed->unknown == original.unknown);
    REQUIRE(parsed->spellings.size() == original.spellings.size());
    for (size_t i = 0; i < original.spellings.size(); ++i) {
      CHECK(parsed->spellings[i].written == original.spellings[i].written);
      CHECK(parsed->spellings[i].read_as == original.spellings[i].read_as);
    }
    REQUIRE(parsed->ingredients.size() == original.ingredients.size());
    for (size_t i = 0; i < original.ingredients.size(); ++i) {
      CHECK(parsed->ingredients[i].ingredient == original.ingredients[i].ingredient);
      CHECK(parsed->ingredients[i].mg_per_unit == original.ingredients[i].mg_per_unit);
      CHECK(parsed->ingredients[i].mg_per_day == original.ingredients[i].mg_per_day);
    }
  }
}

TEST_CASE("absent strengths are written as null") {
  const nlohmann::json json = ResolvedProductToJson(
      Resolve(testing::BundledFormulary(), "Fentanyl 25micrograms/hour transdermal patches"));
  CHECK(json.at("ingredients").at(0).at("mg_per_unit").is_null());
  CHECK(json.at("ingredients").at(0).at("mg_per_day").get<double>() == doctest::Approx(0.6));
  CHECK(json.at("route") == "transdermal");
  CHECK(json.at("match") == "product");
  CHECK(json.at("default_supply_days") == 3);
}

TEST_CASE("a damaged resolution is an input status naming the element") {
  struct Case {
    const char* text;
    const char* message;
  };
  for (const Case& c : {Case{"not json", "resolution JSON: not valid JSON"},
                        Case{"[]", "resolution JSON: : not an object"},
                        Case{R"({"ingredients": 3})", "resolution JSON: /ingredients: missing or not an array"},
                        Case{R"({"ingredients": [{"mg_per_unit": 1}]})",
                             "resolution JSON: /ingredients/0/ingredient: missing or not a string"},
                        Case{R"({"ingredients": [{"ingredient": "x", "mg_per_unit": "1"}]})",
                             "resolution JSON: /ingredients/0/mg_per_unit: not a number"},
                        Case{R"({"ingredients": [], "route": "by mouth"})", "resolution JSON: /route: not a route name"},
                        Case{R"({"ingredients": [], "match": "maybe"})", "resolution JSON: /match: not a match kind"},
                        Case{R"({"ingredients": [], "unknown": "frobazine"})",
                             "resolution JSON: /unknown: not a string or an array of strings"},
                        Case{R"({"ingredients": [], "unknown": [3]})",
                             "resolution JSON: /unknown/0: not a string or an array of strings"},
                        Case{R"({"ingredients": [], "spellings": [{"written": "x"}]})",
                             "resolution JSON: /spellings/0: not an object with written and read_as"}}) {
    const std::string text = c.text;
    CAPTURE(text);
    auto parsed = ParseResolution(text);
    REQUIRE_FALSE(parsed.ok());
    CHECK(parsed.status().code() == StatusCode::kInput);
    CHECK(parsed.status().message() == c.message);
  }
}
TEST_CASE("a code system that is not UTF-8 is serialised with U+FFFD instead of throwing") {
  // Found by the resolver fuzz target: the code system is written into match_detail as
  // given, and a byte that is not UTF-8 made the JSON library throw.
  const ResolvedProduct product =
      Resolve(testing::BundledFormulary(), "", "N02AJ06", "http\xff://www.whocc.no/atc");
  REQUIRE(product.match == MatchKind::kCode);
  std::string text;
  REQUIRE_NOTHROW(text = SerialiseResolution(product));
  auto parsed = ParseResolution(text);
  REQUIRE(parsed.ok());
  CHECK(parsed->match == MatchKind::kCode);
  CHECK(parsed->match_detail.find("http\xEF\xBF\xBD://www.whocc.no/atc") != std::string::npos);
  CHECK(parsed->ingredients.size() == product.ingredients.size());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
