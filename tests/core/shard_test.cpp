#include "medload/core/shard.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {
namespace {

TEST_SUITE("core/shard") {

TEST_CASE("FNV-1a 64-bit hashes match the published test vectors") {
  // Source: Fowler, Noll and Vo, FNV hash reference test vectors (fnv-1a 64: "" and "a").
  CHECK(Fnv1a64("") == 0xcbf29ce484222325ULL);
  CHECK(Fnv1a64("a") == 0xaf63dc4c8601ec8cULL);
  CHECK(Fnv1a64("foobar") == 0x85944171f73967e8ULL);
}

TEST_CASE("every patient falls in exactly one shard") {
  const ShardSpec all{1, 1};
  for (int i = 0; i < 200; ++i) {
    const std::string id = "P" + std::to_string(i);
    CAPTURE(id);
    int hits = 0;
    for (uint32_t k = 1; k <= 5; ++k) hits += InShard(id, ShardSpec{k, 5}) ? 1 : 0;
    CHECK(hits == 1);
    CHECK(InShard(id, all));
  }
}

TEST_CASE("shards are K/N with K between 1 and N") {
  auto shard = ParseShard("3/8");
  REQUIRE(shard.ok());
  CHECK(*shard == ShardSpec{3, 8});
  CHECK(ShardName(*shard) == "3/8");
  for (const char* bad : {"0/4", "5/4", "4", "a/b", "1/0", "1/4x", "/4"}) {
    CAPTURE(bad);
    auto parsed = ParseShard(bad);
    REQUIRE_FALSE(parsed.ok());
    CHECK(parsed.status().code() == StatusCode::kUsage);
  }
  CHECK(ParseShard("0/4").status().message() ==
        "shard \"0/4\" is not K/N with 1 <= K <= N <= 100000 (e.g. 3/8)");
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
