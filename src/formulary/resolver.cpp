// Resolution order (see resolver.h and docs/formulary.md): code, non-medicine terms,
// named products, ingredient words. Strengths, form and route come from the words.
#include "medload/formulary/resolver.h"

#include <algorithm>
#include <cctype>
#include <cstdint>

#include "formulary/name_index.h"

namespace medload {
namespace {

using formulary_internal::SplitWords;
using formulary_internal::Word;
using formulary_internal::WordTable;

struct FormWords {
  std::string_view words;
  std::string_view form;
  Route route;
  std::string_view dose_unit;
};

// Form words as dispensing descriptions write them. Longest match wins.
constexpr FormWords kForms[] = {
    {"tablet", "tablet", Route::kOral, "tablet"},
    {"caplet", "tablet", Route::kOral, "tablet"},
    {"modified release tablet", "modified-release tablet", Route::kOral, "tablet"},
    {"prolonged release tablet", "modified-release tablet", Route::kOral, "tablet"},
    {"gastro resistant tablet", "gastro-resistant tablet", Route::kOral, "tablet"},
    {"dispersible tablet", "dispersible tablet", Route::kOral, "tablet"},
    {"soluble tablet", "soluble tablet", Route::kOral, "tablet"},
    {"effervescent tablet", "effervescent tablet", Route::kOral, "tablet"},
    {"chewable tablet", "chewable tablet", Route::kOral, "tablet"},
    {"orodispersible tablet", "orodispersible tablet", Route::kOral, "tablet"},
    {"orodispersible film", "orodispersible film", Route::kOral, "film"},
    {"sublingual tablet", "sublingual tablet", Route::kSublingualBuccal, "tablet"},
    {"sublingual spray", "sublingual spray", Route::kSublingualBuccal, "dose"},
    {"buccal tablet", "buccal tablet", Route::kSublingualBuccal, "tablet"},
    {"buccal film", "buccal film", Route::kSublingualBuccal, "film"},
    {"oromucosal solution", "oromucosal solution", Route::kSublingualBuccal, "ml"},
    {"oromucosal spray", "oromucosal spray", Route::kSublingualBuccal, "dose"},
    {"mouthspray", "oromucosal spray", Route::kSublingualBuccal, "dose"},
    {"chewing gum", "medicated chewing gum", Route::kSublingualBuccal, "piece"},
    {"capsule", "capsule", Route::kOral, "capsule"},
    {"modified release capsule", "modified-release capsule", Route::kOral, "capsule"},
    {"prolonged release capsule", "modified-release capsule", Route::kOral, "capsule"},
    {"gastro resistant capsule", "gastro-resistant capsule", Route::kOral, "capsule"},
    {"oral solution", "oral solution", Route::kOral, "ml"},
    {"oral suspension", "oral suspension", Route::kOral, "ml"},
    {"oral liquid", "oral solution", Route::kOral, "ml"},
    {"oral drops", "oral drops", Route::kOral, "ml"},
    {"oral emulsion", "oral emulsion", Route::kOral, "ml"},
    {"oral powder", "oral powder", Route::kOral, "sachet"},
    {"oral gel", "oral gel", Route::kOral, "g"},
    {"syrup", "syrup", Route::kOral, "ml"},
    {"elixir", "elixir", Route::kOral, "ml"},
    {"linctus", "linctus", Route::kOral, "ml"},
    {"mixture", "oral solution", Route::kOral, "ml"},
    {"granules", "granules", Route::kOral, "sachet"},
    {"sachet", "sachet", Route::kOral, "sachet"},
    {"lozenge", "lozenge", Route::kOral, "lozenge"},
    {"pastille", "pastille", Route::kOral, "pastille"},
    {"mouthwash", "mouthwash", Route::kOral, "ml"},
    {"cream", "cream", Route::kSkin, "g"},
    {"ointment", "ointment", Route::kSkin, "g"},
    {"gel", "gel", Route::kSkin, "g"},
    {"lotion", "lotion", Route::kSkin, "ml"},
    {"cutaneous solution", "cutaneous solution", Route::kSkin, "ml"},
    {"cutaneous spray", "cutaneous spray", Route::kSkin, "ml"},
    {"cutaneous foam", "cutaneous foam", Route::kSkin, "g"},
    {"cutaneous emulsion", "cutaneous emulsion", Route::kSkin, "ml"},
    {"scalp application", "scalp application", Route::kSkin, "ml"},
    {"shampoo", "shampoo", Route::kSkin, "ml"},
    {"paste", "paste", Route::kSkin, "g"},
    {"emollient", "emollient", Route::kSkin, "g"},
    {"bath additive", "bath additive", Route::kSkin, "ml"},
    {"dusting powder", "dusting powder", Route::kSkin, "g"},
    {"medicated plaster", "medicated plaster", Route::kSkin, "plaster"},
    {"paint", "paint", Route::kSkin, "ml"},
    {"spray", "spray", Route::kUnknown, "dose"},
    {"eye drop", "eye drops", Route::kEye, "ml"},
    {"eye ointment", "eye ointment", Route::kEye, "g"},
    {"eye gel", "eye gel", Route::kEye, "g"},
    {"ear drop", "ear drops", Route::kEar, "ml"},
    {"ear spray", "ear spray", Route::kEar, "ml"},
    {"ear eye drop", "ear/eye drops", Route::kEye, "ml"},
    {"nasal spray", "nasal spray", Route::kNasal, "dose"},
    {"nasal drop", "nasal drops", Route::kNasal, "ml"},
    {"nasal ointment", "nasal ointment", Route::kNasal, "g"},
    {"inhaler", "inhaler", Route::kInhaled, "puff"},
    // Inhaler devices often named in place of the form.
    {"accuhaler", "inhalation powder", Route::kInhaled, "dose"},
    {"easyhaler", "inhalation powder", Route::kInhaled, "dose"},
    {"ellipta", "inhalation powder", Route::kInhaled, "dose"},
    {"evohaler", "inhaler", Route::kInhaled, "puff"},
    {"nexthaler", "inhalation powder", Route::kInhaled, "dose"},
    {"respimat", "inhalation solution", Route::kInhaled, "puff"},
    {"spiromax", "inhalation powder", Route::kInhaled, "dose"},
    {"turbohaler", "inhalation powder", Route::kInhaled, "dose"},
    {"pressurised inhalation", "inhaler", Route::kInhaled, "puff"},
    {"inhalation powder", "inhalation powder", Route::kInhaled, "dose"},
    {"inhalation solution", "inhalation solution", Route::kInhaled, "puff"},
    {"inhalation capsule", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"inhalation powder capsule", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"nebuliser solution", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebuliser liquid", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebuliser suspension", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebule", "nebuliser liquid", Route::kInhaled, "ml"},
    {"patch", "patch", Route::kTransdermal, "patch"},
    {"transdermal patch", "patch", Route::kTransdermal, "patch"},
    {"injection", "injection", Route::kInjection, "injection"},
    {"solution for injection", "injection", Route::kInjection, "injection"},
    {"suspension for injection", "injection", Route::kInjection, "injection"},
    {"powder for solution for injection", "injection", Route::kInjection, "injection"},
    {"pre filled pen", "injection", Route::kInjection, "injection"},
    {"prefilled pen", "injection", Route::kInjection, "injection"},
    {"pre filled syringe", "injection", Route::kInjection, "injection"},
    {"prefilled syringe", "injection", Route::kInjection, "injection"},
    {"cartridge", "injection", Route::kInjection, "injection"},
    {"ampoule", "injection", Route::kInjection, "injection"},
    {"implant", "implant", Route::kInjection, "implant"},
    {"suppository", "suppository", Route::kRectal, "suppository"},
    {"enema", "enema", Route::kRectal, "enema"},
    {"rectal foam", "rectal foam", Route::kRectal, "dose"},
    {"rectal ointment", "rectal ointment", Route::kRectal, "g"},
    {"rectal solution", "enema", Route::kRectal, "enema"},
    {"pessary", "pessary", Route::kVaginal, "pessary"},
    {"vaginal cream", "vaginal cream", Route::kVaginal, "g"},
    {"vaginal gel", "vaginal gel", Route::kVaginal, "g"},
    {"vaginal tablet", "vaginal tablet", Route::kVaginal, "tablet"},
    {"vaginal ring", "vaginal ring", Route::kVaginal, "ring"},
};

const WordTable& FormTable() {
  static const WordTable table = [] {
    WordTable forms;
    for (size_t i = 0; i < std::size(kForms); ++i) forms.Add(kForms[i].words, i);
    return forms;
  }();
  return table;
}

// The longest form phrase in the words (leftmost on a tie); nullptr if none.
const FormWords* FindForm(const std::vector<Word>& words) {
  const WordTable::Entry* best = nullptr;
  for (size_t i = 0; i < words.size(); ++i) {
    const WordTable::Entry* entry = FormTable().LongestAt(words, i);
    if (entry != nullptr && (best == nullptr || entry->words.size() > best->words.size())) best = entry;
  }
  return best == nullptr ? nullptr : &kForms[best->target];
}

// An ingredient found in the words, with the byte offset where its name starts.
struct Mention {
  std::string name;
  size_t offset = 0;
};

std::vector<Mention> FindIngredients(const Formulary& formulary, const std::vector<Word>& words) {
  std::vector<Mention> mentions;
  const WordTable& table = formulary.name_index().ingredients;
  for (size_t i = 0; i < words.size();) {
    const WordTable::Entry* entry = table.LongestAt(words, i);
    if (entry == nullptr) {
      ++i;
      continue;
    }
    const std::string& name = formulary.ingredients()[entry->target].name;
    const bool repeated = std::any_of(mentions.begin(), mentions.end(),
                                      [&](const Mention& m) { return m.name == name; });
    if (!repeated) mentions.push_back(Mention{name, words[i].offset});
    i += entry->words.size();
  }
  return mentions;
}

// The named product whose name (and required words) occur, longest first; nullptr.
const NamedProduct* FindNamedProduct(const Formulary& formulary, const std::vector<Word>& words) {
  const auto& products = formulary.tables().products;
  const WordTable::Entry* best = nullptr;
  for (size_t i = 0; i < words.size(); ++i) {
    const WordTable::Entry* entry = formulary.name_index().products.LongestAt(
        words, i, [&](const WordTable::Entry& candidate) {
          for (const std::string& required : products[candidate.target].requires_words) {
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
  return best == nullptr ? nullptr : &products[best->target];
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

// Pairs ingredients (in `mentions` order) with strengths: one each when the counts agree;
// a single ingredient takes the first strength; otherwise each takes the first strength
// written after its name and before the next ingredient's name.
std::vector<ResolvedIngredient> PairStrengths(const std::vector<Mention>& mentions,
                                              const std::vector<Strength>& strengths, bool by_position,
                                              std::string_view dose_unit) {
  std::vector<ResolvedIngredient> out;
  for (size_t i = 0; i < mentions.size(); ++i) {
    const Strength* strength = nullptr;
    if (strengths.size() == mentions.size()) {
      strength = &strengths[i];
    } else if (mentions.size() == 1 && !strengths.empty()) {
      strength = &strengths.front();
    } else if (by_position) {
      const size_t end = i + 1 < mentions.size() ? mentions[i + 1].offset : SIZE_MAX;
      for (const Strength& candidate : strengths) {
        if (candidate.position > mentions[i].offset && candidate.position < end) {
          strength = &candidate;
          break;
        }
      }
    }
    out.push_back(WithStrength(mentions[i].name, strength, dose_unit));
  }
  return out;
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

void ApplyProduct(const NamedProduct& named, const std::vector<Strength>& strengths, ResolvedProduct& product) {
  if (!named.form.empty()) product.form = named.form;
  if (named.route) product.route = *named.route;
  // A strength per ml or per g decides the unit its mg refer to; otherwise the table's.
  const std::string_view per = DoseUnitFromStrengths(strengths);
  if (!named.dose_unit.empty() && per.empty()) product.dose_unit = named.dose_unit;
  product.default_supply_days = named.supply_days_per_unit;
  std::vector<Mention> mentions;
  for (const std::string& name : named.ingredients) mentions.push_back(Mention{name, 0});
  product.ingredients = PairStrengths(mentions, ForRoute(strengths, product.route), false, product.dose_unit);
}

bool IsAtcLike(std::string_view code) {
  return code.size() == 7 && std::isalpha(static_cast<unsigned char>(code[0])) &&
         std::isdigit(static_cast<unsigned char>(code[1])) && std::isdigit(static_cast<unsigned char>(code[2]));
}

// Resolution by code; true if the code named something.
bool ResolveCode(const Formulary& formulary, std::string_view code, std::string_view system,
                 const std::vector<Strength>& strengths, ResolvedProduct& product) {
  std::string target;
  if (const ProductCode* row = formulary.FindCode(system, code)) {
    target = row->target;
  } else if (system.empty() && IsAtcLike(code)) {
    if (const ProductCode* atc = formulary.FindCode("ATC", code)) target = atc->target;
  }
  const std::string label = (system.empty() ? std::string("code") : std::string(system)) + " " + std::string(code);
  if (target.empty()) {
    const std::string system_key = NameKey(system);
    const bool atc_system = system_key.empty() || system_key == "atc" || system_key.find("whocc") != std::string::npos;
    const Ingredient* ingredient = atc_system ? formulary.FindByAtc(code) : nullptr;
    if (ingredient == nullptr) return false;
    target = ingredient->name;
  }
  product.match = MatchKind::kCode;
  product.match_detail = label + " -> " + target;
  if (const NamedProduct* named = formulary.FindProduct(target)) {
    ApplyProduct(*named, strengths, product);
  } else if (const Ingredient* ingredient = formulary.FindIngredient(target)) {
    product.ingredients =
        PairStrengths({Mention{ingredient->name, 0}}, ForRoute(strengths, product.route), false, product.dose_unit);
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

}  // namespace

ResolvedProduct Resolve(const Formulary& formulary, std::string_view description, std::string_view code,
                        std::string_view code_system) {
  ResolvedProduct product;
  const std::string text = NormaliseText(description);
  const std::vector<Word> words = SplitWords(text);
  const std::vector<Strength> strengths = ParseStrengths(text);
  SetFormAndStrengths(words, strengths, product);
  if (!code.empty() && ResolveCode(formulary, code, code_system, strengths, product)) return product;
  if (ResolveNonMedicine(formulary, words, product)) return product;
  if (const NamedProduct* named = FindNamedProduct(formulary, words)) {
    ApplyProduct(*named, strengths, product);
    product.match = MatchKind::kProduct;
    product.match_detail = "product \"" + named->name + "\"";
    return product;
  }
  const std::vector<Mention> mentions = FindIngredients(formulary, words);
  if (mentions.empty()) {
    product.match_detail = "no code, product or ingredient name recognised";
    return product;
  }
  product.ingredients = PairStrengths(mentions, ForRoute(strengths, product.route), true, product.dose_unit);
  product.match = MatchKind::kIngredient;
  product.match_detail = mentions.size() == 1 ? "ingredient name" : "ingredient names (combination)";
  return product;
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
