#include "medload/formulary/route_policy.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

namespace medload {

TEST_SUITE("formulary/route_policy") {

TEST_CASE("the default systemic routes are the specification's five") {
  // Source: product specification section 5 ("Routes").
  CHECK(DefaultSystemicRoutes() == std::vector<Route>{Route::kOral, Route::kTransdermal, Route::kInjection,
                                                      Route::kRectal, Route::kSublingualBuccal});
  CHECK(NamedRoutes().size() == 12);
  CHECK(RouteListText(NamedRoutes(), ",") ==
        "oral,transdermal,injection,rectal,sublingual/buccal,inhaled,nasal,eye,ear,skin,vaginal,other");
}

TEST_CASE("a route counts when listed, an unknown route always counts") {
  const std::vector<Route> systemic = DefaultSystemicRoutes();
  CHECK(RouteCounts(Route::kOral, systemic));
  CHECK_FALSE(RouteCounts(Route::kEye, systemic));
  CHECK_FALSE(RouteCounts(Route::kSkin, systemic));
  CHECK(RouteCounts(Route::kUnknown, systemic));
  const RouteSet counting(systemic);
  CHECK(RoutesCount(RouteSet(std::vector<Route>{Route::kSkin, Route::kOral}), counting));
  CHECK_FALSE(RoutesCount(RouteSet(std::vector<Route>{Route::kSkin, Route::kEye}), counting));
  CHECK(RoutesCount(RouteSet(std::vector<Route>{Route::kSkin, Route::kUnknown}), counting));
  CHECK_FALSE(RoutesCount(RouteSet(), counting));
}

TEST_CASE("a route set lists its routes in the specification's order, unknown last") {
  RouteSet set;
  for (const Route route : {Route::kUnknown, Route::kSkin, Route::kOral, Route::kSkin}) set.Add(route);
  CHECK(set.Routes() == std::vector<Route>{Route::kOral, Route::kSkin, Route::kUnknown});
  CHECK(RouteListText(set, ", ") == "oral, skin, unknown");
  CHECK(set == RouteSet(std::vector<Route>{Route::kSkin, Route::kOral, Route::kUnknown}));
}

TEST_CASE("route lists read names and aliases, in the specification's order, once each") {
  struct Case {
    const char* text;
    std::vector<Route> routes;
  };
  const std::vector<Case> cases = {
      {"", {}},
      {"oral", {Route::kOral}},
      {" eye | oral ", {Route::kOral, Route::kEye}},
      {"sublingual|buccal", {Route::kSublingualBuccal}},
      {"topical|skin|ophthalmic", {Route::kEye, Route::kSkin}},
  };
  for (const Case& c : cases) {
    const std::string text = c.text;
    CAPTURE(text);
    auto routes = ParseRouteList(c.text);
    REQUIRE(routes.ok());
    CHECK(*routes == c.routes);
  }
  for (const char* bad : {"by mouth", "oral|eyes", "not stated"}) {
    const std::string text = bad;
    CAPTURE(text);
    auto routes = ParseRouteList(bad);
    REQUIRE_FALSE(routes.ok());
  }
  CHECK(ParseRouteList("oral|eyes").status().message() == "\"eyes\" is not a route name");
}

}  // TEST_SUITE

}  // namespace medload
