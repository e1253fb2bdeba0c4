#include "formulary/unit_dose_table.h"

#include <charconv>
#include <cmath>
#include <map>

#include "medload/core/text.h"

namespace medload {

std::string_view UnitDoseFormName(UnitDoseForm form) {
  return form == UnitDoseForm::kPatch ? "patch" : "depot";
}

namespace formulary_internal {
namespace {

constexpr int kMaxIntervalDays = 3650;

// A number > 0 in `text`, or a fault naming `column`; empty text gives nullopt and no
// fault when `required` is false.
bool ReadPositive(const Table& table, const TableRow& row, size_t column, std::string_view name,
                  bool required, std::optional<double>& out, std::vector<std::string>& faults) {
  const std::string& text = row.fields[column];
  if (text.empty()) {
    if (required) faults.push_back(Fault(table.name, row.line, std::string(name) + ": empty"));
    return !required;
  }
  const std::optional<double> parsed = ParseDecimal(text);
  if (!parsed) {
    faults.push_back(Fault(table.name, row.line, std::string(name) + ": \"" + text + "\" is not a number"));
    return false;
  }
  const double value = *parsed;
  if (!(value > 0) || !std::isfinite(value)) {
    faults.push_back(Fault(table.name, row.line, std::string(name) + ": " + text + " must be greater than 0"));
    return false;
  }
  out = value;
  return true;
}

bool ReadInterval(const Table& table, const TableRow& row, int& out, std::vector<std::string>& faults) {
  const std::string& text = row.fields[4];
  int value = 0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (text.empty() || ec != std::errc() || ptr != text.data() + text.size() || value < 1 ||
      value > kMaxIntervalDays) {
    faults.push_back(Fault(table.name, row.line,
                           "interval_days: \"" + text + "\" is not a whole number from 1 to 3650"));
    return false;
  }
  out = value;
  return true;
}

std::optional<UnitDoseForm> ReadForm(const Table& table, const TableRow& row, std::vector<std::string>& faults) {
  const std::string& text = row.fields[1];
  if (text == "patch") return UnitDoseForm::kPatch;
  if (text == "depot") return UnitDoseForm::kDepot;
  faults.push_back(Fault(table.name, row.line, "form: \"" + text + "\" is not patch or depot"));
  return std::nullopt;
}

// A patch needs its release rate; a depot's dose is its strength over its interval.
bool ReleaseFitsForm(const Table& table, const TableRow& row, UnitDoseForm form,
                     std::vector<std::string>& faults) {
  const bool given = !row.fields[3].empty();
  if (form == UnitDoseForm::kPatch && !given) {
    faults.push_back(Fault(table.name, row.line, "release_mg_per_day: empty (a patch needs its labelled release rate)"));
    return false;
  }
  if (form == UnitDoseForm::kDepot && given) {
    faults.push_back(Fault(table.name, row.line,
                           "release_mg_per_day: given for a depot (its dose is the strength over the interval)"));
    return false;
  }
  return true;
}

}  // namespace

void ReadUnitDoses(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    UnitDoseRow out;
    out.ingredient = row.fields[0];
    out.source = row.fields[5];
    out.line = row.line;
    if (out.ingredient.empty()) {
      faults.push_back(Fault(table.name, row.line, "ingredient: empty"));
      continue;
    }
    const std::optional<UnitDoseForm> form = ReadForm(table, row, faults);
    if (!form) continue;
    out.form = *form;
    if (!ReadPositive(table, row, 2, "strength_mg", false, out.strength_mg, faults)) continue;
    if (!ReleaseFitsForm(table, row, out.form, faults)) continue;
    if (!ReadPositive(table, row, 3, "release_mg_per_day", false, out.release_mg_per_day, faults)) continue;
    if (!ReadInterval(table, row, out.interval_days, faults)) continue;
    if (out.source.empty()) {
      faults.push_back(Fault(table.name, row.line, "source: empty (every row cites its source)"));
      continue;
    }
    tables.unit_doses.push_back(std::move(out));
  }
}

void CheckUnitDoses(const Formulary& formulary, std::vector<std::string>& faults) {
  std::map<std::string, int> seen;
  for (const UnitDoseRow& row : formulary.tables().unit_doses) {
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    if (ingredient == nullptr) {
      faults.push_back(Fault(kUnitDosesFile, row.line,
                             "unknown ingredient \"" + row.ingredient + "\" (not in ingredients.csv)"));
      continue;
    }
    std::string strength = "any";
    if (row.strength_mg) {
      strength = std::to_string(*row.strength_mg);
      strength.erase(strength.find_last_not_of('0') + 1);
      if (strength.back() == '.') strength.pop_back();
    }
    const std::string key = ingredient->name + '\x1f' + std::string(UnitDoseFormName(row.form)) + '\x1f' + strength;
    const auto [it, inserted] = seen.emplace(key, row.line);
    if (!inserted) {
      faults.push_back(Fault(kUnitDosesFile, row.line,
                             "duplicate " + std::string(UnitDoseFormName(row.form)) + " of \"" + ingredient->name +
                                 "\" at strength " + strength + (row.strength_mg ? " mg" : "") +
                                 " (first on line " + std::to_string(it->second) + ")"));
    }
  }
}

}  // namespace formulary_internal
}  // namespace medload
