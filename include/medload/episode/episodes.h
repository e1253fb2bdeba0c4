// Episodes: a patient's supplies of one medicine merged into continuous windows of use.
// Each supply counts from its (carried-over) start through its end plus a tail of
// min(grace, days supplied) (docs/measures.md). Pure functions over coverage intervals;
// no clinical tables. A window read "as known on" a day uses only supplies dispensed by then.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <vector>

#include "medload/core/date.h"

namespace medload {

// The days one dispensing covers: `start` to `start + days - 1` inclusive, then `tail`
// more days in which it still counts (the supply has run out; a refill may be late).
struct Coverage {
  Coverage() = default;
  Coverage(Date start_day, int days_supplied, size_t source_index)
      : start(start_day), days(days_supplied), source(source_index), dispensed(start_day) {}

  Date start;            // as given: the day dispensed; after BuildEpisodes: carried over
  int days = 1;          // REQUIRES: >= 1
  size_t source = 0;     // the caller's index of the dispensing behind it
  Date dispensed;        // set by BuildEpisodes: the day dispensed (start before carry-over)
  int tail = 0;          // set by BuildEpisodes: min(grace, days)

  Date end() const { return start + (days - 1); }
  Date tail_end() const { return end() + tail; }
};

struct EpisodeOptions {
  int grace_days = 30;     // --grace-days: the longest tail after a supply ends
  bool carryover = false;  // --carryover: an early refill starts after the previous supply
};

// One continuous window of use: the union of its supplies' extended intervals
// [start, end + tail], and the coverages (after carry-over shifts) that make it up.
struct Episode {
  Date start;
  Date end;         // the last tail day
  Date supply_end;  // the last day a supply covers (end <= supply_end + grace)
  std::vector<Coverage> coverages;  // by start, then source

  bool Contains(Date day) const { return start <= day && day <= end; }
};

// Merges coverages into episodes. Coverages are sorted by start (the day dispensed), then
// by source. With carry-over, a coverage that starts on or before the running end of the
// stock already held moves to the day after it (stockpiling). Each coverage gets its tail
// min(grace, days); extended intervals that overlap or touch (the next starts at most one
// day after the current last tail day) join one episode. Returns the episodes in date
// order; empty input gives no episodes.
std::vector<Episode> BuildEpisodes(std::span<const Coverage> coverages,
                                   const EpisodeOptions& options);

// The episode that contains `day`, or nullptr. REQUIRES: `episodes` from BuildEpisodes.
const Episode* EpisodeOn(std::span<const Episode> episodes, Date day);

// An episode as the supplies dispensed on or before a day show it (the point-in-time view:
// later refills may lengthen the episode, but never change what was known on that day).
struct EpisodeKnown {
  const Episode* episode = nullptr;  // the whole episode, as all supplies make it
  Date start;                        // the episode's first day
  Date end;                          // the last tail day of the supplies dispensed by then
  Date supply_end;                   // the last supplied day of those supplies
  bool in_tail = false;              // no supply covers the day itself: only a tail does
};

// The episode active on `day` as known on that day, or nullopt when no supply dispensed on
// or before `day` extends to it. REQUIRES: `episodes` from BuildEpisodes.
std::optional<EpisodeKnown> EpisodeKnownOn(std::span<const Episode> episodes, Date day);

}  // namespace medload
