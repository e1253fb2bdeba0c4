#include "medload/synth/random.h"

namespace medload {
namespace {

constexpr uint64_t RotateLeft(uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }

}  // namespace

uint64_t SplitMix64(uint64_t& state) {
  state += 0x9e3779b97f4a7c15ULL;
  uint64_t z = state;
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}

SynthRandom::SynthRandom(uint64_t seed) {
  uint64_t state = seed;
  for (uint64_t& word : state_) word = SplitMix64(state);
}

SynthRandom SynthRandom::ForStream(uint64_t seed, uint64_t stream) {
  // Mixing the stream number through splitmix64 keeps neighbouring streams unrelated.
  uint64_t state = stream ^ 0x6a09e667f3bcc909ULL;
  const uint64_t mixed = SplitMix64(state);
  return SynthRandom(seed ^ mixed);
}

uint64_t SynthRandom::Next() {
  const uint64_t result = RotateLeft(state_[1] * 5, 7) * 9;
  const uint64_t t = state_[1] << 17;
  state_[2] ^= state_[0];
  state_[3] ^= state_[1];
  state_[1] ^= state_[2];
  state_[0] ^= state_[3];
  state_[2] ^= t;
  state_[3] = RotateLeft(state_[3], 45);
  return result;
}

uint32_t SynthRandom::Below(uint32_t n) {
  // Multiply-shift on the top 32 bits: integer-only, so identical everywhere. The bias
  // (at most n / 2^32) does not matter for synthetic data.
  const uint64_t high = Next() >> 32;
  return static_cast<uint32_t>((high * n) >> 32);
}

int SynthRandom::Between(int low, int high) {
  const auto span = static_cast<uint32_t>(static_cast<int64_t>(high) - low + 1);
  return static_cast<int>(static_cast<int64_t>(low) + Below(span));
}

bool SynthRandom::Chance(int per_10000) {
  if (per_10000 <= 0) return false;
  if (per_10000 >= 10000) return true;
  return Below(10000) < static_cast<uint32_t>(per_10000);
}

size_t SynthRandom::PickWeighted(std::span<const int> weights) {
  int64_t total = 0;
  for (const int weight : weights) total += weight;
  auto draw = static_cast<int64_t>(Below(static_cast<uint32_t>(total)));
  for (size_t i = 0; i < weights.size(); ++i) {
    if (draw < weights[i]) return i;
    draw -= weights[i];
  }
  return weights.size() - 1;
}

}  // namespace medload
