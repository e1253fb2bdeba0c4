#include "medload/core/clock.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("core/clock") {

TEST_CASE("the UTC time stamp has the ISO 8601 shape YYYY-MM-DDTHH:MM:SSZ") {
  const std::string now = UtcNow();
  const std::string shape = "dddd-dd-ddTdd:dd:ddZ";  // d: a digit
  CAPTURE(now);
  REQUIRE(now.size() == shape.size());
  for (size_t i = 0; i < shape.size(); ++i) {
    CAPTURE(i);
    if (shape[i] == 'd') {
      CHECK((now[i] >= '0' && now[i] <= '9'));
    } else {
      CHECK(now[i] == shape[i]);
    }
  }
}

}  // TEST_SUITE

}  // namespace medload
