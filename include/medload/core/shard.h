// Splitting the network by patient across independent jobs: each patient belongs to
// exactly one of N shards by a stable hash of their identifier, so that shard stores and
// shard results add up to one run. It does not run or schedule anything.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "medload/core/status.h"

namespace medload {

// Shard K of N (1 <= K <= N); {1, 1} is the whole population.
struct ShardSpec {
  uint32_t index = 1;
  uint32_t count = 1;
  bool operator==(const ShardSpec&) const = default;
};

// Parses "K/N" (`--shard`). Usage error naming the text unless 1 <= K <= N <= 100000.
Result<ShardSpec> ParseShard(std::string_view text);
// "K/N".
std::string ShardName(ShardSpec shard);

// FNV-1a 64-bit hash of the bytes of `text` (offset basis 14695981039346656037, prime
// 1099511628211): stable across machines, builds and runs.
uint64_t Fnv1a64(std::string_view text);

// True when the patient belongs to `shard`: Fnv1a64(patient_id) mod count == index - 1.
bool InShard(std::string_view patient_id, ShardSpec shard);

}  // namespace medload
