#include "medload/report/funnel.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("report/funnel") {

// Worked values. Source: Spiegelhalter 2005, Stat Med 24:1185 (exact binomial limits with
// interpolation), as listed in the project's references.md.
TEST_CASE("exact binomial limits with interpolation match the published worked values") {
  struct Case {
    double p0;
    long n;
    double coverage;
    double lower;
    double upper;
  };
  const Case cases[] = {
      {0.2, 100, 0.95, 0.1197, 0.2765},
      {0.2, 100, 0.998, 0.0810, 0.3268},
      {0.2, 20, 0.95, 0.0117, 0.3661},
  };
  for (const Case& c : cases) {
    CAPTURE(c.n);
    CAPTURE(c.coverage);
    const ControlLimits limits = FunnelLimits(c.p0, c.n, c.coverage);
    CHECK(limits.lower == doctest::Approx(c.lower).epsilon(0.0005));
    CHECK(limits.upper == doctest::Approx(c.upper).epsilon(0.0005));
  }
}

// Source: Spiegelhalter 2005 (references.md): p0 .3, n 500, 99.8% exact .2368-.3634.
TEST_CASE("limits for a larger list size match the published worked value") {
  const ControlLimits limits = FunnelLimits(0.3, 500, 0.998);
  CHECK(limits.lower == doctest::Approx(0.2368).epsilon(0.0005));
  CHECK(limits.upper == doctest::Approx(0.3634).epsilon(0.0005));
}

TEST_CASE("the funnel narrows as the list size grows") {
  const ControlLimits small = FunnelLimits(0.1, 200, 0.95);
  const ControlLimits large = FunnelLimits(0.1, 20000, 0.95);
  CHECK(large.upper < small.upper);
  CHECK(large.lower > small.lower);
  CHECK(large.lower < 0.1);
  CHECK(large.upper > 0.1);
}

TEST_CASE("very large list sizes do not overflow") {
  const ControlLimits limits = FunnelLimits(0.05, 60000, 0.998);
  CHECK(limits.lower > 0.04);
  CHECK(limits.upper < 0.06);
}

TEST_CASE("a practice above the upper limit is placed above, one inside is within") {
  // n 100, p0 .2: the 95% upper limit is .2765 (Spiegelhalter 2005 worked value above).
  CHECK(PositionOf(28, 100, 0.2, 0.95) == FunnelPosition::kAbove);
  CHECK(PositionOf(27, 100, 0.2, 0.95) == FunnelPosition::kWithin);
  CHECK(PositionOf(11, 100, 0.2, 0.95) == FunnelPosition::kBelow);
}

TEST_CASE("a target proportion of zero gives limits of zero") {
  const ControlLimits limits = FunnelLimits(0.0, 50, 0.95);
  CHECK(limits.lower == 0.0);
  CHECK(limits.upper == 0.0);
}

}

}  // namespace medload
