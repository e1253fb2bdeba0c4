// Staged instructions (a loading dose, a taper, a step-up): the stages read from the
// text, the dose in force on a day, and the days a quantity lasts through the stages.
#include <doctest/doctest.h>

#include <optional>
#include <string>
#include <vector>

#include "medload/dose/dosage_text.h"
#include "medload/dose/supply.h"

namespace medload {
namespace {

constexpr std::optional<int> kOpen = std::nullopt;

struct StageCase {
  const char* text;
  std::vector<DoseStage> stages;  // empty: not staged
  std::optional<double> units_per_day;
};

std::string Show(const std::vector<DoseStage>& stages) {
  std::string shown;
  for (const DoseStage& stage : stages) {
    if (!shown.empty()) shown += ", ";
    shown += std::to_string(stage.units_per_day) + " x " +
             (stage.days ? std::to_string(*stage.days) : std::string("open"));
  }
  return shown;
}

// Common practice: how loading doses, tapers and titrations are written on UK and US
// prescriptions; each stage's units per day as a pharmacist counts them.
const StageCase kStageCases[] = {
    {"3 a day for 7 days then 2 a day for 7 days then 1 a day for 7 days",
     {{3, 7}, {2, 7}, {1, kOpen}}, 3},
    {"2 stat then 1 daily", {{2, 1}, {1, kOpen}}, 2},
    {"take 2 tablets on the first day then 1 tablet daily", {{2, 1}, {1, kOpen}}, 2},
    {"TWO ON DAY ONE THEN ONE DAILY", {{2, 1}, {1, kOpen}}, 2},
    {"2 tablets on day 1 then 1 tablet daily on days 2-5", {{2, 1}, {1, kOpen}}, 2},
    {"6 tablets daily for 3 days then 4 daily for 3 days then 2 daily for 3 days then stop",
     {{6, 3}, {4, 3}, {2, 3}, {0, kOpen}}, 6},
    {"take 6 tablets daily for 5 days then stop", {{6, 5}, {0, kOpen}}, 6},
    {"one capsule at night for 7 days then one capsule twice a day", {{1, 7}, {2, kOpen}}, 1},
    {"one tablet twice a day for 3 days then one daily", {{2, 3}, {1, kOpen}}, 2},
    {"1 tablet at night for 1 week, then 1 tablet twice a day for 1 week, then 2 tablets twice "
     "a day", {{1, 7}, {2, 7}, {4, kOpen}}, 1},
    {"40mg daily for 5 days then 30mg daily for 5 days then 20mg daily",
     {{40, 5}, {30, 5}, {20, kOpen}}, 40},
    {"1 drop both eyes qds for 7 days then 1 drop both eyes bd", {{8, 7}, {4, kOpen}}, 8},
    {"take two tablets now then one tablet every 8 hours", {{2, 1}, {3, kOpen}}, 2},
    {"one tablet twice a day, increase to two tablets twice a day after one week",
     {{2, 7}, {4, kOpen}}, 2},
    {"take 1 daily, after 2 weeks increase to 2 daily", {{1, 14}, {2, kOpen}}, 1},
    {"Week 1: one tablet daily. Week 2: two tablets daily", {{1, 7}, {2, kOpen}}, 1},
    {"Week 1: one at night. Week 2: one twice a day. Week 3: one three times a day",
     {{1, 7}, {2, 7}, {3, kOpen}}, 1},
    {"Day 1: 2 tablets. Days 2-5: 1 tablet", {{2, 1}, {1, kOpen}}, 2},
    // Not staged: one dose, a course length alone, a later dose with no start day.
    {"one tablet daily for 7 days", {}, 1},
    {"one capsule daily for 3 months then review", {}, 1},
    {"1 daily then 2 daily", {}, 1},
    {"2 sprays into each nostril once daily reducing to 1 spray when controlled", {}, 4},
    {"2 tablets daily for 5 days then see your doctor", {}, 2},
    // Cannot be known: a one-off dose alone, a change by a rule, a stage without a dose.
    {"two tablets stat", {}, std::nullopt},
    {"40mg daily for 5 days then reduce", {}, std::nullopt},
    {"take 6 tablets daily for 5 days then reduce by 1 tablet every 5 days", {}, std::nullopt},
    {"2 tablets daily for 7 days then 10ml daily", {}, std::nullopt},
};

}  // namespace

TEST_SUITE("dose/dosage_stages") {

TEST_CASE("staged instructions read into stages in order, the last one open-ended") {
  for (const StageCase& c : kStageCases) {
    CAPTURE(c.text);
    const DosageReading reading = ReadDosageText(c.text);
    CAPTURE(reading.note);
    CHECK(Show(reading.stages) == Show(c.stages));
    CHECK(reading.units_per_day == c.units_per_day);
    if (!reading.stages.empty()) CHECK(!reading.stages.back().days);
  }
}

TEST_CASE("the dose in force on a day is the stage that covers it, the last one after") {
  const DosageReading taper =
      ReadDosageText("3 a day for 7 days then 2 a day for 7 days then 1 a day for 7 days");
  const std::pair<int, std::optional<double>> days[] = {
      {-1, std::nullopt}, {0, 3}, {6, 3}, {7, 2}, {13, 2}, {14, 1}, {20, 1}, {400, 1}};
  for (const auto& [day, units] : days) {
    const auto day_of_taper = day;  // clang 14 cannot capture a structured binding
    CAPTURE(day_of_taper);
    CHECK(UnitsPerDayOnDay(taper, day) == units);
  }
  const DosageReading stop = ReadDosageText("6 daily for 5 days then stop");
  CHECK(UnitsPerDayOnDay(stop, 4) == 6);
  CHECK(UnitsPerDayOnDay(stop, 5) == 0);
  const DosageReading regular = ReadDosageText("one tablet twice a day");
  CHECK(UnitsPerDayOnDay(regular, 0) == 2);
  CHECK(UnitsPerDayOnDay(regular, 1000) == 2);
  CHECK_FALSE(UnitsPerDayOnDay(ReadDosageText("as directed"), 0));
}

TEST_CASE("the days of supply walk the whole quantity through the stages in order") {
  struct Case {
    const char* text;
    double quantity;
    int days;
  };
  // 3, 2 and 1 a day for 7 days each use 42 tablets in 21 days (not 14 at the highest
  // step); quantity left after the last stage continues it; nothing after "then stop".
  const Case cases[] = {
      {"3 a day for 7 days then 2 a day for 7 days then 1 a day for 7 days", 42, 21},
      {"3 a day for 7 days then 2 a day for 7 days then 1 a day for 7 days", 50, 29},
      {"3 a day for 7 days then 2 a day for 7 days then 1 a day for 7 days", 10, 4},
      {"6 tablets daily for 3 days then 4 daily for 3 days then 2 daily for 3 days then stop", 36,
       9},
      {"6 tablets daily for 3 days then 4 daily for 3 days then 2 daily for 3 days then stop", 50,
       9},
      {"6 tablets daily for 3 days then 4 daily for 3 days then 2 daily for 3 days then stop", 20,
       4},
      {"2 stat then 1 daily", 8, 7},
      {"2 stat then 1 daily", 1, 1},
      {"one capsule at night for 7 days then one capsule twice a day", 56, 32},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CAPTURE(c.quantity);
    const Supply supply = ComputeSupply(c.quantity, std::nullopt, ReadDosageText(c.text),
                                        std::nullopt, SupplyOptions{});
    CHECK(supply.days == c.days);
    CHECK(supply.rule == SupplyRule::kDosageText);
    CHECK_FALSE(supply.units_per_day);  // never the highest stage as the daily dose
  }
}

TEST_CASE("stages convert into the quantity's unit and serve the dose in force") {
  QuantityUnit ml;
  ml.unit = "ml";
  // 0.4 ml a day for 7 days (2.8 ml), then 0.2 ml a day for the 2.2 ml left: 11 days.
  const Supply drops = ComputeSupply(
      5, std::nullopt, ReadDosageText("1 drop both eyes qds for 7 days then 1 drop both eyes bd"),
      std::nullopt, SupplyOptions{}, ml);
  CHECK(drops.days == 18);
  CHECK(UnitsPerDayOnDay(drops, 0) == doctest::Approx(0.4));
  CHECK(UnitsPerDayOnDay(drops, 7) == doctest::Approx(0.2));
  // The record's own days supply comes first; the stages stay for the dose measures.
  const Supply recorded = ComputeSupply(42, 28, ReadDosageText("2 stat then 1 daily"),
                                        std::nullopt, SupplyOptions{});
  CHECK(recorded.days == 28);
  CHECK(recorded.rule == SupplyRule::kRecordDaysSupply);
  CHECK(UnitsPerDayOnDay(recorded, 0) == 2);
  CHECK(UnitsPerDayOnDay(recorded, 1) == 1);
  CHECK_FALSE(UnitsPerDayOnDay(recorded, -1));
}

}  // TEST_SUITE

}  // namespace medload
