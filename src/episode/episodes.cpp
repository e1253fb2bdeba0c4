#include "medload/episode/episodes.h"

#include <algorithm>

namespace medload {
namespace {

// Carry-over shifts each supply to start after the stock already held runs out. The
// running end is the end of all stock so far, not only of the previous dispensing.
void ApplyCarryover(std::vector<Coverage>& sorted) {
  bool first = true;
  Date stock_end;
  for (Coverage& coverage : sorted) {
    if (!first && coverage.start <= stock_end) coverage.start = stock_end + 1;
    stock_end = first ? coverage.end() : std::max(stock_end, coverage.end());
    first = false;
  }
}

}  // namespace

std::vector<Episode> BuildEpisodes(std::span<const Coverage> coverages,
                                   const EpisodeOptions& options) {
  std::vector<Coverage> sorted(coverages.begin(), coverages.end());
  std::stable_sort(sorted.begin(), sorted.end(), [](const Coverage& a, const Coverage& b) {
    return a.start != b.start ? a.start < b.start : a.source < b.source;
  });
  const int grace = std::max(0, options.grace_days);
  for (Coverage& coverage : sorted) {
    coverage.dispensed = coverage.start;
    coverage.tail = std::min(grace, coverage.days);
  }
  if (options.carryover) ApplyCarryover(sorted);

  std::vector<Episode> episodes;
  for (const Coverage& coverage : sorted) {
    if (!episodes.empty() && coverage.start <= episodes.back().end + 1) {
      Episode& current = episodes.back();
      current.end = std::max(current.end, coverage.tail_end());
      current.supply_end = std::max(current.supply_end, coverage.end());
      current.coverages.push_back(coverage);
      continue;
    }
    episodes.push_back(Episode{coverage.start, coverage.tail_end(), coverage.end(), {coverage}});
  }
  return episodes;
}

const Episode* EpisodeOn(std::span<const Episode> episodes, Date day) {
  // Episodes are disjoint and in order: the last one starting on or before `day`.
  auto it = std::upper_bound(episodes.begin(), episodes.end(), day,
                             [](Date d, const Episode& e) { return d < e.start; });
  if (it == episodes.begin()) return nullptr;
  --it;
  return it->Contains(day) ? &*it : nullptr;
}

std::optional<EpisodeKnown> EpisodeKnownOn(std::span<const Episode> episodes, Date day) {
  const Episode* episode = EpisodeOn(episodes, day);
  if (episode == nullptr) return std::nullopt;
  // A supply dispensed after `day` starts after it, so it cannot reach `day`; the supplies
  // dispensed by then form one chain from the episode's start (they come first in start
  // order and each joins the ones before it).
  EpisodeKnown known{episode, episode->start, episode->start, episode->start, true};
  bool any = false;
  for (const Coverage& coverage : episode->coverages) {
    if (coverage.dispensed > day) continue;
    known.end = any ? std::max(known.end, coverage.tail_end()) : coverage.tail_end();
    known.supply_end = any ? std::max(known.supply_end, coverage.end()) : coverage.end();
    if (coverage.start <= day && day <= coverage.end()) known.in_tail = false;
    any = true;
  }
  if (!any || known.end < day) return std::nullopt;
  return known;
}

}  // namespace medload
