// falls(D): distinct active ingredients on systemic routes in a falls-risk category
// (falls_risk.csv, after STOPPFall, Seppala et al. 2021). docs/measures.md has the rule.
#include <algorithm>
#include <map>

#include "burden/longitudinal_parts.h"

namespace medload::longitudinal_internal {
namespace {

// True when a supply of the medicine in force on `on` is given by a route that counts
// (tables.systemic_routes, the route policy of the scales and the DBI): a
// supply whose days or tail reach `on` (concurrent), or dispensed in the window
// (lookback). A medicine is one set of ingredients whatever the route, so a gel and a
// tablet of one ingredient are one medicine: only the supplies in force decide.
bool InForceSystemically(const BurdenTables& tables, const Medicine& medicine, const ActiveMedicine& active,
                         Date on, const MeasureOptions& options) {
  if (options.measure == Measure::kLookback) {
    const Date first_day = on - (options.window_days - 1);
    return std::any_of(medicine.uses.begin(), medicine.uses.end(), [&](const DispensingUse& use) {
      return use.dispensed_on >= first_day && use.dispensed_on <= on && SystemicRoute(tables, use.route);
    });
  }
  const Episode* episode = EpisodeOn(medicine.episodes, on);
  if (episode == nullptr) return SystemicRoute(tables, medicine.uses[active.latest_use].route);
  return std::any_of(episode->coverages.begin(), episode->coverages.end(), [&](const Coverage& coverage) {
    return coverage.dispensed <= on && coverage.start <= on && on <= coverage.tail_end() &&
           SystemicRoute(tables, medicine.uses[coverage.source].route);
  });
}

}  // namespace

void AddFalls(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
              Burden& burden) {
  LongitudinalMeasures& measures = burden.longitudinal;
  if (tables.falls_categories.empty()) return;
  std::map<std::string, FallsRiskIngredient> found;
  for (const ActiveMedicine& active : burden.active) {
    const Medicine& medicine = timeline.medicines[active.medicine];
    bool systemic = false;
    bool checked = false;
    for (const std::string& ingredient : medicine.ingredients) {
      const auto it = tables.falls_categories.find(ingredient);
      if (it == tables.falls_categories.end() || found.count(ingredient) != 0) continue;
      if (!checked) {
        systemic = InForceSystemically(tables, medicine, active, burden.on, options);
        checked = true;
      }
      if (systemic) found.emplace(ingredient, FallsRiskIngredient{ingredient, it->second, active.medicine});
    }
  }
  measures.falls = static_cast<int>(found.size());
  for (auto& [ingredient, entry] : found) measures.falls_ingredients.push_back(std::move(entry));
}

}  // namespace medload::longitudinal_internal
