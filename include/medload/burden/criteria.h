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

// kFalls, kTsdd: at least N (docs/measures.md, "Longitudinal measures"); kPdcBelow: some
// proportion of days covered below X (of any medicine, or of a group of classes).
enum class CriterionKind { kItems, kAcb, kDbi, kRule, kFalls, kTsdd, kPdcBelow };

struct Criterion {
  CriterionKind kind = CriterionKind::kItems;
  double threshold = 0;  // items, acb and falls are whole numbers; pdc is in (0, 1]
  std::string rule_id;   // kRule only
  std::vector<std::string> classes;  // kPdcBelow only: the group's classes, sorted; empty: any medicine

  // The output key: "items>=10", "acb>=3", "dbi>=1", "dbi>=1.5", "rule:ID", "falls>=3",
  // "tsdd>=1095", "pdc<0.8", "pdc<0.8:ace-inhibitor|arb".
  std::string Key() const;
  // True when `burden` meets the criterion.
  bool Met(const Burden& burden) const;
  bool operator==(const Criterion&) const = default;
};

// Parses "items=10", "items>=10", "acb=3", "dbi=1.0", "falls=3", "tsdd=1095" (as given to
// --at-least or found in a config), "pdc<0.8" or "pdc<0.8:CLASS|CLASS" (a config),
// "rule:ID" / "rule=ID", or a bare rule id "ID" (letters, digits, '-', '_', '.'; not a
// measure's name). Thresholds are numbers from 0: items, acb and falls whole numbers up
// to 1000, tsdd up to 1,000,000, dbi up to 100, pdc above 0 and at most 1 (inf, nan and
// 1e400 are refused). Errors (Status::Usage) name the text, the fault and what is accepted.
Result<Criterion> ParseCriterion(std::string_view text);
// Parses the value of --below: "pdc=0.8" or "pdc=0.8:CLASS|CLASS" (the only measure
// selected below a threshold).
Result<Criterion> ParseBelowCriterion(std::string_view text);
// Adds the class group of every pdc criterion with classes to options.pdc_groups (once),
// so that the burden carries their combined PDC.
void AddPdcGroups(const std::vector<Criterion>& criteria, MeasureOptions& options);
// The criterion of `--rule ID`.
Criterion RuleCriterion(std::string id);
// The criterion of a rule as written by a user: "ID", or "rule:ID" / "rule=ID" (the form
// outputs and configs print). Usage error naming the text when what is left is not a rule
// id (letters, digits, '-', '_', '.').
Result<Criterion> ParseRuleCriterion(std::string_view text);

// Status::Input if a rule criterion names a rule the tables do not have, or a pdc
// criterion a class that no ingredient carries. For a rule, the message suggests a close
// id (same words, some left out or added) and points at `medload formulary rules`:
//   rule "nsaid-with-anticoagulant" is not in the formulary's rules.json; did you mean
//   "nsaid-anticoagulant"? ('medload formulary rules' lists them)
Status CheckRulesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables);

}  // namespace medload
