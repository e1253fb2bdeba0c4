#include "medload/core/data_coverage.h"

#include <algorithm>

namespace medload {

void AddToSpans(PracticeSpans& spans, const std::string& practice, Date day) {
  auto [it, added] = spans.try_emplace(practice, DataSpan{day, day});
  if (!added) it->second.Add(day);
}

void MergeSpans(PracticeSpans& into, const PracticeSpans& from) {
  for (const auto& [practice, span] : from) {
    auto [it, added] = into.try_emplace(practice, span);
    if (!added) it->second.Add(span);
  }
}

std::string_view DataStateName(DataState state) {
  switch (state) {
    case DataState::kNoData: return "no-data";
    case DataState::kShortHistory: return "short-history";
    case DataState::kFull: return "full";
    case DataState::kBeyondData: return "beyond-data";
  }
  return "full";
}

int DefaultHistoryDays(int grace_days) { return std::max(84, grace_days); }

DataState DataStateOn(const std::optional<DataSpan>& span, Date on, int history_days) {
  if (!span || on < span->first) return DataState::kNoData;
  if (on - span->first < history_days) return DataState::kShortHistory;
  if (span->latest < on) return DataState::kBeyondData;
  return DataState::kFull;
}

namespace {

std::string Days(int32_t days) { return std::to_string(days) + (days == 1 ? " day" : " days"); }

std::string Whose(std::string_view practice) {
  return practice.empty() ? std::string("the dispensing data") : "practice " + std::string(practice) + "'s data";
}

}  // namespace

std::optional<std::string> DataStateNote(std::string_view practice, DataState state,
                                         const std::optional<DataSpan>& span, Date on,
                                         int history_days) {
  switch (state) {
    case DataState::kFull: return std::nullopt;
    case DataState::kNoData:
      if (!span) return on.ToIso() + ": " + Whose(practice) + " hold no dispensing, so there are no figures";
      return on.ToIso() + " is before " + Whose(practice) + " begin (" + span->first.ToIso() +
             "), so there are no figures for it";
    case DataState::kShortHistory:
      return on.ToIso() + " is within the first " + Days(history_days) + " of " + Whose(practice) + " (from " +
             span->first.ToIso() + "): supplies dispensed before then are missing, so figures may be too low";
    case DataState::kBeyondData:
      return on.ToIso() + " is " + Days(on - span->latest) + " after the latest dispensing in " + Whose(practice) +
             " (" + span->latest.ToIso() + "): supplies and tails running on that date count, "
             "but refills collected since are not loaded";
  }
  return std::nullopt;
}

}  // namespace medload
