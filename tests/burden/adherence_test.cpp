// Proportion of days covered (docs/measures.md): worked examples of the definition used by
// pharmacy quality measures (from memory): over the 365 days ending on D, days covered
// from the first dispensing in the period to D, overlapping supplies shifted forward,
// at least two dispensings, supplies dispensed before the period left out.
#include <doctest/doctest.h>

#include "burden/longitudinal_fixture.h"

namespace medload {
namespace {

using testing::D;
using testing::LongitudinalFixture;
using testing::Rx;

// Three 30-day fills: the second collected 6 days early (shifted to start on 31 July), then
// a gap from 30 August to 30 September before the third.
std::vector<DispensingRecord> StatinWithEarlyRefillAndGap() {
  return {Rx("atorvastatin 20mg tablets", D(2024, 7, 1), 30, 30),
          Rx("atorvastatin 20mg tablets", D(2024, 7, 25), 30, 30),
          Rx("atorvastatin 20mg tablets", D(2024, 10, 1), 30, 30)};
}

}  // namespace

TEST_SUITE("burden/adherence") {

TEST_CASE("an early refill is shifted to start after the previous supply and a gap is not covered") {
  // 1 Jul to 30 Oct 2024 is 122 days; covered: 1-30 Jul, 31 Jul-29 Aug (shifted), 1-30 Oct
  // = 90 days; PDC 90/122 = 0.738 (below 80%). Without the shift the overlap would count
  // once and give 84/122.
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On(StatinWithEarlyRefillAndGap(), D(2024, 10, 30));
  REQUIRE(m.adherence.size() == 1);
  const PdcFigure& pdc = m.adherence.front().figure;
  CHECK(pdc.days == 122);
  CHECK(pdc.days_covered == 90);
  CHECK(pdc.dispensings == 3);
  CHECK(pdc.first == D(2024, 7, 1));
  CHECK(pdc.pdc == doctest::Approx(90.0 / 122));
}

TEST_CASE("days after the date are not counted: the last supply is cut at D") {
  // On 15 Oct the third supply has covered 15 days: (30 + 30 + 15) / 107.
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On(StatinWithEarlyRefillAndGap(), D(2024, 10, 15));
  REQUIRE(m.adherence.size() == 1);
  CHECK(m.adherence.front().figure.days == 107);
  CHECK(m.adherence.front().figure.days_covered == 75);
}

TEST_CASE("a supply dispensed before the period is not counted, even where it would cover days in it") {
  LongitudinalFixture f;
  std::vector<DispensingRecord> records = StatinWithEarlyRefillAndGap();
  records.push_back(Rx("atorvastatin 20mg tablets", D(2023, 10, 1), 180, 180));
  const LongitudinalMeasures m = f.On(records, D(2024, 10, 30));
  REQUIRE(m.adherence.size() == 1);
  CHECK(m.adherence.front().figure.days_covered == 90);
  CHECK(m.adherence.front().figure.dispensings == 3);
}

TEST_CASE("a medicine with fewer than two dispensings in the period has no PDC") {
  LongitudinalFixture f;
  CHECK(f.On({Rx("atorvastatin 20mg tablets", D(2024, 7, 1), 30, 30)}, D(2024, 10, 30)).adherence.empty());
  // The second dispensing is 366 days before D: outside the period.
  CHECK(f.On({Rx("atorvastatin 20mg tablets", D(2023, 10, 30), 30, 30),
              Rx("atorvastatin 20mg tablets", D(2024, 7, 1), 30, 30)},
             D(2024, 10, 30))
            .adherence.empty());
}

TEST_CASE("a supply collected on time every 28 days gives a PDC of 1") {
  LongitudinalFixture f;
  std::vector<DispensingRecord> records;
  for (int i = 0; i < 6; ++i) records.push_back(Rx("ramipril 5mg capsules", D(2024, 1, 1) + 28 * i, 28, 28));
  const LongitudinalMeasures m = f.On(records, D(2024, 6, 1));
  REQUIRE(m.adherence.size() == 1);
  CHECK(m.adherence.front().figure.pdc == doctest::Approx(1.0));
}

TEST_CASE("a class group counts a switch within the class as covered; each medicine alone does not") {
  // Simvastatin 5 Jan and 4 Feb, then atorvastatin 5 Mar and 4 Apr (30 days each), on
  // 3 May: simvastatin alone 60/120, atorvastatin alone 60/60, the statin group 120/120.
  LongitudinalFixture f;
  f.options.pdc_groups = {{"statin"}};
  const LongitudinalMeasures m = f.On({Rx("simvastatin 40mg tablets", D(2024, 1, 5), 30, 30),
                                       Rx("simvastatin 40mg tablets", D(2024, 2, 4), 30, 30),
                                       Rx("atorvastatin 20mg tablets", D(2024, 3, 5), 30, 30),
                                       Rx("atorvastatin 20mg tablets", D(2024, 4, 4), 30, 30)},
                                      D(2024, 5, 3));
  REQUIRE(m.adherence.size() == 2);  // by medicine key: atorvastatin, simvastatin
  CHECK(m.adherence[0].figure.pdc == doctest::Approx(1.0));
  CHECK(m.adherence[1].figure.pdc == doctest::Approx(0.5));
  REQUIRE(m.adherence_groups.size() == 1);
  CHECK(m.adherence_groups.front().classes == std::vector<std::string>{"statin"});
  CHECK(m.adherence_groups.front().figure.days_covered == 120);
  CHECK(m.adherence_groups.front().figure.dispensings == 4);
  CHECK(m.adherence_groups.front().medicines.size() == 2);
}

TEST_CASE("days covered by two medicines of a group at once count once") {
  // Ramipril 1 Jan and 29 Jan, losartan 15 Jan and 12 Feb (28 days each): on 10 Mar the
  // union runs from 1 Jan to 10 Mar, 70 of 70 days; ramipril alone 56 of 70.
  LongitudinalFixture f;
  f.options.pdc_groups = {{"ace-inhibitor", "arb"}};
  const LongitudinalMeasures m = f.On({Rx("ramipril 5mg capsules", D(2024, 1, 1), 28, 28),
                                       Rx("ramipril 5mg capsules", D(2024, 1, 29), 28, 28),
                                       Rx("losartan 50mg tablets", D(2024, 1, 15), 28, 28),
                                       Rx("losartan 50mg tablets", D(2024, 2, 12), 28, 28)},
                                      D(2024, 3, 10));
  REQUIRE(m.adherence_groups.size() == 1);
  CHECK(m.adherence_groups.front().figure.days == 70);
  CHECK(m.adherence_groups.front().figure.days_covered == 70);
  REQUIRE(m.adherence.size() == 2);
  CHECK(m.adherence[1].figure.pdc == doctest::Approx(0.8));  // ramipril: 56/70, exactly adherent
}

TEST_CASE("the pure calculation gives the same figure as the one worked out from a timeline") {
  const std::vector<std::vector<PdcSupply>> supplies = {
      {{D(2024, 7, 1), 30}, {D(2024, 7, 25), 30}, {D(2024, 10, 1), 30}}};
  const auto figure = ProportionOfDaysCovered(supplies, D(2024, 10, 30));
  REQUIRE(figure);
  CHECK(figure->days_covered == 90);
  CHECK(figure->days == 122);
  CHECK_FALSE(ProportionOfDaysCovered(std::vector<std::vector<PdcSupply>>{{{D(2024, 7, 1), 30}}}, D(2024, 10, 30)));
}

TEST_CASE("the PDC on a date does not change when later dispensings are added") {
  // Point in time: a refill collected after D neither shifts nor fills any day up to D.
  LongitudinalFixture f;
  std::vector<DispensingRecord> records = StatinWithEarlyRefillAndGap();
  const LongitudinalMeasures before = f.On(records, D(2024, 9, 20));
  records.push_back(Rx("atorvastatin 20mg tablets", D(2024, 9, 21), 90, 90));
  const LongitudinalMeasures after = f.On(records, D(2024, 9, 20));
  REQUIRE(before.adherence.size() == 1);
  REQUIRE(after.adherence.size() == 1);
  CHECK(after.adherence.front().figure.days_covered == before.adherence.front().figure.days_covered);
  CHECK(after.adherence.front().figure.pdc == doctest::Approx(before.adherence.front().figure.pdc));
}

}  // TEST_SUITE
}  // namespace medload
