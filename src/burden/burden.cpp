#include "medload/burden/burden.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <tuple>

#include "burden/dbi_dose.h"
#include "burden/rule_firing.h"

namespace medload {

std::string_view DoseBasisName(DoseBasis basis) {
  switch (basis) {
    case DoseBasis::kRateStrength: return "rate strength";
    case DoseBasis::kDosage: return "strength x units per day";
    case DoseBasis::kQuantity: return "strength x quantity / days supply";
    case DoseBasis::kPatchRelease: return "labelled release rate of the patch";
    case DoseBasis::kDepotInterval: return "strength per dose / labelled interval";
  }
  return "";
}

std::string DoseBasisMark(const DbiContribution& contribution) {
  std::vector<std::string> marks;
  if (contribution.as_needed_max) marks.push_back("as-needed maximum");
  if (contribution.range_upper) marks.push_back("upper value of a range");
  if (contribution.staged) marks.push_back("stage of a changing dose on the date");
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
    bool counted = false;
    size_t dose_owner = owner;
    auto dose = burden_internal::IngredientDbiDose(timeline, burden, tables, ingredient, options, counted,
                                                   dose_owner);
    if (!counted) continue;  // only on routes the DBI does not count
    if (!dose) {
      burden.dbi_incomplete.push_back(ingredient);
      continue;
    }
    // Hilmer et al. 2007: DBI = sum of D / (D + delta).
    dose->min_daily_dose_mg = entry->min_daily_dose_mg;
    dose->value = dose->dose_mg_per_day / (dose->dose_mg_per_day + entry->min_daily_dose_mg);
    burden.dbi += dose->value;
    burden.active[dose_owner].dbi += dose->value;
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
  AddLongitudinalMeasures(timeline, tables, options, burden);
  return burden;
}

}  // namespace medload
