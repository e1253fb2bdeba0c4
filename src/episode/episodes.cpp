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
  if (options.carryover) ApplyCarryover(sorted);

  std::vector<Episode> episodes;
  for (const Coverage& coverage : sorted) {
    if (!episodes.empty()) {
      Episode& current = episodes.back();
      const int gap = coverage.start - current.end - 1;
      if (gap <= options.grace_days) {
        current.end = std::max(current.end, coverage.end());
        current.coverages.push_back(coverage);
        continue;
      }
    }
    episodes.push_back(Episode{coverage.start, coverage.end(), {coverage}});
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

}  // namespace medload
