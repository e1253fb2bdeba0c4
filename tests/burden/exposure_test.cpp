// Cumulative anticholinergic exposure in total standardised daily doses (Gray et al. 2015,
// JAMA Intern Med 175(3):401-407): quantity x strength / minimum effective daily dose,
// summed over the dispensings on or before D, and the published bands.
#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "burden/longitudinal_fixture.h"

namespace medload {
namespace {

using testing::D;
using testing::LongitudinalFixture;
using testing::Rx;

// `days` tablets of oxybutynin 5 mg, one a day, collected in 30-day fills from 1 Jan 2020.
std::vector<DispensingRecord> OxybutyninDaily(int days) {
  std::vector<DispensingRecord> records;
  for (int start = 0; start < days; start += 30) {
    const int fill = std::min(30, days - start);
    records.push_back(Rx("oxybutynin 5mg tablets", D(2020, 1, 1) + start, fill, fill));
  }
  return records;
}

}  // namespace

TEST_SUITE("burden/exposure") {

TEST_CASE("oxybutynin 5 mg daily gives one TSDD a day and falls in Gray et al.'s bands") {
  // Source: Gray et al. 2015, Table 3 footnote: the minimum effective daily dose of
  // oxybutynin is 5 mg (= 1 TSDD); 5 mg daily for 45 days is in 1-90, for 180 days in
  // 91-365, for 720 days in 366-1095, for 4 years in >1095.
  LongitudinalFixture f;
  struct Case {
    int days;
    const char* band;
  };
  for (const Case c : {Case{45, "1-90"}, Case{180, "91-365"}, Case{720, "366-1095"}, Case{4 * 365, ">1095"}}) {
    CAPTURE(c.days);
    const LongitudinalMeasures m = f.On(OxybutyninDaily(c.days), D(2024, 12, 31));
    CHECK(m.tsdd == doctest::Approx(c.days));
    CHECK(TsddBand(m.tsdd) == c.band);
    REQUIRE(m.tsdd_contributions.size() == 1);
    CHECK(m.tsdd_contributions.front().ingredient == "oxybutynin");
  }
}

TEST_CASE("the band edges of a TSDD follow the published bands") {
  // Source: Gray et al. 2015, Table 3: 0, 1-90, 91-365, 366-1095, >1095.
  struct Case {
    double tsdd;
    const char* band;
  };
  const std::vector<Case> cases = {{0, "0"},          {0.5, "1-90"},       {1, "1-90"},       {90, "1-90"},
                                   {90.5, "91-365"},  {91, "91-365"},      {365, "91-365"},   {366, "366-1095"},
                                   {1095, "366-1095"}, {1095.01, ">1095"}, {1096, ">1095"}};
  for (const Case& c : cases) {
    CAPTURE(c.tsdd);
    CHECK(TsddBand(c.tsdd) == c.band);
  }
}

TEST_CASE("ingredients are summed each on its own minimum effective dose; a patch counts mg per day x days") {
  // 28 amitriptyline 10 mg = 280 mg / 25 mg (from memory) = 11.2; 8 oxybutynin patches of
  // 3.9 mg/24 hours over 28 days = 109.2 mg / 5 mg = 21.84.
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
                                       Rx("oxybutynin 3.9mg/24 hours patches", D(2024, 1, 1), 8, 28)},
                                      D(2024, 2, 1));
  CHECK(m.tsdd == doctest::Approx(11.2 + 21.84));
  REQUIRE(m.tsdd_contributions.size() == 2);
  CHECK(m.tsdd_contributions[0].tsdd == doctest::Approx(11.2));
  CHECK(m.tsdd_contributions[1].tsdd == doctest::Approx(21.84));
}

