// tsdd(D): cumulative anticholinergic exposure in total standardised daily doses (Gray et
// al. 2015): over the dispensings on or before D in the exposure period, the sum of
// quantity x strength / the ingredient's minimum effective daily dose (tsdd.csv).
#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "burden/longitudinal_parts.h"

namespace medload {

std::string_view TsddBand(double tsdd) {
  // Gray et al. 2015, JAMA Intern Med 175(3):401-407, Table 3: 0, 1-90, 91-365, 366-1095,
  // >1095 TSDDs. Between whole numbers the upper edge belongs to the lower band.
  if (!(tsdd > 0)) return "0";
  if (tsdd <= 90) return "1-90";
  if (tsdd <= 365) return "91-365";
  if (tsdd <= 1095) return "366-1095";
  return ">1095";
}

Date YearsBefore(Date on, int years) {
  const int year = on.year() - years;
  const int month = on.month();
  int day = on.day();
  if (!IsValidCivil(year, month, day)) day = 28;  // 29 February in a year without one
  return Date::FromCivil(year, month, day) + 1;
}

namespace longitudinal_internal {
namespace {

// The milligrams a dispensing supplied of `ingredient`: quantity x strength per unit, or
// for a rate strength (a patch) mg per day x days of supply, or for a patch whose
// strength is its content what it releases (unit_doses.csv: rate x interval a patch).
// nullopt when not known.
std::optional<double> MilligramsSupplied(const DispensingUse& use, const std::string& ingredient,
                                         const BurdenTables& tables) {
  if (!use.ingredients) return std::nullopt;
  for (const ResolvedIngredient& resolved : *use.ingredients) {
    if (resolved.ingredient != ingredient) continue;
    double mg = 0;
    const UnitDoseRow* patch = use.route == Route::kTransdermal && resolved.mg_per_unit
                                   ? tables.UnitDose(ingredient, UnitDoseForm::kPatch, *resolved.mg_per_unit)
                                   : nullptr;
    if (patch != nullptr) mg = *patch->release_mg_per_day * patch->interval_days * use.quantity;
    else if (resolved.mg_per_unit) mg = *resolved.mg_per_unit * use.quantity;
    else if (resolved.mg_per_day) mg = *resolved.mg_per_day * use.supply.days;
    else return std::nullopt;
    if (!std::isfinite(mg) || mg < 0) return std::nullopt;
    return mg;
  }
  return std::nullopt;
}

}  // namespace

void AddExposure(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
                 Burden& burden) {
  LongitudinalMeasures& measures = burden.longitudinal;
  const Date on = burden.on;
  if (options.exposure_years) measures.tsdd_from = YearsBefore(on, *options.exposure_years);
  if (tables.tsdd_doses.empty()) return;
  std::map<std::string, TsddContribution> found;
  std::set<std::string> incomplete;
  for (const Medicine& medicine : timeline.medicines) {
    for (const std::string& ingredient : medicine.ingredients) {
      const auto dose = tables.tsdd_doses.find(ingredient);
      if (dose == tables.tsdd_doses.end()) continue;
      for (const DispensingUse& use : medicine.uses) {
        if (use.dispensed_on > on) break;  // uses are in date order
        if ((measures.tsdd_from && use.dispensed_on < *measures.tsdd_from) || !SystemicRoute(tables, use.route)) continue;
        const std::optional<double> mg = MilligramsSupplied(use, ingredient, tables);
        if (!mg) {
          incomplete.insert(ingredient);
          continue;
        }
        TsddContribution& entry = found[ingredient];
        entry.ingredient = ingredient;
        entry.min_effective_daily_dose_mg = dose->second;
        entry.tsdd += *mg / dose->second;
        ++entry.dispensings;
      }
    }
  }
  for (auto& [ingredient, entry] : found) {
    measures.tsdd += entry.tsdd;
    measures.tsdd_contributions.push_back(std::move(entry));
  }
  measures.tsdd_incomplete.assign(incomplete.begin(), incomplete.end());
}

}  // namespace longitudinal_internal
}  // namespace medload
