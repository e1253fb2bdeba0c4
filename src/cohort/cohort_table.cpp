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

std::optional<DataSpan> SpanOf(const PracticeSpans& spans, const std::string& practice) {
  const auto it = spans.find(practice);
  return it == spans.end() ? std::nullopt : std::optional<DataSpan>(it->second);
}

// A group's coverage on date `d`: practices without figures that day are left out of the
// cell (their unseen patients taken off), and the others decide the state.
struct GroupDay {
  CohortCell cell;
  DataState data = DataState::kFull;
  long practices_without_data = 0;
};

GroupDay CoverGroup(const CohortTally& tally, const std::string& group, size_t d, int history_days) {
  GroupDay day{tally.groups.at(group)[d], DataState::kFull, 0};
  const auto codes = tally.practices.find(group);
  if (codes == tally.practices.end()) return day;
  const auto unseen = tally.unseen.find(group);
  bool short_history = false, beyond = false;
  for (const std::string& code : codes->second) {
    const DataState state = DataStateOn(SpanOf(tally.spans, code), tally.dates[d], history_days);
    short_history = short_history || state == DataState::kShortHistory;
    beyond = beyond || state == DataState::kBeyondData;
    if (state != DataState::kNoData) continue;
    ++day.practices_without_data;
    if (unseen == tally.unseen.end() || tally.group_by == GroupBy::kPractice) continue;
    const auto cells = unseen->second.find(code);
    if (cells == unseen->second.end() || d >= cells->second.size()) continue;
    day.cell.registered -= cells->second[d].registered;
    for (size_t b = 0; b < kEspBands; ++b) day.cell.registered_by_band[b] -= cells->second[d].registered_by_band[b];
  }
  if (day.practices_without_data == static_cast<long>(codes->second.size())) {
    // No practice has figures: the row keeps its registered count (list sizes are shown
    // like any other row's) and has no figures.
    day.cell = tally.groups.at(group)[d];
    day.data = DataState::kNoData;
  }
  else if (short_history) day.data = DataState::kShortHistory;
  else if (beyond) day.data = DataState::kBeyondData;
  // --by practice: the row is the practice's own, shown with its registered list size.
  if (tally.group_by == GroupBy::kPractice) day.practices_without_data = 0;
  return day;
}

// Consecutive dates in one state, as "2025-01-31" or "2025-01-31 to 2025-03-31".
std::string DateRun(const std::vector<Date>& dates) {
  if (dates.size() == 1) return dates.front().ToIso();
  return dates.front().ToIso() + " to " + dates.back().ToIso() + " (" + std::to_string(dates.size()) + " dates)";
}

}  // namespace

std::vector<std::string> CoverageNotes(const PracticeSpans& spans, const std::set<std::string>& practices,
                                       const std::vector<Date>& dates, int history_days) {
  std::vector<std::string> notes;
  for (const std::string& code : practices) {
    const std::optional<DataSpan> span = SpanOf(spans, code);
    const std::string who = code.empty() ? "dispensings that name no practice" : "practice " + code;
    std::vector<Date> none, young, beyond;
    for (const Date date : dates) {
      const DataState state = DataStateOn(span, date, history_days);
      if (state == DataState::kNoData) none.push_back(date);
      if (state == DataState::kShortHistory) young.push_back(date);
      if (state == DataState::kBeyondData) beyond.push_back(date);
    }
    if (!none.empty()) {
      notes.push_back(span ? who + ": no figures for " + DateRun(none) + ", before its data begin on " + span->first.ToIso()
                           : who + ": no dispensing data, so no figures");
    }
    if (!young.empty()) {
      notes.push_back(who + ": " + DateRun(young) + " within the first " + std::to_string(history_days) +
                      " days of its data (from " + span->first.ToIso() +
                      "), marked short-history: supplies dispensed before then are missing, so figures may be "
                      "too low and changes are not computed against them");
    }
    if (!beyond.empty()) {
      notes.push_back(who + ": " + DateRun(beyond) + " after its latest dispensing loaded (" + span->latest.ToIso() +
                      "), marked beyond-data: supplies and tails running then count, refills collected since are "
                      "not loaded");
    }
  }
  return notes;
}

CohortTable BuildCohortTable(const CohortTally& tally, long suppress_below, int history_days) {
  CohortTable table;
  table.criteria = tally.criteria;
  table.keys = tally.criteria;
  table.keys.push_back("any");
  table.dates = tally.dates;
  table.group_by = tally.group_by;
  table.measure = tally.measure;
  table.population = tally.population;
  table.suppress_below = suppress_below;
  table.history_days = history_days;
  table.complete = tally.complete();
  table.shards = ShardsText(tally);
  for (const auto& entry : tally.groups) table.groups.push_back(entry.first);
  for (size_t d = 0; d < tally.dates.size(); ++d) {
    for (const auto& entry : tally.groups) {
      const GroupDay day = CoverGroup(tally, entry.first, d, history_days);
      CohortRow row;
      row.date = tally.dates[d];
      row.group = entry.first;
      row.registered = day.cell.registered;
      row.data = day.data;
      row.practices_without_data = day.practices_without_data;
      for (const long n : day.cell.registered_by_band) row.registered_known_age += n;
      for (size_t k = 0; k < table.keys.size(); ++k) {
        row.values.push_back(HasFigures(day.data) ? ValueOf(day.cell, k, suppress_below) : CohortValue{});
      }
      table.rows.push_back(std::move(row));
    }
  }
  std::set<std::string> practices;
  for (const auto& [group, codes] : tally.practices) practices.insert(codes.begin(), codes.end());
  table.notes = CoverageNotes(tally.spans, practices, tally.dates, history_days);
  return table;
}

}  // namespace medload
