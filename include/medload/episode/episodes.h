// Episodes: a patient's supplies of one medicine merged into continuous windows of use,
// with a grace period between supplies and optional carry-over of early refills
// (docs/measures.md). Pure functions over coverage intervals; no clinical tables.
#pragma once

#include <cstddef>
#include <span>
#include <vector>

#include "medload/core/date.h"

namespace medload {

// The days one dispensing covers: `start` to `start + days - 1` inclusive.
struct Coverage {
  Date start;
  int days = 1;          // REQUIRES: >= 1
  size_t source = 0;     // the caller's index of the dispensing behind it

  Date end() const { return start + (days - 1); }
};

struct EpisodeOptions {
  int grace_days = 30;     // --grace-days: a gap of at most this many days joins supplies
  bool carryover = false;  // --carryover: an early refill starts after the previous supply
};

// One continuous window of use: from the first start to the latest end, gap days
// included, and the coverages (after carry-over shifts) that make it up, by start.
struct Episode {
  Date start;
  Date end;
  std::vector<Coverage> coverages;

  bool Contains(Date day) const { return start <= day && day <= end; }
};

// Merges coverages into episodes. Coverages are sorted by start (then by source) first;
// the next one joins the current episode while `next.start - current.end - 1 <= grace`.
// With carry-over, a coverage that starts on or before the running end of the previous
// supply is moved to start the day after it (stockpiling), before merging. Returns the
// episodes in date order; empty input gives no episodes.
std::vector<Episode> BuildEpisodes(std::span<const Coverage> coverages,
                                   const EpisodeOptions& options);

// The episode that contains `day`, or nullptr. REQUIRES: `episodes` from BuildEpisodes.
const Episode* EpisodeOn(std::span<const Episode> episodes, Date day);

}  // namespace medload
