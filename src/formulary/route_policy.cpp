#include "medload/formulary/route_policy.h"

#include <algorithm>
#include <array>

namespace medload {
namespace {

// Product specification section 5 ("Routes"), in its order.
constexpr std::array<Route, 12> kNamedRoutes = {
    Route::kOral,   Route::kTransdermal, Route::kInjection, Route::kRectal,
    Route::kSublingualBuccal, Route::kInhaled, Route::kNasal, Route::kEye,
    Route::kEar,    Route::kSkin,        Route::kVaginal,   Route::kOther,
};

size_t Order(Route route) {
  const auto it = std::find(kNamedRoutes.begin(), kNamedRoutes.end(), route);
  return static_cast<size_t>(it - kNamedRoutes.begin());
}

std::string_view TrimSpaces(std::string_view text) {
  while (!text.empty() && (text.front() == ' ' || text.front() == '\t')) text.remove_prefix(1);
  while (!text.empty() && (text.back() == ' ' || text.back() == '\t')) text.remove_suffix(1);
  return text;
}

}  // namespace

std::span<const Route> NamedRoutes() { return kNamedRoutes; }

std::vector<Route> DefaultSystemicRoutes() {
  return {Route::kOral, Route::kTransdermal, Route::kInjection, Route::kRectal, Route::kSublingualBuccal};
}

bool RouteCounts(Route route, std::span<const Route> counting) {
  return route == Route::kUnknown || std::find(counting.begin(), counting.end(), route) != counting.end();
}

RouteSet::RouteSet(std::span<const Route> routes) {
  for (const Route route : routes) Add(route);
}

std::vector<Route> RouteSet::Routes() const {
  std::vector<Route> routes;
  for (const Route route : kNamedRoutes) {
    if (Contains(route)) routes.push_back(route);
  }
  if (Contains(Route::kUnknown)) routes.push_back(Route::kUnknown);
  return routes;
}

bool RoutesCount(RouteSet in_use, RouteSet counting) {
  return in_use.Contains(Route::kUnknown) || in_use.Intersects(counting);
}

Result<std::vector<Route>> ParseRouteList(std::string_view text) {
  std::vector<Route> routes;
  size_t start = 0;
  while (start <= text.size()) {
    size_t end = text.find('|', start);
    if (end == std::string_view::npos) end = text.size();
    const std::string_view name = TrimSpaces(text.substr(start, end - start));
    start = end + 1;
    if (name.empty()) continue;
    const std::optional<Route> route = RouteFromName(name);
    if (!route || *route == Route::kUnknown) {
      return Status::Input("\"" + std::string(name) + "\" is not a route name");
    }
    routes.push_back(*route);
  }
  SortRoutes(routes);
  return routes;
}

void SortRoutes(std::vector<Route>& routes) {
  std::sort(routes.begin(), routes.end(), [](Route a, Route b) { return Order(a) < Order(b); });
  routes.erase(std::unique(routes.begin(), routes.end()), routes.end());
}

std::string RouteListText(std::span<const Route> routes, std::string_view separator) {
  std::vector<Route> sorted(routes.begin(), routes.end());
  SortRoutes(sorted);
  std::string text;
  for (const Route route : sorted) {
    if (!text.empty()) text += separator;
    text += RouteName(route);
  }
  return text;
}

std::string RouteListText(RouteSet routes, std::string_view separator) {
  return RouteListText(routes.Routes(), separator);
}

}  // namespace medload
