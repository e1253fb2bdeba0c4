// Drug Burden Index doses (Hilmer et al. 2007): products taken together and the daily
// dose of each on the census date. The rules are in docs/measures.md, "Drug Burden Index".
#include "burden/dbi_dose.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <tuple>

namespace medload::burden_internal {
namespace {

const ResolvedIngredient* IngredientIn(const DispensingUse& use, const std::string& ingredient) {
  if (!use.ingredients) return nullptr;
  const auto it = std::find_if(use.ingredients->begin(), use.ingredients->end(),
                               [&](const auto& i) { return i.ingredient == ingredient; });
  return it == use.ingredients->end() ? nullptr : &*it;
}

// One use of a medicine that counts on D: the run it belongs to starts no later than
// `from` and counts until `to`; `taken_from` is the first day of its own supply.
struct CountedUse {
  Date from;
  Date to;
  size_t use = 0;
  Date taken_from;
};

// One product of an ingredient active on D: the same strength of it by the same route
// within one medicine (descriptions that differ only in wording are one product).
struct ActiveProduct {
  size_t active = 0;     // index into Burden::active
  size_t use = 0;        // its latest dispensing on or before D (index into Medicine::uses)
  Date chain_start;      // the first day of its own run of supplies that reaches D
  Date taken_from;       // the first day of that latest dispensing's supply
};

using ProductKey = std::tuple<std::optional<double>, std::optional<double>, Route>;

std::optional<ProductKey> KeyFor(const DispensingUse& use, const std::string& ingredient) {
  const ResolvedIngredient* it = IngredientIn(use, ingredient);
  if (it == nullptr) return std::nullopt;
  return ProductKey{it->mg_per_unit, it->mg_per_day, use.route};
}

// The uses of one medicine that count on D: the coverages of the episode known on D
// (concurrent), or the dispensings in the window (lookback: each counted on its day only,
// so that a run is the whole window).
std::vector<CountedUse> CountedUses(const Medicine& medicine, Date on, const MeasureOptions& options) {
  std::vector<CountedUse> uses;
  if (options.measure == Measure::kLookback) {
    const Date first_day = on - (options.window_days - 1);
    for (size_t i = 0; i < medicine.uses.size(); ++i) {
      const Date day = medicine.uses[i].dispensed_on;
      if (day >= first_day && day <= on) uses.push_back({first_day, on, i, day});
    }
    return uses;
  }
  const Episode* episode = EpisodeOn(medicine.episodes, on);
  if (episode == nullptr) return uses;
  for (const Coverage& coverage : episode->coverages) {
    if (coverage.dispensed <= on) {
      uses.push_back({coverage.start, coverage.tail_end(), coverage.source, coverage.start});
    }
  }
  return uses;
}

bool DispensedLater(const Medicine& medicine, size_t use, size_t than) {
  const Date a = medicine.uses[use].dispensed_on;
  const Date b = medicine.uses[than].dispensed_on;
  return a > b || (a == b && use > than);
}

// The products of `ingredient` in one active medicine that are active on D.
void CollectProducts(const Timeline& timeline, const std::vector<ActiveMedicine>& active, size_t a,
                     const std::string& ingredient, Date on, const MeasureOptions& options,
                     std::vector<ActiveProduct>& out) {
  const Medicine& medicine = timeline.medicines[active[a].medicine];
  std::map<ProductKey, std::vector<CountedUse>> by_product;
  for (const CountedUse& counted : CountedUses(medicine, on, options)) {
    auto key = KeyFor(medicine.uses[counted.use], ingredient);
    if (key) by_product[*key].push_back(counted);
  }
  for (const auto& [key, runs] : by_product) {
    // In start order: a run reaching D, and its first day.
    std::optional<Date> start, end, reaching;
    const CountedUse* latest = &runs.front();
    for (const CountedUse& run : runs) {
      if (!end || run.from > *end + 1) start = run.from, end = run.to;
      else end = std::max(*end, run.to);
      if (*start <= on && on <= *end) reaching = *start;
      if (DispensedLater(medicine, run.use, latest->use)) latest = &run;
    }
    if (reaching) out.push_back(ActiveProduct{a, latest->use, *reaching, latest->taken_from});
  }
}

// Spec section 5, "Routes": a product counts for the DBI when its route does.
bool DbiRouteCounts(const Timeline& timeline, const Burden& burden, const BurdenTables& tables,
                    const ActiveProduct& product, const std::string& ingredient) {
  RouteSet route;
  route.Add(timeline.medicines[burden.active[product.active].medicine].uses[product.use].route);
  return tables.CountsForDbi(route, ingredient);
}

// The products of `ingredient` taken together on D, the most recently dispensed first:
// that product, plus every other active product dispensed again since its run began (a
// product dispensed only before then was switched from, not added). Products on a route
// the DBI does not count for the ingredient are left out first.
std::vector<ActiveProduct> ProductsTakenTogether(const Timeline& timeline, const Burden& burden,
                                                 const BurdenTables& tables, const std::string& ingredient,
                                                 const MeasureOptions& options) {
  std::vector<ActiveProduct> products;
  for (size_t a = 0; a < burden.active.size(); ++a) {
    const Medicine& medicine = timeline.medicines[burden.active[a].medicine];
    if (std::binary_search(medicine.ingredients.begin(), medicine.ingredients.end(), ingredient)) {
      CollectProducts(timeline, burden.active, a, ingredient, burden.on, options, products);
    }
  }
  std::erase_if(products, [&](const ActiveProduct& p) {
    return !DbiRouteCounts(timeline, burden, tables, p, ingredient);
  });
  if (products.empty()) return products;
  auto use_of = [&](const ActiveProduct& p) -> const DispensingUse& {
    return timeline.medicines[burden.active[p.active].medicine].uses[p.use];
  };
  std::stable_sort(products.begin(), products.end(), [&](const ActiveProduct& x, const ActiveProduct& y) {
    const DispensingUse& ux = use_of(x);
    const DispensingUse& uy = use_of(y);
    return ux.dispensed_on != uy.dispensed_on ? ux.dispensed_on > uy.dispensed_on : ux.record > uy.record;
  });
  std::vector<ActiveProduct> together = {products.front()};
  const Date since = products.front().chain_start;
  for (size_t i = 1; i < products.size(); ++i) {
    if (use_of(products[i]).dispensed_on >= since) together.push_back(products[i]);
  }
  return together;
}

// A transdermal patch whose strength is its content: the row giving its release rate.
const UnitDoseRow* PatchRow(const DispensingUse& use, const ResolvedIngredient& ingredient,
                            const BurdenTables& tables) {
  if (use.route != Route::kTransdermal || !ingredient.mg_per_unit) return nullptr;
  return tables.UnitDose(ingredient.ingredient, UnitDoseForm::kPatch, *ingredient.mg_per_unit);
}

// A depot injection of known strength per ampoule or syringe: the row giving its interval.
const UnitDoseRow* DepotRow(const DispensingUse& use, const ResolvedIngredient& ingredient,
                            const BurdenTables& tables) {
  if (use.route != Route::kInjection || !ingredient.mg_per_unit || !use.units_per_container) return nullptr;
  return tables.UnitDose(ingredient.ingredient, UnitDoseForm::kDepot,
                         *ingredient.mg_per_unit * *use.units_per_container);
}

}  // namespace

std::optional<DoseSource> DailyDose(const DispensingUse& use, const std::string& ingredient,
                                    const BurdenTables& tables, Date on, Date taken_from) {
  const ResolvedIngredient* it = IngredientIn(use, ingredient);
  if (it == nullptr) return std::nullopt;
  DoseSource dose;
  const std::optional<double> units = UnitsPerDayOnDay(use.supply, std::max(0, on - taken_from));
  if (it->mg_per_day) {
    dose.dose_mg_per_day = *it->mg_per_day;
    dose.basis = DoseBasis::kRateStrength;
  } else if (!it->mg_per_unit) {
    return std::nullopt;
  } else if (const UnitDoseRow* patch = PatchRow(use, *it, tables)) {
    dose.dose_mg_per_day = *patch->release_mg_per_day;
    dose.basis = DoseBasis::kPatchRelease;
  } else if (use.route == Route::kTransdermal && tables.HasUnitDoses(ingredient, UnitDoseForm::kPatch)) {
    // A patch of a listed ingredient at a content the table does not list: its content
    // is not what it releases, so the dose is unknown (listed), never the content.
    return std::nullopt;
  } else if (units) {
    // Units per day in units of the dispensed quantity (the dosage, converted); for a
    // changing dose the stage in force on D (product specification section 5, dbi(D)).
    dose.dose_mg_per_day = *it->mg_per_unit * *units;
    dose.as_needed_max = use.dosage.as_needed;
    dose.range_upper = use.dosage.range_upper;
    dose.staged = !use.supply.stages.empty();
    // After "then stop" nothing is taken: a known dose of 0, not an unknown one.
    if (dose.staged && *units == 0) return dose;
  } else if (const UnitDoseRow* depot = DepotRow(use, *it, tables)) {
    dose.dose_mg_per_day = *it->mg_per_unit * *use.units_per_container / depot->interval_days;
    dose.basis = DoseBasis::kDepotInterval;
  } else {
    dose.dose_mg_per_day = *it->mg_per_unit * use.quantity / use.supply.days;
    dose.basis = DoseBasis::kQuantity;
    dose.supply_assumed = use.supply.rule == SupplyRule::kDefaultDays;
  }
  // A dose that cannot be worked out (none, or beyond any number) is unknown: the
  // ingredient is listed as incomplete, never a blank or infinite contribution.
  if (!(dose.dose_mg_per_day > 0) || !std::isfinite(dose.dose_mg_per_day)) return std::nullopt;
  return dose;
}

std::optional<DbiContribution> IngredientDbiDose(const Timeline& timeline, const Burden& burden,
                                                 const BurdenTables& tables, const std::string& ingredient,
                                                 const MeasureOptions& options, bool& counted,
                                                 size_t& owner) {
  const auto products = ProductsTakenTogether(timeline, burden, tables, ingredient, options);
  counted = !products.empty();
  if (!counted) return std::nullopt;  // only on routes the DBI does not count
  owner = products.front().active;
  DbiContribution total;
  total.ingredient = ingredient;
  for (const ActiveProduct& product : products) {
    const size_t medicine = burden.active[product.active].medicine;
    auto dose = DailyDose(timeline.medicines[medicine].uses[product.use], ingredient, tables, burden.on,
                          product.taken_from);
    if (!dose) return std::nullopt;
    dose->medicine = medicine;
    dose->use = product.use;
    total.dose_mg_per_day += dose->dose_mg_per_day;
    total.supply_assumed = total.supply_assumed || dose->supply_assumed;
    total.as_needed_max = total.as_needed_max || dose->as_needed_max;
    total.range_upper = total.range_upper || dose->range_upper;
    total.staged = total.staged || dose->staged;
    total.sources.push_back(*dose);
  }
  total.basis = total.sources.front().basis;
  return total;
}

}  // namespace medload::burden_internal
