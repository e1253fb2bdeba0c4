#include "formulary/longitudinal_tables.h"

#include <cmath>
#include <unordered_map>

#include "medload/core/text.h"

namespace medload::formulary_internal {
namespace {

// The source column every table has; false (with a fault) when it is empty.
bool HasSource(const Table& table, const TableRow& row, std::vector<std::string>& faults) {
  if (!row.fields.back().empty()) return true;
  faults.push_back(Fault(table.name, row.line, "source: empty (every row cites its source)"));
  return false;
}

std::string FirstOn(int line) { return " (first on line " + std::to_string(line) + ")"; }

}  // namespace

void ReadTsdd(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (row.fields[0].empty()) {
      faults.push_back(Fault(table.name, row.line, "ingredient: empty"));
      continue;
    }
    if (!HasSource(table, row, faults)) continue;
    const std::optional<double> dose = ParseDecimal(row.fields[1]);
    if (!dose) {
      faults.push_back(Fault(table.name, row.line,
                             "min_effective_daily_dose_mg: \"" + row.fields[1] + "\" is not a number"));
      continue;
    }
    if (!(*dose > 0) || !std::isfinite(*dose)) {
      faults.push_back(Fault(table.name, row.line,
                             "min_effective_daily_dose_mg: " + row.fields[1] + " must be greater than 0"));
      continue;
    }
    tables.tsdd.push_back(TsddDose{row.fields[0], *dose, row.fields[2], row.line});
  }
}

void ReadFallsRisk(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    const std::string& category = row.fields[0];
    const std::string& class_name = row.fields[1];
    const std::string& ingredient = row.fields[2];
    if (!IsLowerHyphenated(category)) {
      faults.push_back(Fault(table.name, row.line, category.empty() ? "category: empty"
                                                                    : "category: \"" + category +
                                                                          "\" is not lower-case-hyphenated"));
      continue;
    }
    if (class_name.empty() == ingredient.empty()) {
      faults.push_back(Fault(table.name, row.line, class_name.empty()
                                                       ? "class, ingredient: both empty (give one)"
                                                       : "class, ingredient: both given (give one)"));
      continue;
    }
    if (!HasSource(table, row, faults)) continue;
    tables.falls_risk.push_back(FallsRiskRow{category, class_name, ingredient, row.fields[3], row.line});
  }
}

void CheckLongitudinalTables(const Formulary& formulary, std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const TsddDose& row : formulary.tables().tsdd) {
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    if (ingredient == nullptr) {
      faults.push_back(Fault(kTsddFile, row.line, "unknown ingredient \"" + row.ingredient + "\" (not in ingredients.csv)"));
      continue;
    }
    const auto [it, inserted] = seen.emplace(ingredient->name, row.line);
    if (!inserted) {
      faults.push_back(Fault(kTsddFile, row.line, "duplicate ingredient \"" + ingredient->name + "\"" + FirstOn(it->second)));
    }
  }
  seen.clear();
  for (const FallsRiskRow& row : formulary.tables().falls_risk) {
    std::string member;
    if (!row.class_name.empty()) {
      if (!formulary.IsKnownClass(row.class_name)) {
        faults.push_back(Fault(kFallsRiskFile, row.line,
                               "unknown class \"" + row.class_name + "\" (no ingredient carries it)"));
        continue;
      }
      member = "class \"" + row.class_name + "\"";
    } else {
      const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
      if (ingredient == nullptr) {
        faults.push_back(Fault(kFallsRiskFile, row.line,
                               "unknown ingredient \"" + row.ingredient + "\" (not in ingredients.csv)"));
        continue;
      }
      member = "ingredient \"" + ingredient->name + "\"";
    }
    const auto [it, inserted] = seen.emplace(row.category + '\x1f' + member, row.line);
    if (!inserted) {
      faults.push_back(Fault(kFallsRiskFile, row.line,
                             "duplicate " + member + " in category \"" + row.category + "\"" + FirstOn(it->second)));
    }
  }
}

}  // namespace medload::formulary_internal
