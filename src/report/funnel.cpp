#include "medload/report/funnel.h"

#include <algorithm>
#include <cmath>

namespace medload {
namespace {

// log of the binomial probability P(R = r), computed with lgamma so that list sizes of
// tens of thousands do not overflow.
double LogPmf(long r, long n, double p0) {
  const double dn = static_cast<double>(n);
  const double dr = static_cast<double>(r);
  return std::lgamma(dn + 1) - std::lgamma(dr + 1) - std::lgamma(dn - dr + 1) +
         dr * std::log(p0) + (dn - dr) * std::log1p(-p0);
}

}  // namespace

double BinomialLimit(double p0, long n, double p) {
  if (n < 1) return p0;
  if (p0 <= 0 || p0 >= 1) return p0;
  // The mass more than 12 standard deviations below the mean is far below double
  // precision, so the walk starts there; each next term follows from the last by the
  // ratio P(R = r + 1) / P(R = r) = (n - r) / (r + 1) * p0 / (1 - p0).
  const double dn = static_cast<double>(n);
  const double sd = std::sqrt(dn * p0 * (1 - p0));
  const long start = std::max(0L, static_cast<long>(std::floor(dn * p0 - 12 * sd - 1)));
  const double ratio = p0 / (1 - p0);
  double mass = std::exp(LogPmf(start, n, p0));
  double cumulative = 0;
  for (long r = start; r <= n; ++r) {
    if (r > start) mass *= static_cast<double>(n - r + 1) / static_cast<double>(r) * ratio;
    cumulative += mass;
    if (cumulative >= p && mass > 0) {
      const double alpha = (cumulative - p) / mass;
      return (static_cast<double>(r) - alpha) / dn;
    }
  }
  return 1.0;  // rounding left the total just under p: the top of the range
}

ControlLimits FunnelLimits(double p0, long n, double coverage) {
  const double tail = (1 - coverage) / 2;
  ControlLimits limits;
  limits.lower = std::max(0.0, BinomialLimit(p0, n, tail));
  limits.upper = std::min(1.0, BinomialLimit(p0, n, 1 - tail));
  return limits;
}

FunnelPosition PositionOf(long count, long n, double p0, double coverage) {
  if (n < 1) return FunnelPosition::kWithin;
  const ControlLimits limits = FunnelLimits(p0, n, coverage);
  const double proportion = static_cast<double>(count) / static_cast<double>(n);
  if (proportion > limits.upper) return FunnelPosition::kAbove;
  if (proportion < limits.lower) return FunnelPosition::kBelow;
  return FunnelPosition::kWithin;
}

}  // namespace medload
