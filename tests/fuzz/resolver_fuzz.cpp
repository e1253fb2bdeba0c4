// libFuzzer target: the product resolver (formulary/resolver.h) against the bundled
// formulary, read once from $MEDLOAD_FUZZ_FORMULARY or else the source tree's formulary/.
// The input is "description\ncode\ncode system" (missing parts are empty).
//
// Invariants:
// - normalised text is UTF-8; every strength is finite, the amount not negative and the
//   denominator above zero, at a position inside the text;
// - a resolution names only ingredients the formulary knows, with finite doses above
//   zero; an unmatched or non-medicine product has no ingredients; a partial one names
//   what it does not know, an approximate one the spellings it read (as known
//   ingredients); a default supply is 1..3650 days;
// - the resolution survives its JSON form (what the store keeps) unchanged, and the
//   resolution cache gives the same answer as resolving directly (text that is not UTF-8,
//   such as a code as given, comes back with U+FFFD; it must not throw).
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <string_view>

#include "fuzz/fuzz_check.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"
#include "medload/input/csv_reader.h"

namespace medload {
namespace {

const Formulary& TheFormulary() {
  static const Formulary formulary = [] {
    const char* dir = std::getenv("MEDLOAD_FUZZ_FORMULARY");
    Result<Formulary> loaded = LoadFormulary(dir != nullptr ? dir : MEDLOAD_SOURCE_FORMULARY);
    if (!loaded.ok()) {
      std::fprintf(stderr, "cannot load the formulary: %s\n", loaded.status().message().c_str());
      std::abort();
    }
    return std::move(loaded).value();
  }();
  return formulary;
}

bool PositiveFinite(const std::optional<double>& value) {
  return !value || (std::isfinite(*value) && *value > 0);
}

void CheckStrengths(std::string_view description) {
  const std::string normalised = NormaliseText(description);
  FuzzCheck(IsValidUtf8(normalised), "normalised text is UTF-8");
  for (const Strength& strength : ParseStrengths(normalised)) {
    FuzzCheck(std::isfinite(strength.amount) && strength.amount >= 0, "a strength is finite, not negative");
    FuzzCheck(std::isfinite(strength.per_amount) && strength.per_amount > 0,
              "a strength's denominator is finite and above zero");
    FuzzCheck(strength.position < normalised.size(), "a strength is inside the text");
    const std::optional<double> per_unit = strength.MgPerUnit();
    const std::optional<double> per_day = strength.MgPerDay();
    FuzzCheck(!per_unit || (std::isfinite(*per_unit) && *per_unit >= 0), "mg per unit is finite");
    FuzzCheck(!per_day || (std::isfinite(*per_day) && *per_day >= 0), "mg per day is finite");
  }
}

void CheckResolution(const Formulary& formulary, const ResolvedProduct& product) {
  FuzzCheck(product.matched() || product.ingredients.empty(), "an unmatched product has no ingredients");
  FuzzCheck(!product.non_medicine || product.ingredients.empty(), "a non-medicine has no ingredients");
  FuzzCheck(product.match != MatchKind::kPartial || !product.unknown.empty(), "a partial product names what it does not know");
  FuzzCheck(product.match != MatchKind::kApproximate || !product.spellings.empty(),
            "an approximate product names the spellings it read");
  for (const SpellingReading& reading : product.spellings) {
    FuzzCheck(formulary.FindIngredient(reading.read_as) != nullptr, "a spelling is read as a known ingredient");
  }
  for (const ResolvedIngredient& ingredient : product.ingredients) {
    const Ingredient* known = formulary.FindIngredient(ingredient.ingredient);
    FuzzCheck(known != nullptr && known->name == ingredient.ingredient,
              "a resolved ingredient is a canonical formulary name");
    FuzzCheck(PositiveFinite(ingredient.mg_per_unit), "mg per unit is finite and above zero");
    FuzzCheck(PositiveFinite(ingredient.mg_per_day), "mg per day is finite and above zero");
  }
  FuzzCheck(!product.default_supply_days ||
                (*product.default_supply_days >= 1 && *product.default_supply_days <= 3650),
            "a default supply is 1..3650 days");
  const Result<ResolvedProduct> again = ParseResolution(SerialiseResolution(product));
  FuzzCheck(again.ok(), "a serialised resolution parses");
  // Text that is not UTF-8 (a code as given) is stored with U+FFFD: compare the rest.
  FuzzCheck(again->match == product.match && again->ingredients.size() == product.ingredients.size(),
            "a resolution survives its JSON form");
  if (IsValidUtf8(product.match_detail)) {
    FuzzCheck(ResolvedProductToJson(*again) == ResolvedProductToJson(product),
              "a resolution in UTF-8 survives its JSON form unchanged");
  }
}

}  // namespace
}  // namespace medload

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace medload;
  const Formulary& formulary = TheFormulary();
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  const size_t first = input.find('\n');
  const std::string_view description = input.substr(0, first);
  std::string_view code;
  std::string_view code_system;
  if (first != std::string_view::npos) {
    const std::string_view rest = input.substr(first + 1);
    const size_t second = rest.find('\n');
    code = rest.substr(0, second);
    if (second != std::string_view::npos) code_system = rest.substr(second + 1);
  }
  CheckStrengths(description);
  const ResolvedProduct product = Resolve(formulary, description, code, code_system);
  CheckResolution(formulary, product);
  ResolutionCache cache(formulary);
  const ResolvedProduct& cached = cache.Resolve(description, code, code_system);
  FuzzCheck(cached.match == product.match && cached.match_detail == product.match_detail &&
                cached.ingredients.size() == product.ingredients.size(),
            "the cache gives the same resolution");
  return 0;
}
