#include "medload/cohort/cohort_table.h"

#include "medload/format/suppression.h"

namespace medload {
namespace {

constexpr double kPer = 1000.0;

CohortValue ValueOf(const CohortCell& cell, size_t key, long suppress_below) {
  CohortValue value;
  const long count = cell.counts[key];
  if (IsSuppressed(count, suppress_below)) return value;
  value.count = count;
  if (cell.registered > 0) {
    value.rate = kPer * static_cast<double>(count) / static_cast<double>(cell.registered);
  }
  BandCounts bands;
  bands.population = cell.registered_by_band;
  bands.events = cell.counts_by_band[key];
  value.standardised = DirectlyStandardisedRate(bands, kPer);
  return value;
}

std::string ShardsText(const CohortTally& tally) {
  if (tally.shard_count == 1) return "1/1";
  if (tally.shards.size() == 1) {
    return std::to_string(*tally.shards.begin()) + "/" + std::to_string(tally.shard_count);
  }
  return std::to_string(tally.shards.size()) + " of " + std::to_string(tally.shard_count) +
         " shards";
}

}  // namespace

CohortTable BuildCohortTable(const CohortTally& tally, long suppress_below) {
  CohortTable table;
  table.criteria = tally.criteria;
  table.keys = tally.criteria;
  table.keys.push_back("any");
  table.dates = tally.dates;
  table.group_by = tally.group_by;
  table.measure = tally.measure;
  table.suppress_below = suppress_below;
  table.complete = tally.complete();
  table.shards = ShardsText(tally);
  for (const auto& entry : tally.groups) table.groups.push_back(entry.first);
  for (size_t d = 0; d < tally.dates.size(); ++d) {
    for (const auto& [group, cells] : tally.groups) {
      const CohortCell& cell = cells[d];
      CohortRow row;
      row.date = tally.dates[d];
      row.group = group;
      row.registered = cell.registered;
      for (const long n : cell.registered_by_band) row.registered_known_age += n;
      for (size_t k = 0; k < table.keys.size(); ++k) {
        row.values.push_back(ValueOf(cell, k, suppress_below));
      }
      table.rows.push_back(std::move(row));
    }
  }
  return table;
}

}  // namespace medload
