#include "medload/burden/criteria.h"

#include <algorithm>
#include <charconv>

#include "burden/longitudinal_criteria.h"
#include "medload/format/output.h"

namespace medload {
namespace {

// The largest thresholds a criterion takes: items and acb, and dbi.
constexpr double kMaxCountThreshold = 1000;
constexpr double kMaxDbiThreshold = 100;

}  // namespace

std::string Criterion::Key() const {
  switch (kind) {
    case CriterionKind::kItems: return "items>=" + FormatNumber(threshold, 0);
    case CriterionKind::kAcb: return "acb>=" + FormatNumber(threshold, 0);
    case CriterionKind::kDbi: return "dbi>=" + FormatNumber(threshold, 3);
    case CriterionKind::kRule: return "rule:" + rule_id;
    case CriterionKind::kFalls:
    case CriterionKind::kTsdd:
    case CriterionKind::kPdcBelow: return LongitudinalKey(*this);
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
    case CriterionKind::kFalls:
    case CriterionKind::kTsdd:
    case CriterionKind::kPdcBelow: return LongitudinalMet(*this, burden.longitudinal);
  }
  return false;
}

Criterion RuleCriterion(std::string id) { return Criterion{CriterionKind::kRule, 0, std::move(id), {}}; }

namespace {

// A rule id as rules.json spells them: letters, digits, '-', '_' and '.', not empty.
bool IsRuleId(std::string_view id) {
  return !id.empty() && std::all_of(id.begin(), id.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '-' || c == '_' ||
           c == '.';
  });
}

// "ID" with a "rule:" or "rule=" prefix removed.
std::string_view WithoutRulePrefix(std::string_view text) {
  for (std::string_view prefix : {"rule:", "rule="}) {
    if (text.substr(0, prefix.size()) == prefix) return text.substr(prefix.size());
  }
  return text;
}

}  // namespace

Result<Criterion> ParseRuleCriterion(std::string_view text) {
  const std::string_view id = WithoutRulePrefix(text);
  if (!IsRuleId(id)) {
    return Status::Usage("rule \"" + std::string(text) +
                         "\" is not a rule id (letters, digits, '-', '_', '.'); use ID or rule:ID");
  }
  return RuleCriterion(std::string(id));
}

Result<Criterion> ParseCriterion(std::string_view text) {
  const auto bad = [&](std::string_view why) {
    return Status::Usage("criterion \"" + std::string(text) + "\" " + std::string(why) +
                         "; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X, rule:ID or a rule id");
  };
  if (auto longitudinal = ParseLongitudinalCriterion(text)) return *longitudinal;
  const std::string_view id = WithoutRulePrefix(text);
  if (id.size() != text.size()) {
    if (!IsRuleId(id)) return bad("names no rule id");
    return RuleCriterion(std::string(id));
  }
  const bool measure_word = text == "items" || text == "acb" || text == "dbi" || text == "falls" ||
                            text == "tsdd" || text == "pdc";
  if (text.find_first_of("<>=") == std::string_view::npos && !measure_word && IsRuleId(text)) {
    return RuleCriterion(std::string(text));  // a bare rule id, as --rule takes it
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
  // Past these no patient can qualify (a DBI adds under 1 a medicine; Hilmer et al. 2007),
  // so a larger threshold (inf, 1e300) is a typing slip, not a wish for an empty list.
  const bool dbi = criterion.kind == CriterionKind::kDbi;
  const double most = dbi ? kMaxDbiThreshold : kMaxCountThreshold;
  if (!(value <= most)) {
    return bad("has a threshold above " + FormatNumber(most, 0) + ", which no patient can reach");
  }
  if (!dbi && value != static_cast<double>(static_cast<long>(value))) return bad("needs a whole number");
  criterion.threshold = value;
  return criterion;
}

namespace {

std::vector<std::string> IdWords(std::string_view id) {
  std::vector<std::string> words;
  std::string word;
  for (const char c : id) {
    if (c == '-' || c == '_' || c == '.') {
      if (!word.empty()) words.push_back(std::move(word));
      word.clear();
    } else {
      word += static_cast<char>(c >= 'A' && c <= 'Z' ? c - 'A' + 'a' : c);
    }
  }
  if (!word.empty()) words.push_back(std::move(word));
  return words;
}

bool Contains(const std::vector<std::string>& words, const std::vector<std::string>& part) {
  return std::all_of(part.begin(), part.end(),
                     [&](const std::string& w) { return std::find(words.begin(), words.end(), w) != words.end(); });
}

// A rule id the user may have meant: one whose words all appear in `id`, or all of whose
// words `id` holds ("nsaid-with-anticoagulant" -> "nsaid-anticoagulant"); the first in
// the tables' order. Empty when none is close.
std::string CloseRuleId(const std::string& id, const std::vector<Rule>& rules) {
  const std::vector<std::string> typed = IdWords(id);
  if (typed.empty()) return "";
  for (const Rule& rule : rules) {
    const std::vector<std::string> words = IdWords(rule.id);
    if (!words.empty() && (Contains(typed, words) || Contains(words, typed))) return rule.id;
  }
  return "";
}

}  // namespace

Status CheckRulesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables) {
  if (Status classes = CheckPdcClassesExist(criteria, tables); !classes.ok()) return classes;
  for (const Criterion& criterion : criteria) {
    if (criterion.kind != CriterionKind::kRule || tables.FindRule(criterion.rule_id) != nullptr) continue;
    std::string message = "rule \"" + criterion.rule_id + "\" is not in the formulary's rules.json";
    const std::string close = CloseRuleId(criterion.rule_id, tables.rules);
    if (!close.empty()) message += "; did you mean \"" + close + "\"?";
    return Status::Input(message + " ('medload formulary rules' lists them)");
  }
  return Status::Ok();
}

}  // namespace medload
