#include "medload/burden/tables.h"

#include <algorithm>

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

BurdenTables TablesFromFormulary(const Formulary& formulary, const std::string& scale) {
  BurdenTables tables;
  tables.scale = scale;
  for (const Ingredient& ingredient : formulary.ingredients()) {
    if (!ingredient.classes.empty()) tables.classes[ingredient.name] = ingredient.classes;
  }
  for (const Scale& table : formulary.tables().scales) {
    auto& scores = tables.scales[table.name];
    for (const ScaleRow& row : table.rows) scores[row.ingredient] = row.score;
  }
  for (const DbiDose& row : formulary.tables().dbi) {
    tables.dbi[row.ingredient] = DbiEntry{row.min_daily_dose_mg, std::string(DbiEffectName(row.effect))};
  }
  for (const DbiClass& row : formulary.tables().dbi_classes) tables.dbi_classes.push_back(row.class_name);
  tables.rules = formulary.rules();
  return tables;
}

}  // namespace medload