TEST_CASE("only dispensings on or before the date and within the exposure years count") {
  LongitudinalFixture f;
  const std::vector<DispensingRecord> records = {Rx("oxybutynin 5mg tablets", D(2020, 6, 1), 30, 30),
                                                 Rx("oxybutynin 5mg tablets", D(2023, 6, 1), 30, 30),
                                                 Rx("oxybutynin 5mg tablets", D(2024, 6, 1), 30, 30)};
  CHECK(f.On(records, D(2024, 5, 31)).tsdd == doctest::Approx(60));
  CHECK(f.On(records, D(2024, 6, 1)).tsdd == doctest::Approx(90));
  f.options.exposure_years = 1;  // 2 Jun 2023 to 1 Jun 2024: the 2023 fill is one day too old
  const LongitudinalMeasures one_year = f.On(records, D(2024, 6, 1));
  CHECK(one_year.tsdd == doctest::Approx(30));
  REQUIRE(one_year.tsdd_from);
  CHECK(*one_year.tsdd_from == D(2023, 6, 2));
  f.options.exposure_years = 3;
  CHECK(f.On(records, D(2024, 6, 1)).tsdd == doctest::Approx(60));
}

TEST_CASE("a dispensing with no known strength is listed, not counted; an eye drop does not count") {
  LongitudinalFixture f;
  const LongitudinalMeasures m = f.On({Rx("amitriptyline tablets", D(2024, 1, 1), 28, 28),
                                       Rx("atropine 1% eye drops", D(2024, 1, 1), 10, 28)},
                                      D(2024, 2, 1));
  CHECK(m.tsdd == doctest::Approx(0));
  CHECK(m.tsdd_incomplete == std::vector<std::string>{"amitriptyline"});
  CHECK(m.tsdd_contributions.empty());
}

TEST_CASE("TSDDs follow the formulary's route policy: an eye drop counts only where the policy counts eyes") {
  // Product specification section 5, Routes: the formulary says which routes count.
  // Atropine 1% is 10 mg/ml; 10 ml = 100 mg; minimum effective dose 0.4 mg (from memory):
  // 250 TSDDs once eye drops count (Gray et al. 2015: quantity x strength / dose).
  LongitudinalFixture f;
  const std::vector<DispensingRecord> records = {Rx("atropine 1% eye drops", D(2024, 1, 1), 10, 28)};
  CHECK(f.On(records, D(2024, 2, 1)).tsdd == doctest::Approx(0));
  f.tables.systemic_routes.Add(Route::kEye);
  CHECK(f.On(records, D(2024, 2, 1)).tsdd == doctest::Approx(250));
  // Oral taken out of the policy: oxybutynin tablets add nothing either.
  f.tables.systemic_routes = RouteSet(std::vector<Route>{Route::kTransdermal});
  CHECK(f.On({Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28)}, D(2024, 2, 1)).tsdd == doctest::Approx(0));
}

TEST_CASE("a patch whose strength is its content supplies what it releases, not what it holds") {
  // A 1.5 mg hyoscine patch releases about 1 mg over 72 hours (Scopoderm SPC, from
  // memory): 4 patches supply 4 mg, 10 TSDDs at a 0.4 mg minimum effective dose (from
  // memory), not 6 mg and 15 (Gray et al. 2015: mg supplied / dose).
  LongitudinalFixture f;
  f.products["hyoscine 1.5mg patch"] = testing::Made({{"hyoscine hydrobromide", 1.5, {}}}, Route::kTransdermal);
  f.tables.tsdd_doses["hyoscine hydrobromide"] = 0.4;
  const std::vector<DispensingRecord> records = {Rx("hyoscine 1.5mg patch", D(2024, 1, 1), 4, 12)};
  CHECK(f.On(records, D(2024, 1, 20)).tsdd == doctest::Approx(15));
  UnitDoseRow row;
  row.form = UnitDoseForm::kPatch;
  row.strength_mg = 1.5;
  row.release_mg_per_day = 1.0 / 3;
  row.interval_days = 3;
  row.source = "test";
  f.tables.unit_doses["hyoscine hydrobromide"] = {row};
  CHECK(f.On(records, D(2024, 1, 20)).tsdd == doctest::Approx(10));
}

TEST_CASE("the years before a date start the day after the same calendar day") {
  CHECK(YearsBefore(D(2024, 6, 1), 1) == D(2023, 6, 2));
  CHECK(YearsBefore(D(2024, 2, 29), 1) == D(2023, 3, 1));  // from 28 Feb 2023, plus one day
  CHECK(YearsBefore(D(2024, 12, 31), 10) == D(2015, 1, 1));
}

}  // TEST_SUITE
}  // namespace medload
