#include "medload/cohort/standard_population.h"

#include <doctest/doctest.h>

#include <numeric>

namespace medload {
namespace {

TEST_SUITE("cohort/standard_population") {

TEST_CASE("the ESP 2013 weights are the Eurostat table and sum to 100000") {
  // Source: Eurostat 2013, Revision of the European Standard Population, ESP 2013 table:
  // 0-4 5000, 5-9 5500, 10-14 5500, 15-19 5500, 20-24 6000, 25-29 6000, 30-34 6500,
  // 35-39 7000, 40-44 7000, 45-49 7000, 50-54 7000, 55-59 6500, 60-64 6000, 65-69 5500,
  // 70-74 5000, 75-79 4000, 80-84 2500, 85-89 1500, 90+ 1000.
  const std::array<int, kEspBands> eurostat = {5000, 5500, 5500, 5500, 6000, 6000, 6500,
                                               7000, 7000, 7000, 7000, 6500, 6000, 5500,
                                               5000, 4000, 2500, 1500, 1000};
  CHECK(kEsp2013Weights == eurostat);
  CHECK(std::accumulate(kEsp2013Weights.begin(), kEsp2013Weights.end(), 0) == 100000);
}

TEST_CASE("ages fall into five-year ESP bands with 90 and over together") {
  CHECK(EspBandOf(0) == 0);
  CHECK(EspBandOf(4) == 0);
  CHECK(EspBandOf(5) == 1);
  CHECK(EspBandOf(89) == 17);
  CHECK(EspBandOf(90) == 18);
  CHECK(EspBandOf(107) == 18);
  CHECK(EspBandLabel(0) == "0-4");
  CHECK(EspBandLabel(17) == "85-89");
  CHECK(EspBandLabel(18) == "90+");
}

TEST_CASE("exact Poisson limits match the tabulated 95% limits") {
  // Source: exact Poisson 95% limits (Garwood 1936), as tabulated in public-health
  // methods guides: 0 -> (0, 3.689), 1 -> (0.0253, 5.572), 20 -> (12.217, 30.888).
  CHECK(PoissonCountLimits(0).lower == 0);
  CHECK(PoissonCountLimits(0).upper == doctest::Approx(3.6889).epsilon(1e-4));
  CHECK(PoissonCountLimits(1).lower == doctest::Approx(0.02532).epsilon(1e-3));
  CHECK(PoissonCountLimits(1).upper == doctest::Approx(5.5716).epsilon(1e-4));
  CHECK(PoissonCountLimits(20).lower == doctest::Approx(12.2165).epsilon(1e-4));
  CHECK(PoissonCountLimits(20).upper == doctest::Approx(30.8884).epsilon(1e-4));
}

TEST_CASE("large counts use Byar's approximation") {
  // Byar's approximation (Breslow and Day 1987) by hand for O = 400, z = 1.95996:
  // lower = 400 (1 - 1/3600 - 1.95996/60)^3 = 361.755;
  // upper = 401 (1 - 1/3609 + 1.95996/(3 sqrt 401))^3 = 441.187.
  CHECK(PoissonCountLimits(400).lower == doctest::Approx(361.755).epsilon(1e-5));
  CHECK(PoissonCountLimits(400).upper == doctest::Approx(441.187).epsilon(1e-5));
}

TEST_CASE("a standardised rate and its Dobson limits match a worked example") {
  // Worked by hand. Band 65-69 (weight 5500): 10 of 100; band 70-74 (weight 5000): 10 of
  // 50; no other band has people, so the standard is those two weights (sum 10500).
  // DSR = 1000 * (5500 * 0.1 + 5000 * 0.2) / 10500 = 1000 * 1550 / 10500 = 147.619.
  // var = 1000^2 * (5500^2 * 10 / 100^2 + 5000^2 * 10 / 50^2) / 10500^2
  //     = 1e6 * (30250 + 100000) / 110250000 = 1181.406.
  // O = 20, exact limits 12.2165 and 30.8884 (Garwood 1936); Dobson et al. 1991:
  // lower = 147.619 + sqrt(1181.406 / 20) * (12.2165 - 20) = 147.619 - 7.68572 * 7.7835
  //       = 87.797; upper = 147.619 + 7.68572 * 10.8884 = 231.304.
  BandCounts counts;
  counts.population[13] = 100;
  counts.events[13] = 10;
  counts.population[14] = 50;
  counts.events[14] = 10;
  auto rate = DirectlyStandardisedRate(counts);
  REQUIRE(rate.has_value());
  CHECK(rate->rate == doctest::Approx(147.619).epsilon(1e-5));
  CHECK(rate->events == 20);
  REQUIRE(rate->lower.has_value());
  REQUIRE(rate->upper.has_value());
  CHECK(*rate->lower == doctest::Approx(87.797).epsilon(1e-4));
  CHECK(*rate->upper == doctest::Approx(231.304).epsilon(1e-4));
}

TEST_CASE("a population of one age band standardises to its crude rate") {
  BandCounts counts;
  counts.population[16] = 400;
  counts.events[16] = 30;
  auto rate = DirectlyStandardisedRate(counts);
  REQUIRE(rate.has_value());
  CHECK(rate->rate == doctest::Approx(75.0));
}

TEST_CASE("no events gives a zero rate without limits, and no people gives no rate") {
  BandCounts counts;
  counts.population[3] = 10;
  auto rate = DirectlyStandardisedRate(counts);
  REQUIRE(rate.has_value());
  CHECK(rate->rate == 0);
  CHECK_FALSE(rate->lower.has_value());
  CHECK_FALSE(DirectlyStandardisedRate(BandCounts{}).has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
