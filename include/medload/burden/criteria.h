// Selection criteria shared by the worklist, the cohort counts and the report config:
// "at least N items / ACB points / DBI" and "rule ID fired", with the fixed output keys
// `items>=10`, `acb>=3`, `dbi>=1`, `rule:ID` (docs/measures.md).
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "medload/burden/burden.h"
#include "medload/core/status.h"

namespace medload {

enum class CriterionKind { kItems, kAcb, kDbi, kRule };

struct Criterion {
  CriterionKind kind = CriterionKind::kItems;
  double threshold = 0;  // items and acb are whole numbers
  std::string rule_id;   // kRule only

  // The output key: "items>=10", "acb>=3", "dbi>=1", "dbi>=1.5", "rule:ID".
  std::string Key() const;
  // True when `burden` meets the criterion.
  bool Met(const Burden& burden) const;
  bool operator==(const Criterion&) const = default;
};

// Parses "items=10", "items>=10", "acb=3", "dbi=1.0" (as given to --at-least or found in a
// config), "rule:ID" / "rule=ID", or a bare rule id "ID" (letters, digits, '-', '_', '.';
// not items, acb or dbi). Usage error naming the text and what is accepted.
Result<Criterion> ParseCriterion(std::string_view text);
// The criterion of `--rule ID`.
Criterion RuleCriterion(std::string id);
// The criterion of a rule as written by a user: "ID", or "rule:ID" / "rule=ID" (the form
// outputs and configs print). Usage error naming the text when what is left is not a rule
// id (letters, digits, '-', '_', '.').
Result<Criterion> ParseRuleCriterion(std::string_view text);

// Status::Input if a rule criterion names a rule the tables do not have; the message
// suggests a close id (same words, some left out or added) and points at
// `medload formulary rules`, which lists them:
//   rule "nsaid-with-anticoagulant" is not in the formulary's rules.json; did you mean
//   "nsaid-anticoagulant"? ('medload formulary rules' lists them)
Status CheckRulesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables);

}  // namespace medload
