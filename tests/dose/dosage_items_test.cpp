#include "dose/dosage_items.h"

#include <doctest/doctest.h>

#include <string>

#include "dose/dosage_phrases.h"  // kClockEventBase

namespace medload {
namespace {

std::string KindName(ItemKind kind) {
  switch (kind) {
    case ItemKind::kAmount: return "amount";
    case ItemKind::kUnit: return "unit";
    case ItemKind::kCount: return "count";
    case ItemKind::kPeriod: return "period";
    case ItemKind::kFrequency: return "frequency";
    case ItemKind::kEvent: return "event";
    case ItemKind::kMeals: return "meals";
    case ItemKind::kWeekday: return "weekday";
    case ItemKind::kExceptDays: return "except";
    case ItemKind::kAsNeeded: return "prn";
    case ItemKind::kMaximum: return "max";
    case ItemKind::kAsDirected: return "as-directed";
    case ItemKind::kSeparator: return "sep";
    case ItemKind::kThen: return "then";
    case ItemKind::kDuration: return "days";
    case ItemKind::kOneDay: return "one-day";
    case ItemKind::kStop: return "stop";
    case ItemKind::kVariable: return "variable";
    case ItemKind::kNegation: return "not";
    case ItemKind::kStageMark: return "stage";
    case ItemKind::kStartAfter: return "after";
    case ItemKind::kEachSide: return "each-side";
    case ItemKind::kUnitHint: return "hint";
    case ItemKind::kFiller: return "-";
    case ItemKind::kUnknown: return "?";
  }
  return "";
}

// Items as "kind=value" words; fillers as "-"; units with their name.
std::string Show(std::string_view text) {
  std::string shown;
  for (const Item& item : RecogniseDosageItems(LexDosageText(text).tokens)) {
    if (!shown.empty()) shown += ' ';
    shown += KindName(item.kind);
    if (item.kind == ItemKind::kUnit || item.kind == ItemKind::kUnitHint) {
      shown += "=" + std::string(item.unit);
    } else if (item.kind == ItemKind::kUnknown) {
      shown += "=" + item.text;
    }
  }
  return shown;
}

double ValueOf(std::string_view text, size_t index) {
  const auto items = RecogniseDosageItems(LexDosageText(text).tokens);
  REQUIRE(index < items.size());
  return items[index].value;
}

}  // namespace

TEST_SUITE("dose/dosage_items") {

TEST_CASE("amounts read digits, words, fractions and ranges at their upper value") {
  CHECK(ValueOf("2", 0) == 2);
  CHECK(ValueOf("twenty four", 0) == 24);
  CHECK(ValueOf("1/2", 0) == 0.5);
  CHECK(ValueOf("1 1/2", 0) == 1.5);
  CHECK(ValueOf("1 \xC2\xBD", 0) == 1.5);
  CHECK(ValueOf("one and a half", 0) == 1.5);
  CHECK(ValueOf("a half", 0) == 0.5);
  CHECK(ValueOf("1-2", 0) == 2);
  CHECK(ValueOf("one or two", 0) == 2);
  CHECK(ValueOf("3 to 2", 0) == 3);
  CHECK(ValueOf("2 x 5 ml", 0) == 10);
  CHECK(Show("2.5ml to 5ml") == "amount unit=ml");
  CHECK(ValueOf("2.5ml to 5ml", 0) == 5);
  CHECK(Show("1 tablet or 2 capsules") == "amount unit=tablet - amount unit=capsule");
  CHECK(Show("half a tablet") == "amount unit=tablet");
  CHECK(Show("a quarter of a tablet") == "amount unit=tablet");
  CHECK(Show("a tablet") == "amount unit=tablet");
}

TEST_CASE("a fraction over 7, 52 or 12 is a duration in days, not an amount") {
  // Common practice: n/7 days, n/52 weeks, n/12 months (a month read as 30 days).
  CHECK(Show("5/7") == "days");
  CHECK(ValueOf("5/7", 0) == 5);
  CHECK(Show("for 2/52") == "days");
  CHECK(ValueOf("for 2/52", 0) == 14);
  CHECK(Show("3/12") == "days");
  CHECK(ValueOf("3/12", 0) == 90);
}

TEST_CASE("intervals and counts read as periods in days and administrations") {
  CHECK(Show("every 4 to 6 hours") == "period");
  CHECK(ValueOf("every 4 to 6 hours", 0) == doctest::Approx(4.0 / 24));
  CHECK(ValueOf("every 3 weeks", 0) == 21);
  CHECK(ValueOf("4-6 hourly", 0) == doctest::Approx(4.0 / 24));
  CHECK(ValueOf("q6h", 0) == doctest::Approx(0.25));
  CHECK(ValueOf("in any 24 hour period", 0) == 1);
  CHECK(ValueOf("/24h", 0) == 1);
  CHECK(Show("3 times a day") == "count period");
  CHECK(ValueOf("2-3 times", 0) == 3);
  CHECK(Show("x3 daily") == "count period");
  CHECK(Show("3x daily") == "count period");
  CHECK(Show("1 x 3 daily") == "amount count period");
}

TEST_CASE("durations of a day or more are kept in days and offsets carry nothing") {
  CHECK(Show("for 7 days") == "days");
  CHECK(ValueOf("for 7 days", 0) == 7);
  CHECK(Show("for a week") == "days");
  CHECK(ValueOf("for a week", 0) == 7);
  CHECK(Show("x 5 days") == "days");
  CHECK(ValueOf("for 5-7 days", 0) == 7);  // a range: the upper value
  CHECK(Show("for 2 hours") == "-");       // under a day: not a course length
  CHECK(Show("2 hours before bed") == "- - event");
  CHECK(Show("30 minutes before food") == "- - -");
  CHECK(Show("14 days before food") == "- - -");
  CHECK(Show("days 2-5") == "stage");
  CHECK(ValueOf("days 2-5", 0) == 4);
  CHECK(Show("weeks 3-4") == "stage");
  CHECK(ValueOf("weeks 3-4", 0) == 14);
  CHECK(Show("after one week") == "after");
  CHECK(ValueOf("after one week", 0) == 7);
  CHECK(Show("after food") == "- -");
  CHECK(Show("x 28/7") == "days");
}

TEST_CASE("a dose on one day only is marked as such") {
  CHECK(Show("on day 1") == "- one-day");
  CHECK(Show("day one") == "one-day");
  CHECK(Show("2 stat") == "amount one-day");
  CHECK(Show("2 immediately") == "amount one-day");
  CHECK(Show("on the first day") == "- - one-day");
  CHECK(Show("then stop") == "stop");
  CHECK(Show("then review") == "-");
}

TEST_CASE("clock times are events and a number before am without a space is a time") {
  CHECK(Show("8am") == "event");
  CHECK(ValueOf("8am", 0) == kClockEventBase + 800);
  CHECK(ValueOf("8pm", 0) == kClockEventBase + 2000);
  CHECK(ValueOf("12am", 0) == kClockEventBase);
  CHECK(ValueOf("at 8 pm", 1) == kClockEventBase + 2000);
  CHECK(ValueOf("20:30", 0) == kClockEventBase + 2030);
  CHECK(Show("2 am") == "amount event");  // two in the morning
}

TEST_CASE("on means at night only where it is not a preposition") {
  CHECK(Show("one on") == "amount event");
  CHECK(Show("one on and one om") == "amount event sep amount event");
  CHECK(Show("one on alternate days") == "amount - period");
  CHECK(Show("one on mondays") == "amount - weekday");
}

TEST_CASE("a spoon with its volume is a unit of that many ml") {
  CHECK(Show("two 5ml spoonfuls") == "amount unit=ml");
  CHECK(ValueOf("two 5ml spoonfuls", 1) == 5);
  CHECK(Show("5ml") == "amount unit=ml");
}

TEST_CASE("numbers too large for a dose are unknown and marked unusable") {
  const auto items = RecogniseDosageItems(LexDosageText("1000000 daily").tokens);
  REQUIRE(items.size() == 2);
  CHECK(items[0].kind == ItemKind::kUnknown);
  CHECK(items[0].unusable_amount);
}

TEST_CASE("unknown words are kept with their text and brackets separate clauses") {
  CHECK(Show("one zorb daily") == "amount ?=zorb period");
  CHECK(Show("( )") == "sep sep");
  CHECK(Show("* !") == "- -");
}

}  // TEST_SUITE

}  // namespace medload
