// A small, portable pseudo-random generator for the synthetic data: xoshiro256**
// seeded through splitmix64, with integer-only helpers so that one seed gives the same
// bytes on every platform. Not for anything that needs unpredictability.
#pragma once

#include <cstdint>
#include <span>

namespace medload {

// Advances `state` and returns the next splitmix64 output (Steele, Lea and Flood 2014).
uint64_t SplitMix64(uint64_t& state);

class SynthRandom {
 public:
  // A generator whose whole sequence is fixed by `seed`.
  explicit SynthRandom(uint64_t seed);
  // An independent generator for one numbered stream (a patient, a practice) of a run:
  // the same (seed, stream) always gives the same sequence, whatever else was drawn.
  static SynthRandom ForStream(uint64_t seed, uint64_t stream);

  // The next 64 random bits (xoshiro256**, Blackman and Vigna 2018).
  uint64_t Next();
  // A whole number in [0, n). REQUIRES: n > 0.
  uint32_t Below(uint32_t n);
  // A whole number in [low, high], both included. REQUIRES: low <= high.
  int Between(int low, int high);
  // True with probability per_10000 / 10000 (<= 0: never; >= 10000: always).
  bool Chance(int per_10000);
  // An index into `weights` drawn in proportion to them. REQUIRES: at least one weight
  // is positive and none is negative.
  size_t PickWeighted(std::span<const int> weights);

 private:
  uint64_t state_[4];
};

}  // namespace medload
