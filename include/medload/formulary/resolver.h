// Turns a dispensed product (its description as written, and optionally a code) into a
// ResolvedProduct: ingredients with strengths, form, route, dose unit, non-medicine flag.
// Pure: it reads only the formulary; it does not read dosage text or compute supply.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/core/status.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/product.h"

namespace medload {

// Raised whenever the same text, with the same tables, may resolve differently: saved
// resolutions are keyed by it together with the formulary checksum and the version.
inline constexpr int kResolverVersion = 3;

// Resolves one product. Order: by code (codes.csv, dictionary.csv, then the ATC codes of
// ingredients.csv), then non-medicine terms, then a dictionary product's exact name, then
// named products and brands (longest name first), then ingredient names and synonyms
// found in the words (longest first; several give a combination). Abbreviations are
// written out first ("tabs", "m/r", "HCl") and a maker in trailing brackets is ignored.
// A part of a combination that names no known ingredient is read as a close spelling
// (kApproximate) or kept in `unknown` (kPartial), never dropped; strengths go only where
// it is certain which is whose. Strengths, form and route come from the description's
// words. Salt and ester words name nothing and are ignored. Never fails: a description
// nothing recognises comes back with match == kUnmatched.
ResolvedProduct Resolve(const Formulary& formulary, std::string_view description,
                        std::string_view code = {}, std::string_view code_system = {});

// The unit of a strength as written.
enum class StrengthUnit { kMg, kUnits, kPercent };

// One strength written in a description: "10mg", "5mg/5ml", "0.1%", "5micrograms/hour",
// "100units/ml", or one number of "30/500".
struct Strength {
  double amount = 0;           // in mg for kMg (micrograms, grams converted), else as written
  StrengthUnit unit = StrengthUnit::kMg;
  double per_amount = 1;       // the denominator's amount ("5" of "/5ml"); 1 when absent
  std::string per;             // the denominator's unit: "", "ml", "g", "hour", "dose", ...
  size_t position = 0;         // byte offset in the normalised text, for ordering
  bool bare = false;           // no unit was written ("30/500"): taken as mg

  // mg in one dose unit (one tablet, one ml, one g, one dose); nullopt for units, for
  // rates over time, and for a percentage without a mass or volume base.
  std::optional<double> MgPerUnit() const;
  // mg per day for rates over time ("/hour", "/24hours", "/72hours", "/day"); else nullopt.
  std::optional<double> MgPerDay() const;
};

// Every strength in `normalised` (text already passed through NormaliseText), in order.
std::vector<Strength> ParseStrengths(std::string_view normalised);

// The text the resolver works on: NFD, combining marks removed, case-folded, micro signs
// written "mc"; everything else kept. UTF-8 in and out; invalid UTF-8 bytes become spaces.
std::string NormaliseText(std::string_view text);

// Resolves each distinct (description, code, code system) once per run. The references
// it returns stay valid for the cache's lifetime. Not thread-safe.
class ResolutionCache {
 public:
  // REQUIRES: `formulary` outlives the cache.
  explicit ResolutionCache(const Formulary& formulary) : formulary_(formulary) {}
  const ResolvedProduct& Resolve(std::string_view description, std::string_view code = {},
                                 std::string_view code_system = {});
  size_t size() const { return cache_.size(); }

 private:
  const Formulary& formulary_;
  std::unordered_map<std::string, ResolvedProduct> cache_;
};

// Up to `limit` names in the tables (ingredients, synonyms, brands) nearest in spelling
// to the words of `description` that name nothing, nearest first: suggestions for a
// product nothing resolves. Empty when no word is close to a name.
std::vector<std::string> SuggestNames(const Formulary& formulary, std::string_view description, size_t limit = 3);

// JSON form of a resolution, for the store's resolution cache (keyed by the formulary
// checksum) and for `formulary lookup --format json`.
nlohmann::json ResolvedProductToJson(const ResolvedProduct& product);
// The inverse of ResolvedProductToJson. Status::Input naming the JSON pointer of the first
// bad element; never throws.
Result<ResolvedProduct> ResolvedProductFromJson(const nlohmann::json& json);
// The same through a string (what the store keeps).
std::string SerialiseResolution(const ResolvedProduct& product);
Result<ResolvedProduct> ParseResolution(std::string_view text);

}  // namespace medload
