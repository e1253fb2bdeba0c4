// Control limits for a funnel plot of practice proportions against their list sizes
// (Spiegelhalter 2005, "Funnel plots for comparing institutional performance", Stat Med
// 24:1185): exact binomial limits with interpolation around a target proportion. It does
// not draw anything (report_charts.cpp does) and does not decide what is "unusual".
#pragma once

#include <optional>

namespace medload {

// The exact binomial quantile with interpolation (Spiegelhalter 2005, appendix A.1.1):
// r_p is the smallest r with P(R <= r) >= p for R ~ Binomial(n, p0);
// alpha = (P(R <= r_p) - p) / P(R = r_p); the result is (r_p - alpha) / n, a proportion.
// REQUIRES: n >= 1, 0 <= p0 <= 1, 0 < p < 1. With p0 of 0 or 1 the limit is p0.
double BinomialLimit(double p0, long n, double p);

// The lower and upper limits of one funnel at list size n, as proportions.
struct ControlLimits {
  double lower = 0;
  double upper = 0;
};

// Two-sided limits containing `coverage` of practices in control (0.95 or 0.998 in the
// report): BinomialLimit at (1 - coverage) / 2 and at 1 - (1 - coverage) / 2.
// REQUIRES: 0 < coverage < 1, n >= 1.
ControlLimits FunnelLimits(double p0, long n, double coverage);

// Where a practice's proportion falls against the limits of one coverage.
enum class FunnelPosition { kBelow, kWithin, kAbove };
FunnelPosition PositionOf(long count, long n, double p0, double coverage);

}  // namespace medload
