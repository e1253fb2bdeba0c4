#include "medload/burden/criteria.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "medload/burden/tables.h"

namespace medload {
namespace {

BurdenTables TablesWithRules(const std::vector<std::string>& ids) {
  BurdenTables tables;
  for (const std::string& id : ids) {
    Rule rule;
    rule.id = id;
    rule.title = "title of " + id;
    tables.rules.push_back(rule);
  }
  return tables;
}

}  // namespace

TEST_SUITE("burden/criteria") {

TEST_CASE("every written form of a criterion parses to its output key") {
  struct Case {
    const char* text;
    const char* key;
  };
  const Case cases[] = {
      {"items=10", "items>=10"},
      {"items>=10", "items>=10"},
      {"acb=3", "acb>=3"},
      {"acb>=3", "acb>=3"},
      {"dbi=1.0", "dbi>=1"},
      {"dbi>=1.5", "dbi>=1.5"},
      {"rule:opioid-benzodiazepine", "rule:opioid-benzodiazepine"},
      {"rule=opioid-benzodiazepine", "rule:opioid-benzodiazepine"},
      {"opioid-benzodiazepine", "rule:opioid-benzodiazepine"},  // a bare rule id, as --rule takes it
      {"local_rule.2", "rule:local_rule.2"},
      {"dbi>=0.5", "dbi>=0.5"},
      {"dbi=100", "dbi>=100"},
      {"items=1000", "items>=1000"},
      {"falls-risk-pair", "rule:falls-risk-pair"},  // a rule id that starts with a measure's name
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE(criterion.ok());
    CHECK(criterion->Key() == c.key);
  }
}

TEST_CASE("a threshold that is not a number, not finite or beyond any patient is refused with what is accepted") {
  const std::string accepted = "; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id";
  const struct {
    std::string text;
    std::string fault;
  } cases[] = {
      {"dbi>=inf", "has a threshold above 100, which no patient can reach"},
      {"dbi=1e300", "has a threshold above 100, which no patient can reach"},
      {"dbi=100.5", "has a threshold above 100, which no patient can reach"},
      {"items=1e300", "has a threshold above 1000, which no patient can reach"},
      {"acb=1001", "has a threshold above 1000, which no patient can reach"},
      {"dbi=nan", "has a threshold that is not a number >= 0"},
      {"dbi=1e400", "has a threshold that is not a number >= 0"},
      {"items=-1", "has a threshold that is not a number >= 0"},
      {"items=2.5", "needs a whole number"},
      {"items", "has no threshold"},
      {"age>=80", "measures nothing known"},
      {"rule:", "names no rule id"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().code() == StatusCode::kUsage);
    CHECK(criterion.status().message() == "criterion \"" + c.text + "\" " + c.fault + accepted);
  }
}

TEST_CASE("a falls or tsdd threshold beyond any patient is refused") {
  const struct {
    std::string text;
    std::string fault;
  } cases[] = {
      {"falls>=inf", "has a threshold above 1000, which no patient can reach"},
      {"falls=1001", "has a threshold above 1000, which no patient can reach"},
      {"tsdd=1e300", "has a threshold above 1000000, which no patient can reach"},
      {"tsdd=nan", "has a threshold that is not a number >= 0"},
      {"falls=2.5", "needs a whole number"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().code() == StatusCode::kUsage);
    CHECK(criterion.status().message() == "criterion \"" + c.text + "\" " + c.fault);
  }
  CHECK(ParseCriterion("tsdd=1000000").ok());
  CHECK(ParseCriterion("falls=1000").ok());
}

TEST_CASE("a criterion that measures nothing known or has a bad threshold is refused with its text") {
  struct Case {
    const char* text;
    const char* message;
  };
  const Case cases[] = {
      {"items", "criterion \"items\" has no threshold; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"acb", "criterion \"acb\" has no threshold; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"items=ten", "criterion \"items=ten\" has a threshold that is not a number >= 0; use items=N, acb=N, "
                    "dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"items=2.5", "criterion \"items=2.5\" needs a whole number; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"age>=3", "criterion \"age>=3\" measures nothing known; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"items>3", "criterion \"items>3\" has an unknown comparison; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"rule:", "criterion \"rule:\" names no rule id; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
      {"rule:two words", "criterion \"rule:two words\" names no rule id; use items=N, acb=N, dbi=X, falls=N, tsdd=N, "
                         "pdc<X, rule:ID or a rule id"},
      {"two words", "criterion \"two words\" has no threshold; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().message() == c.message);
  }
}

TEST_CASE("a rule flag takes the id alone or with the rule: prefix that outputs print") {
  for (const char* text : {"nsaid-anticoagulant", "rule:nsaid-anticoagulant", "rule=nsaid-anticoagulant"}) {
    CAPTURE(text);
    const Result<Criterion> criterion = ParseRuleCriterion(text);
    REQUIRE(criterion.ok());
    CHECK(criterion->kind == CriterionKind::kRule);
    CHECK(criterion->rule_id == "nsaid-anticoagulant");
  }
  for (const char* text : {"", "rule:", "two words", "rule:a,b"}) {
    CAPTURE(text);
    const Result<Criterion> criterion = ParseRuleCriterion(text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().message() == "rule \"" + std::string(text) +
                                              "\" is not a rule id (letters, digits, '-', '_', '.'); use ID or rule:ID");
  }
}

TEST_CASE("an unknown rule is refused with a close id when one shares its words") {
  const BurdenTables tables = TablesWithRules({"aki-triple", "nsaid-anticoagulant", "duplicate-nsaid"});
  CHECK(CheckRulesExist({RuleCriterion("nsaid-anticoagulant"), *ParseCriterion("items=3")}, tables).ok());
  struct Case {
    const char* id;
    const char* message;
  };
  const Case cases[] = {
      {"nsaid-with-anticoagulant",
       "rule \"nsaid-with-anticoagulant\" is not in the formulary's rules.json; did you mean "
       "\"nsaid-anticoagulant\"? ('medload formulary rules' lists them)"},
      {"Duplicate-NSAID",
       "rule \"Duplicate-NSAID\" is not in the formulary's rules.json; did you mean \"duplicate-nsaid\"? "
       "('medload formulary rules' lists them)"},
      {"triple", "rule \"triple\" is not in the formulary's rules.json; did you mean \"aki-triple\"? "
                 "('medload formulary rules' lists them)"},
      {"opioid-benzodiazepine",
       "rule \"opioid-benzodiazepine\" is not in the formulary's rules.json ('medload formulary rules' lists them)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.id);
    const Status status = CheckRulesExist({RuleCriterion(c.id)}, tables);
    REQUIRE_FALSE(status.ok());
    CHECK(status.code() == StatusCode::kInput);
    CHECK(status.message() == c.message);
  }
}

}  // TEST_SUITE

}  // namespace medload
