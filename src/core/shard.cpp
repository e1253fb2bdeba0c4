#include "medload/core/shard.h"

#include <charconv>

namespace medload {
namespace {

constexpr uint32_t kMaxShards = 100000;

bool ParseWhole(std::string_view text, uint32_t& value) {
  if (text.empty()) return false;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  return error == std::errc() && end == text.data() + text.size();
}

}  // namespace

Result<ShardSpec> ParseShard(std::string_view text) {
  const size_t slash = text.find('/');
  ShardSpec shard;
  if (slash == std::string_view::npos || !ParseWhole(text.substr(0, slash), shard.index) ||
      !ParseWhole(text.substr(slash + 1), shard.count) || shard.count < 1 ||
      shard.count > kMaxShards || shard.index < 1 || shard.index > shard.count) {
    return Status::Usage("shard \"" + std::string(text) +
                         "\" is not K/N with 1 <= K <= N <= 100000 (e.g. 3/8)");
  }
  return shard;
}

std::string ShardName(ShardSpec shard) {
  return std::to_string(shard.index) + "/" + std::to_string(shard.count);
}

uint64_t Fnv1a64(std::string_view text) {
  uint64_t hash = 14695981039346656037ULL;
  for (const char c : text) {
    hash ^= static_cast<uint64_t>(static_cast<unsigned char>(c));
    hash *= 1099511628211ULL;
  }
  return hash;
}

bool InShard(std::string_view patient_id, ShardSpec shard) {
  if (shard.count <= 1) return true;
  return Fnv1a64(patient_id) % shard.count == shard.index - 1;
}

}  // namespace medload
