#include "medload/formulary/product.h"

#include <array>
#include <algorithm>
#include <cmath>
#include <utility>

namespace medload {
namespace {

constexpr std::array<std::pair<Route, std::string_view>, 13> kRouteNames = {{
    {Route::kUnknown, "unknown"},
    {Route::kOral, "oral"},
    {Route::kSublingualBuccal, "sublingual/buccal"},
    {Route::kSkin, "skin"},
    {Route::kTransdermal, "transdermal"},
    {Route::kEye, "eye"},
    {Route::kEar, "ear"},
    {Route::kNasal, "nasal"},
    {Route::kInhaled, "inhaled"},
    {Route::kRectal, "rectal"},
    {Route::kVaginal, "vaginal"},
    {Route::kInjection, "injection"},
    {Route::kOther, "other"},
}};

// Names used by earlier versions and in the trade for the same routes.
constexpr std::array<std::pair<Route, std::string_view>, 8> kRouteAliases = {{
    {Route::kSublingualBuccal, "sublingual"},
    {Route::kSublingualBuccal, "buccal"},
    {Route::kSkin, "topical"},
    {Route::kSkin, "cutaneous"},
    {Route::kEye, "ophthalmic"},
    {Route::kEar, "otic"},
    {Route::kInjection, "parenteral"},
    {Route::kUnknown, "not stated"},
}};

}  // namespace

std::string_view RouteName(Route route) {
  for (const auto& [value, name] : kRouteNames) {
    if (value == route) return name;
  }
  return "unknown";
}

std::optional<Route> RouteFromName(std::string_view name) {
  for (const auto& [value, route_name] : kRouteNames) {
    if (route_name == name) return value;
  }
  for (const auto& [value, alias] : kRouteAliases) {
    if (alias == name) return value;
  }
  return std::nullopt;
}

std::string_view MatchKindName(MatchKind kind) {
  switch (kind) {
    case MatchKind::kUnmatched: return "unmatched";
    case MatchKind::kCode: return "code";
    case MatchKind::kProduct: return "product";
    case MatchKind::kIngredient: return "ingredient";
    case MatchKind::kNonMedicine: return "non-medicine";
    case MatchKind::kApproximate: return "approximate";
    case MatchKind::kPartial: return "partial";
  }
  return "unmatched";
}

std::string FlagDescription(const ResolvedProduct& product) {
  std::string text;
  if (!product.unknown.empty()) {
    text = "not in the formulary: ";
    for (size_t i = 0; i < product.unknown.size(); ++i) text += (i == 0 ? "" : ", ") + product.unknown[i];
  }
  for (const SpellingReading& reading : product.spellings) {
    text += (text.empty() ? "" : "; ") + ("\"" + reading.written + "\" read as " + reading.read_as);
  }
  return text;
}

std::optional<int> ProductDefaultSupplyDays(const ResolvedProduct& product, double quantity) {
  if (!product.default_supply_days || !(quantity > 0)) return std::nullopt;
  constexpr double kMaxDays = 3650;
  const double days = std::ceil(quantity * *product.default_supply_days - 1e-9);
  return static_cast<int>(std::min(days, kMaxDays));
}

}  // namespace medload
