#include "medload/formulary/formulary.h"

#include <algorithm>
#include <map>
#include <set>

#include "formulary/name_index.h"
#include "formulary/table_files.h"

namespace medload {

struct Formulary::Lookups {
  std::unordered_map<std::string, size_t> by_name;  // NameKey of name or synonym -> ingredient
  std::unordered_map<std::string, size_t> by_atc;   // ATC code -> ingredient
  std::map<std::string, std::vector<size_t>, std::less<>> by_class;  // class -> ingredients
  std::map<std::string, std::unordered_map<std::string, int>, std::less<>> scales;  // canonical names
  std::unordered_map<std::string, size_t> dbi;       // canonical name -> row
  std::unordered_map<std::string, size_t> products;  // NameKey -> first row
  std::unordered_map<std::string, size_t> codes;     // CodeKey -> row
  std::unordered_map<std::string, size_t> rules;     // id -> rule
};

namespace {

const std::vector<std::string> kNoClasses;

// The code system as compared: lower case, no trailing slash; the WHO ATC URIs are "atc".
std::string CodeSystemKey(std::string_view system) {
  std::string key = NameKey(system);
  if (key == "atc" || key == "http www whocc no atc" || key == "https www whocc no atc" || key == "who atc") {
    return "atc";
  }
  return key;
}

std::string CodeKey(std::string_view system, std::string_view code) {
  std::string key = CodeSystemKey(system);
  key += '\x1f';
  for (const char c : code) key += (c >= 'a' && c <= 'z') ? static_cast<char>(c - 32) : c;
  return key;
}

// Maps `name` to its canonical ingredient name if the lookups know it.
void Canonicalise(const Formulary::Lookups& lookups, const std::vector<Ingredient>& ingredients,
                  std::string& name) {
  const auto it = lookups.by_name.find(NameKey(name));
  if (it != lookups.by_name.end()) name = ingredients[it->second].name;
}

}  // namespace

std::string_view DbiEffectName(DbiEffect effect) {
  switch (effect) {
    case DbiEffect::kAnticholinergic: return "anticholinergic";
    case DbiEffect::kSedative: return "sedative";
    case DbiEffect::kBoth: return "both";
  }
  return "both";
}

Formulary::Formulary() : Formulary(FromTables(FormularyTables{})) {}

Formulary Formulary::FromTables(FormularyTables tables) {
  auto lookups = std::make_shared<Lookups>();
  auto index = std::make_shared<NameIndex>();
  for (size_t i = 0; i < tables.ingredients.size(); ++i) {
    const Ingredient& ingredient = tables.ingredients[i];
    lookups->by_name.emplace(NameKey(ingredient.name), i);
    index->ingredients.Add(ingredient.name, i);
    for (const std::string& synonym : ingredient.synonyms) {
      lookups->by_name.emplace(NameKey(synonym), i);
      index->ingredients.Add(synonym, i);
    }
    for (const std::string& code : ingredient.atc) lookups->by_atc.emplace(code, i);
    for (const std::string& class_name : ingredient.classes) lookups->by_class[class_name].push_back(i);
  }
  for (Scale& scale : tables.scales) {
    auto& scores = lookups->scales[scale.name];
    for (ScaleRow& row : scale.rows) {
      Canonicalise(*lookups, tables.ingredients, row.ingredient);
      scores.emplace(row.ingredient, row.score);
    }
  }
  for (size_t i = 0; i < tables.dbi.size(); ++i) {
    Canonicalise(*lookups, tables.ingredients, tables.dbi[i].ingredient);
    lookups->dbi.emplace(tables.dbi[i].ingredient, i);
  }
  for (size_t i = 0; i < tables.products.size(); ++i) {
    NamedProduct& product = tables.products[i];
    for (std::string& name : product.ingredients) Canonicalise(*lookups, tables.ingredients, name);
    lookups->products.emplace(NameKey(product.name), i);
    index->products.Add(product.name, i, product.requires_words.size());
  }
  for (size_t i = 0; i < tables.codes.size(); ++i) {
    lookups->codes.emplace(CodeKey(tables.codes[i].code_system, tables.codes[i].code), i);
  }
  for (size_t i = 0; i < tables.non_medicines.size(); ++i) {
    index->non_medicines.Add(tables.non_medicines[i].term, i);
  }
  for (size_t i = 0; i < tables.rules.size(); ++i) {
    for (RuleRequirement& requirement : tables.rules[i].require) {
      for (std::string& name : requirement.ingredients) Canonicalise(*lookups, tables.ingredients, name);
    }
    lookups->rules.emplace(tables.rules[i].id, i);
  }
  Formulary formulary(Private{});
  formulary.tables_ = std::make_shared<const FormularyTables>(std::move(tables));
  formulary.lookups_ = std::move(lookups);
  formulary.index_ = std::move(index);
  return formulary;
}

const Ingredient* Formulary::FindIngredient(std::string_view name) const {
  const auto it = lookups_->by_name.find(NameKey(name));
  return it == lookups_->by_name.end() ? nullptr : &tables_->ingredients[it->second];
}

const Ingredient* Formulary::FindByAtc(std::string_view code) const {
  std::string key(code);
  for (char& c : key) c = (c >= 'a' && c <= 'z') ? static_cast<char>(c - 32) : c;
  const auto it = lookups_->by_atc.find(key);
  return it == lookups_->by_atc.end() ? nullptr : &tables_->ingredients[it->second];
}

const std::vector<std::string>& Formulary::ClassesOf(std::string_view ingredient) const {
  const Ingredient* found = FindIngredient(ingredient);
  return found == nullptr ? kNoClasses : found->classes;
}

bool Formulary::HasClass(std::string_view ingredient, std::string_view class_name) const {
  const auto& classes = ClassesOf(ingredient);
  return std::find(classes.begin(), classes.end(), class_name) != classes.end();
}

bool Formulary::IsKnownClass(std::string_view class_name) const {
  return lookups_->by_class.find(class_name) != lookups_->by_class.end();
}

std::vector<std::string> Formulary::IngredientsInClass(std::string_view class_name) const {
  std::vector<std::string> names;
  const auto it = lookups_->by_class.find(class_name);
  if (it == lookups_->by_class.end()) return names;
  for (const size_t i : it->second) names.push_back(tables_->ingredients[i].name);
  return names;
}

std::vector<std::string> Formulary::ScaleNames() const {
  std::vector<std::string> names;
  for (const auto& [name, scores] : lookups_->scales) names.push_back(name);
  return names;
}

bool Formulary::HasScale(std::string_view scale) const {
  return lookups_->scales.find(scale) != lookups_->scales.end();
}

std::optional<int> Formulary::ScoreOn(std::string_view scale, std::string_view ingredient) const {
  const auto found_scale = lookups_->scales.find(scale);
  if (found_scale == lookups_->scales.end()) return std::nullopt;
  const Ingredient* found = FindIngredient(ingredient);
  const auto it = found_scale->second.find(found != nullptr ? found->name : std::string(ingredient));
  if (it == found_scale->second.end()) return std::nullopt;
  return it->second;
}

const DbiDose* Formulary::DbiOf(std::string_view ingredient) const {
  const Ingredient* found = FindIngredient(ingredient);
  const auto it = lookups_->dbi.find(found != nullptr ? found->name : std::string(ingredient));
  return it == lookups_->dbi.end() ? nullptr : &tables_->dbi[it->second];
}

const NamedProduct* Formulary::FindProduct(std::string_view name) const {
  const auto it = lookups_->products.find(NameKey(name));
  return it == lookups_->products.end() ? nullptr : &tables_->products[it->second];
}

const ProductCode* Formulary::FindCode(std::string_view code_system, std::string_view code) const {
  const auto it = lookups_->codes.find(CodeKey(code_system, code));
  return it == lookups_->codes.end() ? nullptr : &tables_->codes[it->second];
}

const Rule* Formulary::FindRule(std::string_view id) const {
  const auto it = lookups_->rules.find(std::string(id));
  return it == lookups_->rules.end() ? nullptr : &tables_->rules[it->second];
}

}  // namespace medload
