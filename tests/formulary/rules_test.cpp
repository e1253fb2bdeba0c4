#include "medload/formulary/rules.h"

#include <doctest/doctest.h>

#include <algorithm>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"

namespace medload {
namespace {

std::vector<Rule> Parse(const std::string& text, std::vector<std::string>& faults) {
  return ParseRules(text, "rules.json", faults);
}

TEST_SUITE("formulary/rules") {

TEST_CASE("the documented example rule parses with every field") {
  const std::string text = R"({"rules": [
    {"id": "aki-triple", "title": "ACE inhibitor or ARB with a diuretic and an NSAID",
     "explanation": "why", "source": "Lapi et al. BMJ 2013;346:e8525", "age_min": 0,
     "measures": {"items": 5, "acb": 3, "dbi": 1.5},
     "require": [
       {"classes": ["ace-inhibitor", "arb"], "at_least": 1},
       {"ingredients": ["furosemide"], "at_least": 2},
       {"scale_score_at_least": 3, "scale": "ars"},
       {"scale_score_at_least": 2}
     ]}]})";
  std::vector<std::string> faults;
  const std::vector<Rule> rules = Parse(text, faults);
  CHECK(faults.empty());
  REQUIRE(rules.size() == 1);
  const Rule& rule = rules[0];
  CHECK(rule.id == "aki-triple");
  CHECK(rule.source == "Lapi et al. BMJ 2013;346:e8525");
  CHECK(rule.age_min == 0);
  CHECK(rule.measures.items == 5);
  CHECK(rule.measures.acb == 3);
  CHECK(rule.measures.dbi == doctest::Approx(1.5));
  REQUIRE(rule.require.size() == 4);
  CHECK(rule.require[0].classes == std::vector<std::string>{"ace-inhibitor", "arb"});
  CHECK(rule.require[1].ingredients == std::vector<std::string>{"furosemide"});
  CHECK(rule.require[1].at_least == 2);
  CHECK(rule.require[2].scale == "ars");
  CHECK(rule.require[2].scale_score_at_least == 3);
  CHECK(rule.require[3].scale == "acb");   // the default scale
  CHECK(rule.require[3].at_least == 1);    // the default count
}

TEST_CASE("each malformed element is reported with its JSON pointer") {
  struct Case {
    const char* json;
    const char* fault;
  };
  const std::vector<Case> cases = {
      {R"({"rules": {}})", "rules.json: /rules: missing or not an array"},
      {R"({"rules": [3]})", "rules.json: /rules/0: not an object"},
      {R"({"rules": [{"title": "t", "explanation": "e", "source": "s", "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/id: missing or not a non-empty string"},
      {R"({"rules": [{"id": "r", "title": "", "explanation": "e", "source": "s", "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/title: missing or not a non-empty string"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "require": []}]})",
       "rules.json: /rules/0/require: missing or not a non-empty array"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "require": [{"at_least": 2}]}]})",
       "rules.json: /rules/0/require/0: needs classes, ingredients or scale_score_at_least"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"], "at_least": 0}]}]})",
       "rules.json: /rules/0/require/0/at_least: not a whole number from 1 to 1000"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"scale_score_at_least": 4}]}]})",
       "rules.json: /rules/0/require/0/scale_score_at_least: not a whole number from 1 to 3"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": "nsaid"}]}]})",
       "rules.json: /rules/0/require/0/classes: not an array of strings"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "colour": "red",
           "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/colour: unknown key"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "age_min": -1,
           "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/age_min: not a whole number from 0 to 150"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "measures": {"dbi": "high"},
           "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/measures/dbi: not a number >= 0"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"]}], "forbid": {"classes": ["ppi"]}}]})",
       "rules.json: /rules/0/forbid: not an array"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"]}], "forbid": [{"at_least": 1}]}]})",
       "rules.json: /rules/0/forbid/0: needs classes, ingredients or scale_score_at_least"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"]}], "routes": ["oral", "by mouth"]}]})",
       "rules.json: /rules/0/routes/1: \"by mouth\" is not a route name"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"]}], "routes": []}]})",
       "rules.json: /rules/0/routes: empty: leave the key out for the systemic routes"},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
           "require": [{"classes": ["x"], "count": "products"}]}]})",
       "rules.json: /rules/0/require/0/count: \"products\" is not \"ingredients\" or \"medicines\""},
      {R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s", "source_checked": "yes",
           "require": [{"classes": ["x"]}]}]})",
       "rules.json: /rules/0/source_checked: not true or false"},
      {R"json({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "STOPP version 3, from memory",
           "require": [{"classes": ["x"]}]}]})json",
       "rules.json: /rules/0/source: cites \"from memory\": give the citation and \"source_checked\": false"},
      {R"json({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "STOPP version 3 (from memory)",
           "source_checked": true, "require": [{"classes": ["x"]}]}]})json",
       "rules.json: /rules/0/source_checked: true, but the source says \"(from memory)\""},
  };
  for (const Case& c : cases) {
    const std::string expected = c.fault;
    CAPTURE(expected);
    std::vector<std::string> faults;
    const std::vector<Rule> rules = Parse(c.json, faults);
    REQUIRE(faults.size() >= 1);
    CHECK(faults[0] == expected);
    CHECK(rules.empty());
  }
}

