#include "medload/cohort/standard_population.h"

#include <cmath>

namespace medload {
namespace {

// The two-sided 95% normal quantile.
constexpr double kZ95 = 1.959963984540054;
// Below this count the exact limits are used, above it Byar's approximation, whose error
// is then negligible (the split of the public-health profile tools).
constexpr long kExactBelow = 389;

// P(X <= k) for X ~ Poisson(mean), summed in log space.
double PoissonCdf(long k, double mean) {
  if (mean <= 0) return 1.0;
  double sum = 0;
  for (long i = 0; i <= k; ++i) {
    const double x = static_cast<double>(i);
    sum += std::exp(-mean + x * std::log(mean) - std::lgamma(x + 1.0));
  }
  return std::min(sum, 1.0);
}

// The mean at which PoissonCdf(k, mean) equals `target` (the CDF falls as the mean grows).
double SolveMean(long k, double target) {
  double low = 0;
  double high = static_cast<double>(k) + 20.0 + 10.0 * std::sqrt(static_cast<double>(k) + 1.0);
  for (int i = 0; i < 200 && high - low > 1e-12 * (1.0 + high); ++i) {
    const double mid = (low + high) / 2;
    if (PoissonCdf(k, mid) > target) low = mid;
    else high = mid;
  }
  return (low + high) / 2;
}

}  // namespace

size_t EspBandOf(int age) {
  if (age < 0) return 0;
  const size_t band = static_cast<size_t>(age / 5);
  return band < kEspBands ? band : kEspBands - 1;
}

std::string EspBandLabel(size_t band) {
  if (band + 1 >= kEspBands) return "90+";
  return std::to_string(band * 5) + "-" + std::to_string(band * 5 + 4);
}

PoissonLimits PoissonCountLimits(long observed) {
  PoissonLimits limits;
  if (observed <= 0) {
    limits.upper = SolveMean(0, 0.025);
    return limits;
  }
  const double o = static_cast<double>(observed);
  if (observed < kExactBelow) {
    // Exact (Garwood 1936): P(X >= O | lower) = 0.025 and P(X <= O | upper) = 0.025.
    limits.lower = SolveMean(observed - 1, 0.975);
    limits.upper = SolveMean(observed, 0.025);
    return limits;
  }
  // Byar's approximation (Breslow and Day 1987).
  limits.lower = o * std::pow(1.0 - 1.0 / (9.0 * o) - kZ95 / (3.0 * std::sqrt(o)), 3);
  const double o1 = o + 1.0;
  limits.upper = o1 * std::pow(1.0 - 1.0 / (9.0 * o1) + kZ95 / (3.0 * std::sqrt(o1)), 3);
  return limits;
}

std::optional<StandardisedRate> DirectlyStandardisedRate(const BandCounts& counts, double per) {
  double weight_sum = 0;
  double weighted_rate = 0;
  double weighted_variance = 0;
  long events = 0;
  for (size_t band = 0; band < kEspBands; ++band) {
    if (counts.population[band] <= 0) continue;
    const double w = kEsp2013Weights[band];
    const double n = static_cast<double>(counts.population[band]);
    const double o = static_cast<double>(counts.events[band]);
    weight_sum += w;
    weighted_rate += w * o / n;
    weighted_variance += w * w * o / (n * n);
    events += counts.events[band];
  }
  if (weight_sum <= 0) return std::nullopt;
  StandardisedRate result;
  result.rate = per * weighted_rate / weight_sum;
  result.events = events;
  if (events == 0) return result;
  // Dobson et al. 1991: the limits of the count, carried onto the weighted rate.
  const double variance = per * per * weighted_variance / (weight_sum * weight_sum);
  const double o = static_cast<double>(events);
  const double scale = std::sqrt(variance / o);
  const PoissonLimits limits = PoissonCountLimits(events);
  result.lower = result.rate + scale * (limits.lower - o);
  result.upper = result.rate + scale * (limits.upper - o);
  return result;
}

}  // namespace medload
