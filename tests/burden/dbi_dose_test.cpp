// The daily dose the Drug Burden Index uses on a census date: the stage of a taper in
// force on the date, and the marks that say when a dose is the upper value of a range.
#include "medload/burden/burden.h"

#include <doctest/doctest.h>

#include <map>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

ResolvedProduct Tablet(const std::string& ingredient, double mg) {
  ResolvedProduct product;
  product.ingredients = {{ingredient, mg, {}}};
  product.route = Route::kOral;
  product.form = "tablet";
  product.dose_unit = "tablet";
  product.match = MatchKind::kIngredient;
  return product;
}

ResolvedProduct PerUnit(const std::string& ingredient, std::optional<double> mg_per_unit,
                        std::optional<double> mg_per_day, Route route, const std::string& unit, int days_per_unit) {
  ResolvedProduct product;
  product.ingredients = {{ingredient, mg_per_unit, mg_per_day}};
  product.route = route;
  product.form = route == Route::kTransdermal ? "patch" : "injection";
  product.dose_unit = unit;
  product.default_supply_days = days_per_unit;
  product.match = MatchKind::kProduct;
  return product;
}

UnitDoseRow Row(UnitDoseForm form, std::optional<double> strength, std::optional<double> release, int interval) {
  UnitDoseRow row;
  row.form = form;
  row.strength_mg = strength;
  row.release_mg_per_day = release;
  row.interval_days = interval;
  row.source = "test";
  return row;
}

struct Fixture {
  std::map<std::string, ResolvedProduct> products;
  ResolvedProduct unmatched;
  BurdenTables tables;
  MeasureOptions options;

  Fixture() {
    products["diazepam 5mg tablets"] = Tablet("diazepam", 5);
    products["diazepam 2mg tablets"] = Tablet("diazepam", 2);
    // Hilmer et al. 2007: diazepam delta 5 mg (Australian minimum daily dose).
    tables.dbi["diazepam"] = {5.0, "sedative"};
    // Patches and depots as formulary/unit_doses.csv lists them (product SPCs, from memory).
    products["Scopoderm 1.5mg patch"] = PerUnit("hyoscine hydrobromide", 1.5, {}, Route::kTransdermal, "patch", 3);
    products["Buprenorphine 5micrograms/hour patch"] = PerUnit("buprenorphine", {}, 0.12, Route::kTransdermal, "patch", 7);
    products["Buprenorphine 20mg patch"] = PerUnit("buprenorphine", 20, {}, Route::kTransdermal, "patch", 7);
    products["Fentanyl 12micrograms/hour patch"] = PerUnit("fentanyl", {}, 0.288, Route::kTransdermal, "patch", 3);
    products["Flupentixol decanoate 40mg/2ml injection"] = PerUnit("flupentixol", 20, {}, Route::kInjection, "ml", 14);
    tables.unit_doses["hyoscine hydrobromide"] = {Row(UnitDoseForm::kPatch, 1.5, 1.0 / 3, 3)};
    tables.unit_doses["buprenorphine"] = {Row(UnitDoseForm::kPatch, 5, 0.12, 7)};
    tables.unit_doses["flupentixol"] = {Row(UnitDoseForm::kDepot, {}, {}, 14)};
    // Minimum daily doses as dbi.csv gives them (Hilmer et al. 2007 method; from memory).
    tables.dbi["hyoscine hydrobromide"] = {0.3, "both"};
    tables.dbi["buprenorphine"] = {0.12, "sedative"};
    tables.dbi["fentanyl"] = {0.288, "both"};
    tables.dbi["flupentixol"] = {1.0, "sedative"};
  }

  Burden On(const std::vector<DispensingRecord>& records, Date on) const {
    const Timeline timeline = BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
      auto it = products.find(r.product);
      return it == products.end() ? unmatched : it->second;
    }, options);
    return EvaluateBurden(timeline, on, tables, options, 80);
  }
};

DispensingRecord Rx(const std::string& product, Date on, double quantity, const std::string& dosage,
                    std::optional<int> days = std::nullopt) {
  DispensingRecord record;
  record.patient_id = "T1";
  record.product = product;
  record.dispensed_on = on;
  record.quantity = quantity;
  record.days_supply = days;
  record.dosage = dosage;
  return record;
}

const char* const kTaper =
    "3 tablets daily for 7 days, then 2 daily for 7 days, then 1 daily for 7 days";

}  // namespace

