#include "medload/burden/longitudinal_writer.h"

#include <algorithm>
#include <cmath>

#include "medload/core/text.h"
#include "medload/format/output.h"

namespace medload {
namespace {

std::string Plural(int n, const char* one, const char* many) { return std::to_string(n) + " " + (n == 1 ? one : many); }

std::string ExposureSince(const LongitudinalMeasures& measures) {
  return measures.tsdd_from ? "dispensed from " + measures.tsdd_from->ToIso() : "all dispensings loaded";
}

std::string FallsList(const LongitudinalMeasures& measures) {
  std::vector<std::string> parts;
  for (const FallsRiskIngredient& entry : measures.falls_ingredients) {
    parts.push_back(entry.ingredient + " (" + Join(entry.categories, ", ") + ")");
  }
  return Join(parts, ", ");
}

std::string TsddList(const LongitudinalMeasures& measures) {
  std::vector<std::string> parts;
  for (const TsddContribution& c : measures.tsdd_contributions) parts.push_back(c.ingredient + " " + FormatNumber(c.tsdd, 0));
  return Join(parts, ", ");
}

std::string PdcPhrase(const AdherenceEntry& entry) {
  return entry.name + " " + PdcPercent(entry.figure.pdc) + " (" + Plural(entry.figure.dispensings, "dispensing", "dispensings") +
         " since " + entry.figure.first.ToIso() + ")";
}

}  // namespace

std::vector<AdherenceEntry> AdherenceEntries(const Timeline& timeline, const Burden& burden) {
  const auto active = [&](size_t medicine) {
    return std::any_of(burden.active.begin(), burden.active.end(),
                       [&](const ActiveMedicine& a) { return a.medicine == medicine; });
  };
  std::vector<AdherenceEntry> entries;
  for (const MedicineAdherence& a : burden.longitudinal.adherence) {
    entries.push_back({timeline.medicines[a.medicine].key, false, active(a.medicine), a.figure});
  }
  for (const GroupAdherence& g : burden.longitudinal.adherence_groups) {
    entries.push_back({Join(g.classes, "|"), true, std::any_of(g.medicines.begin(), g.medicines.end(), active), g.figure});
  }
  return entries;
}

std::string PdcPercent(double pdc) { return std::to_string(static_cast<int>(std::floor(pdc * 100 + 1e-9))) + "%"; }

nlohmann::json LongitudinalJson(const Timeline& timeline, const Burden& burden) {
  const LongitudinalMeasures& measures = burden.longitudinal;
  nlohmann::json falls = nlohmann::json::array();
  for (const FallsRiskIngredient& entry : measures.falls_ingredients) {
    falls.push_back({{"ingredient", entry.ingredient}, {"categories", entry.categories},
                     {"medicine", timeline.medicines[entry.medicine].key}});
  }
  nlohmann::json tsdd = nlohmann::json::array();
  for (const TsddContribution& c : measures.tsdd_contributions) {
    tsdd.push_back({{"ingredient", c.ingredient}, {"tsdd", c.tsdd}, {"dispensings", c.dispensings},
                    {"min_effective_daily_dose_mg", c.min_effective_daily_dose_mg}});
  }
  nlohmann::json adherence = nlohmann::json::array();
  nlohmann::json groups = nlohmann::json::array();
  for (const AdherenceEntry& entry : AdherenceEntries(timeline, burden)) {
    nlohmann::json row = {{entry.group ? "group" : "medicine", entry.name}, {"pdc", entry.figure.pdc},
                          {"dispensings", entry.figure.dispensings}, {"days_covered", entry.figure.days_covered},
                          {"days", entry.figure.days}, {"first", entry.figure.first.ToIso()},
                          {"adherent", entry.figure.pdc >= kAdherentPdc - 1e-12}, {"active", entry.active}};
    (entry.group ? groups : adherence).push_back(std::move(row));
  }
  return {{"falls", measures.falls}, {"falls_ingredients", falls}, {"tsdd", measures.tsdd},
          {"tsdd_band", std::string(TsddBand(measures.tsdd))},
          {"tsdd_from", measures.tsdd_from ? nlohmann::json(measures.tsdd_from->ToIso()) : nlohmann::json(nullptr)},
          {"tsdd_contributions", tsdd}, {"tsdd_incomplete", measures.tsdd_incomplete},
          {"adherence", adherence}, {"adherence_groups", groups}};
}

nlohmann::json TrajectoryJson(const Trajectory& trajectory) {
  const auto figure = [&](auto member) {
    return trajectory.before ? nlohmann::json((*trajectory.before).*member) : nlohmann::json(nullptr);
  };
  return {{"on", trajectory.before_on.ToIso()}, {"data", std::string(DataStateName(trajectory.before_data))},
          {"items", figure(&BurdenFigures::items)}, {"acb", figure(&BurdenFigures::acb)},
          {"dbi", figure(&BurdenFigures::dbi)}, {"falls", figure(&BurdenFigures::falls)},
          {"tsdd", figure(&BurdenFigures::tsdd)}, {"comparable", trajectory.Comparable()},
          {"started", trajectory.started}, {"stopped", trajectory.stopped}};
}

std::vector<std::string> LongitudinalLines(const Timeline& timeline, const Burden& burden) {
  const LongitudinalMeasures& measures = burden.longitudinal;
  std::vector<std::string> lines;
  lines.push_back("Falls-risk medicines (STOPPFall classes, systemic routes): " + std::to_string(measures.falls) +
                  (measures.falls > 0 ? ": " + FallsList(measures) : ""));
  lines.push_back("Anticholinergic exposure: " + FormatNumber(measures.tsdd, 1) + " TSDD (band " +
                  std::string(TsddBand(measures.tsdd)) + "), " + ExposureSince(measures) +
                  (measures.tsdd_contributions.empty() ? "" : ": " + TsddList(measures)));
  std::vector<std::string> parts;
  for (const AdherenceEntry& entry : AdherenceEntries(timeline, burden)) {
    parts.push_back(PdcPhrase(entry) + (entry.figure.pdc < kAdherentPdc - 1e-12 ? " below 80%" : "") +
                    (entry.active ? "" : ", not active on the date"));
  }
  lines.push_back("Proportion of days covered (" + std::to_string(kPdcPeriodDays) + " days to the date, medicines with "
                  "2 or more dispensings): " + (parts.empty() ? std::string("none") : Join(parts, "; ")));
  return lines;
}

std::vector<std::string> LongitudinalReasons(const Timeline& timeline, const Burden& burden) {
  const LongitudinalMeasures& measures = burden.longitudinal;
  std::vector<std::string> reasons;
  if (measures.falls > 0) reasons.push_back("falls-risk " + std::to_string(measures.falls) + ": " + FallsList(measures));
  if (measures.tsdd > 0) {
    reasons.push_back("TSDD " + FormatNumber(measures.tsdd, 0) + " (" + std::string(TsddBand(measures.tsdd)) +
                      "): " + TsddList(measures));
  }
  std::vector<std::string> low;
  for (const AdherenceEntry& entry : AdherenceEntries(timeline, burden)) {
    if (entry.figure.pdc < kAdherentPdc - 1e-12) low.push_back(PdcPhrase(entry) + (entry.active ? "" : " not active"));
  }
  if (!low.empty()) reasons.push_back("PDC below 80%: " + Join(low, ", "));
  return reasons;
}

std::vector<std::string> LongitudinalWarnings(const LongitudinalMeasures& measures) {
  std::vector<std::string> warnings;
  for (const std::string& ingredient : measures.tsdd_incomplete) {
    warnings.push_back("The strength of some dispensings of " + ingredient +
                       " is not known, so they add nothing to the anticholinergic exposure (TSDD).");
  }
  return warnings;
}

}  // namespace medload
