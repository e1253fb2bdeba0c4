#include "medload/core/clock.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("core/clock") {

TEST_CASE("the UTC time stamp has the ISO 8601 shape YYYY-MM-DDTHH:MM:SSZ") {
  const std::string now = UtcNow();
  REQUIRE(now.size() == 20);
  CAPTURE(now);
  for (const size_t i : {0, 1, 2, 3, 5, 6, 8, 9, 11, 12, 14, 15, 17, 18}) {
    CHECK(now[i] >= '0');
    CHECK(now[i] <= '9');
  }
  CHECK(now[4] == '-');
  CHECK(now[7] == '-');
  CHECK(now[10] == 'T');
  CHECK(now[13] == ':');
  CHECK(now[16] == ':');
  CHECK(now[19] == 'Z');
}

}  // TEST_SUITE

}  // namespace medload
