// Combination rules as loaded from formulary/rules.json: what a rule requires of a
// patient's active medicines and what it forbids (classes, ingredients, scale scores,
// counts), the routes it counts, its minimum age and its citation. Plain data; the loader
// and checker live in formulary/, the evaluation in burden/.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/formulary/product.h"

namespace medload {

// What a requirement counts (product specification section 5, "Rules").
enum class RuleCount {
  kIngredients,  // distinct active ingredients: one ingredient in two products is one drug
  kMedicines,    // distinct active medicines (products with different ingredient sets):
                 // for "two paracetamol-containing products"
};

// One requirement: at least `at_least` DISTINCT active ingredients (or medicines, with
// `count`) that are in any of `classes`, or named in `ingredients` (canonical names), or
// score at least `scale_score_at_least` on `scale`. Any of the three kinds may be
// combined: an ingredient matches if any of them matches.
struct RuleRequirement {
  std::vector<std::string> classes;
  std::vector<std::string> ingredients;        // canonical ingredient names
  std::optional<int> scale_score_at_least;
  std::string scale = "acb";                   // the scale the score refers to
  int at_least = 1;
  RuleCount count = RuleCount::kIngredients;
};

// Minimum measures on the date for the rule to fire (each optional).
struct RuleMeasures {
  std::optional<int> items;
  std::optional<int> acb;
  std::optional<double> dbi;
};

struct Rule {
  std::string id;           // stable identifier, used by --rule ID and in output keys
  std::string title;        // one line
  std::string explanation;  // for the pharmacist: why it matters, what to consider
  std::string source;       // the citation of the published source (authors, year)
  // Minimum age in completed years on the date (65 for criteria written for older
  // people: Beers, STOPP); the rule is not judged when the age is unknown.
  std::optional<int> age_min;
  RuleMeasures measures;
  std::vector<RuleRequirement> require;  // all must hold
  size_t position = 0;      // index in rules.json's "rules" array, for fault messages
  std::vector<RuleRequirement> forbid = {};  // none may hold ("unless a PPI is active")
  // The routes whose medicines the rule counts; empty: the formulary's systemic routes.
  std::vector<Route> routes = {};
  // True once the rule has been checked against the publication it cites; false shows
  // "check against the current edition before local use" beside the citation.
  bool source_checked = false;
};

// What outputs show as a rule's source: the citation, followed, when the rule has not
// been checked against it, by "; not yet checked against the publication: check against
// the current edition before local use".
std::string RuleSourceText(const Rule& rule);

// Parses the text of rules.json (format in docs/formulary.md). Every fault is appended
// to `faults` as "FILE: /json/pointer: fault" (or "FILE:LINE: ..." for a syntax error),
// FILE being `file_name`; rules with a fault are left out of the result. Names are kept
// as written: Formulary::FromTables maps ingredient names to canonical ones and
// CheckTables reports unknown classes, ingredients and scales.
std::vector<Rule> ParseRules(std::string_view json_text, std::string_view file_name,
                             std::vector<std::string>& faults);

}  // namespace medload
