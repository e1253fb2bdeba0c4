// The import's memo of plausible product strengths: a description is remembered only
// once it passed, so that a repeated implausible one is refused on every row.
#include "store/record_checks.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("store/record_checks") {

TEST_CASE("a description whose strengths pass is remembered, an implausible one is refused on every row") {
  PlausibleProducts plausible;
  CHECK_FALSE(StrengthFault("d.csv", 2, "Amlodipine 5mg tablets", &plausible).has_value());
  CHECK(plausible.Contains("Amlodipine 5mg tablets"));
  for (size_t line : {3u, 4u}) {
    CAPTURE(line);
    const std::optional<RowFault> fault = StrengthFault("d.csv", line, "Amlodipine 5000000mg tablets", &plausible);
    REQUIRE(fault.has_value());
    CHECK(fault->reason == "implausible_strength");
    CHECK(fault->message == "d.csv:" + std::to_string(line) +
                                ": product: \"Amlodipine 5000000mg tablets\": a strength of 5000000 mg is above the"
                                " plausible 1000000 mg; check the description");
  }
  CHECK_FALSE(plausible.Contains("Amlodipine 5000000mg tablets"));
  // Descriptions without a digit are never read, so never remembered.
  CHECK_FALSE(StrengthFault("d.csv", 5, "Paracetamol tablets", &plausible).has_value());
  CHECK_FALSE(plausible.Contains("Paracetamol tablets"));
}

}  // TEST_SUITE

}  // namespace medload
