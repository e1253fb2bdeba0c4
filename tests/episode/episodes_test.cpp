#include "medload/episode/episodes.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

std::vector<Episode> Build(std::vector<Coverage> coverages, int grace, bool carryover = false) {
  return BuildEpisodes(coverages, EpisodeOptions{grace, carryover});
}

}  // namespace

TEST_SUITE("episode/episodes") {

TEST_CASE("a supply of s days dispensed on day d covers d to d+s-1 inclusive, then its tail") {
  // Product specification: coverage d .. d+s-1; tail t = min(grace, s) days after it.
  const Coverage c{D(2024, 1, 1), 28, 0};
  CHECK(c.end() == D(2024, 1, 28));
  const auto episodes = Build({c}, 0);
  REQUIRE(episodes.size() == 1);
  CHECK(episodes[0].Contains(D(2024, 1, 28)));
  CHECK_FALSE(episodes[0].Contains(D(2024, 1, 29)));
  CHECK_FALSE(episodes[0].Contains(D(2023, 12, 31)));
  const auto with_tail = Build({c}, 30);
  REQUIRE(with_tail.size() == 1);
  CHECK(with_tail[0].supply_end == D(2024, 1, 28));
  CHECK(with_tail[0].end == D(2024, 2, 25));  // 28-day supply: a 28-day tail
  CHECK(with_tail[0].coverages[0].tail == 28);
}

TEST_CASE("the tail is the grace days, or the days supplied when fewer") {
  // A 7-day course gets 7 days, a 28-day supply 28, an 84-day supply 30 (grace 30).
  CHECK(Build({{D(2024, 1, 1), 7, 0}}, 30)[0].end == D(2024, 1, 14));
  CHECK(Build({{D(2024, 1, 1), 28, 0}}, 30)[0].end == D(2024, 2, 25));
  CHECK(Build({{D(2024, 1, 1), 84, 0}}, 30)[0].end == D(2024, 3, 24) + 30);
}

TEST_CASE("a refill one day inside the tail joins; one day after it splits") {
  // 28 days from 2024-01-01: supply to Jan 28, tail to Feb 25 (grace 30). A refill on
  // Feb 26 touches the tail and joins; one on Feb 27 leaves Feb 26 uncovered.
  const Coverage first{D(2024, 1, 1), 28, 0};
  auto joined = Build({first, Coverage{D(2024, 2, 26), 28, 1}}, 30);
  REQUIRE(joined.size() == 1);
  CHECK(joined[0].start == D(2024, 1, 1));
  CHECK(joined[0].supply_end == D(2024, 3, 24));
  CHECK(joined[0].end == D(2024, 4, 21));
  CHECK(joined[0].Contains(D(2024, 2, 10)));

  auto split = Build({first, Coverage{D(2024, 2, 27), 28, 1}}, 30);
  REQUIRE(split.size() == 2);
  CHECK(split[0].end == D(2024, 2, 25));
  CHECK(split[1].start == D(2024, 2, 27));
  CHECK(EpisodeOn(split, D(2024, 2, 26)) == nullptr);
}

TEST_CASE("two short courses four weeks apart are not one episode") {
  // Two 7-day NSAID courses dispensed on Jan 1 and Jan 29: each counts 7 days plus a
  // 7-day tail, so the days between (Jan 15 .. Jan 28) are not covered.
  auto episodes = Build({{D(2024, 1, 1), 7, 0}, {D(2024, 1, 29), 7, 1}}, 30);
  REQUIRE(episodes.size() == 2);
  CHECK(episodes[0].end == D(2024, 1, 14));
  CHECK(EpisodeOn(episodes, D(2024, 1, 20)) == nullptr);
}

TEST_CASE("adjacent supplies with grace zero join; one empty day with grace zero splits") {
  CHECK(Build({{D(2024, 1, 1), 10, 0}, {D(2024, 1, 11), 10, 1}}, 0).size() == 1);
  CHECK(Build({{D(2024, 1, 1), 10, 0}, {D(2024, 1, 12), 10, 1}}, 0).size() == 2);
}

TEST_CASE("the episode ends at the latest end, even when an earlier supply outlasts a later one") {
  auto episodes = Build({{D(2024, 1, 1), 90, 0}, {D(2024, 1, 10), 7, 1}}, 0);
  REQUIRE(episodes.size() == 1);
  CHECK(episodes[0].end == D(2024, 3, 30));
  CHECK(episodes[0].coverages.size() == 2);
}

TEST_CASE("coverages are sorted by start before merging") {
  auto episodes = Build({{D(2024, 3, 1), 28, 2}, {D(2024, 1, 1), 28, 0}, {D(2024, 1, 29), 28, 1}}, 5);
  REQUIRE(episodes.size() == 1);
  CHECK(episodes[0].start == D(2024, 1, 1));
  CHECK(episodes[0].supply_end == D(2024, 3, 28));
  CHECK(episodes[0].end == D(2024, 4, 2));
  CHECK(episodes[0].coverages[0].source == 0);
  CHECK(episodes[0].coverages[2].source == 2);
}

TEST_CASE("an early refill starts the day after the previous supply ends when carry-over is on") {
  // Refilled 7 days early: without carry-over the stock is lost; with it the second
  // supply runs from 2024-01-29 to 2024-02-25.
  std::vector<Coverage> supplies = {{D(2024, 1, 1), 28, 0}, {D(2024, 1, 22), 28, 1}};
  auto plain = Build(supplies, 0);
  REQUIRE(plain.size() == 1);
  CHECK(plain[0].end == D(2024, 2, 18));
  auto carried = Build(supplies, 0, true);
  REQUIRE(carried.size() == 1);
  CHECK(carried[0].end == D(2024, 2, 25));
  CHECK(carried[0].coverages[1].start == D(2024, 1, 29));
  CHECK(carried[0].coverages[1].dispensed == D(2024, 1, 22));
}

TEST_CASE("carry-over with a tail: the tail follows the carried-over supply") {
  // Same two supplies, grace 30: the second runs Jan 29 .. Feb 25, its 28-day tail to
  // Mar 24.
  auto carried = Build({{D(2024, 1, 1), 28, 0}, {D(2024, 1, 22), 28, 1}}, 30, true);
  REQUIRE(carried.size() == 1);
  CHECK(carried[0].supply_end == D(2024, 2, 25));
  CHECK(carried[0].end == D(2024, 3, 24));
}

TEST_CASE("carry-over accumulates stock over several early refills") {
  // Three 28-day supplies on the same day: 84 days of stock.
  auto carried = Build({{D(2024, 1, 1), 28, 0}, {D(2024, 1, 1), 28, 1}, {D(2024, 1, 1), 28, 2}}, 0, true);
  REQUIRE(carried.size() == 1);
  CHECK(carried[0].end == D(2024, 3, 24));
}

TEST_CASE("compared with the drug-era convention: the same grouping here, eras end later by the tail") {
  // Source: OHDSI OMOP CDM drug era derivation (30-day persistence window; era end is the
  // end of the last exposure; exposure end = start + days_supply - 1; no stockpiling).
  // Exposures: Jan 1, Mar 1, Apr 30 and Jul 1, 30 days each. The drug era joins the first
  // three (gaps of 30 days) and ends on May 29; Jul 1 starts a new era. Here each 30-day
  // supply has a 30-day tail, so the first three join too, but the episode runs to the
  // last tail day, Jun 28: built after the fact, an era has no tail and is not a
  // point-in-time measure.
  auto episodes = Build({{D(2024, 1, 1), 30, 0},
                         {D(2024, 3, 1), 30, 1},
                         {D(2024, 4, 30), 30, 2},
                         {D(2024, 7, 1), 30, 3}},
                        30);
  REQUIRE(episodes.size() == 2);
  CHECK(episodes[0].start == D(2024, 1, 1));
  CHECK(episodes[0].supply_end == D(2024, 5, 29));
  CHECK(episodes[0].end == D(2024, 6, 28));
  CHECK(episodes[1].start == D(2024, 7, 1));
  CHECK(episodes[1].end == D(2024, 8, 29));
}

TEST_CASE("the episode on a day is found by binary search, or none") {
  auto episodes = Build({{D(2024, 1, 1), 10, 0}, {D(2024, 3, 1), 10, 1}}, 0);
  REQUIRE(episodes.size() == 2);
  CHECK(EpisodeOn(episodes, D(2024, 1, 10)) == &episodes[0]);
  CHECK(EpisodeOn(episodes, D(2024, 1, 11)) == nullptr);
  CHECK(EpisodeOn(episodes, D(2024, 3, 1)) == &episodes[1]);
  CHECK(EpisodeOn(episodes, D(2023, 12, 31)) == nullptr);
  CHECK(EpisodeOn({}, D(2024, 1, 1)) == nullptr);
}

TEST_CASE("a refill due but not collected: the day is in the tail of the last supply") {
  // 28 days from Jan 1, the refill due on Jan 29 not yet collected on Feb 10.
  auto episodes = Build({{D(2024, 1, 1), 28, 0}}, 30);
  const auto known = EpisodeKnownOn(episodes, D(2024, 2, 10));
  REQUIRE(known.has_value());
  CHECK(known->in_tail);
  CHECK(known->supply_end == D(2024, 1, 28));
  CHECK(known->end == D(2024, 2, 25));
  const auto covered = EpisodeKnownOn(episodes, D(2024, 1, 20));
  REQUIRE(covered.has_value());
  CHECK_FALSE(covered->in_tail);
  CHECK_FALSE(EpisodeKnownOn(episodes, D(2024, 2, 26)).has_value());
}

TEST_CASE("an episode as known on a day ignores supplies dispensed after it") {
  // The same history with and without the refill of Feb 20: on Feb 10 both say the
  // episode started on Jan 1 and, as known then, runs to Feb 25.
  const std::vector<Coverage> before = {{D(2024, 1, 1), 28, 0}};
  const std::vector<Coverage> after = {{D(2024, 1, 1), 28, 0}, {D(2024, 2, 20), 28, 1}};
  for (const bool carryover : {false, true}) {
    CAPTURE(carryover);
    const auto a = EpisodeKnownOn(Build(before, 30, carryover), D(2024, 2, 10));
    const auto b = EpisodeKnownOn(Build(after, 30, carryover), D(2024, 2, 10));
    REQUIRE(a.has_value());
    REQUIRE(b.has_value());
    CHECK(a->start == b->start);
    CHECK(a->end == b->end);
    CHECK(a->supply_end == b->supply_end);
    CHECK(a->in_tail == b->in_tail);
  }
  // On the refill day itself the refill is known.
  const auto on_refill = EpisodeKnownOn(Build(after, 30), D(2024, 2, 20));
  REQUIRE(on_refill.has_value());
  CHECK(on_refill->supply_end == D(2024, 3, 18));
  CHECK_FALSE(on_refill->in_tail);
}

}  // TEST_SUITE

}  // namespace medload
