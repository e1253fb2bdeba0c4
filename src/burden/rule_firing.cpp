#include "burden/rule_firing.h"

#include <algorithm>
#include <set>

namespace medload {
namespace {

bool IngredientMatches(const std::string& ingredient, const RuleRequirement& requirement,
                       const BurdenTables& tables) {
  for (const std::string& class_name : requirement.classes) {
    if (tables.HasClass(ingredient, class_name)) return true;
  }
  if (std::find(requirement.ingredients.begin(), requirement.ingredients.end(), ingredient) !=
      requirement.ingredients.end()) {
    return true;
  }
  return requirement.scale_score_at_least &&
         tables.Score(ingredient, requirement.scale) >= *requirement.scale_score_at_least;
}

bool MedicineMatches(const Medicine& medicine, const RuleRequirement& requirement, const BurdenTables& tables) {
  return std::any_of(medicine.ingredients.begin(), medicine.ingredients.end(),
                     [&](const std::string& ingredient) { return IngredientMatches(ingredient, requirement, tables); });
}

bool MeasuresHold(const RuleMeasures& measures, const Burden& burden) {
  return (!measures.items || burden.items >= *measures.items) &&
         (!measures.acb || burden.acb >= *measures.acb) &&
         (!measures.dbi || burden.dbi >= *measures.dbi - 1e-9);
}

size_t RequirementsOf(const Rule& rule) { return rule.require.size() + rule.forbid.size(); }

size_t RequirementCount(const BurdenTables& tables) {
  size_t count = 0;
  for (const Rule& rule : tables.rules) count += RequirementsOf(rule);
  return count;
}

// How one rule is judged on one date.
struct RuleContext {
  const Timeline& timeline;
  const BurdenTables& tables;
  const Burden& burden;
  const std::vector<bool>* flags;  // MatchRuleRequirements, or null: work each match out
  size_t per_medicine = 0;         // requirements of all rules
  size_t first = 0;                // flat index of this rule's first requirement
  bool every_route = false;        // count every route (what would fire without the policy)
};

// The active medicines, and their distinct ingredients, that meet `requirement` (flat
// index `k`) through a route the rule counts.
struct Met {
  std::set<std::string> ingredients;
  std::set<size_t> medicines;  // indexes into Timeline::medicines
  size_t Count(RuleCount count) const {
    return count == RuleCount::kIngredients ? ingredients.size() : medicines.size();
  }
};

Met Meeting(const Rule& rule, const RuleRequirement& requirement, size_t k, const RuleContext& context) {
  Met met;
  for (const ActiveMedicine& active : context.burden.active) {
    const Medicine& medicine = context.timeline.medicines[active.medicine];
    const bool may = context.flags != nullptr
                         ? (*context.flags)[active.medicine * context.per_medicine + context.first + k]
                         : MedicineMatches(medicine, requirement, context.tables);
    if (!may || (!context.every_route && !context.tables.CountsForRule(active.routes, rule))) continue;
    for (const std::string& ingredient : medicine.ingredients) {
      if (!IngredientMatches(ingredient, requirement, context.tables)) continue;
      met.ingredients.insert(ingredient);
      met.medicines.insert(active.medicine);
    }
  }
  return met;
}

// Spec section 5, "Rules": every requirement met by enough distinct ingredients (or
// medicines), no forbidden class present.
std::optional<FiredRule> Fire(const Rule& rule, const RuleContext& context) {
  if (!MeasuresHold(rule.measures, context.burden)) return std::nullopt;
  std::set<size_t> involved;
  for (size_t k = 0; k < rule.require.size(); ++k) {
    const RuleRequirement& requirement = rule.require[k];
    const Met met = Meeting(rule, requirement, k, context);
    if (met.Count(requirement.count) < static_cast<size_t>(requirement.at_least)) return std::nullopt;
    involved.insert(met.medicines.begin(), met.medicines.end());
  }
  for (size_t k = 0; k < rule.forbid.size(); ++k) {
    const RuleRequirement& forbidden = rule.forbid[k];
    const Met met = Meeting(rule, forbidden, rule.require.size() + k, context);
    if (met.Count(forbidden.count) >= static_cast<size_t>(forbidden.at_least)) return std::nullopt;
  }
  return FiredRule{&rule, std::vector<size_t>(involved.begin(), involved.end())};
}

// Whether `age` lets the rule be judged (spec section 5: criteria for older people apply
// from their minimum age; an unknown age cannot be judged).
bool AgeAllows(const Rule& rule, std::optional<int> age) { return !rule.age_min || (age && *age >= *rule.age_min); }

}  // namespace

namespace burden_internal {

RouteSet RoutesInForce(const Medicine& medicine, const ActiveMedicine& active, Date on,
                       const MeasureOptions& options) {
  RouteSet routes;
  routes.Add(medicine.uses[active.latest_use].route);
  if (options.measure == Measure::kLookback) {
    const Date first_day = on - (options.window_days - 1);
    for (const DispensingUse& use : medicine.uses) {
      if (use.dispensed_on >= first_day && use.dispensed_on <= on) routes.Add(use.route);
    }
  } else if (const Episode* episode = EpisodeOn(medicine.episodes, on)) {
    for (const Coverage& coverage : episode->coverages) {
      const DispensingUse& use = medicine.uses[coverage.source];
      if (routes.Contains(use.route)) continue;
      // Spec section 5: a supply counts through its tail, min(grace, days supplied).
      if (coverage.dispensed <= on && coverage.start <= on && on <= coverage.tail_end()) routes.Add(use.route);
    }
  }
  return routes;
}

void FireRules(const Timeline& timeline, const BurdenTables& tables, std::optional<int> age,
               const std::vector<bool>* matches, Burden& burden) {
  RuleContext context{timeline, tables, burden, matches, matches != nullptr ? RequirementCount(tables) : 0};
  for (const Rule& rule : tables.rules) {
    const size_t first = context.first;
    context.first += RequirementsOf(rule);
    const bool judged = AgeAllows(rule, age);
    if (!judged && (age || burden.age_unknown_for_rules)) continue;
    RuleContext here = context;
    here.first = first;
    auto fired = Fire(rule, here);
    if (!fired) continue;
    if (judged) {
      burden.rules.push_back(std::move(*fired));
    } else {
      burden.age_unknown_for_rules = true;  // it would fire, but the age is not known
    }
  }
}

}  // namespace burden_internal

std::vector<bool> MatchRuleRequirements(const Timeline& timeline, const BurdenTables& tables) {
  std::vector<bool> matches;
  matches.reserve(timeline.medicines.size() * RequirementCount(tables));
  for (const Medicine& medicine : timeline.medicines) {
    for (const Rule& rule : tables.rules) {
      for (const RuleRequirement& requirement : rule.require) {
        matches.push_back(MedicineMatches(medicine, requirement, tables));
      }
      for (const RuleRequirement& forbidden : rule.forbid) {
        matches.push_back(MedicineMatches(medicine, forbidden, tables));
      }
    }
  }
  return matches;
}

std::vector<FiredRule> RulesLeftOutByRoute(const Timeline& timeline, const Burden& burden,
                                           const BurdenTables& tables, std::optional<int> age) {
  std::vector<FiredRule> left_out;
  const RuleContext context{timeline, tables, burden, nullptr, 0, 0, true};
  for (const Rule& rule : tables.rules) {
    const bool fired = std::any_of(burden.rules.begin(), burden.rules.end(),
                                   [&](const FiredRule& f) { return f.rule == &rule; });
    if (fired || !AgeAllows(rule, age)) continue;
    if (auto would = Fire(rule, context)) left_out.push_back(std::move(*would));
  }
  return left_out;
}

}  // namespace medload
