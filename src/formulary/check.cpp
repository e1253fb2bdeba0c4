// Cross-table checks and the two entry points that read a folder: CheckFormulary (every
// fault, for `formulary check`) and LoadFormulary (fails on any fault).
#include <set>
#include <unordered_map>

#include "formulary/longitudinal_tables.h"
#include "formulary/name_index.h"
#include "formulary/unit_dose_table.h"
#include "formulary/table_files.h"
#include "formulary/table_reader.h"
#include "medload/formulary/formulary.h"

namespace medload {
namespace {

using formulary_internal::Fault;

struct Claim {
  std::string ingredient;
  int line = 0;
  bool is_name = false;
};

void CheckIngredients(const FormularyTables& tables, std::vector<std::string>& faults) {
  std::unordered_map<std::string, Claim> names;
  std::unordered_map<std::string, Claim> atc_codes;
  const std::string file = "ingredients.csv";
  for (const Ingredient& ingredient : tables.ingredients) {
    const std::string key = NameKey(ingredient.name);
    if (const auto it = names.find(key); it != names.end()) {
      const Claim& first = it->second;
      faults.push_back(Fault(file, ingredient.line,
                             first.is_name ? "duplicate ingredient \"" + ingredient.name + "\" (first on line " +
                                                 std::to_string(first.line) + ")"
                                           : "ingredient \"" + ingredient.name + "\" is already a synonym of \"" +
                                                 first.ingredient + "\" (line " + std::to_string(first.line) + ")"));
    } else {
      names.emplace(key, Claim{ingredient.name, ingredient.line, true});
    }
    for (const std::string& synonym : ingredient.synonyms) {
      const auto [it, inserted] = names.emplace(NameKey(synonym), Claim{ingredient.name, ingredient.line, false});
      if (inserted || it->second.ingredient == ingredient.name) continue;
      faults.push_back(Fault(file, ingredient.line,
                             "synonym \"" + synonym + "\" is already a name of \"" + it->second.ingredient +
                                 "\" (line " + std::to_string(it->second.line) + ")"));
    }
    for (const std::string& code : ingredient.atc) {
      const auto [it, inserted] = atc_codes.emplace(code, Claim{ingredient.name, ingredient.line, true});
      if (inserted || it->second.ingredient == ingredient.name) continue;
      faults.push_back(Fault(file, ingredient.line,
                             "atc: \"" + code + "\" is already the code of \"" + it->second.ingredient +
                                 "\" (line " + std::to_string(it->second.line) + ")"));
    }
  }
}

std::string UnknownIngredient(const std::string& name) {
  return "unknown ingredient \"" + name + "\" (not in ingredients.csv)";
}

// Rows naming one ingredient each (scales, dbi): known and not repeated.
template <typename Row>
void CheckIngredientRows(const Formulary& formulary, const std::string& file, const std::vector<Row>& rows,
                         std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const Row& row : rows) {
    const Ingredient* ingredient = formulary.FindIngredient(row.ingredient);
    if (ingredient == nullptr) {
      faults.push_back(Fault(file, row.line, UnknownIngredient(row.ingredient)));
      continue;
    }
    const auto [it, inserted] = seen.emplace(ingredient->name, row.line);
    if (!inserted) {
      faults.push_back(Fault(file, row.line, "duplicate ingredient \"" + ingredient->name + "\" (first on line " +
                                                 std::to_string(it->second) + ")"));
    }
  }
}

// dbi_classes.csv: each class is one some ingredient has, named once.
void CheckDbiClasses(const Formulary& formulary, std::vector<std::string>& faults) {
  std::set<std::string> known;
  for (const Ingredient& ingredient : formulary.ingredients()) known.insert(ingredient.classes.begin(), ingredient.classes.end());
  std::unordered_map<std::string, int> seen;
  for (const DbiClass& row : formulary.tables().dbi_classes) {
    if (known.count(row.class_name) == 0U) {
      faults.push_back(Fault("dbi_classes.csv", row.line, "no ingredient has the class \"" + row.class_name + "\""));
    }
    const auto [it, inserted] = seen.emplace(row.class_name, row.line);
    if (!inserted) {
      faults.push_back(Fault("dbi_classes.csv", row.line, "duplicate class \"" + row.class_name + "\" (first on line " +
                                                             std::to_string(it->second) + ")"));
    }
  }
}

// Rows of products.csv or brands.csv: known ingredients, no duplicate names.
void CheckNamedProducts(const Formulary& formulary, const std::vector<NamedProduct>& rows,
                        std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const NamedProduct& product : rows) {
    const std::string& file = product.table;
    for (const std::string& name : product.ingredients) {
      if (formulary.FindIngredient(name) != nullptr) continue;
      faults.push_back(Fault(file, product.line, file == "brands.csv" ? "unknown ingredient or product \"" + name +
                                                                         "\" (not in ingredients.csv or products.csv)"
                                                                   : UnknownIngredient(name)));
    }
    if (file == "brands.csv") {
      if (const Ingredient* ingredient = formulary.FindIngredient(product.name)) {
        faults.push_back(Fault(file, product.line, "brand \"" + product.name + "\" is also a name of the ingredient \"" +
                                                        ingredient->name + "\""));
      }
    }
    std::set<std::string> words;
    for (const std::string& word : product.requires_words) words.insert(NameKey(word));
    std::string key = NameKey(product.name);
    for (const std::string& word : words) key += "|" + word;
    const auto [it, inserted] = seen.emplace(key, product.line);
    if (!inserted) {
      faults.push_back(Fault(file, product.line, std::string(file == "brands.csv" ? "duplicate brand \"" : "duplicate product \"") +
                                                     product.name + "\" (first on line " + std::to_string(it->second) + ")"));
    }
  }
}

