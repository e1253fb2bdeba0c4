#include "medload/burden/burden.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

namespace medload {

std::string_view DoseBasisName(DoseBasis basis) {
  switch (basis) {
    case DoseBasis::kRateStrength: return "rate strength";
    case DoseBasis::kDosage: return "strength x units per day";
    case DoseBasis::kQuantity: return "strength x quantity / days supply";
  }
  return "";
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
  const Episode* episode = EpisodeOn(medicine.episodes, on);
  if (episode == nullptr) return std::nullopt;
  return ActiveMedicine{index, episode->start, episode->end, LatestUseIn(*episode, medicine, on), 0, 0};
}

std::optional<ActiveMedicine> ActiveLookback(const Medicine& medicine, size_t index, Date on,
                                             int window_days) {
  const Date first_day = on - (window_days - 1);
  std::optional<ActiveMedicine> active;
  for (size_t i = 0; i < medicine.uses.size(); ++i) {
    const DispensingUse& use = medicine.uses[i];
    if (use.dispensed_on < first_day || use.dispensed_on > on) continue;
    if (!active) active = ActiveMedicine{index, use.dispensed_on, use.dispensed_on, i, 0, 0};
    active->latest_use = i;  // uses are in date order
    active->until = std::max(active->until, use.dispensed_on + (use.supply.days - 1));
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

// For each distinct active ingredient, the active medicine whose latest dispensing of it
// is the most recent: that medicine carries the ingredient's score and dose.
std::map<std::string, size_t> IngredientOwners(const Timeline& timeline,
                                               const std::vector<ActiveMedicine>& active) {
  std::map<std::string, size_t> owners;  // ingredient -> index into `active`
  for (size_t a = 0; a < active.size(); ++a) {
    const Medicine& medicine = timeline.medicines[active[a].medicine];
    const Date latest = medicine.uses[active[a].latest_use].dispensed_on;
    for (const std::string& ingredient : medicine.ingredients) {
      auto [it, inserted] = owners.emplace(ingredient, a);
      if (inserted) continue;
      const ActiveMedicine& other = active[it->second];
      if (timeline.medicines[other.medicine].uses[other.latest_use].dispensed_on < latest) it->second = a;
    }
  }
  return owners;
}

std::optional<DbiContribution> DailyDose(const DispensingUse& use, const std::string& ingredient) {
  if (!use.ingredients) return std::nullopt;
  const auto it = std::find_if(use.ingredients->begin(), use.ingredients->end(),
                               [&](const auto& i) { return i.ingredient == ingredient; });
  if (it == use.ingredients->end()) return std::nullopt;
  DbiContribution dose;
  dose.ingredient = ingredient;
  if (it->mg_per_day) {
    dose.dose_mg_per_day = *it->mg_per_day;
    dose.basis = DoseBasis::kRateStrength;
  } else if (!it->mg_per_unit) {
    return std::nullopt;
  } else if (use.supply.units_per_day) {
    // Units per day in units of the dispensed quantity (the dosage, converted).
    dose.dose_mg_per_day = *it->mg_per_unit * *use.supply.units_per_day;
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

void ScoreAndDose(const Timeline& timeline, const BurdenTables& tables, Burden& burden) {
  for (const auto& [ingredient, owner] : IngredientOwners(timeline, burden.active)) {
    ActiveMedicine& active = burden.active[owner];
    const Medicine& medicine = timeline.medicines[active.medicine];
    if (const int score = tables.Score(ingredient); score > 0) {
      burden.score_contributions.push_back({ingredient, score});
      burden.acb += score;
      active.score += score;
    }
    const DbiEntry* entry = tables.Dbi(ingredient);
    if (entry == nullptr) continue;
    auto dose = DailyDose(medicine.uses[active.latest_use], ingredient);
    if (!dose) {
      burden.dbi_incomplete.push_back(ingredient);
      continue;
    }
    // Hilmer et al. 2007: DBI = sum of D / (D + delta).
    dose->min_daily_dose_mg = entry->min_daily_dose_mg;
    dose->value = dose->dose_mg_per_day / (dose->dose_mg_per_day + entry->min_daily_dose_mg);
    burden.dbi += dose->value;
    active.dbi += dose->value;
    burden.dbi_contributions.push_back(*dose);
  }
  std::stable_sort(burden.score_contributions.begin(), burden.score_contributions.end(),
                   [](const auto& a, const auto& b) { return a.score > b.score; });
}

bool MedicineMatches(const Medicine& medicine, const RuleRequirement& requirement,
                     const BurdenTables& tables) {
  for (const std::string& ingredient : medicine.ingredients) {
    for (const std::string& class_name : requirement.classes) {
      if (tables.HasClass(ingredient, class_name)) return true;
    }
    for (const std::string& name : requirement.ingredients) {
      if (name == ingredient) return true;
    }
    if (requirement.scale_score_at_least &&
        tables.Score(ingredient, requirement.scale) >= *requirement.scale_score_at_least) {
      return true;
    }
  }
  return false;
}

bool MeasuresHold(const RuleMeasures& measures, const Burden& burden) {
  return (!measures.items || burden.items >= *measures.items) &&
         (!measures.acb || burden.acb >= *measures.acb) &&
         (!measures.dbi || burden.dbi >= *measures.dbi - 1e-9);
}

size_t RequirementCount(const BurdenTables& tables) {
  size_t count = 0;
  for (const Rule& rule : tables.rules) count += rule.require.size();
  return count;
}

// Flags of MatchRuleRequirements, with where this rule's requirements start in them.
struct PreparedMatches {
  const std::vector<bool>* flags = nullptr;  // null: work each match out
  size_t per_medicine = 0;                   // requirements of all rules
  size_t first = 0;                          // flat index of the rule's first requirement
};

std::optional<FiredRule> Fire(const Rule& rule, const Timeline& timeline, const BurdenTables& tables,
                              const Burden& burden, const PreparedMatches& prepared) {
  if (!MeasuresHold(rule.measures, burden)) return std::nullopt;
  std::set<size_t> involved;
  for (size_t k = 0; k < rule.require.size(); ++k) {
    const RuleRequirement& requirement = rule.require[k];
    int matched = 0;
    for (const ActiveMedicine& active : burden.active) {
      const bool meets =
          prepared.flags != nullptr
              ? (*prepared.flags)[active.medicine * prepared.per_medicine + prepared.first + k]
              : MedicineMatches(timeline.medicines[active.medicine], requirement, tables);
      if (!meets) continue;
      ++matched;
      involved.insert(active.medicine);
    }
    if (matched < requirement.at_least) return std::nullopt;
  }
  return FiredRule{&rule, std::vector<size_t>(involved.begin(), involved.end())};
}

}  // namespace

std::vector<bool> MatchRuleRequirements(const Timeline& timeline, const BurdenTables& tables) {
  std::vector<bool> matches;
  matches.reserve(timeline.medicines.size() * RequirementCount(tables));
  for (const Medicine& medicine : timeline.medicines) {
    for (const Rule& rule : tables.rules) {
      for (const RuleRequirement& requirement : rule.require) {
        matches.push_back(MedicineMatches(medicine, requirement, tables));
      }
    }
  }
  return matches;
}

Burden EvaluateBurden(const Timeline& timeline, Date on, const BurdenTables& tables,
                      const MeasureOptions& options, std::optional<int> age,
                      const std::vector<bool>* matches) {
  Burden burden;
  burden.on = on;
  burden.active = FindActive(timeline, on, options);
  burden.items = static_cast<int>(burden.active.size());
  ScoreAndDose(timeline, tables, burden);
  PreparedMatches prepared{matches, matches != nullptr ? RequirementCount(tables) : 0, 0};
  for (size_t first = 0; const Rule& rule : tables.rules) {
    prepared.first = first;
    first += rule.require.size();
    if (rule.age_min) {
      if (!age) {
        burden.age_unknown_for_rules = true;
        continue;
      }
      if (*age < *rule.age_min) continue;
    }
    if (auto fired = Fire(rule, timeline, tables, burden, prepared)) {
      burden.rules.push_back(std::move(*fired));
    }
  }
  return burden;
}

}  // namespace medload
