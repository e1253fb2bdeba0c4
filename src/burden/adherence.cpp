// Adherence on D as the proportion of days covered (PDC): per medicine and per group of
// classes, over the kPdcPeriodDays days ending on D (docs/measures.md has the definition).
#include <algorithm>

#include "burden/longitudinal_parts.h"

namespace medload {
namespace {

struct Interval {
  Date start, end;
};

// Appends the days one medicine's supplies in [period_start, on] cover up to `on`, each
// supply starting no earlier than the day after the previous one ends; returns how many
// supplies were dispensed in the period.
int AddShifted(const std::vector<PdcSupply>& supplies, Date period_start, Date on, std::vector<Interval>& out) {
  int count = 0;
  std::optional<Date> previous_end;
  for (const PdcSupply& supply : supplies) {
    if (supply.dispensed < period_start || supply.dispensed > on) continue;
    ++count;
    Date start = supply.dispensed;
    if (previous_end && start <= *previous_end) start = *previous_end + 1;
    const Date end = start + (std::max(supply.days, 1) - 1);
    previous_end = end;
    if (start <= on) out.push_back({start, std::min(end, on)});
  }
  return count;
}

}  // namespace

std::optional<PdcFigure> ProportionOfDaysCovered(std::span<const std::vector<PdcSupply>> medicines, Date on) {
  const Date period_start = on - (kPdcPeriodDays - 1);
  std::vector<Interval> covered;
  int dispensings = 0;
  std::optional<Date> first;
  for (const std::vector<PdcSupply>& supplies : medicines) {
    dispensings += AddShifted(supplies, period_start, on, covered);
    for (const PdcSupply& supply : supplies) {
      if (supply.dispensed >= period_start && supply.dispensed <= on && (!first || supply.dispensed < *first)) {
        first = supply.dispensed;
      }
    }
  }
  if (dispensings < 2 || !first) return std::nullopt;
  std::sort(covered.begin(), covered.end(), [](const Interval& a, const Interval& b) { return a.start < b.start; });
  int days_covered = 0;
  std::optional<Date> reached;  // the last day counted so far
  for (const Interval& interval : covered) {
    const Date start = reached && interval.start <= *reached ? *reached + 1 : interval.start;
    if (start > interval.end) continue;
    days_covered += interval.end - start + 1;
    reached = interval.end;
  }
  PdcFigure figure;
  figure.dispensings = dispensings;
  figure.first = *first;
  figure.days = on - *first + 1;
  figure.days_covered = days_covered;
  figure.pdc = static_cast<double>(days_covered) / figure.days;
  return figure;
}

namespace longitudinal_internal {
namespace {

using UseIterator = std::vector<DispensingUse>::const_iterator;

// The medicine's dispensings in the period ending on `on`, by binary search (uses are in
// date order).
std::pair<UseIterator, UseIterator> UsesInPeriod(const Medicine& medicine, Date on) {
  const Date period_start = on - (kPdcPeriodDays - 1);
  const auto first = std::lower_bound(medicine.uses.begin(), medicine.uses.end(), period_start,
                                      [](const DispensingUse& use, Date day) { return use.dispensed_on < day; });
  const auto last = std::upper_bound(first, medicine.uses.end(), on,
                                     [](Date day, const DispensingUse& use) { return day < use.dispensed_on; });
  return {first, last};
}

// ProportionOfDaysCovered of one medicine, straight from its uses: shifted supplies of
// one medicine never overlap, so no union is needed (and nothing is copied per date).
std::optional<PdcFigure> MedicinePdc(UseIterator first, UseIterator last, Date on) {
  if (last - first < 2) return std::nullopt;
  int covered = 0;
  std::optional<Date> previous_end;
  for (auto it = first; it != last; ++it) {
    Date start = it->dispensed_on;
    if (previous_end && start <= *previous_end) start = *previous_end + 1;
    const Date end = start + (std::max(it->supply.days, 1) - 1);
    previous_end = end;
    if (start <= on) covered += std::min(end, on) - start + 1;
  }
  PdcFigure figure;
  figure.dispensings = static_cast<int>(last - first);
  figure.first = first->dispensed_on;
  figure.days = on - figure.first + 1;
  figure.days_covered = covered;
  figure.pdc = static_cast<double>(covered) / figure.days;
  return figure;
}

bool InGroup(const Medicine& medicine, const std::vector<std::string>& classes, const BurdenTables& tables) {
  for (const std::string& ingredient : medicine.ingredients) {
    for (const std::string& class_name : classes) {
      if (tables.HasClass(ingredient, class_name)) return true;
    }
  }
  return false;
}

std::optional<GroupAdherence> GroupPdc(const Timeline& timeline, const std::vector<std::string>& classes,
                                       const BurdenTables& tables, Date on) {
  GroupAdherence group{classes, {}, {}};
  std::vector<std::vector<PdcSupply>> members;
  for (size_t m = 0; m < timeline.medicines.size(); ++m) {
    const Medicine& medicine = timeline.medicines[m];
    const auto [first, last] = UsesInPeriod(medicine, on);
    if (first == last || !InGroup(medicine, classes, tables)) continue;
    group.medicines.push_back(m);
    std::vector<PdcSupply>& supplies = members.emplace_back();
    for (auto it = first; it != last; ++it) supplies.push_back({it->dispensed_on, it->supply.days});
  }
  auto figure = ProportionOfDaysCovered(members, on);
  if (!figure) return std::nullopt;
  group.figure = *figure;
  return group;
}

}  // namespace

void AddAdherence(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
                  Burden& burden) {
  LongitudinalMeasures& measures = burden.longitudinal;
  for (size_t m = 0; m < timeline.medicines.size(); ++m) {
    const auto [first, last] = UsesInPeriod(timeline.medicines[m], burden.on);
    if (auto figure = MedicinePdc(first, last, burden.on)) measures.adherence.push_back({m, *figure});
  }
  for (const std::vector<std::string>& classes : options.pdc_groups) {
    if (auto group = GroupPdc(timeline, classes, tables, burden.on)) measures.adherence_groups.push_back(std::move(*group));
  }
}

}  // namespace longitudinal_internal
}  // namespace medload
