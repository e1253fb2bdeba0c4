// Which days a practice's dispensing data cover, and what that means for a figure on a
// date: no figures before the data begin, "short history" in their first days (supplies
// dispensed before the extract began are missing), "beyond the data" after the latest
// dispensing (docs/measures.md). Value types, the rule and its wording only: the spans
// themselves are gathered by the store or the patient pass.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <string_view>

#include "medload/core/date.h"

namespace medload {

// The first and the latest counting dispensing of one practice.
struct DataSpan {
  Date first;
  Date latest;

  // Widens the span to include `day`.
  void Add(Date day) {
    if (day < first) first = day;
    if (latest < day) latest = day;
  }
  // Widens the span to include `other`.
  void Add(const DataSpan& other) {
    Add(other.first);
    Add(other.latest);
  }
  bool operator==(const DataSpan&) const = default;
};

// Practice code -> its span ("" for dispensings that name no practice).
using PracticeSpans = std::map<std::string, DataSpan>;

// Adds `day` to the span of `practice`, creating it when new.
void AddToSpans(PracticeSpans& spans, const std::string& practice, Date day);
// Adds every span of `from` into `into` (spans of one practice widen each other).
void MergeSpans(PracticeSpans& into, const PracticeSpans& from);

enum class DataState {
  kNoData,        // before the practice's first dispensing (or it has none): no figures
  kShortHistory,  // within its first `history` days: supplies from before may be missing
  kFull,          // figures rest on the history they need
  kBeyondData,    // after its latest dispensing: later dispensings are not loaded
};

// "no-data", "short-history", "full", "beyond-data".
std::string_view DataStateName(DataState state);

// The default length of the short-history window: max(84, grace) days (the usual look-back
// of 84 days, or the grace when longer, so that a tail can have begun inside the data).
int DefaultHistoryDays(int grace_days);

// The state of a date for a practice with `span` (nullopt: no dispensing at all). A date
// in the first `history_days` days is short-history even when it is also after the latest
// dispensing (so that no change is ever computed against it).
DataState DataStateOn(const std::optional<DataSpan>& span, Date on, int history_days);

// Whether a figure for a date in this state may be shown (all but kNoData), and whether a
// change or trend may be computed against it (kFull and kBeyondData: not before the data,
// and not in the short-history window where figures are too low by construction).
inline bool HasFigures(DataState state) { return state != DataState::kNoData; }
inline bool Comparable(DataState state) {
  return state == DataState::kFull || state == DataState::kBeyondData;
}

// A plain sentence for a practice's state on `on` (no full stop), or nullopt for kFull.
// `practice` may be empty ("the data"). REQUIRES: `span` present unless kNoData.
std::optional<std::string> DataStateNote(std::string_view practice, DataState state,
                                         const std::optional<DataSpan>& span, Date on,
                                         int history_days);

}  // namespace medload
