// The facts about ingredients that the measures need, flattened from the formulary for
// one run: classes, scores on every scale, Drug Burden Index minimum doses, the
// combination rules, and which routes count for each (spec section 5, "Routes"). A plain
// value so that tests can build one by hand.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "medload/formulary/route_policy.h"
#include "medload/formulary/rules.h"
#include "medload/formulary/unit_doses.h"

namespace medload {

struct DbiEntry {
  double min_daily_dose_mg = 0;  // delta in Hilmer et al. 2007; > 0
  std::string effect;            // "anticholinergic", "sedative" or "both"
};

struct BurdenTables {
  std::string scale = "acb";  // the scale that acb(D) sums
  // Canonical ingredient name -> classes.
  std::unordered_map<std::string, std::vector<std::string>> classes;
  // Scale name -> canonical ingredient name -> score (absent = 0).
  std::map<std::string, std::unordered_map<std::string, int>> scales;
  std::unordered_map<std::string, DbiEntry> dbi;
  // Classes whose members the Drug Burden Index expects (dbi_classes.csv): a member with
  // no minimum dose in `dbi` is listed as incomplete, never a silent 0.
  std::vector<std::string> dbi_classes;
  std::vector<Rule> rules;
  // The routes that count unless an entry or a rule says otherwise (routes.csv).
  RouteSet systemic_routes = RouteSet(DefaultSystemicRoutes());
  // Per-entry overrides (the `routes` column): scale name -> ingredient -> routes, and
  // ingredient -> routes for the DBI. Absent: systemic_routes.
  std::map<std::string, std::unordered_map<std::string, RouteSet>> scale_routes;
  std::unordered_map<std::string, RouteSet> dbi_routes;
  // Longitudinal measures (docs/measures.md): canonical ingredient -> minimum effective
  // daily dose in mg (anticholinergic/tsdd.csv), and -> falls-risk categories, sorted
  // (falls_risk.csv, classes expanded to their ingredients).
  std::unordered_map<std::string, double> tsdd_doses;
  std::unordered_map<std::string, std::vector<std::string>> falls_categories;
  // Patches and depot injections per unit (unit_doses.csv): canonical ingredient -> rows.
  std::unordered_map<std::string, std::vector<UnitDoseRow>> unit_doses;

  // The score of `ingredient` on `scale_name` (0 when absent or the scale is unknown).
  int Score(const std::string& ingredient, const std::string& scale_name) const;
  int Score(const std::string& ingredient) const { return Score(ingredient, scale); }
  bool HasClass(const std::string& ingredient, const std::string& class_name) const;
  const DbiEntry* Dbi(const std::string& ingredient) const;
  // Whether the ingredient is in a class of dbi_classes (whatever `dbi` holds for it).
  bool InDbiClass(const std::string& ingredient) const;
  const Rule* FindRule(const std::string& id) const;
  // The unit_doses row of `ingredient` as `form` whose strength is `strength_mg` (within
  // a millionth), else its row for any strength; nullptr when neither exists.
  const UnitDoseRow* UnitDose(const std::string& ingredient, UnitDoseForm form, double strength_mg) const;
  // Whether unit_doses lists `ingredient` as `form` at any strength.
  bool HasUnitDoses(const std::string& ingredient, UnitDoseForm form) const;

  // The routes on which `ingredient`'s score on `scale_name` counts, its DBI counts, or
  // `rule` counts medicines.
  RouteSet ScaleRoutes(const std::string& ingredient, const std::string& scale_name) const;
  RouteSet DbiRoutes(const std::string& ingredient) const;
  RouteSet RuleRoutes(const Rule& rule) const;
  // Whether a medicine in use by `routes` on the date counts for `ingredient`'s score on
  // the run's scale, for its DBI, or for `rule`. An unknown route counts.
  bool CountsForScale(RouteSet routes, const std::string& ingredient) const;
  bool CountsForDbi(RouteSet routes, const std::string& ingredient) const;
  bool CountsForRule(RouteSet routes, const Rule& rule) const;
};

class Formulary;

// Flattens a loaded formulary for a run that scores on `scale`. Rules are copied, with
// their ingredient names already canonical. REQUIRES: formulary.HasScale(scale) was
// checked by the caller (an unknown scale scores every ingredient 0).
BurdenTables TablesFromFormulary(const Formulary& formulary, const std::string& scale);

}  // namespace medload