TEST_CASE("forbidden classes, routes, a count of medicines and a checked source are read") {
  const std::string text = R"({"rules": [
    {"id": "nsaid-antiplatelet", "title": "t", "explanation": "e", "source": "STOPP version 3",
     "source_checked": true, "routes": ["nasal", "oral", "sublingual"],
     "require": [{"classes": ["nsaid"]}, {"ingredients": ["paracetamol"], "count": "medicines", "at_least": 2}],
     "forbid": [{"classes": ["ppi"]}]}]})";
  std::vector<std::string> faults;
  const std::vector<Rule> rules = Parse(text, faults);
  CHECK(faults.empty());
  REQUIRE(rules.size() == 1);
  const Rule& rule = rules[0];
  CHECK(rule.source_checked);
  // In the specification's order, aliases read as their route.
  CHECK(rule.routes == std::vector<Route>{Route::kOral, Route::kSublingualBuccal, Route::kNasal});
  CHECK(rule.require[0].count == RuleCount::kIngredients);  // the default
  CHECK(rule.require[1].count == RuleCount::kMedicines);
  REQUIRE(rule.forbid.size() == 1);
  CHECK(rule.forbid[0].classes == std::vector<std::string>{"ppi"});
  CHECK(RuleSourceText(rule) == "STOPP version 3");
}

TEST_CASE("an older table's '(from memory)' mark leaves the citation and reads as not yet checked") {
  std::vector<std::string> faults;
  const std::vector<Rule> rules = Parse(R"json({"rules": [{"id": "r", "title": "t", "explanation": "e",
      "source": "STOPP/START criteria version 3 (From Memory)", "require": [{"classes": ["x"]}]}]})json", faults);
  CHECK(faults.empty());
  REQUIRE(rules.size() == 1);
  CHECK(rules[0].source == "STOPP/START criteria version 3");
  CHECK_FALSE(rules[0].source_checked);
}

TEST_CASE("a source not yet checked is shown with a reminder to check the current edition") {
  Rule rule;
  rule.source = "STOPP/START criteria version 3, O'Mahony et al. Eur Geriatr Med 2023;14:625-632";
  CHECK(RuleSourceText(rule) ==
        "STOPP/START criteria version 3, O'Mahony et al. Eur Geriatr Med 2023;14:625-632; not yet checked against "
        "the publication: check against the current edition before local use");
}

TEST_CASE("a duplicate rule id is a fault and the good rules are kept") {
  const std::string text = R"({"rules": [
    {"id": "a", "title": "t", "explanation": "e", "source": "s", "require": [{"classes": ["x"]}]},
    {"id": "a", "title": "t", "explanation": "e", "source": "s", "require": [{"classes": ["x"]}]}]})";
  std::vector<std::string> faults;
  const std::vector<Rule> rules = Parse(text, faults);
  CHECK(faults == std::vector<std::string>{"rules.json: /rules/1/id: duplicate rule id \"a\""});
  REQUIRE(rules.size() == 1);
  CHECK(rules[0].position == 0);
}

TEST_CASE("rule ingredient names are mapped to canonical names when the formulary loads") {
  const Rule* rule = nullptr;
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  folder.Write("rules.json", R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
      "require": [{"ingredients": ["Chlorpheniramine"]}]}]})");
  auto loaded = LoadFormulary(folder.path());
  REQUIRE(loaded.ok());
  rule = loaded->FindRule("r");
  REQUIRE(rule != nullptr);
  CHECK(rule->require[0].ingredients == std::vector<std::string>{"chlorphenamine"});
}

