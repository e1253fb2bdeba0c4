#include "medload/format/suppression.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("format/suppression") {

TEST_CASE("suppression withholds 1 to N-1 and shows zero and N") {
  CHECK_FALSE(IsSuppressed(0, 5));
  CHECK(IsSuppressed(1, 5));
  CHECK(IsSuppressed(4, 5));
  CHECK_FALSE(IsSuppressed(5, 5));
  CHECK_FALSE(IsSuppressed(1, 0));
  CHECK_FALSE(IsSuppressed(1, 1));
}

TEST_CASE("the suppression note states the rule and the secondary-disclosure limit") {
  CHECK(SuppressionNote(0).find("No small-number suppression") == 0);
  const std::string note = SuppressionNote(10);
  CHECK(note.find("Counts from 1 to 9 (below 10) are withheld") == 0);
  CHECK(note.find("does not suppress complementary cells") != std::string::npos);
}

}  // TEST_SUITE

}  // namespace medload
