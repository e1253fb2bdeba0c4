// Kernel of episode building: one medicine's supplies over a year merged into episodes,
// for monthly, weekly and daily dispensing, with and without carry-over.
#include <benchmark/benchmark.h>

#include <cstdint>
#include <vector>

#include "medload/core/date.h"
#include "medload/episode/episodes.h"

namespace medload {
namespace {

// `count` dispensings of one medicine across a year, in date order: each covers about the
// interval to the next one, refills come up to a third of that interval early (overlaps)
// or late (gaps within the grace period), and every 8th refill comes 40 days late, which
// starts a new episode. A fixed linear congruential sequence keeps every run the same.
std::vector<Coverage> Supplies(int count) {
  const int step = 365 / count;  // 30, 7 or 1 days between dispensings
  const int days = step > 2 ? step - step / 15 : 1;
  uint32_t state = 12345;
  std::vector<Coverage> coverages;
  coverages.reserve(static_cast<size_t>(count));
  Date on = Date::FromCivil(2025, 1, 1);
  for (int i = 0; i < count; ++i) {
    state = state * 1664525u + 1013904223u;
    const int spread = 2 * (step / 3) + 1;
    const int jitter = static_cast<int>((state >> 16) % static_cast<uint32_t>(spread)) - step / 3;
    const int extra = static_cast<int>((state >> 8) % 3u);  // 0-2 extra days: overlaps
    coverages.push_back(Coverage{on, days + extra, static_cast<size_t>(i)});
    on = on + (step + jitter + (i % 8 == 7 ? 40 : 0));
  }
  return coverages;
}

// Arguments: dispensings in the year, carry-over (0 or 1).
void BM_BuildEpisodes(benchmark::State& state) {
  const auto coverages = Supplies(static_cast<int>(state.range(0)));
  EpisodeOptions options;
  options.carryover = state.range(1) != 0;
  size_t episodes = 0;
  for (auto _ : state) {
    const auto built = BuildEpisodes(coverages, options);
    episodes = built.size();
    benchmark::DoNotOptimize(built.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(coverages.size()));
  state.counters["episodes"] = static_cast<double>(episodes);
}
BENCHMARK(BM_BuildEpisodes)
    ->ArgNames({"dispensings", "carryover"})
    ->ArgsProduct({{12, 52, 365}, {0, 1}});

}  // namespace
}  // namespace medload
