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
// config) or "rule:ID" / "rule=ID". Thresholds are numbers from 0: items and acb whole
// numbers up to 1000, dbi up to 100 (inf, nan and 1e400 are refused). Errors
// (Status::Usage) name the text, the fault and what is accepted.
Result<Criterion> ParseCriterion(std::string_view text);
// The criterion of `--rule ID`.
Criterion RuleCriterion(std::string id);

// Status::Input if a rule criterion names a rule the tables do not have.
Status CheckRulesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables);

}  // namespace medload
