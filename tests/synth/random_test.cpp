#include "medload/synth/random.h"

#include <doctest/doctest.h>

#include <array>
#include <set>
#include <vector>

namespace medload {

TEST_SUITE("synth/random") {

TEST_CASE("splitmix64 gives the published first outputs for state zero") {
  // Source: the reference splitmix64.c of Vigna (prng.di.unimi.it), seeded with 0; from
  // memory.
  uint64_t state = 0;
  CHECK(SplitMix64(state) == 0xe220a8397b1dcdafULL);
  CHECK(SplitMix64(state) == 0x6e789e6aa1b965f4ULL);
  CHECK(SplitMix64(state) == 0x06c45d188009454fULL);
}

TEST_CASE("the same seed gives the same sequence and another seed a different one") {
  SynthRandom a(12345);
  SynthRandom b(12345);
  SynthRandom c(12346);
  int differences = 0;
  for (int i = 0; i < 1000; ++i) {
    const uint64_t value = a.Next();
    CHECK(value == b.Next());
    if (value != c.Next()) ++differences;
  }
  CHECK(differences == 1000);
}

TEST_CASE("a stream depends only on the seed and its number") {
  SynthRandom first = SynthRandom::ForStream(7, 41);
  SynthRandom other = SynthRandom::ForStream(7, 42);
  SynthRandom again = SynthRandom::ForStream(7, 41);
  SynthRandom other_seed = SynthRandom::ForStream(8, 41);
  const uint64_t value = first.Next();
  CHECK(value == again.Next());
  CHECK(value != other.Next());
  CHECK(value != other_seed.Next());
}

TEST_CASE("whole numbers below n stay in range and cover it evenly") {
  SynthRandom random(99);
  std::array<int, 10> counts{};
  for (int i = 0; i < 100000; ++i) {
    const uint32_t value = random.Below(10);
    REQUIRE(value < 10);
    ++counts[value];
  }
  for (const int count : counts) {
    CAPTURE(count);
    CHECK(count > 9500);   // expected 10,000 each; 5 standard deviations is about 475
    CHECK(count < 10500);
  }
  CHECK(random.Below(1) == 0);
}

TEST_CASE("between includes both ends and nothing outside them") {
  SynthRandom random(3);
  std::set<int> seen;
  for (int i = 0; i < 2000; ++i) {
    const int value = random.Between(-3, 3);
    REQUIRE(value >= -3);
    REQUIRE(value <= 3);
    seen.insert(value);
  }
  CHECK(seen.size() == 7);
  CHECK(random.Between(5, 5) == 5);
}

TEST_CASE("chance of 0 never happens, of 10000 always, and of 2500 about a quarter of the time") {
  SynthRandom random(5);
  int hits = 0;
  for (int i = 0; i < 40000; ++i) {
    CHECK_FALSE(random.Chance(0));
    CHECK(random.Chance(10000));
    if (random.Chance(2500)) ++hits;
  }
  CHECK(hits > 9500);   // expected 10,000; sd about 87
  CHECK(hits < 10500);
}

TEST_CASE("weighted picks follow the weights and never pick a zero weight") {
  SynthRandom random(11);
  const std::vector<int> weights = {1, 0, 3};
  std::array<int, 3> counts{};
  for (int i = 0; i < 40000; ++i) ++counts[random.PickWeighted(weights)];
  CHECK(counts[1] == 0);
  CHECK(counts[0] > 9000);   // expected 10,000
  CHECK(counts[0] < 11000);
  CHECK(counts[2] > 29000);  // expected 30,000
}

}  // TEST_SUITE

}  // namespace medload
