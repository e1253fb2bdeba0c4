// Combination rules as loaded from formulary/rules.json: what a rule requires of a
// patient's active medicines (classes, ingredients, scale scores, counts, age, measures).
// Plain data; the loader and checker live in formulary/, the evaluation in burden/.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// One requirement: at least `at_least` DISTINCT active medicines that contain an
// ingredient in any of `classes`, or named in `ingredients` (canonical names), or scoring
// at least `scale_score_at_least` on `scale`. Any of the three kinds may be combined: a
// medicine matches if any of them matches.
struct RuleRequirement {
  std::vector<std::string> classes;
  std::vector<std::string> ingredients;        // canonical ingredient names
  std::optional<int> scale_score_at_least;
  std::string scale = "acb";                   // the scale the score refers to
  int at_least = 1;
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
  std::string source;       // published source (authors, year)
  std::optional<int> age_min;
  RuleMeasures measures;
  std::vector<RuleRequirement> require;  // all must hold
  size_t position = 0;      // index in rules.json's "rules" array, for fault messages
};

// Parses the text of rules.json (format in docs/formulary.md). Every fault is appended
// to `faults` as "FILE: /json/pointer: fault" (or "FILE:LINE: ..." for a syntax error),
// FILE being `file_name`; rules with a fault are left out of the result. Names are kept
// as written: Formulary::FromTables maps ingredient names to canonical ones and
// CheckTables reports unknown classes, ingredients and scales.
std::vector<Rule> ParseRules(std::string_view json_text, std::string_view file_name,
                             std::vector<std::string>& faults);

}  // namespace medload
