#include "medload/burden/tables.h"

#include <algorithm>
#include <cmath>

#include "medload/burden/longitudinal.h"
#include "medload/formulary/formulary.h"

namespace medload {

int BurdenTables::Score(const std::string& ingredient, const std::string& scale_name) const {
  const auto scale_it = scales.find(scale_name);
  if (scale_it == scales.end()) return 0;
  const auto it = scale_it->second.find(ingredient);
  return it == scale_it->second.end() ? 0 : it->second;
}

bool BurdenTables::HasClass(const std::string& ingredient, const std::string& class_name) const {
  const auto it = classes.find(ingredient);
  return it != classes.end() &&
         std::find(it->second.begin(), it->second.end(), class_name) != it->second.end();
}

const DbiEntry* BurdenTables::Dbi(const std::string& ingredient) const {
  const auto it = dbi.find(ingredient);
  return it == dbi.end() ? nullptr : &it->second;
}

bool BurdenTables::InDbiClass(const std::string& ingredient) const {
  return std::any_of(dbi_classes.begin(), dbi_classes.end(),
                     [&](const std::string& name) { return HasClass(ingredient, name); });
}

const Rule* BurdenTables::FindRule(const std::string& id) const {
  for (const Rule& rule : rules) {
    if (rule.id == id) return &rule;
  }
  return nullptr;
}

const UnitDoseRow* BurdenTables::UnitDose(const std::string& ingredient, UnitDoseForm form,
                                          double strength_mg) const {
  const auto it = unit_doses.find(ingredient);
  if (it == unit_doses.end()) return nullptr;
  const UnitDoseRow* any = nullptr;
  for (const UnitDoseRow& row : it->second) {
    if (row.form != form) continue;
    if (!row.strength_mg) {
      any = &row;
    } else if (std::abs(*row.strength_mg - strength_mg) <= 1e-6 * std::max(1.0, strength_mg)) {
      return &row;
    }
  }
  return any;
}

bool BurdenTables::HasUnitDoses(const std::string& ingredient, UnitDoseForm form) const {
  const auto it = unit_doses.find(ingredient);
  return it != unit_doses.end() &&
         std::any_of(it->second.begin(), it->second.end(), [&](const UnitDoseRow& row) { return row.form == form; });
}

RouteSet BurdenTables::ScaleRoutes(const std::string& ingredient, const std::string& scale_name) const {
  const auto scale_it = scale_routes.find(scale_name);
  if (scale_it == scale_routes.end()) return systemic_routes;
  const auto it = scale_it->second.find(ingredient);
  return it == scale_it->second.end() ? systemic_routes : it->second;
}

RouteSet BurdenTables::DbiRoutes(const std::string& ingredient) const {
  const auto it = dbi_routes.find(ingredient);
  return it == dbi_routes.end() ? systemic_routes : it->second;
}

RouteSet BurdenTables::RuleRoutes(const Rule& rule) const {
  return rule.routes.empty() ? systemic_routes : RouteSet(rule.routes);
}

bool BurdenTables::CountsForScale(RouteSet routes, const std::string& ingredient) const {
  return RoutesCount(routes, ScaleRoutes(ingredient, scale));
}

bool BurdenTables::CountsForDbi(RouteSet routes, const std::string& ingredient) const {
  return RoutesCount(routes, DbiRoutes(ingredient));
}

bool BurdenTables::CountsForRule(RouteSet routes, const Rule& rule) const {
  return RoutesCount(routes, RuleRoutes(rule));
}

BurdenTables TablesFromFormulary(const Formulary& formulary, const std::string& scale) {
  BurdenTables tables;
  tables.scale = scale;
  for (const Ingredient& ingredient : formulary.ingredients()) {
    if (!ingredient.classes.empty()) tables.classes[ingredient.name] = ingredient.classes;
  }
  for (const Scale& table : formulary.tables().scales) {
    auto& scores = tables.scales[table.name];
    for (const ScaleRow& row : table.rows) {
      scores[row.ingredient] = row.score;
      if (!row.routes.empty()) tables.scale_routes[table.name][row.ingredient] = RouteSet(row.routes);
    }
  }
  for (const DbiDose& row : formulary.tables().dbi) {
    tables.dbi[row.ingredient] = DbiEntry{row.min_daily_dose_mg, std::string(DbiEffectName(row.effect))};
    if (!row.routes.empty()) tables.dbi_routes[row.ingredient] = RouteSet(row.routes);
  }
  for (const DbiClass& row : formulary.tables().dbi_classes) tables.dbi_classes.push_back(row.class_name);
  tables.rules = formulary.rules();
  tables.systemic_routes = RouteSet(formulary.SystemicRoutes());
  for (const UnitDoseRow& row : formulary.tables().unit_doses) {
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    UnitDoseRow canonical = row;
    if (ingredient != nullptr) canonical.ingredient = ingredient->name;
    tables.unit_doses[canonical.ingredient].push_back(std::move(canonical));
  }
  AddLongitudinalTables(formulary, tables);
  return tables;
}

}  // namespace medload
