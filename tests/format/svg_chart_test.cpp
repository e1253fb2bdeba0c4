#include "medload/format/svg_chart.h"

#include <doctest/doctest.h>

#include <vector>

namespace medload {

TEST_SUITE("format/svg_chart") {

TEST_CASE("an axis ends at the least round number at or above the highest value") {
  struct Case {
    double value;
    double coarse;  // steps 1, 2, 5
    double fine;    // steps 1, 1.5, 2, 2.5, 5
  };
  const std::vector<Case> cases = {
      {0, 1, 1},       {-3, 1, 1},      {1, 1, 1},       {1.2, 2, 1.5},
      {2.2, 5, 2.5},   {7, 10, 10},     {110, 200, 150}, {2600, 5000, 5000},
      {0.03, 0.05, 0.05},
  };
  for (const Case& c : cases) {
    CAPTURE(c.value);
    CHECK(NiceAxisTop(c.value) == doctest::Approx(c.coarse));
    CHECK(NiceAxisTop(c.value, kFineAxisSteps) == doctest::Approx(c.fine));
  }
}

TEST_CASE("SVG coordinates are printed with one decimal") {
  CHECK(SvgNumber(12) == "12.0");
  CHECK(SvgNumber(3.26) == "3.3");
  CHECK(SvgNumber(-0.06) == "-0.1");
  CHECK(SvgNumber(546) == "546.0");
}

}  // TEST_SUITE

}  // namespace medload