TEST_CASE("the bundled rules include the combinations the project promises") {
  const Formulary& formulary = testing::BundledFormulary();
  for (const char* id : {"aki-triple", "opioid-benzodiazepine", "opioid-gabapentinoid", "cns-active-3",
                         "anticholinergic-2", "anticholinergic-cholinesterase", "nsaid-anticoagulant",
                         "nsaid-antiplatelet", "duplicate-nsaid", "duplicate-opioid", "duplicate-ssri",
                         "duplicate-antipsychotic", "duplicate-benzodiazepine", "dual-ras-blockade"}) {
    const std::string text = id;
    CAPTURE(text);
    const Rule* rule = formulary.FindRule(text);
    REQUIRE(rule != nullptr);
    CHECK_FALSE(rule->source.empty());
    CHECK_FALSE(rule->explanation.empty());
  }
  // Source: Lapi et al. BMJ 2013;346:e8525 (ACE inhibitor or ARB, diuretic, NSAID).
  const Rule* aki = formulary.FindRule("aki-triple");
  REQUIRE(aki->require.size() == 3);
  CHECK(aki->require[2].classes == std::vector<std::string>{"nsaid"});
  // Source: 2023 AGS Beers Criteria, J Am Geriatr Soc 2023;71:2052 (three or more).
  CHECK(formulary.FindRule("cns-active-3")->require[0].at_least == 3);
}

TEST_CASE("bundled rules citing only criteria for older people apply from 65") {
  // Source: product specification section 5 (Beers and STOPP apply from 65). A rule that
  // also cites a regulator or product information applies at any age.
  for (const Rule& rule : testing::BundledFormulary().rules()) {
    CAPTURE(rule.id);
    const bool older_people = rule.source.find("Beers") != std::string::npos ||
                              rule.source.find("STOPP") != std::string::npos;
    const bool any_age = rule.source.find("FDA") != std::string::npos ||
                         rule.source.find("MHRA") != std::string::npos ||
                         rule.source.find("product information") != std::string::npos;
    if (older_people && !any_age) CHECK(rule.age_min == 65);
    if (!older_people) CHECK_FALSE(rule.age_min.has_value());
  }
}

TEST_CASE("bundled rule titles and citations say what the rule does and cite the current STOPP") {
  // STOPP/START version 3 (O'Mahony et al. Eur Geriatr Med 2023) replaced version 2
  // (O'Mahony et al. Age Ageing 2015); "definite" anticholinergic activity is ACB 2 or 3
  // (Boustani et al. 2008), so a rule needing 3 must not say "definite".
  for (const Rule& rule : testing::BundledFormulary().rules()) {
    CAPTURE(rule.id);
    CHECK(rule.title.find("definite") == std::string::npos);
    CHECK(rule.source.find("version 2") == std::string::npos);
    CHECK(rule.source.find("Age Ageing 2015") == std::string::npos);
    if (rule.source.find("STOPP") != std::string::npos) {
      CHECK(rule.source.find("STOPP/START criteria version 3, O'Mahony et al. Eur Geriatr Med 2023") !=
            std::string::npos);
    }
  }
}

TEST_CASE("the bundled NSAID and antiplatelet rule forbids a PPI and the opioid rules count nasal opioids") {
  const Formulary& formulary = testing::BundledFormulary();
  // Source: STOPP/START version 3 (NSAID with antiplatelet without PPI prophylaxis).
  const Rule* rule = formulary.FindRule("nsaid-antiplatelet");
  REQUIRE(rule != nullptr);
  REQUIRE(rule->forbid.size() == 1);
  CHECK(rule->forbid[0].classes == std::vector<std::string>{"ppi"});
  for (const char* id : {"opioid-benzodiazepine", "opioid-z-drug", "opioid-gabapentinoid", "duplicate-opioid"}) {
    const std::string text = id;
    CAPTURE(text);
    const Rule* opioid = formulary.FindRule(text);
    REQUIRE(opioid != nullptr);
    CHECK(std::find(opioid->routes.begin(), opioid->routes.end(), Route::kNasal) != opioid->routes.end());
  }
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
