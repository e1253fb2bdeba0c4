// Direct age standardisation against the European Standard Population 2013 (Eurostat
// 2013, "Revision of the European Standard Population", 19 five-year bands to 90+), with
// 95% confidence limits by the method of Dobson et al. 1991 (Stat Med 10:457-462). It
// does not choose who is counted; it turns per-band counts into a rate.
#pragma once

#include <array>
#include <optional>
#include <string>

namespace medload {

inline constexpr size_t kEspBands = 19;

// ESP 2013 weights per 100,000, bands 0-4, 5-9, ..., 85-89, 90+.
// Source: Eurostat 2013, Revision of the European Standard Population (table of the ESP
// 2013), the weights summing to 100,000.
inline constexpr std::array<int, kEspBands> kEsp2013Weights = {
    5000, 5500, 5500, 5500, 6000, 6000, 6500, 7000, 7000, 7000,
    7000, 6500, 6000, 5500, 5000, 4000, 2500, 1500, 1000};

// The ESP band index (0..18) of an age in completed years. REQUIRES: age >= 0.
size_t EspBandOf(int age);
// "0-4", "5-9", ..., "85-89", "90+".
std::string EspBandLabel(size_t band);

// Per-band numerators and denominators for one rate.
struct BandCounts {
  std::array<long, kEspBands> events{};
  std::array<long, kEspBands> population{};
};

struct StandardisedRate {
  double rate = 0;   // per `per` people
  std::optional<double> lower;  // 95% limits; absent when no events were counted
  std::optional<double> upper;
  long events = 0;   // the total count the limits rest on
};

// The directly standardised rate per `per` people: sum over bands of w_i * O_i / n_i
// divided by the sum of the weights of the bands that have people (a band with no people
// has no rate, so it leaves the standard). nullopt when no band has people.
// Limits by Dobson et al. 1991: DSR + sqrt(var(DSR) / O) * (O_limit - O), where O is the
// total count, var(DSR) = sum w_i^2 O_i / n_i^2 / (sum w_i)^2, and O_limit are the 95%
// limits of a Poisson count: exact (from the chi-square relation) for O < 389 and Byar's
// approximation above, the split used in public-health profile tools.
std::optional<StandardisedRate> DirectlyStandardisedRate(const BandCounts& counts,
                                                         double per = 1000.0);

// The 95% confidence limits of a Poisson count `observed` (exact for observed < 389,
// Byar's approximation otherwise). The lower limit of 0 is 0.
struct PoissonLimits {
  double lower = 0;
  double upper = 0;
};
PoissonLimits PoissonCountLimits(long observed);

}  // namespace medload
