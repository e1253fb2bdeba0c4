// Resolution order (see resolver.h and docs/formulary.md): code, non-medicine terms, a
// dictionary's exact name, named products and brands, ingredient words (with close
// spellings and unknown parts). Strengths, form and route come from the words.
#include "medload/formulary/resolver.h"

#include <algorithm>
#include <cctype>

#include "formulary/description_words.h"
#include "formulary/ingredient_words.h"
#include "formulary/name_index.h"
#include "formulary/product_forms.h"
#include "formulary/spelling.h"

namespace medload {
namespace {

using formulary_internal::Component;
using formulary_internal::FindComponents;
using formulary_internal::FindForm;
using formulary_internal::FormWords;
using formulary_internal::SplitWords;
using formulary_internal::Word;
using formulary_internal::WordTable;

// A description made ready for matching.
struct Text {
  std::string text;                // normalised, abbreviations written out
  std::vector<Word> words;         // its words, without a trailing maker in brackets
  std::vector<Strength> strengths;
};

bool StartsName(const Formulary& formulary, const std::vector<Word>& words, size_t i) {
  const NameIndex& index = formulary.name_index();
  return index.ingredients.LongestAt(words, i) != nullptr || index.products.LongestAt(words, i) != nullptr ||
         index.non_medicines.LongestAt(words, i) != nullptr;
}

// Drops the words of a trailing bracket that holds no number and no known name: the
// maker, as dispensing systems append it ("Detrusitol 2mg tablets (Pfizer Ltd)").
void DropMaker(const Formulary& formulary, Text& text) {
  size_t end = text.text.find_last_not_of(" .");
  if (end == std::string::npos || text.text[end] != ')') return;
  int depth = 0;
  size_t open = end + 1;
  for (size_t i = end + 1; i-- > 0;) {
    if (text.text[i] == ')') ++depth;
    if (text.text[i] == '(' && --depth == 0) {
      open = i;
      break;
    }
  }
  if (open > end || open == 0) return;
  const std::string_view inside = std::string_view(text.text).substr(open, end - open);
  if (inside.find_first_of("0123456789") != std::string_view::npos) return;
  const auto first = std::find_if(text.words.begin(), text.words.end(), [&](const Word& w) { return w.offset > open; });
  for (auto it = first; it != text.words.end(); ++it) {
    if (StartsName(formulary, text.words, static_cast<size_t>(it - text.words.begin()))) return;
  }
  text.words.erase(first, text.words.end());
}

Text Prepare(const Formulary& formulary, std::string_view description) {
  Text text;
  text.text = formulary_internal::ExpandAbbreviations(NormaliseText(description));
  text.words = SplitWords(text.text);
  text.strengths = ParseStrengths(text.text);
  DropMaker(formulary, text);
  return text;
}

// The named product whose name (and required words) occur, longest first; nullptr.
const NamedProduct* FindNamedProduct(const Formulary& formulary, const std::vector<Word>& words) {
  const WordTable::Entry* best = nullptr;
  for (size_t i = 0; i < words.size(); ++i) {
    const WordTable::Entry* entry = formulary.name_index().products.LongestAt(
        words, i, [&](const WordTable::Entry& candidate) {
          for (const std::string& required : formulary.NamedProductAt(candidate.target).requires_words) {
            const std::string key = NameKey(required);
            std::vector<std::string> required_words;
            for (const Word& word : SplitWords(key)) required_words.emplace_back(word.text);
            if (!WordTable::Contains(words, required_words)) return false;
          }
          return true;
        });
    if (entry == nullptr) continue;
    const size_t size = entry->words.size() + entry->rank;
    if (best == nullptr || size > best->words.size() + best->rank) best = entry;
  }
  return best == nullptr ? nullptr : &formulary.NamedProductAt(best->target);
}

ResolvedIngredient WithStrength(const std::string& name, const Strength* strength, std::string_view dose_unit) {
  ResolvedIngredient ingredient{name, std::nullopt, std::nullopt};
  if (strength != nullptr) {
    ingredient.mg_per_unit = strength->MgPerUnit();
    ingredient.mg_per_day = strength->MgPerDay();
    // A percentage is mg per g or ml: it says nothing about one plaster or one tablet.
    if (strength->unit == StrengthUnit::kPercent && dose_unit != "g" && dose_unit != "ml") {
      ingredient.mg_per_unit.reset();
    }
  }
  return ingredient;
}

// The dose unit implied by the strengths' denominators ("5mg/5ml" -> ml), if any.
std::string_view DoseUnitFromStrengths(const std::vector<Strength>& strengths) {
  for (const Strength& strength : strengths) {
    if (strength.per == "ml" || strength.per == "g") return strength.per;
  }
  return {};
}

void SetFormAndStrengths(const std::vector<Word>& words, const std::vector<Strength>& strengths,
                         ResolvedProduct& product) {
  if (const FormWords* form = FindForm(words)) {
    product.form = std::string(form->form);
    product.route = form->route;
    product.dose_unit = std::string(form->dose_unit);
  }
  const std::string_view per = DoseUnitFromStrengths(strengths);
  if (!per.empty()) product.dose_unit = std::string(per);
  if (product.dose_unit.empty() && !strengths.empty() && strengths.front().per == "dose") product.dose_unit = "dose";
}

// Inhaler strengths are written in micrograms; "200/6" without units means micrograms.
std::vector<Strength> ForRoute(std::vector<Strength> strengths, Route route) {
  if (route != Route::kInhaled) return strengths;
  for (Strength& strength : strengths) {
    if (strength.bare) strength.amount *= 0.001;
  }
  return strengths;
}

// Sets the ingredients: names starting "?" are substances the tables do not know (kept
// in `unknown`, never given a known ingredient's strength). Returns true if any was.
bool SetIngredients(const std::vector<std::string>& names, const std::vector<const Strength*>& paired,
                    ResolvedProduct& product) {
  for (size_t i = 0; i < names.size(); ++i) {
    if (!names[i].empty() && names[i].front() == '?') {
      product.unknown.push_back(names[i].substr(1));
      continue;
    }
    product.ingredients.push_back(WithStrength(names[i], paired[i], product.dose_unit));
  }
  return !product.unknown.empty();
}

void ApplyProduct(const NamedProduct& named, const std::vector<Strength>& strengths, ResolvedProduct& product) {
  if (!named.form.empty()) product.form = named.form;
  if (named.route) product.route = *named.route;
  // A strength per ml or per g decides the unit its mg refer to; otherwise the table's.
  const std::string_view per = DoseUnitFromStrengths(strengths);
  if (!named.dose_unit.empty() && per.empty()) product.dose_unit = named.dose_unit;
  product.default_supply_days = named.supply_days_per_unit;
  const std::vector<Strength> scaled = ForRoute(strengths, product.route);
  std::vector<const Strength*> paired = formulary_internal::PairStrengths(named.ingredients.size(), {}, scaled);
  if (!named.strengths_in_order && named.ingredients.size() > 1) paired.assign(paired.size(), nullptr);
  if (SetIngredients(named.ingredients, paired, product)) product.match = MatchKind::kPartial;
}

// A dictionary row: its own strengths when it gives any ("codeine=30mg"), else the
// description's as for a named product.
void ApplyDictionary(const Formulary& formulary, const DictionaryEntry& entry, Text& text, ResolvedProduct& product) {
  if (product.form.empty() || text.strengths.empty()) {
    Text own = Prepare(formulary, entry.name);
    if (product.form.empty()) SetFormAndStrengths(own.words, own.strengths, product);
    if (text.strengths.empty()) text.strengths = std::move(own.strengths);
  }
  std::vector<std::string> names;
  std::vector<Strength> own_strengths;
  bool explicit_strengths = false;
  for (const std::string& element : entry.ingredients) {
    const size_t equals = element.find('=');
    names.push_back(element.substr(0, equals));
    explicit_strengths = explicit_strengths || equals != std::string::npos;
  }
  std::vector<const Strength*> paired(names.size(), nullptr);
  if (explicit_strengths) {
    own_strengths.reserve(names.size());
    for (size_t i = 0; i < names.size(); ++i) {
      const size_t equals = entry.ingredients[i].find('=');
      const auto parsed = equals == std::string::npos ? std::vector<Strength>{}
                                                       : ParseStrengths(NormaliseText(entry.ingredients[i].substr(equals + 1)));
      own_strengths.push_back(parsed.empty() ? Strength{} : parsed.front());
      if (!parsed.empty()) paired[i] = &own_strengths.back();
    }
  } else {
    own_strengths = ForRoute(text.strengths, product.route);  // kept alive for `paired`
    paired = formulary_internal::PairStrengths(names.size(), {}, own_strengths);
  }
  if (SetIngredients(names, paired, product)) product.match = MatchKind::kPartial;
}

bool IsAtcLike(std::string_view code) {
  return code.size() == 7 && std::isalpha(static_cast<unsigned char>(code[0])) &&
         std::isdigit(static_cast<unsigned char>(code[1])) && std::isdigit(static_cast<unsigned char>(code[2]));
}

std::string CodeLabel(std::string_view code, std::string_view system) {
  return (system.empty() ? std::string("code") : std::string(system)) + " " + std::string(code);
}

// The target name of a code in codes.csv or the ATC codes of ingredients.csv; "" if none.
std::string CodeTarget(const Formulary& formulary, std::string_view code, std::string_view system) {
  if (const ProductCode* row = formulary.FindCode(system, code)) return row->target;
  if (system.empty() && IsAtcLike(code)) {
    if (const ProductCode* atc = formulary.FindCode("ATC", code)) return atc->target;
  }
  const std::string system_key = CodeSystemKey(system);
  const bool atc_system = system_key.empty() || system_key == "atc" || system_key.find("whocc") != std::string::npos;
  const Ingredient* ingredient = atc_system ? formulary.FindByAtc(code) : nullptr;
  return ingredient == nullptr ? std::string() : ingredient->name;
}

// Resolution by code; true if the code named something.
bool ResolveCode(const Formulary& formulary, std::string_view code, std::string_view system, Text& text,
                 ResolvedProduct& product) {
  std::string target;
  if (const ProductCode* row = formulary.FindCode(system, code)) target = row->target;
  if (target.empty()) {
    if (const DictionaryEntry* entry = formulary.FindDictionaryCode(system, code)) {
      product.match = MatchKind::kCode;
      product.match_detail = CodeLabel(code, system) + " -> \"" + entry->name + "\" (dictionary.csv)";
      ApplyDictionary(formulary, *entry, text, product);
      return true;
    }
    target = CodeTarget(formulary, code, system);
  }
  if (target.empty()) return false;
  product.match = MatchKind::kCode;
  product.match_detail = CodeLabel(code, system) + " -> " + target;
  const std::vector<Strength> strengths = ForRoute(text.strengths, product.route);
  if (const NamedProduct* named = formulary.FindProduct(target)) {
    ApplyProduct(*named, text.strengths, product);
  } else if (const Ingredient* ingredient = formulary.FindIngredient(target)) {
    product.ingredients.push_back(WithStrength(ingredient->name, strengths.empty() ? nullptr : &strengths.front(),
                                               product.dose_unit));
  } else {
    product.non_medicine = true;  // a code for a non-medicine term
  }
  return true;
}

bool ResolveNonMedicine(const Formulary& formulary, const std::vector<Word>& words, ResolvedProduct& product) {
  const WordTable& table = formulary.name_index().non_medicines;
  for (size_t i = 0; i < words.size(); ++i) {
    const WordTable::Entry* entry = table.LongestAt(words, i);
    if (entry == nullptr) continue;
    const NonMedicineTerm& term = formulary.tables().non_medicines[entry->target];
    product.non_medicine = true;
    product.match = MatchKind::kNonMedicine;
    product.match_detail = "non-medicine term \"" + term.term + "\" (" + term.category + ")";
    return true;
  }
  return false;
}

std::string JoinWords(const std::vector<std::string>& words) {
  std::string out;
  for (const std::string& word : words) out += (out.empty() ? "" : ", ") + word;
  return out;
}

// Resolution by the ingredient names, close spellings and unknown parts in the words.
void ResolveByIngredients(const Formulary& formulary, const Text& text, ResolvedProduct& product) {
  const std::vector<Component> components = FindComponents(formulary, text.text, text.words, text.strengths);
  if (components.empty()) {
    product.match_detail = "no code, product or ingredient name recognised";
    return;
  }
  std::vector<std::string> names;
  std::vector<size_t> offsets;
  for (const Component& component : components) {
    names.push_back(component.kind == Component::Kind::kUnknown ? "?" + component.name : component.name);
    offsets.push_back(component.offset);
    if (component.kind == Component::Kind::kSpelled) product.spellings.push_back({component.written, component.name});
  }
  const std::vector<Strength> strengths = ForRoute(text.strengths, product.route);
  const std::vector<const Strength*> paired = formulary_internal::PairStrengths(names.size(), offsets, strengths);
  const bool partial = SetIngredients(names, paired, product);
  product.match = partial ? MatchKind::kPartial
                          : (product.spellings.empty() ? MatchKind::kIngredient : MatchKind::kApproximate);
  product.match_detail = product.ingredients.size() + product.unknown.size() == 1 ? "ingredient name"
                                                                                    : "ingredient names (combination)";
}

// Says in the detail what was read from a close spelling and what was not recognised.
void NoteFlags(ResolvedProduct& product) {
  std::vector<std::string> readings;
  for (const SpellingReading& reading : product.spellings) readings.push_back("\"" + reading.written + "\" read as " + reading.read_as);
  if (!readings.empty()) product.match_detail += "; close spelling: " + JoinWords(readings);
  if (!product.unknown.empty()) product.match_detail += "; not in the formulary: " + JoinWords(product.unknown);
}

}  // namespace

ResolvedProduct Resolve(const Formulary& formulary, std::string_view description, std::string_view code,
                        std::string_view code_system) {
  ResolvedProduct product;
  Text text = Prepare(formulary, description);
  SetFormAndStrengths(text.words, text.strengths, product);
  if (!code.empty() && ResolveCode(formulary, code, code_system, text, product)) {
    NoteFlags(product);
    return product;
  }
  if (ResolveNonMedicine(formulary, text.words, product)) return product;
  if (const DictionaryEntry* entry = formulary.FindDictionaryName(description)) {
    product.match = MatchKind::kProduct;
    product.match_detail = "dictionary product \"" + entry->name + "\" (" + entry->code_system + ")";
    ApplyDictionary(formulary, *entry, text, product);
  } else if (const NamedProduct* named = FindNamedProduct(formulary, text.words)) {
    product.match = MatchKind::kProduct;
    product.match_detail = "product \"" + named->name + "\" (" + named->table + ")";
    ApplyProduct(*named, text.strengths, product);
  } else {
    ResolveByIngredients(formulary, text, product);
  }
  NoteFlags(product);
  return product;
}

std::vector<std::string> SuggestNames(const Formulary& formulary, std::string_view description, size_t limit) {
  const Text text = Prepare(formulary, description);
  std::vector<std::string> names;
  for (const Word& word : text.words) {
    if (!formulary_internal::LooksLikeIngredient(word.text)) continue;
    for (std::string& name : formulary_internal::NearestNames(formulary, word.text, limit)) {
      if (std::find(names.begin(), names.end(), name) == names.end()) names.push_back(std::move(name));
    }
  }
  if (names.size() > limit) names.resize(limit);
  return names;
}

const ResolvedProduct& ResolutionCache::Resolve(std::string_view description, std::string_view code,
                                                std::string_view code_system) {
  std::string key;
  key.reserve(description.size() + code.size() + code_system.size() + 2);
  key.append(description).append(1, '\x1f').append(code).append(1, '\x1f').append(code_system);
  const auto it = cache_.find(key);
  if (it != cache_.end()) return it->second;
  return cache_.emplace(std::move(key), medload::Resolve(formulary_, description, code, code_system))
      .first->second;
}

}  // namespace medload
