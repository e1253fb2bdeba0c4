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

TEST_CASE("a supply of s days dispensed on day d covers d to d+s-1 inclusive") {
  const Coverage c{D(2024, 1, 1), 28, 0};
  CHECK(c.end() == D(2024, 1, 28));
  const auto episodes = Build({c}, 0);
  REQUIRE(episodes.size() == 1);
  CHECK(episodes[0].Contains(D(2024, 1, 28)));
  CHECK_FALSE(episodes[0].Contains(D(2024, 1, 29)));
  CHECK_FALSE(episodes[0].Contains(D(2023, 12, 31)));
}

TEST_CASE("a gap of exactly grace days joins and one more day splits") {
  // Coverage ends 2024-01-28; grace 30: a start on 2024-02-28 leaves a 30-day gap
  // (Jan 29 .. Feb 27), which joins; a start on 2024-02-29 leaves 31 and splits.
  const Coverage first{D(2024, 1, 1), 28, 0};
  auto joined = Build({first, Coverage{D(2024, 2, 28), 28, 1}}, 30);
  REQUIRE(joined.size() == 1);
  CHECK(joined[0].start == D(2024, 1, 1));
  CHECK(joined[0].end == D(2024, 3, 26));
  CHECK(joined[0].Contains(D(2024, 2, 10)));  // gap days are inside the episode

  auto split = Build({first, Coverage{D(2024, 2, 29), 28, 1}}, 30);
  REQUIRE(split.size() == 2);
  CHECK(split[0].end == D(2024, 1, 28));
  CHECK(split[1].start == D(2024, 2, 29));
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
  CHECK(episodes[0].end == D(2024, 3, 28));
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
}

TEST_CASE("carry-over accumulates stock over several early refills") {
  // Three 28-day supplies on the same day: 84 days of stock.
  auto carried = Build({{D(2024, 1, 1), 28, 0}, {D(2024, 1, 1), 28, 1}, {D(2024, 1, 1), 28, 2}}, 0, true);
  REQUIRE(carried.size() == 1);
  CHECK(carried[0].end == D(2024, 3, 24));
}

TEST_CASE("the drug-era convention: 30-day persistence window, no stockpiling") {
  // Source: OHDSI OMOP CDM drug era derivation (30-day persistence window; era end is the
  // end of the last exposure; exposure end = start + days_supply - 1; no stockpiling).
  // Exposures: Jan 1 (30 days) -> ends Jan 30; Mar 1 (30 days): gap Jan 31..Feb 29 is
  // 30 days -> same era; Apr 30 (30 days): gap Mar 31..Apr 29 = 30 days -> same era;
  // Jul 1: gap May 30..Jun 30 = 32 days -> a new era.
  auto eras = Build({{D(2024, 1, 1), 30, 0},
                     {D(2024, 3, 1), 30, 1},
                     {D(2024, 4, 30), 30, 2},
                     {D(2024, 7, 1), 30, 3}},
                    30);
  REQUIRE(eras.size() == 2);
  CHECK(eras[0].start == D(2024, 1, 1));
  CHECK(eras[0].end == D(2024, 5, 29));
  CHECK(eras[1].start == D(2024, 7, 1));
  CHECK(eras[1].end == D(2024, 7, 30));
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

}  // TEST_SUITE

}  // namespace medload
