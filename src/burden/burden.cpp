#include "medload/burden/burden.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <tuple>

#include "burden/rule_firing.h"

namespace medload {

std::string_view DoseBasisName(DoseBasis basis) {
  switch (basis) {
    case DoseBasis::kRateStrength: return "rate strength";
    case DoseBasis::kDosage: return "strength x units per day";
    case DoseBasis::kQuantity: return "strength x quantity / days supply";
  }
  return "";
}

std::string DoseBasisMark(const DbiContribution& contribution) {
  std::vector<std::string> marks;
  if (contribution.as_needed_max) marks.push_back("as-needed maximum");
  if (contribution.sources.size() > 1) {
    marks.push_back(std::to_string(contribution.sources.size()) + " products summed");
  }
  if (contribution.supply_assumed) marks.push_back("days of supply assumed");
  std::string text;
  for (const std::string& mark : marks) text += (text.empty() ? " (" : "; ") + mark;
  return text.empty() ? text : text + ")";
}

namespace {

// The latest use dispensed on or before `on` among the coverages of `episode`.
size_t LatestUseIn(const Episode& episode, const Medicine& medicine, Date on) {
  size_t latest = episode.coverages.front().source;
  for (const Coverage& coverage : episode.coverages) {
    const DispensingUse& use = medicine.uses[coverage.source];
    const DispensingUse& best = medicine.uses[latest];
    if (use.dispensed_on <= on && (best.dispensed_on > on || use.dispensed_on > best.dispensed_on ||
                                   (use.dispensed_on == best.dispensed_on && coverage.source > latest))) {
      latest = coverage.source;
    }
  }
  return latest;
}

std::optional<ActiveMedicine> ActiveConcurrent(const Medicine& medicine, size_t index, Date on) {
  const std::optional<EpisodeKnown> known = EpisodeKnownOn(medicine.episodes, on);
  if (!known) return std::nullopt;
  ActiveMedicine active;
  active.medicine = index;
  active.since = known->start;
  active.until = known->end;
  active.supply_end = known->supply_end;
  active.in_tail = known->in_tail;
  active.latest_use = LatestUseIn(*known->episode, medicine, on);
  return active;
}

std::optional<ActiveMedicine> ActiveLookback(const Medicine& medicine, size_t index, Date on,
                                             int window_days) {
  const Date first_day = on - (window_days - 1);
  std::optional<ActiveMedicine> active;
  for (size_t i = 0; i < medicine.uses.size(); ++i) {
    const DispensingUse& use = medicine.uses[i];
    if (use.dispensed_on < first_day || use.dispensed_on > on) continue;
    if (!active) active = ActiveMedicine{index, use.dispensed_on, use.dispensed_on, use.dispensed_on, false, i, 0, 0};
    active->latest_use = i;  // uses are in date order
    active->until = std::max(active->until, use.dispensed_on + (use.supply.days - 1));
    active->supply_end = active->until;
  }
  return active;
}

std::vector<ActiveMedicine> FindActive(const Timeline& timeline, Date on, const MeasureOptions& options) {
  std::vector<ActiveMedicine> active;
  for (size_t i = 0; i < timeline.medicines.size(); ++i) {
    const Medicine& medicine = timeline.medicines[i];
    auto found = options.measure == Measure::kConcurrent
                     ? ActiveConcurrent(medicine, i, on)
                     : ActiveLookback(medicine, i, on, options.window_days);
    if (found) active.push_back(*found);
  }
  return active;
}

// Whether a medicine in use by `routes` counts for the ingredient's score or DBI at all.
bool RoutesCount(const BurdenTables& tables, RouteSet routes, const std::string& ingredient) {
  return tables.CountsForScale(routes, ingredient) || tables.CountsForDbi(routes, ingredient);
}

// For each distinct active ingredient, the active medicine whose latest dispensing of it
// is the most recent, preferring one whose route counts (tablets over a cream of the same
// ingredient): that medicine carries the ingredient's score.
std::map<std::string, size_t> IngredientOwners(const Timeline& timeline, const BurdenTables& tables,
                                               const std::vector<ActiveMedicine>& active) {
  std::map<std::string, size_t> owners;  // ingredient -> index into `active`
  for (size_t a = 0; a < active.size(); ++a) {
    const Medicine& medicine = timeline.medicines[active[a].medicine];
    const Date latest = medicine.uses[active[a].latest_use].dispensed_on;
    for (const std::string& ingredient : medicine.ingredients) {
      auto [it, inserted] = owners.emplace(ingredient, a);
      if (inserted) continue;
      const ActiveMedicine& other = active[it->second];
      const bool counts = RoutesCount(tables, active[a].routes, ingredient);
      if (counts != RoutesCount(tables, other.routes, ingredient)) {
        if (counts) it->second = a;
        continue;
      }
      if (timeline.medicines[other.medicine].uses[other.latest_use].dispensed_on < latest) it->second = a;
    }
  }
  return owners;
}

const ResolvedIngredient* IngredientIn(const DispensingUse& use, const std::string& ingredient) {
  if (!use.ingredients) return nullptr;
  const auto it = std::find_if(use.ingredients->begin(), use.ingredients->end(),
                               [&](const auto& i) { return i.ingredient == ingredient; });
  return it == use.ingredients->end() ? nullptr : &*it;
}

std::optional<DoseSource> DailyDose(const DispensingUse& use, const std::string& ingredient) {
  const ResolvedIngredient* it = IngredientIn(use, ingredient);
  if (it == nullptr) return std::nullopt;
  DoseSource dose;
  if (it->mg_per_day) {
    dose.dose_mg_per_day = *it->mg_per_day;
    dose.basis = DoseBasis::kRateStrength;
  } else if (!it->mg_per_unit) {
    return std::nullopt;
  } else if (use.supply.units_per_day) {
    // Units per day in units of the dispensed quantity (the dosage, converted).
    dose.dose_mg_per_day = *it->mg_per_unit * *use.supply.units_per_day;
    dose.as_needed_max = use.dosage.as_needed;
  } else {
    dose.dose_mg_per_day = *it->mg_per_unit * use.quantity / use.supply.days;
    dose.basis = DoseBasis::kQuantity;
    dose.supply_assumed = use.supply.rule == SupplyRule::kDefaultDays;
  }
  if (!(dose.dose_mg_per_day > 0) || !std::isfinite(dose.dose_mg_per_day)) return std::nullopt;
  return dose;
}

// One product of an ingredient active on D: the same strength of it by the same route
// within one medicine (descriptions that differ only in wording are one product).
struct ActiveProduct {
  size_t active = 0;     // index into Burden::active
  size_t use = 0;        // its latest dispensing on or before D (index into Medicine::uses)
  Date chain_start;      // the first day of its own run of supplies that reaches D
};

using ProductKey = std::tuple<std::optional<double>, std::optional<double>, Route>;

std::optional<ProductKey> KeyFor(const DispensingUse& use, const std::string& ingredient) {
  const ResolvedIngredient* it = IngredientIn(use, ingredient);
  if (it == nullptr) return std::nullopt;
  return ProductKey{it->mg_per_unit, it->mg_per_day, use.route};
}

// The uses of one medicine that count on D, as (start, last counted day, use): the
// coverages of the episode known on D (concurrent), or the dispensings in the window
// (lookback: each counted on its day only, so that a run is the whole window).
std::vector<std::tuple<Date, Date, size_t>> CountedUses(const Medicine& medicine, Date on,
                                                         const MeasureOptions& options) {
  std::vector<std::tuple<Date, Date, size_t>> uses;
  if (options.measure == Measure::kLookback) {
    const Date first_day = on - (options.window_days - 1);
    for (size_t i = 0; i < medicine.uses.size(); ++i) {
      const Date day = medicine.uses[i].dispensed_on;
      if (day >= first_day && day <= on) uses.emplace_back(first_day, on, i);
    }
    return uses;
  }
  const Episode* episode = EpisodeOn(medicine.episodes, on);
  if (episode == nullptr) return uses;
  for (const Coverage& coverage : episode->coverages) {
    if (coverage.dispensed <= on) uses.emplace_back(coverage.start, coverage.tail_end(), coverage.source);
  }
  return uses;
}

// The products of `ingredient` in one active medicine that are active on D.
void CollectProducts(const Timeline& timeline, const std::vector<ActiveMedicine>& active, size_t a,
                     const std::string& ingredient, Date on, const MeasureOptions& options,
                     std::vector<ActiveProduct>& out) {
  const Medicine& medicine = timeline.medicines[active[a].medicine];
  std::map<ProductKey, std::vector<std::tuple<Date, Date, size_t>>> by_product;
  for (const auto& counted : CountedUses(medicine, on, options)) {
    auto key = KeyFor(medicine.uses[std::get<2>(counted)], ingredient);
    if (key) by_product[*key].push_back(counted);
  }
  for (const auto& [key, runs] : by_product) {
    // In start order: a run reaching D, and its first day.
    std::optional<Date> start, end;
    std::optional<Date> reaching;
    size_t latest = std::get<2>(runs.front());
    for (const auto& [from, to, use] : runs) {
      if (!end || from > *end + 1) start = from, end = to;
      else end = std::max(*end, to);
      if (*start <= on && on <= *end) reaching = *start;
      if (medicine.uses[use].dispensed_on > medicine.uses[latest].dispensed_on ||
          (medicine.uses[use].dispensed_on == medicine.uses[latest].dispensed_on && use > latest)) {
        latest = use;
      }
    }
    if (reaching) out.push_back(ActiveProduct{a, latest, *reaching});
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
                                                 Date on, const MeasureOptions& options) {
  std::vector<ActiveProduct> products;
  for (size_t a = 0; a < burden.active.size(); ++a) {
    const Medicine& medicine = timeline.medicines[burden.active[a].medicine];
    if (std::binary_search(medicine.ingredients.begin(), medicine.ingredients.end(), ingredient)) {
      CollectProducts(timeline, burden.active, a, ingredient, on, options, products);
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

// The DBI dose of one ingredient: the sum over its products taken together, or nullopt
// when any of their doses is unknown.
std::optional<DbiContribution> IngredientDose(const Timeline& timeline, const Burden& burden,
                                              const std::string& ingredient,
                                              const std::vector<ActiveProduct>& products) {
  DbiContribution total;
  total.ingredient = ingredient;
  for (const ActiveProduct& product : products) {
    const size_t medicine = burden.active[product.active].medicine;
    auto dose = DailyDose(timeline.medicines[medicine].uses[product.use], ingredient);
    if (!dose) return std::nullopt;
    dose->medicine = medicine;
    dose->use = product.use;
    total.dose_mg_per_day += dose->dose_mg_per_day;
    total.supply_assumed = total.supply_assumed || dose->supply_assumed;
    total.as_needed_max = total.as_needed_max || dose->as_needed_max;
    total.sources.push_back(*dose);
  }
  if (total.sources.empty()) return std::nullopt;
  total.basis = total.sources.front().basis;
  return total;
}

void ScoreAndDose(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
                  Burden& burden) {
  for (const auto& [ingredient, owner] : IngredientOwners(timeline, tables, burden.active)) {
    // Spec section 5, "Routes": the scale and the DBI count systemic routes only.
    const int score = tables.Score(ingredient);
    if (score > 0 && tables.CountsForScale(burden.active[owner].routes, ingredient)) {
      burden.score_contributions.push_back({ingredient, score});
      burden.acb += score;
      burden.active[owner].score += score;
    }
    const DbiEntry* entry = tables.Dbi(ingredient);
    if (entry == nullptr) {
      if (tables.InDbiClass(ingredient)) {
        burden.dbi_incomplete.push_back(ingredient);
        burden.dbi_no_minimum.push_back(ingredient);
      }
      continue;
    }
    const auto products = ProductsTakenTogether(timeline, burden, tables, ingredient, burden.on, options);
    if (products.empty()) continue;  // only on routes the DBI does not count
    auto dose = IngredientDose(timeline, burden, ingredient, products);
    if (!dose) {
      burden.dbi_incomplete.push_back(ingredient);
      continue;
    }
    // Hilmer et al. 2007: DBI = sum of D / (D + delta).
    dose->min_daily_dose_mg = entry->min_daily_dose_mg;
    dose->value = dose->dose_mg_per_day / (dose->dose_mg_per_day + entry->min_daily_dose_mg);
    burden.dbi += dose->value;
    burden.active[products.front().active].dbi += dose->value;
    burden.dbi_contributions.push_back(std::move(*dose));
  }
  std::stable_sort(burden.score_contributions.begin(), burden.score_contributions.end(),
                   [](const auto& a, const auto& b) { return a.score > b.score; });
}

}  // namespace

Burden EvaluateBurden(const Timeline& timeline, Date on, const BurdenTables& tables,
                      const MeasureOptions& options, std::optional<int> age,
                      const std::vector<bool>* matches) {
  Burden burden;
  burden.on = on;
  burden.active = FindActive(timeline, on, options);
  burden.items = static_cast<int>(burden.active.size());
  for (ActiveMedicine& active : burden.active) {
    active.routes = burden_internal::RoutesInForce(timeline.medicines[active.medicine], active, on, options);
  }
  ScoreAndDose(timeline, tables, options, burden);
  burden_internal::FireRules(timeline, tables, age, matches, burden);
  return burden;
}

}  // namespace medload
