#include "medload/burden/route_notes.h"

#include <algorithm>

namespace medload {
namespace {

std::string RoutesText(const ActiveMedicine& active) { return RouteListText(active.routes, ", "); }

// "not a systemic route" when the list is the default systemic one, else the list.
std::string Why(const ActiveMedicine& active, RouteSet counting, const BurdenTables& tables,
                const std::string& what) {
  if (counting == tables.systemic_routes) return RoutesText(active) + ": not a systemic route for " + what;
  return RoutesText(active) + ": not a route counted for " + what + " (" + RouteListText(counting, ", ") + ")";
}

void ScaleAndDbiNotes(const Medicine& medicine, size_t index, const ActiveMedicine& active,
                      const BurdenTables& tables, std::vector<RouteNote>& notes) {
  for (const std::string& ingredient : medicine.ingredients) {
    if (tables.Score(ingredient) > 0 && !tables.CountsForScale(active.routes, ingredient)) {
      notes.push_back({index, Why(active, tables.ScaleRoutes(ingredient, tables.scale), tables,
                                  "the " + tables.scale + " scale")});
      break;
    }
  }
  for (const std::string& ingredient : medicine.ingredients) {
    if (tables.Dbi(ingredient) != nullptr && !tables.CountsForDbi(active.routes, ingredient)) {
      notes.push_back({index, Why(active, tables.DbiRoutes(ingredient), tables, "the Drug Burden Index")});
      break;
    }
  }
}

}  // namespace

std::vector<RouteNote> RouteNotes(const Timeline& timeline, const Burden& burden, const BurdenTables& tables,
                                  std::optional<int> age) {
  const std::vector<FiredRule> left_out = RulesLeftOutByRoute(timeline, burden, tables, age);
  std::vector<RouteNote> notes;
  for (size_t a = 0; a < burden.active.size(); ++a) {
    const ActiveMedicine& active = burden.active[a];
    ScaleAndDbiNotes(timeline.medicines[active.medicine], a, active, tables, notes);
    for (const FiredRule& would : left_out) {
      const bool involved = std::find(would.medicines.begin(), would.medicines.end(), active.medicine) !=
                            would.medicines.end();
      if (!involved || tables.CountsForRule(active.routes, *would.rule)) continue;
      notes.push_back({a, Why(active, tables.RuleRoutes(*would.rule), tables, "rule " + would.rule->id)});
    }
  }
  return notes;
}

bool RouteNotStated(const ActiveMedicine& active) {
  return active.routes.Contains(Route::kUnknown);
}

}  // namespace medload
