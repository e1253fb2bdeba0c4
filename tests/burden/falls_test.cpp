// falls(D): distinct active ingredients in a falls-risk category on a systemic route
// (docs/measures.md; categories after STOPPFall, Seppala et al. 2021, Age Ageing; from
// memory). A product whose route is not stated counts; a topical product does not.
#include <doctest/doctest.h>

#include "burden/longitudinal_fixture.h"

namespace medload {
namespace {

using testing::D;
using testing::LongitudinalFixture;
using testing::Rx;

}  // namespace

TEST_SUITE("burden/falls") {

TEST_CASE("a topical antidepressant does not count; a route not stated does") {
  // Diazepam (benzodiazepine), furosemide (diuretic) and tamsulosin (alpha-blocker, route
  // not stated) count: 3. Doxepin cream is on the skin: not systemic, not counted.
  // Paracetamol is in no falls-risk category.
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On({Rx("diazepam 5mg tablets", D(2024, 3, 1), 28, 28),
                                       Rx("doxepin 5% cream", D(2024, 3, 1), 1, 28),
                                       Rx("furosemide 40mg tablets", D(2024, 3, 1), 28, 28),
                                       Rx("tamsulosin 400 micrograms", D(2024, 3, 1), 28, 28),
                                       Rx("paracetamol 500mg tablets", D(2024, 3, 1), 100, 25)},
                                      D(2024, 3, 10));
  CHECK(m.falls == 3);
  REQUIRE(m.falls_ingredients.size() == 3);
  CHECK(m.falls_ingredients[0].ingredient == "diazepam");
  CHECK(m.falls_ingredients[0].categories == std::vector<std::string>{"sedative-hypnotic"});
  CHECK(m.falls_ingredients[1].ingredient == "furosemide");
  CHECK(m.falls_ingredients[2].ingredient == "tamsulosin");
}

TEST_CASE("one ingredient through two products counts once") {
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On({Rx("diazepam 5mg tablets", D(2024, 3, 1), 28, 28),
                                       Rx("diazepam 10mg rectal tubes", D(2024, 3, 2), 2, 28)},
                                      D(2024, 3, 10));
  CHECK(m.falls == 1);
}

TEST_CASE("only medicines active on the date count, including in their tail") {
  LongitudinalFixture f;
  const std::vector<DispensingRecord> records = {Rx("diazepam 5mg tablets", D(2024, 1, 1), 14, 14)};
  CHECK(f.On(records, D(2023, 12, 31)).falls == 0);  // not yet dispensed
  CHECK(f.On(records, D(2024, 1, 20)).falls == 1);   // supply ran out on 14 Jan; tail of 14 days
  CHECK(f.On(records, D(2024, 1, 29)).falls == 0);   // after the tail
}

TEST_CASE("falls-risk counts follow the formulary's route policy, not a list of their own") {
  // Product specification section 5, Routes: the formulary says which routes count. With
  // skin added to routes.csv's systemic routes the doxepin cream counts; with oral taken
  // out the diazepam tablets no longer do (the rectal tubes still would).
  LongitudinalFixture f;
  const std::vector<DispensingRecord> records = {Rx("diazepam 5mg tablets", D(2024, 3, 1), 28, 28),
                                                 Rx("doxepin 5% cream", D(2024, 3, 1), 1, 28)};
  CHECK(f.On(records, D(2024, 3, 10)).falls == 1);
  f.tables.systemic_routes.Add(Route::kSkin);
  CHECK(f.On(records, D(2024, 3, 10)).falls == 2);
  f.tables.systemic_routes = RouteSet(std::vector<Route>{Route::kRectal});
  CHECK(f.On(records, D(2024, 3, 10)).falls == 0);
}

TEST_CASE("without a falls-risk table nothing counts") {
  LongitudinalFixture f;
  f.tables.falls_categories.clear();
  CHECK(f.On({Rx("diazepam 5mg tablets", D(2024, 3, 1), 28, 28)}, D(2024, 3, 10)).falls == 0);
}

}  // TEST_SUITE
}  // namespace medload