TEST_SUITE("burden/dbi_dose") {

TEST_CASE("a taper's whole quantity sets its days of supply: 42 tablets at 3, 2, 1 a day last 21 days") {
  Fixture f;
  // 21 + 14 + 7 tablets: the supply covers 1 to 21 January; 22 January is in its tail.
  const Burden b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 42, kTaper)}, D(2024, 1, 21));
  REQUIRE(b.active.size() == 1);
  CHECK(b.active[0].supply_end == D(2024, 1, 21));
  CHECK_FALSE(b.active[0].in_tail);
}

TEST_CASE("a taper's DBI dose is the stage in force on the census date, not the first stage") {
  // Product specification section 5, dbi(D): a taper uses the stage in force on D.
  // Hilmer et al. 2007: DBI = D / (D + delta), diazepam delta 5 mg.
  Fixture f;
  const std::vector<DispensingRecord> records = {Rx("diazepam 5mg tablets", D(2024, 1, 1), 42, kTaper)};
  struct Expected {
    Date on;
    double mg;
  };
  const Expected expected[] = {{D(2024, 1, 1), 15}, {D(2024, 1, 7), 15}, {D(2024, 1, 8), 10},
                               {D(2024, 1, 10), 10}, {D(2024, 1, 15), 5}, {D(2024, 1, 17), 5}};
  for (const Expected& e : expected) {
    CAPTURE(e.on.ToIso());
    const Burden b = f.On(records, e.on);
    REQUIRE(b.dbi_contributions.size() == 1);
    CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(e.mg));
    CHECK(b.dbi == doctest::Approx(e.mg / (e.mg + 5)));
    CHECK(b.dbi_contributions[0].staged);
    CHECK(DoseBasisMark(b.dbi_contributions[0]) == " (stage of a changing dose on the date)");
  }
}

TEST_CASE("a taper carried over behind an earlier supply counts its stages from the day it starts") {
  // With carry-over the second supply starts on 15 January, the day after the first ends:
  // on 24 January it is on its day 9 (second stage, 2 a day), not day 14 from dispensing.
  Fixture f;
  f.options.episodes.carryover = true;
  const Burden b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 14, "one daily"),
                         Rx("diazepam 5mg tablets", D(2024, 1, 10), 42, kTaper)},
                        D(2024, 1, 24));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(10));
}

TEST_CASE("a taper that ends with 'then stop' adds no dose after it stops") {
  // Hilmer et al. 2007: D = 0 gives 0 / (0 + delta) = 0.
  Fixture f;
  const Burden b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 12, "2 daily for 3 days then 1 daily for 6 days then stop")},
                        D(2024, 1, 11));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == 0);
  CHECK(b.dbi == 0);
  CHECK(b.dbi_incomplete.empty());
}

TEST_CASE("a DBI dose from the upper value of a range is marked, and a plain dose is not") {
  // Product specification section 5: a range uses its upper value, and the DBI says so.
  struct Case {
    const char* dosage;
    double mg;
    bool range_upper;
    bool as_needed;
  };
  const Case cases[] = {
      {"1-2 tablets at night", 10, true, false},
      {"one or two tablets at night", 10, true, false},
      {"one tablet once or twice daily", 10, true, false},
      {"one tablet 2-3 times a day", 15, true, false},
      {"one tablet twice daily", 10, false, false},
      {"one tablet up to three times a day when required", 15, false, true},
      {"1-2 tablets up to three times a day when required", 30, true, true},
  };
  for (const Case& c : cases) {
    CAPTURE(c.dosage);
    Fixture f;
    const Burden b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 28, c.dosage)}, D(2024, 1, 2));
    REQUIRE(b.dbi_contributions.size() == 1);
    CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(c.mg));
    CHECK(b.dbi_contributions[0].range_upper == c.range_upper);
    CHECK(b.dbi_contributions[0].as_needed_max == c.as_needed);
    const bool marked = DoseBasisMark(b.dbi_contributions[0]).find("upper value of a range") != std::string::npos;
    CHECK(marked == c.range_upper);
  }
}

