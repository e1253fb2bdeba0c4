// What a dispensed product is, once the formulary has resolved its description or code:
// ingredients with strengths, form, route, and whether it is a medicine at all. A value
// type shared by the resolver, the store's resolution cache and the burden measures.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// The route a product is given by. Names as in docs/formulary.md (oral,
// transdermal, injection, rectal, sublingual/buccal, inhaled, nasal, eye, ear, skin,
// vaginal, other); kUnknown when neither the product table nor the description says.
enum class Route {
  kUnknown,
  kOral,
  kSublingualBuccal,
  kSkin,
  kTransdermal,
  kEye,
  kEar,
  kNasal,
  kInhaled,
  kRectal,
  kVaginal,
  kInjection,
  kOther,
};

// "oral", "skin", "sublingual/buccal", ... (lower case, as used by --exclude-route).
std::string_view RouteName(Route route);
// The route of a name from RouteName, or of an accepted alias ("sublingual", "buccal",
// "topical", "cutaneous", "ophthalmic", "otic", "parenteral"); nullopt otherwise.
std::optional<Route> RouteFromName(std::string_view name);

struct ResolvedIngredient {
  std::string ingredient;              // the formulary's canonical ingredient name
  std::optional<double> mg_per_unit;   // mg in one dose unit (one tablet, one ml, ...)
  // For rate strengths (patches "5 micrograms/hour", "mg/24 hours"): mg per day when
  // used as labelled. When set, the daily dose is this, whatever the dispensed quantity.
  std::optional<double> mg_per_day;
};

enum class MatchKind {
  kUnmatched,     // nothing in the tables recognised it
  kCode,          // by product code
  kProduct,       // by a named product (products.csv, brands.csv, a dictionary's name or brand)
  kIngredient,    // by ingredient names in the description
  kNonMedicine,   // by a non-medicine term
  kApproximate,   // some ingredient read from a close spelling (see `spellings`)
  kPartial,       // some of the text names an ingredient the tables do not know (`unknown`)
};

std::string_view MatchKindName(MatchKind kind);

// A word of the description read as the name of a known ingredient it closely resembles.
struct SpellingReading {
  std::string written;  // the word as normalised ("amitriptilline")
  std::string read_as;  // the canonical ingredient ("amitriptyline")
};

struct ResolvedProduct {
  std::vector<ResolvedIngredient> ingredients;  // empty for non-medicines and unmatched
  std::string form;                  // "tablet", "oral solution", "patch", ... or empty
  std::string dose_unit;             // what one unit of the quantity is: "tablet", "ml", ...
  Route route = Route::kUnknown;
  bool non_medicine = false;
  MatchKind match = MatchKind::kUnmatched;
  std::string match_detail;          // how it matched, for explanations
  // kPartial: the words taken for ingredients the tables do not know ("hydrocodone"); their
  // strengths are never given to a known ingredient. May be set with kApproximate too.
  std::vector<std::string> unknown;
  // Close spellings read as known ingredients (kApproximate, or kPartial with both).
  std::vector<SpellingReading> spellings;
  // Days that ONE unit of the quantity lasts when the product implies it (a seven-day
  // patch: 7; a 72-hour patch: 3; a 12-week depot injection: 84); empty otherwise. For a
  // dispensing of several units use ProductDefaultSupplyDays(product, quantity).
  std::optional<int> default_supply_days;

  bool matched() const { return match != MatchKind::kUnmatched; }
  // Recognised only in part or through a close spelling: it counts (with the ingredients
  // found) but every output that uses it must say so.
  bool flagged() const { return match == MatchKind::kPartial || match == MatchKind::kApproximate; }
  bool is_medicine() const { return matched() && !non_medicine && !ingredients.empty(); }
};

// What a partial or approximate resolution did not know and how it read close spellings,
// for warnings: "not in the formulary: frobazine; \"oxybutinin\" read as oxybutynin".
// Empty for other resolutions.
std::string FlagDescription(const ResolvedProduct& product);

// The default days of supply of a dispensing of `quantity` units of `product`:
// ceil(quantity x default_supply_days) when the product implies a supply per unit and
// quantity > 0, else empty. Never more than 3650.
std::optional<int> ProductDefaultSupplyDays(const ResolvedProduct& product, double quantity);

}  // namespace medload