void CheckDictionary(const Formulary& formulary, std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const DictionaryEntry& entry : formulary.tables().dictionary) {
    for (const std::string& element : entry.ingredients) {
      const std::string name = element.substr(0, element.find('='));
      if (name.empty() || name.front() == '?' || formulary.FindIngredient(name) != nullptr) continue;
      faults.push_back(Fault("dictionary.csv", entry.line,
                             UnknownIngredient(name) + "; write \"?" + name + "\" for a substance it does not know"));
    }
    if (entry.code.empty()) continue;
    const auto [it, inserted] = seen.emplace(CodeSystemKey(entry.code_system) + "\x1f" + entry.code, entry.line);
    if (!inserted) {
      faults.push_back(Fault("dictionary.csv", entry.line, "duplicate code " + entry.code_system + " " + entry.code +
                                                               " (first on line " + std::to_string(it->second) + ")"));
    }
  }
}

bool IsNonMedicineTerm(const FormularyTables& tables, const std::string& name) {
  for (const NonMedicineTerm& term : tables.non_medicines) {
    if (NameKey(term.term) == NameKey(name)) return true;
  }
  return false;
}

void CheckCodes(const Formulary& formulary, std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const ProductCode& code : formulary.tables().codes) {
    if (formulary.FindProduct(code.target) == nullptr && formulary.FindIngredient(code.target) == nullptr &&
        !IsNonMedicineTerm(formulary.tables(), code.target)) {
      faults.push_back(Fault("codes.csv", code.line,
                             "\"" + code.target + "\" is not a product, ingredient or non-medicine term"));
    }
    const auto [it, inserted] = seen.emplace(CodeSystemKey(code.code_system) + "\x1f" + code.code, code.line);
    if (!inserted) {
      faults.push_back(Fault("codes.csv", code.line, "duplicate code " + code.code_system + " " + code.code +
                                                         " (first on line " + std::to_string(it->second) + ")"));
    }
  }
}

void CheckNonMedicines(const Formulary& formulary, std::vector<std::string>& faults) {
  std::unordered_map<std::string, int> seen;
  for (const NonMedicineTerm& term : formulary.tables().non_medicines) {
    const auto [it, inserted] = seen.emplace(NameKey(term.term), term.line);
    if (!inserted) {
      faults.push_back(Fault("non_medicines.csv", term.line, "duplicate term \"" + term.term + "\" (first on line " +
                                                                  std::to_string(it->second) + ")"));
    }
    if (const Ingredient* ingredient = formulary.FindIngredient(term.term)) {
      faults.push_back(Fault("non_medicines.csv", term.line,
                             "term \"" + term.term + "\" is also a name of the ingredient \"" + ingredient->name +
                                 "\", which could then never resolve"));
    }
  }
}