TEST_CASE("a patch's daily dose is its labelled release rate, not what it holds") {
  // Scopoderm 1.5 mg releases about 1 mg over 72 hours (SPC, from memory): 0.333 mg/day,
  // not 1.5 mg / 3 days = 0.5. Buprenorphine 5 micrograms/hour = 0.12 mg/day; fentanyl
  // 12 micrograms/hour = 0.288 mg/day (rate strengths as labelled). Hilmer et al. 2007:
  // D = delta gives 0.5.
  struct Case {
    const char* product;
    const char* dosage;
    double mg;
    DoseBasis basis;
  };
  const Case cases[] = {
      {"Scopoderm 1.5mg patch", "apply one patch every 72 hours", 1.0 / 3, DoseBasis::kPatchRelease},
      {"Scopoderm 1.5mg patch", "", 1.0 / 3, DoseBasis::kPatchRelease},
      {"Buprenorphine 5micrograms/hour patch", "one patch every 7 days", 0.12, DoseBasis::kRateStrength},
      {"Fentanyl 12micrograms/hour patch", "one patch every 3 days", 0.288, DoseBasis::kRateStrength},
  };
  for (const Case& c : cases) {
    CAPTURE(c.product);
    CAPTURE(c.dosage);
    Fixture f;
    const Burden b = f.On({Rx(c.product, D(2024, 1, 1), 4, c.dosage)}, D(2024, 1, 5));
    REQUIRE(b.dbi_contributions.size() == 1);
    CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(c.mg));
    CHECK(b.dbi_contributions[0].basis == c.basis);
  }
  Fixture f;
  CHECK(f.On({Rx("Fentanyl 12micrograms/hour patch", D(2024, 1, 1), 5, "")}, D(2024, 1, 5)).dbi ==
        doctest::Approx(0.5));
}

TEST_CASE("a patch whose content the table does not list has an unknown dose, never its content") {
  // 20 mg of buprenorphine is a 7-day 20 micrograms/hour patch or a 96-hour 35
  // micrograms/hour one (SPCs, from memory): the content cannot tell the rate.
  Fixture f;
  const Burden b = f.On({Rx("Buprenorphine 20mg patch", D(2024, 1, 1), 4, "one patch weekly")}, D(2024, 1, 5));
  CHECK(b.dbi_contributions.empty());
  CHECK(b.dbi_incomplete == std::vector<std::string>{"buprenorphine"});
}

TEST_CASE("a depot injection counts per ampoule with its labelled interval, whatever volume is recorded") {
  // Flupentixol decanoate 40 mg/2 ml every 14 days (SPC, from memory): D = 40 / 14 mg a
  // day, the same whether the record counts ampoules or ml; the supply is 14 days an
  // ampoule. Hilmer et al. 2007, delta 1 mg: D / (D + 1).
  struct Case {
    double quantity;
    const char* unit;
    Date supply_end;
  };
  const Case cases[] = {{1, "", D(2024, 1, 14)},      {2, "", D(2024, 1, 14)},  {2, "ml", D(2024, 1, 14)},
                        {4, "ml", D(2024, 1, 28)},    {2, "ampoule", D(2024, 1, 28)}, {3, "", D(2024, 2, 11)}};
  for (const Case& c : cases) {
    CAPTURE(c.quantity);
    CAPTURE(c.unit);
    Fixture f;
    DispensingRecord record = Rx("Flupentixol decanoate 40mg/2ml injection", D(2024, 1, 1), c.quantity, "");
    record.unit = c.unit;
    const Burden b = f.On({record}, D(2024, 1, 10));
    REQUIRE(b.dbi_contributions.size() == 1);
    CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(40.0 / 14));
    CHECK(b.dbi_contributions[0].basis == DoseBasis::kDepotInterval);
    CHECK(b.dbi == doctest::Approx((40.0 / 14) / (40.0 / 14 + 1)));
    REQUIRE(b.active.size() == 1);
    CHECK(b.active[0].supply_end == c.supply_end);
  }
}

TEST_CASE("a depot's dosage in mg, when given, sets its dose") {
  // "20mg every 2 weeks" from a 40 mg/2 ml ampoule: 20 / 14 mg a day.
  Fixture f;
  const Burden b = f.On({Rx("Flupentixol decanoate 40mg/2ml injection", D(2024, 1, 1), 2, "20mg every 2 weeks")},
                        D(2024, 1, 10));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(20.0 / 14));
  CHECK(b.dbi_contributions[0].basis == DoseBasis::kDosage);
}

}  // TEST_SUITE

}  // namespace medload
