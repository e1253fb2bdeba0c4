#include "medload/formulary/product.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

TEST_SUITE("formulary/product") {

TEST_CASE("route names round-trip and unknown names are refused") {
  for (const Route route : {Route::kUnknown, Route::kOral, Route::kSublingualBuccal, Route::kSkin,
                            Route::kTransdermal, Route::kEye, Route::kEar, Route::kNasal, Route::kInhaled,
                            Route::kRectal, Route::kVaginal, Route::kInjection, Route::kOther}) {
    const std::string name(RouteName(route));
    CAPTURE(name);
    CHECK(RouteFromName(name) == route);
  }
  CHECK(RouteName(Route::kInhaled) == "inhaled");
  // The route names of docs/formulary.md.
  CHECK(RouteName(Route::kSublingualBuccal) == "sublingual/buccal");
  CHECK(RouteName(Route::kSkin) == "skin");
  CHECK(RouteName(Route::kEye) == "eye");
  CHECK(RouteName(Route::kEar) == "ear");
  CHECK(RouteName(Route::kInjection) == "injection");
  CHECK(RouteName(Route::kOther) == "other");
}

TEST_CASE("earlier route names are read as aliases of the current ones") {
  CHECK(RouteFromName("topical") == Route::kSkin);
  CHECK(RouteFromName("parenteral") == Route::kInjection);
  CHECK(RouteFromName("ophthalmic") == Route::kEye);
  CHECK(RouteFromName("otic") == Route::kEar);
  CHECK(RouteFromName("buccal") == Route::kSublingualBuccal);
  CHECK(RouteFromName("sublingual") == Route::kSublingualBuccal);
  CHECK_FALSE(RouteFromName("Oral").has_value());
  CHECK_FALSE(RouteFromName("by mouth").has_value());
}

TEST_CASE("match kinds have lower-case names") {
  CHECK(MatchKindName(MatchKind::kUnmatched) == "unmatched");
  CHECK(MatchKindName(MatchKind::kCode) == "code");
  CHECK(MatchKindName(MatchKind::kProduct) == "product");
  CHECK(MatchKindName(MatchKind::kIngredient) == "ingredient");
  CHECK(MatchKindName(MatchKind::kNonMedicine) == "non-medicine");
}

TEST_CASE("the default supply of a dispensing is the quantity times the days per unit") {
  ResolvedProduct patches;
  patches.default_supply_days = 7;
  CHECK(ProductDefaultSupplyDays(patches, 4) == 28);
  CHECK(ProductDefaultSupplyDays(patches, 0.5) == 4);   // rounded up
  CHECK_FALSE(ProductDefaultSupplyDays(patches, 0).has_value());
  CHECK(ProductDefaultSupplyDays(patches, 1e9) == 3650);
  CHECK_FALSE(ProductDefaultSupplyDays(ResolvedProduct{}, 4).has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
