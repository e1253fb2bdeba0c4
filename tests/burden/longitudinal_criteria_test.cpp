// The criteria on the longitudinal measures: falls>=N, tsdd>=N and pdc<X[:CLASSES], their
// stable keys, their parsing (table-driven, messages exact) and when a burden meets them.
#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "burden/longitudinal_fixture.h"
#include "medload/burden/criteria.h"

namespace medload {
namespace {

using testing::D;
using testing::LongitudinalFixture;
using testing::Rx;

}  // namespace

TEST_SUITE("burden/longitudinal_criteria") {

TEST_CASE("longitudinal criteria parse to stable keys") {
  struct Case {
    const char* text;
    const char* key;
  };
  const std::vector<Case> cases = {
      {"falls=3", "falls>=3"},          {"falls>=2", "falls>=2"},
      {"tsdd=1095", "tsdd>=1095"},      {"tsdd>=90.5", "tsdd>=90.5"},
      {"pdc<0.8", "pdc<0.8"},           {"pdc<0.80:statin", "pdc<0.8:statin"},
      {"pdc<0.8:arb|ace-inhibitor", "pdc<0.8:ace-inhibitor|arb"},
      {"pdc<1:arb|arb", "pdc<1:arb"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    auto criterion = ParseCriterion(c.text);
    REQUIRE_MESSAGE(criterion.ok(), criterion.status().message());
    CHECK(criterion->Key() == c.key);
    // The key parses back to the same criterion (configs and saved runs use keys).
    auto again = ParseCriterion(criterion->Key());
    REQUIRE(again.ok());
    CHECK(*again == *criterion);
  }
}

TEST_CASE("--below takes pdc=X with an optional class group") {
  struct Case {
    const char* text;
    const char* key;
  };
  for (const Case& c : {Case{"pdc=0.8", "pdc<0.8"}, Case{"pdc=0.9:statin", "pdc<0.9:statin"},
                        Case{"pdc<0.5", "pdc<0.5"}}) {
    CAPTURE(c.text);
    auto criterion = ParseBelowCriterion(c.text);
    REQUIRE(criterion.ok());
    CHECK(criterion->Key() == c.key);
  }
}

TEST_CASE("malformed longitudinal criteria are refused with the reason") {
  struct Case {
    const char* text;
    bool below;
    const char* message;
  };
  const std::vector<Case> cases = {
      {"falls=2.5", false, "criterion \"falls=2.5\" needs a whole number"},
      {"falls<3", false, "criterion \"falls<3\" has an unknown comparison; use falls=N"},
      {"tsdd=-1", false, "criterion \"tsdd=-1\" has a threshold that is not a number >= 0"},
      {"tsdd=lots", false, "criterion \"tsdd=lots\" has a threshold that is not a number >= 0"},
      {"pdc=0.8", false, "criterion \"pdc=0.8\" selects adherence below a threshold: write pdc<X"},
      {"pdc<1.5", false, "criterion \"pdc<1.5\" needs a proportion of days covered above 0 and at most 1 (pdc<0.8)"},
      {"pdc<0", false, "criterion \"pdc<0\" needs a proportion of days covered above 0 and at most 1 (pdc<0.8)"},
      {"pdc<0.8:Statins", false,
       "criterion \"pdc<0.8:Statins\" names a class \"Statins\" that is not lower-case-hyphenated"},
      {"pdc<0.8:statin|", false, "criterion \"pdc<0.8:statin|\" names a class \"\" that is not lower-case-hyphenated"},
      {"items=3", true,
       "criterion \"items=3\" cannot be selected below a threshold; only pdc can: pdc=X or pdc=X:CLASS|CLASS"},
      {"pdc=abc", true, "criterion \"pdc=abc\" needs a proportion of days covered above 0 and at most 1 (pdc<0.8)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    auto criterion = c.below ? ParseBelowCriterion(c.text) : ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().message() == c.message);
  }
}

TEST_CASE("a burden meets falls, tsdd and pdc criteria by its longitudinal measures") {
  LongitudinalFixture f;
  f.options.pdc_groups = {{"statin"}};
  const Timeline timeline = f.Build({Rx("diazepam 5mg tablets", D(2024, 10, 10), 28, 28),
                                     Rx("furosemide 40mg tablets", D(2024, 10, 10), 28, 28),
                                     Rx("oxybutynin 5mg tablets", D(2024, 9, 1), 100, 100),
                                     Rx("atorvastatin 20mg tablets", D(2024, 7, 1), 30, 30),
                                     Rx("atorvastatin 20mg tablets", D(2024, 7, 25), 30, 30),
                                     Rx("atorvastatin 20mg tablets", D(2024, 10, 1), 30, 30)});
  const Burden burden = EvaluateBurden(timeline, D(2024, 10, 30), f.tables, f.options, 80);
  // falls 2 (diazepam, furosemide), tsdd 100 (100 x 5 mg / 5 mg), statin PDC 90/122.
  CHECK(burden.longitudinal.falls == 2);
  CHECK(ParseCriterion("falls=2")->Met(burden));
  CHECK_FALSE(ParseCriterion("falls=3")->Met(burden));
  CHECK(ParseCriterion("tsdd=100")->Met(burden));
  CHECK_FALSE(ParseCriterion("tsdd=100.5")->Met(burden));
  CHECK(ParseCriterion("pdc<0.8")->Met(burden));
  CHECK_FALSE(ParseCriterion("pdc<0.7")->Met(burden));
  CHECK(ParseCriterion("pdc<0.8:statin")->Met(burden));
  // A group the options did not ask for has no figure, so its criterion is not met.
  CHECK_FALSE(ParseCriterion("pdc<0.8:ace-inhibitor")->Met(burden));
}

TEST_CASE("pdc criteria with classes add their groups once; unknown classes are refused") {
  MeasureOptions options;
  AddPdcGroups({*ParseCriterion("pdc<0.8:statin"), *ParseCriterion("pdc<0.9:statin"),
                *ParseCriterion("pdc<0.8:arb|ace-inhibitor"), *ParseCriterion("pdc<0.8")},
               options);
  CHECK(options.pdc_groups == std::vector<std::vector<std::string>>{{"statin"}, {"ace-inhibitor", "arb"}});
  LongitudinalFixture f;
  CHECK(CheckRulesExist({*ParseCriterion("pdc<0.8:statin")}, f.tables).ok());
  const Status unknown = CheckRulesExist({*ParseCriterion("pdc<0.8:statins")}, f.tables);
  CHECK(unknown.message() ==
        "criterion \"pdc<0.8:statins\": no ingredient in ingredients.csv carries the class \"statins\"");
}

}  // TEST_SUITE
}  // namespace medload
