#include "medload/burden/longitudinal.h"

#include <algorithm>

#include "burden/longitudinal_parts.h"
#include "medload/formulary/formulary.h"

namespace medload {

namespace longitudinal_internal {

bool SystemicRoute(const BurdenTables& tables, Route route) {
  RouteSet in_use;
  in_use.Add(route);
  return RoutesCount(in_use, tables.systemic_routes);
}

}  // namespace longitudinal_internal

void AddLongitudinalMeasures(const Timeline& timeline, const BurdenTables& tables,
                             const MeasureOptions& options, Burden& burden) {
  longitudinal_internal::AddFalls(timeline, tables, options, burden);
  longitudinal_internal::AddExposure(timeline, tables, options, burden);
  longitudinal_internal::AddAdherence(timeline, tables, options, burden);
}

void AddLongitudinalTables(const Formulary& formulary, BurdenTables& tables) {
  for (const TsddDose& row : formulary.tables().tsdd) {
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    tables.tsdd_doses[ingredient != nullptr ? ingredient->name : row.ingredient] = row.min_effective_daily_dose_mg;
  }
  auto add = [&](const std::string& ingredient, const std::string& category) {
    std::vector<std::string>& categories = tables.falls_categories[ingredient];
    const auto at = std::lower_bound(categories.begin(), categories.end(), category);
    if (at == categories.end() || *at != category) categories.insert(at, category);
  };
  for (const FallsRiskRow& row : formulary.tables().falls_risk) {
    if (!row.class_name.empty()) {
      for (const std::string& ingredient : formulary.IngredientsInClass(row.class_name)) add(ingredient, row.category);
      continue;
    }
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    add(ingredient != nullptr ? ingredient->name : row.ingredient, row.category);
  }
}

}  // namespace medload
