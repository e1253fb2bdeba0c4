#include "medload/formulary/formulary.h"

#include <algorithm>
#include <map>
#include <optional>
#include <set>

#include "formulary/description_words.h"
#include "formulary/name_index.h"
#include "formulary/table_files.h"
#include "medload/formulary/resolver.h"

namespace medload {

struct Formulary::Lookups {
  std::unordered_map<std::string, size_t> by_name;  // NameKey of name or synonym -> ingredient
  std::unordered_map<std::string, size_t> by_atc;   // ATC code -> ingredient
  std::map<std::string, std::vector<size_t>, std::less<>> by_class;  // class -> ingredients
  std::map<std::string, std::unordered_map<std::string, int>, std::less<>> scales;  // canonical names
  std::unordered_map<std::string, size_t> dbi;       // canonical name -> row
  std::unordered_map<std::string, size_t> products;  // NameKey -> first target (see NamedProductAt)
  std::vector<NamedProduct> dictionary_brands;       // one per unambiguous dictionary brand
  std::unordered_map<std::string, size_t> dictionary_codes;  // CodeKey -> dictionary row
  std::unordered_map<std::string, size_t> dictionary_names;  // DescriptionKey -> dictionary row
  std::unordered_map<std::string, size_t> codes;     // CodeKey -> row
  std::unordered_map<std::string, size_t> rules;     // id -> rule
};

namespace {

const std::vector<std::string> kNoClasses;

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

// The key a dictionary name is found under: abbreviations written out, then NameKey.
std::string DescriptionKey(std::string_view text) {
  return NameKey(formulary_internal::ExpandAbbreviations(NormaliseText(text)));
}

// A brands.csv row naming one products.csv row takes that row's ingredients, form, route,
// dose unit and supply; otherwise its names are ingredients.
void ResolveBrand(const Formulary::Lookups& lookups, const FormularyTables& tables, NamedProduct& brand) {
  if (brand.ingredients.size() == 1 && lookups.by_name.count(NameKey(brand.ingredients[0])) == 0) {
    const auto it = lookups.products.find(NameKey(brand.ingredients[0]));
    if (it != lookups.products.end() && it->second < tables.products.size()) {
      const NamedProduct& product = tables.products[it->second];
      brand.ingredients = product.ingredients;
      brand.form = product.form;
      brand.route = product.route;
      brand.dose_unit = product.dose_unit;
      brand.supply_days_per_unit = product.supply_days_per_unit;
      return;
    }
  }
  for (std::string& name : brand.ingredients) Canonicalise(lookups, tables.ingredients, name);
}

// Canonicalises the name part of each "name=strength" element ("?name" stays as written).
void CanonicaliseEntry(const Formulary::Lookups& lookups, const FormularyTables& tables, DictionaryEntry& entry) {
  for (std::string& element : entry.ingredients) {
    if (element.empty() || element.front() == '?') continue;
    const size_t equals = element.find('=');
    std::string name = element.substr(0, equals);
    Canonicalise(lookups, tables.ingredients, name);
    element = equals == std::string::npos ? name : name + element.substr(equals);
  }
}

// One named product per dictionary brand whose rows all name the same ingredients;
// a brand whose rows disagree is left to exact names and codes.
void AddDictionaryBrands(const FormularyTables& tables, Formulary::Lookups& lookups) {
  std::map<std::string, std::optional<NamedProduct>> brands;
  for (const DictionaryEntry& entry : tables.dictionary) {
    if (entry.brand.empty()) continue;
    NamedProduct brand;
    brand.name = entry.brand;
    brand.source = entry.source;
    brand.line = entry.line;
    brand.table = "dictionary.csv";
    for (const std::string& element : entry.ingredients) brand.ingredients.push_back(element.substr(0, element.find('=')));
    // A dictionary writes a combination's ingredients in its own order, not necessarily
    // the order a brand's strengths are written in: its brand pairs no strength.
    brand.strengths_in_order = brand.ingredients.size() == 1;
    std::sort(brand.ingredients.begin(), brand.ingredients.end());
    auto [it, inserted] = brands.emplace(NameKey(entry.brand), brand);
    if (!inserted && it->second && it->second->ingredients != brand.ingredients) it->second.reset();
  }
  for (auto& [key, brand] : brands) {
    if (brand) lookups.dictionary_brands.push_back(std::move(*brand));
  }
}

void IndexDictionary(FormularyTables& tables, Formulary::Lookups& lookups) {
  for (size_t i = 0; i < tables.dictionary.size(); ++i) {
    DictionaryEntry& entry = tables.dictionary[i];
    CanonicaliseEntry(lookups, tables, entry);
    if (!entry.code.empty()) lookups.dictionary_codes.emplace(CodeKey(entry.code_system, entry.code), i);
    if (!entry.name.empty()) lookups.dictionary_names.emplace(DescriptionKey(entry.name), i);
  }
  AddDictionaryBrands(tables, lookups);
}

// Index entries of the single-word names (the candidates for a close spelling).
void IndexSpellings(const FormularyTables& tables, NameIndex& index) {
  for (size_t i = 0; i < tables.ingredients.size(); ++i) {
    const Ingredient& ingredient = tables.ingredients[i];
    auto add = [&](const std::string& name) {
      const std::string key = NameKey(name);
      if (!key.empty() && key.find(' ') == std::string::npos) index.spelling_names.emplace_back(key, i);
    };
    add(ingredient.name);
    for (const std::string& synonym : ingredient.synonyms) add(synonym);
  }
  std::sort(index.spelling_names.begin(), index.spelling_names.end());  // by first letter for lookups
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
  for (size_t i = 0; i < tables.brands.size(); ++i) {
    NamedProduct& brand = tables.brands[i];
    ResolveBrand(*lookups, tables, brand);
    lookups->products.emplace(NameKey(brand.name), tables.products.size() + i);
    index->products.Add(brand.name, tables.products.size() + i, brand.requires_words.size());
  }
  IndexDictionary(tables, *lookups);
  const size_t first_dictionary_brand = tables.products.size() + tables.brands.size();
  for (size_t i = 0; i < lookups->dictionary_brands.size(); ++i) {
    index->products.Add(lookups->dictionary_brands[i].name, first_dictionary_brand + i);
  }
  IndexSpellings(tables, *index);
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
    for (RuleRequirement& requirement : tables.rules[i].forbid) {
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
  return it == lookups_->products.end() ? nullptr : &NamedProductAt(it->second);
}

const NamedProduct& Formulary::NamedProductAt(size_t target) const {
  if (target < tables_->products.size()) return tables_->products[target];
  target -= tables_->products.size();
  if (target < tables_->brands.size()) return tables_->brands[target];
  return lookups_->dictionary_brands.at(target - tables_->brands.size());
}

const DictionaryEntry* Formulary::FindDictionaryCode(std::string_view code_system, std::string_view code) const {
  const auto it = lookups_->dictionary_codes.find(CodeKey(code_system, code));
  return it == lookups_->dictionary_codes.end() ? nullptr : &tables_->dictionary[it->second];
}

const DictionaryEntry* Formulary::FindDictionaryName(std::string_view description) const {
  if (lookups_->dictionary_names.empty()) return nullptr;
  const auto it = lookups_->dictionary_names.find(DescriptionKey(description));
  return it == lookups_->dictionary_names.end() ? nullptr : &tables_->dictionary[it->second];
}

const ProductCode* Formulary::FindCode(std::string_view code_system, std::string_view code) const {
  const auto it = lookups_->codes.find(CodeKey(code_system, code));
  return it == lookups_->codes.end() ? nullptr : &tables_->codes[it->second];
}

const Rule* Formulary::FindRule(std::string_view id) const {
  const auto it = lookups_->rules.find(std::string(id));
  return it == lookups_->rules.end() ? nullptr : &tables_->rules[it->second];
}

std::string CodeSystemKey(std::string_view system) {
  std::string key = NameKey(system);
  std::erase(key, ' ');
  // FHIR system URIs (FHIR R4 terminologies page; the dm+d URI from memory).
  if (key == "httpwwwwhoccnoatc" || key == "httpswwwwhoccnoatc" || key == "whoatc") return "atc";
  if (key == "httpsdmdnhsuk" || key == "httpdmdnhsuk") return "dmd";
  if (key == "httpwwwnlmnihgovresearchumlsrxnorm") return "rxnorm";
  return key;
}

std::vector<Route> Formulary::SystemicRoutes() const {
  std::vector<Route> routes = DefaultSystemicRoutes();
  for (const RouteRow& row : tables_->routes) {
    std::erase(routes, row.route);
    if (row.systemic) routes.push_back(row.route);
  }
  SortRoutes(routes);
  return routes;
}

}  // namespace medload
