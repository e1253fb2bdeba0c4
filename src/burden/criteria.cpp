#include "medload/burden/criteria.h"

#include <charconv>

#include "medload/format/output.h"

namespace medload {

std::string Criterion::Key() const {
  switch (kind) {
    case CriterionKind::kItems: return "items>=" + FormatNumber(threshold, 0);
    case CriterionKind::kAcb: return "acb>=" + FormatNumber(threshold, 0);
    case CriterionKind::kDbi: return "dbi>=" + FormatNumber(threshold, 3);
    case CriterionKind::kRule: return "rule:" + rule_id;
  }
  return "";
}

bool Criterion::Met(const Burden& burden) const {
  switch (kind) {
    case CriterionKind::kItems: return burden.items >= threshold;
    case CriterionKind::kAcb: return burden.acb >= threshold;
    case CriterionKind::kDbi: return burden.dbi >= threshold - 1e-9;
    case CriterionKind::kRule:
      for (const FiredRule& fired : burden.rules) {
        if (fired.rule->id == rule_id) return true;
      }
      return false;
  }
  return false;
}

Criterion RuleCriterion(std::string id) { return Criterion{CriterionKind::kRule, 0, std::move(id)}; }

Result<Criterion> ParseCriterion(std::string_view text) {
  const auto bad = [&](std::string_view why) {
    return Status::Usage("criterion \"" + std::string(text) + "\" " + std::string(why) +
                         "; use items=N, acb=N, dbi=X or rule:ID");
  };
  for (std::string_view prefix : {"rule:", "rule="}) {
    if (text.substr(0, prefix.size()) == prefix) {
      if (text.size() == prefix.size()) return bad("names no rule");
      return RuleCriterion(std::string(text.substr(prefix.size())));
    }
  }
  const size_t op = text.find_first_of(">=");
  if (op == std::string_view::npos) return bad("has no threshold");
  const std::string_view name = text.substr(0, op);
  std::string_view number = text.substr(op);
  if (number.substr(0, 2) == ">=") number.remove_prefix(2);
  else if (number[0] == '=') number.remove_prefix(1);
  else return bad("has an unknown comparison");
  Criterion criterion;
  if (name == "items") criterion.kind = CriterionKind::kItems;
  else if (name == "acb") criterion.kind = CriterionKind::kAcb;
  else if (name == "dbi") criterion.kind = CriterionKind::kDbi;
  else return bad("measures nothing known");
  double value = 0;
  auto [end, error] = std::from_chars(number.data(), number.data() + number.size(), value);
  if (error != std::errc() || end != number.data() + number.size() || !(value >= 0)) {
    return bad("has a threshold that is not a number >= 0");
  }
  if (criterion.kind != CriterionKind::kDbi && value != static_cast<double>(static_cast<long>(value))) {
    return bad("needs a whole number");
  }
  criterion.threshold = value;
  return criterion;
}

Status CheckRulesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables) {
  for (const Criterion& criterion : criteria) {
    if (criterion.kind == CriterionKind::kRule && tables.FindRule(criterion.rule_id) == nullptr) {
      return Status::Input("rule \"" + criterion.rule_id +
                           "\" is not in the formulary's rules.json; 'medload formulary rules' lists them");
    }
  }
  return Status::Ok();
}

}  // namespace medload