// One requirement's classes, ingredients and scale; `pointer` is its JSON pointer.
void CheckRequirement(const Formulary& formulary, const RuleRequirement& requirement, const std::string& pointer,
                      std::vector<std::string>& faults) {
  for (size_t i = 0; i < requirement.classes.size(); ++i) {
    if (!formulary.IsKnownClass(requirement.classes[i])) {
      faults.push_back(pointer + "/classes/" + std::to_string(i) + ": unknown class \"" + requirement.classes[i] +
                       "\" (no ingredient carries it)");
    }
  }
  for (size_t i = 0; i < requirement.ingredients.size(); ++i) {
    if (formulary.FindIngredient(requirement.ingredients[i]) == nullptr) {
      faults.push_back(pointer + "/ingredients/" + std::to_string(i) + ": " +
                       UnknownIngredient(requirement.ingredients[i]));
    }
  }
  if (requirement.scale_score_at_least && !formulary.HasScale(requirement.scale)) {
    faults.push_back(pointer + "/scale: unknown scale \"" + requirement.scale + "\"");
  }
}

void CheckRules(const Formulary& formulary, std::vector<std::string>& faults) {
  for (const Rule& rule : formulary.rules()) {
    const std::string rule_pointer = "rules.json: /rules/" + std::to_string(rule.position);
    for (size_t r = 0; r < rule.require.size(); ++r) {
      CheckRequirement(formulary, rule.require[r], rule_pointer + "/require/" + std::to_string(r), faults);
    }
    for (size_t r = 0; r < rule.forbid.size(); ++r) {
      CheckRequirement(formulary, rule.forbid[r], rule_pointer + "/forbid/" + std::to_string(r), faults);
    }
  }
}

}  // namespace

void CheckTables(const FormularyTables& tables, std::vector<std::string>& faults) {
  CheckIngredients(tables, faults);
  const Formulary formulary = Formulary::FromTables(tables);
  for (const Scale& scale : formulary.tables().scales) {
    CheckIngredientRows(formulary, "anticholinergic/" + scale.name + ".csv", scale.rows, faults);
  }
  CheckIngredientRows(formulary, "dbi.csv", formulary.tables().dbi, faults);
  CheckDbiClasses(formulary, faults);
  CheckNamedProducts(formulary, formulary.tables().products, faults);
  CheckNamedProducts(formulary, formulary.tables().brands, faults);
  CheckDictionary(formulary, faults);
  CheckCodes(formulary, faults);
  CheckNonMedicines(formulary, faults);
  CheckRules(formulary, faults);
  formulary_internal::CheckLongitudinalTables(formulary, faults);
  formulary_internal::CheckUnitDoses(formulary, faults);
}

FormularyCheck CheckFormulary(const std::string& dir) {
  FormularyCheck check;
  const FormularyTables tables = formulary_internal::ReadTableFiles(dir, check.faults);
  CheckTables(tables, check.faults);
  check.checksum = tables.checksum;
  check.ingredients = tables.ingredients.size();
  for (const Ingredient& ingredient : tables.ingredients) check.synonyms += ingredient.synonyms.size();
  check.scales = tables.scales.size();
  for (const Scale& scale : tables.scales) check.scale_rows += scale.rows.size();
  check.dbi_rows = tables.dbi.size();
  check.products = tables.products.size();
  check.brands = tables.brands.size();
  check.dictionary_rows = tables.dictionary.size();
  check.codes = tables.codes.size();
  check.non_medicine_terms = tables.non_medicines.size();
  check.rules = tables.rules.size();
  check.routes = tables.routes.size();
  check.tsdd_rows = tables.tsdd.size();
  check.falls_risk_rows = tables.falls_risk.size();
  check.unit_dose_rows = tables.unit_doses.size();
  return check;
}

Result<Formulary> LoadFormulary(const std::string& dir) {
  std::vector<std::string> faults;
  FormularyTables tables = formulary_internal::ReadTableFiles(dir, faults);
  CheckTables(tables, faults);
  if (!faults.empty()) {
    std::string message = "formulary " + dir + ": " + std::to_string(faults.size()) +
                          (faults.size() == 1 ? " fault" : " faults") + " ('medload formulary check' lists them)";
    for (const std::string& fault : faults) message += "\n" + fault;
    return Status::Input(std::move(message));
  }
  return Formulary::FromTables(std::move(tables));
}

}  // namespace medload
