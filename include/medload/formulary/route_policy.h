// Which routes count for the measures (product specification section 5, "Routes"): the
// default systemic routes, the list syntax the tables use to override them per entry,
// and the one test every scale entry, DBI row and rule applies. It does not say which
// route a product has (the resolver does) nor hold the route table (formulary.h).
#pragma once

#include <cstdint>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/status.h"
#include "medload/formulary/product.h"

namespace medload {

// Every named route in the specification's order: oral, transdermal, injection, rectal,
// sublingual/buccal, inhaled, nasal, eye, ear, skin, vaginal, other (kUnknown excluded).
std::span<const Route> NamedRoutes();

// The specification's default systemic routes: oral, transdermal, injection, rectal,
// sublingual/buccal. formulary/routes.csv may change the set.
std::vector<Route> DefaultSystemicRoutes();

// A set of routes (kUnknown included) as bits: a small value the measures copy freely.
class RouteSet {
 public:
  RouteSet() = default;
  explicit RouteSet(std::span<const Route> routes);
  void Add(Route route) { bits_ = static_cast<uint16_t>(bits_ | Bit(route)); }
  bool Contains(Route route) const { return (bits_ & Bit(route)) != 0; }
  bool Intersects(RouteSet other) const { return (bits_ & other.bits_) != 0; }
  bool empty() const { return bits_ == 0; }
  // The routes in the specification's order, kUnknown last.
  std::vector<Route> Routes() const;
  friend bool operator==(RouteSet a, RouteSet b) { return a.bits_ == b.bits_; }

 private:
  static uint16_t Bit(Route route) { return static_cast<uint16_t>(1U << static_cast<unsigned>(route)); }
  uint16_t bits_ = 0;
};

// True when a medicine given by `route` counts where the `counting` routes count. A
// route that is not known (kUnknown: no form in the description) always counts, so that
// burden is never lost silently; outputs say that the route was not stated.
bool RouteCounts(Route route, std::span<const Route> counting);
// True when any route `in_use` counts (a medicine may be in use by several routes on a
// date); an unknown route among them counts.
bool RoutesCount(RouteSet in_use, RouteSet counting);

// Reads a `|`-separated list of route names or aliases ("oral|sublingual/buccal"); empty
// text gives an empty list. On a name that is not a route: Status::Input with the fault
// text `"NAME" is not a route name`. A route named twice is kept once.
Result<std::vector<Route>> ParseRouteList(std::string_view text);

// Puts `routes` in the specification's order and removes repeats.
void SortRoutes(std::vector<Route>& routes);

// The routes' names joined by `separator`, in the specification's order.
std::string RouteListText(std::span<const Route> routes, std::string_view separator = "|");
std::string RouteListText(RouteSet routes, std::string_view separator = "|");

}  // namespace medload
