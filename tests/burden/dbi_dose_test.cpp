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

}  // TEST_SUITE

}  // namespace medload
