#include "medload/dose/dosage_text.h"

#include <doctest/doctest.h>

#include <chrono>
#include <optional>
#include <string>

namespace medload {
namespace {

constexpr auto kFull = Understanding::kFull;
constexpr auto kPartial = Understanding::kPartial;
constexpr auto kUnknown = Understanding::kUnknown;
constexpr auto kEmpty = Understanding::kEmpty;
constexpr bool kPrn = true;
constexpr bool kRegular = false;
const std::optional<double> kNone = std::nullopt;

struct Case {
  const char* text;
  std::optional<double> units_per_day;
  bool as_needed;
  Understanding understanding;
  const char* unit;
};

// Expected readings are common practice: how a British primary-care pharmacist counts
// these instructions (od = once daily, bd = twice, tds = three times, qds = four times,
// mane = morning, nocte = at night, prn = when required; ranges and as-needed
// instructions at their maximum, docs/dosage-text.md).
const Case kCases[] = {
    // Once a day.
    {"1 tablet once daily", 1, kRegular, kFull, "tablet"},
    {"one tablet daily", 1, kRegular, kFull, "tablet"},
    {"Take ONE tablet ONCE a day", 1, kRegular, kFull, "tablet"},
    {"1 od", 1, kRegular, kFull, ""},
    {"one om", 1, kRegular, kFull, ""},
    {"one on", 1, kRegular, kFull, ""},
    {"1 tab mane", 1, kRegular, kFull, "tablet"},
    {"2 tabs nocte", 2, kRegular, kFull, "tablet"},
    {"one at night", 1, kRegular, kFull, ""},
    {"one every morning", 1, kRegular, kFull, ""},
    {"one at bedtime", 1, kRegular, kFull, ""},
    {"one tablet once daily in the morning", 1, kRegular, kFull, "tablet"},
    {"a tablet a day", 1, kRegular, kFull, "tablet"},
    {"take one tablet daily with food", 1, kRegular, kFull, "tablet"},
    {"one tablet daily at 8am", 1, kRegular, kFull, "tablet"},
    {"take one daily as directed", 1, kRegular, kFull, ""},
    // Twice, three and four times a day.
    {"1 bd", 2, kRegular, kFull, ""},
    {"1 bid", 2, kRegular, kFull, ""},
    {"one tablet b.d.", 2, kRegular, kFull, "tablet"},
    {"one tablet twice-daily", 2, kRegular, kFull, "tablet"},
    {"one tablet twice a day", 2, kRegular, kFull, "tablet"},
    {"twice daily", 2, kRegular, kFull, ""},
    {"2 tds", 6, kRegular, kFull, ""},
    {"1 tid", 3, kRegular, kFull, ""},
    {"take two tablets three times a day", 6, kRegular, kFull, "tablet"},
    {"1 tablet 3x a day", 3, kRegular, kFull, "tablet"},
    {"one x3 daily", 3, kRegular, kFull, ""},
    {"1 qds", 4, kRegular, kFull, ""},
    {"1 qid", 4, kRegular, kFull, ""},
    {"one capsule four times daily", 4, kRegular, kFull, "capsule"},
    {"TAKE ONE TABLET TWICE A DAY", 2, kRegular, kFull, "tablet"},
    {"one tablet twice a day for pain", 2, kRegular, kFull, "tablet"},
    // Times of day that add up.
    {"one tablet in the morning and one at night", 2, kRegular, kFull, "tablet"},
    {"1 in the morning and at night", 2, kRegular, kFull, ""},
    {"one tablet morning and evening", 2, kRegular, kFull, "tablet"},
    {"2 in the morning and 1 at night", 3, kRegular, kFull, ""},
    {"one tablet twice a day and two at night", 4, kRegular, kFull, "tablet"},
    {"1 mane 2 nocte", 3, kRegular, kFull, ""},
    {"one at 8am and one at 8pm", 2, kRegular, kFull, ""},
    {"take one tablet at 08:00 and 20:00", 2, kRegular, kFull, "tablet"},
    {"one twice daily (morning and night)", 2, kRegular, kFull, ""},
    {"one capsule three times a day with meals", 3, kRegular, kFull, "capsule"},
    {"one tablet with each meal", 3, kRegular, kFull, "tablet"},
    // Intervals.
    {"1-2 tablets every 4-6 hours", 12, kRegular, kFull, "tablet"},
    {"one every 4 to 6 hours", 6, kRegular, kFull, ""},
    {"one four hourly", 6, kRegular, kFull, ""},
    {"one q4h", 6, kRegular, kFull, ""},
    {"1 tablet 2 hourly", 12, kRegular, kFull, "tablet"},
    {"one drop hourly", 24, kRegular, kFull, "drop"},
    {"suck one lozenge every 2 hours", 12, kRegular, kFull, "lozenge"},
    {"one patch every 72 hours", 1.0 / 3, kRegular, kFull, "patch"},
    {"change patch weekly", 1.0 / 7, kRegular, kFull, "patch"},
    {"one tablet every other day", 0.5, kRegular, kFull, "tablet"},
    {"one on alternate days", 0.5, kRegular, kFull, ""},
    {"one tablet every 3 days", 1.0 / 3, kRegular, kFull, "tablet"},
    {"every 8 hours", 3, kRegular, kFull, ""},
    {"take one at night 2 hours before bed", 1, kRegular, kFull, ""},
    // Weekly and monthly.
    {"one tablet weekly", 1.0 / 7, kRegular, kFull, "tablet"},
    {"take four tablets once a week", 4.0 / 7, kRegular, kFull, "tablet"},
    {"one every week", 1.0 / 7, kRegular, kFull, ""},
    {"one twice weekly", 2.0 / 7, kRegular, kFull, ""},
    {"apply one patch twice a week", 2.0 / 7, kRegular, kFull, "patch"},
    {"one tablet on mondays", 1.0 / 7, kRegular, kFull, "tablet"},
    {"3 tablets on monday and friday", 6.0 / 7, kRegular, kFull, "tablet"},
    {"one tablet daily except sunday", 6.0 / 7, kRegular, kFull, "tablet"},
    {"one daily except weekends", 5.0 / 7, kRegular, kFull, ""},
    {"take 7.5mg weekly", 7.5 / 7, kRegular, kFull, "mg"},
    {"one every 12 weeks", 1.0 / 84, kRegular, kFull, ""},
    {"one fortnightly", 1.0 / 14, kRegular, kFull, ""},
    {"one monthly", 1.0 / 30, kRegular, kFull, ""},
    {"one tablet once a month", 1.0 / 30, kRegular, kFull, "tablet"},
    // Amounts: fractions, words, ranges.
    {"half a tablet at night", 0.5, kRegular, kFull, "tablet"},
    {"one and a half tablets daily", 1.5, kRegular, kFull, "tablet"},
    {"1/2 tablet twice a day", 1, kRegular, kFull, "tablet"},
    {"\xC2\xBD tablet bd", 1, kRegular, kFull, "tablet"},
    {"1\xC2\xBD tablets daily", 1.5, kRegular, kFull, "tablet"},
    {"one or two tablets at night", 2, kRegular, kFull, "tablet"},
    {"1 to 2 tablets twice a day", 4, kRegular, kFull, "tablet"},
    {"take 1 tablet(s) daily", 1, kRegular, kFull, "tablet"},
    // Units.
    {"5ml tds", 15, kRegular, kFull, "ml"},
    {"10ml twice a day", 20, kRegular, kFull, "ml"},
    {"5ml - 10ml tds", 30, kRegular, kFull, "ml"},
    {"two 5ml spoonfuls three times a day", 30, kRegular, kFull, "ml"},
    {"2 x 5ml spoonfuls tds", 30, kRegular, kFull, "ml"},
    {"Take one 5ml spoonful 3 times/day", 15, kRegular, kFull, "ml"},
    {"one 5ml spoonful at night", 5, kRegular, kFull, "ml"},
    {"2 puffs bd", 4, kRegular, kFull, "puff"},
    {"two inhalations twice daily", 4, kRegular, kFull, "puff"},
    {"one dose daily", 1, kRegular, kFull, "dose"},
    {"one drop in each eye four times a day", 8, kRegular, kFull, "drop"},
    {"one drop both eyes at night", 2, kRegular, kFull, "drop"},
    {"instil 2 drops into the left ear three times a day", 6, kRegular, kFull, "drop"},
    {"one sachet twice daily", 2, kRegular, kFull, "sachet"},
    {"one application twice daily", 2, kRegular, kFull, "application"},
    {"insert one suppository at night", 1, kRegular, kFull, "suppository"},
    {"one pessary at night", 1, kRegular, kFull, "pessary"},
    {"two sprays into each nostril once daily", 4, kRegular, kFull, "spray"},
    {"10 units in the morning and 8 units at night", 18, kRegular, kFull, "unit"},
    {"500mg three times a day", 1500, kRegular, kFull, "mg"},
    {"1g four times a day", 4000, kRegular, kFull, "mg"},
    // Topicals.
    {"apply twice daily", 2, kRegular, kFull, "application"},
    {"apply thinly twice a day to the affected area(s)", 2, kRegular, kFull, "application"},
    {"apply sparingly once or twice daily", 2, kRegular, kFull, "application"},
    {"apply thinly", kNone, kRegular, kUnknown, "application"},
    // As needed.
    {"1-2 every 4-6 hours when required", 12, kPrn, kFull, ""},
    {"two tablets four times a day when required, max 8 in 24 hours", 8, kPrn, kFull, "tablet"},
    {"1-2 tablets up to four times a day when required", 8, kPrn, kFull, "tablet"},
    {"1-2 tablets when required, maximum 4 doses a day", 8, kPrn, kFull, "tablet"},
    {"one or two when needed, no more than 8 tablets in 24 hours", 8, kPrn, kFull, "tablet"},
    {"1 tablet when required max 4 times a day", 4, kPrn, kFull, "tablet"},
    {"one tablet every four to six hours when required, up to a maximum of eight tablets in "
     "twenty four hours", 8, kPrn, kFull, "tablet"},
    {"1 tab t.d.s. p.r.n.", 3, kPrn, kFull, "tablet"},
    {"qds prn", 4, kPrn, kFull, ""},
    {"1 tab prn max 3/day", 3, kPrn, kFull, "tablet"},
    {"1-2 puffs prn max qds", 8, kPrn, kFull, "puff"},
    {"one tablet at onset of migraine, may repeat after 2 hours, max 2 in 24 hours", 2, kPrn,
     kFull, "tablet"},
    {"1 nocte prn", 1, kPrn, kFull, ""},
    {"one daily if needed", 1, kPrn, kFull, ""},
    {"5-10ml four times a day as needed", 40, kPrn, kFull, "ml"},
    {"2.5ml to 5ml every four hours when required", 30, kPrn, kFull, "ml"},
    {"one capsule after each loose stool, maximum four a day", 4, kPrn, kFull, "capsule"},
    {"2 puffs as required up to 4 times a day", 8, kPrn, kFull, "puff"},
    {"one when necessary", kNone, kPrn, kUnknown, ""},
    {"one tablet when required", kNone, kPrn, kUnknown, "tablet"},
    {"one pastille as and when required", kNone, kPrn, kUnknown, "pastille"},
    {"prn", kNone, kPrn, kUnknown, ""},
    {"as directed when required", kNone, kPrn, kUnknown, ""},
    // Maxima on regular doses.
    {"two every 4 hours, max 6 in 24 hours", 6, kRegular, kFull, ""},
    // "up to" leaves the number to the patient: as needed (common practice).
    {"up to 8 tablets a day", 8, kPrn, kFull, "tablet"},
    // Changing doses: the first stage's units per day (stages: dosage_stages_test.cpp).
    {"1 tablet three times a day for 5 days then twice a day", 3, kRegular, kFull, "tablet"},
    {"1 tablet at night, increasing to 2 tablets at night", 1, kRegular, kPartial, "tablet"},
    {"one tablet daily for 7 days", 1, kRegular, kFull, "tablet"},
    {"TWO ON DAY ONE THEN ONE DAILY", 2, kRegular, kFull, ""},
    {"one capsule daily for 3 months then review", 1, kRegular, kFull, "capsule"},
    {"1 tablet daily 5/7", 1, kRegular, kFull, "tablet"},
    // No usable amount per day.
    {"as directed", kNone, kRegular, kUnknown, ""},
    {"use as directed", kNone, kRegular, kUnknown, ""},
    {"as per instructions", kNone, kRegular, kUnknown, ""},
    {"two tablets", kNone, kRegular, kUnknown, "tablet"},
    {"two tablets stat", kNone, kRegular, kUnknown, "tablet"},
    // Partly understood.
    {"one tablet twice a day xyzzy", 2, kRegular, kPartial, "tablet"},
    {"one frobble daily", 1, kRegular, kPartial, ""},
    {"Methotrexate 10mg once a week on Monday", 10.0 / 7, kRegular, kPartial, "mg"},
    {"one tablet daily \xE2\x98\xBA", 1, kRegular, kPartial, "tablet"},
    {"two tablets three times", 6, kRegular, kPartial, "tablet"},
    // Invalid and garbage input.
    {"", kNone, kRegular, kEmpty, ""},
    {"   \t ", kNone, kRegular, kEmpty, ""},
    {"12345", kNone, kRegular, kUnknown, ""},
    {"0 tablets daily", kNone, kRegular, kUnknown, "tablet"},
    {"!!!", kNone, kRegular, kUnknown, ""},
    {"99999999999999999999 daily", kNone, kRegular, kUnknown, ""},
    {"99999999999999999999am daily", kNone, kRegular, kUnknown, ""},
    {"99999999999999999999\xC2\xBD daily", kNone, kRegular, kUnknown, ""},
    {"\xE4\xB8\x80\xE6\x97\xA5\xE4\xB8\x80\xE5\x9B\x9E", kNone, kRegular, kUnknown, ""},
    {"\xFF\xFE\x01 bd", 2, kRegular, kPartial, ""},
};

}  // namespace

TEST_SUITE("dose/dosage_text") {

TEST_CASE("instructions as prescribers write them read into units per day") {
  for (const Case& c : kCases) {
    CAPTURE(c.text);
    const DosageReading reading = ReadDosageText(c.text);
    CAPTURE(reading.note);
    CHECK(reading.units_per_day.has_value() == c.units_per_day.has_value());
    if (reading.units_per_day && c.units_per_day) {
      CHECK(*reading.units_per_day == doctest::Approx(*c.units_per_day));
    }
    CHECK(reading.as_needed == c.as_needed);
    CHECK(UnderstandingName(reading.understanding) == UnderstandingName(c.understanding));
    CHECK(reading.unit == c.unit);
  }
}

TEST_CASE("the table covers at least sixty instructions") {
  CHECK(std::size(kCases) >= 60);
}

TEST_CASE("understanding names are the lower-case words used in outputs") {
  CHECK(UnderstandingName(Understanding::kEmpty) == "empty");
  CHECK(UnderstandingName(Understanding::kFull) == "full");
  CHECK(UnderstandingName(Understanding::kPartial) == "partial");
  CHECK(UnderstandingName(Understanding::kUnknown) == "unknown");
}

TEST_CASE("the note names the words that were not understood") {
  CHECK(ReadDosageText("one tablet twice a day xyzzy").note == "did not understand \"xyzzy\"");
  CHECK(ReadDosageText("as directed").note == "as directed: no amount per day is given");
  CHECK(ReadDosageText("one when required").note == "as needed with no frequency or maximum");
  CHECK(ReadDosageText("two tablets").note == "no usable dose and frequency found");
  CHECK(ReadDosageText("2 tablets daily and 1 tablet").note ==
        "a dose without a frequency was left out");
  CHECK(ReadDosageText("1 tablet three times a day for 5 days then twice a day").note ==
        "the dose changes: read in 2 stages, the first one's units per day shown");
  CHECK(ReadDosageText("1 daily then 2 daily").note ==
        "a stage has no length: its dose is taken to continue");
  CHECK(ReadDosageText("40mg daily for 5 days then reduce").note ==
        "the dose changes by a rule that is not written out; no usable dose and frequency found");
  CHECK(ReadDosageText("two tablets stat").note ==
        "a dose on one day only: no amount per day; no usable dose and frequency found");
  CHECK(ReadDosageText("take one tablet tiwce a day").note == "read \"tiwce\" as \"twice\"");
  CHECK(ReadDosageText("one zz yy xx ww vv uu daily").note ==
        "did not understand \"zz\", \"yy\", \"xx\", \"ww\", \"vv\", ...");
  CHECK(ReadDosageText("99999999999 daily").note ==
        "did not understand \"99999999999\"; an amount too large to be a dose; "
        "no usable dose and frequency found");
}

TEST_CASE("the note never carries invalid UTF-8 from the text") {
  const DosageReading reading = ReadDosageText("\xFF\xFE\x01 bd");
  CHECK(reading.note == "did not understand \"??\"");
  // Overlong forms and UTF-16 surrogates are not UTF-8 (RFC 3629); good text is kept.
  CHECK(ReadDosageText("\xC0\xAF bd").note == "did not understand \"??\"");
  CHECK(ReadDosageText("\xED\xA0\x80 bd").note == "did not understand \"???\"");
  CHECK(ReadDosageText("caf\xC3\xA9 bd").note == "did not understand \"caf\xC3\xA9\"");
}

TEST_CASE("very long text is read up to the cap quickly and says so") {
  std::string text;
  while (text.size() < 100000) text += "one tablet daily and ";
  const auto start = std::chrono::steady_clock::now();
  const DosageReading reading = ReadDosageText(text);
  const auto elapsed = std::chrono::steady_clock::now() - start;
  CHECK(elapsed < std::chrono::milliseconds(200));
  CHECK(reading.understanding == Understanding::kPartial);
  CHECK(reading.note.find("the rest was ignored") != std::string::npos);

  const std::string digits(5000, '7');
  CHECK(ReadDosageText(digits).understanding == Understanding::kUnknown);
  std::string hyphens(5000, '-');
  CHECK_NOTHROW(ReadDosageText(hyphens));
  std::string halves;
  for (int k = 0; k < 2000; ++k) halves += "\xC2\xBD";
  CHECK_NOTHROW(ReadDosageText(halves));
}

TEST_CASE("a cut in the middle of a UTF-8 sequence at the cap is not split") {
  std::string text(999, 'a');
  text += "\xE2\x98\xBA";  // a three-byte character across the 1000-byte cap
  const DosageReading reading = ReadDosageText(text);
  CHECK(reading.understanding == Understanding::kUnknown);
  CHECK(reading.note.find("\xE2\x98") == std::string::npos);
}

TEST_CASE("a reading that counts the upper value of a range says so") {
  // Product specification section 5: a dose range uses its upper value; the reading
  // marks it so that the Drug Burden Index can say the dose may be less (common practice).
  struct Case {
    const char* text;
    double units_per_day;
    bool range_upper;
  };
  const Case cases[] = {
      {"1-2 tablets at night", 2, true},
      {"one or two tablets twice a day", 4, true},
      {"1 to 2 tablets three times a day", 6, true},
      {"one tablet once or twice daily", 2, true},
      {"one tablet 2-3 times a day", 3, true},
      {"2.5ml to 5ml three times a day", 15, true},
      {"one tablet twice a day", 2, false},
      {"2 tablets at night", 2, false},
      {"one up to four times a day when required", 4, false},
      {"1-2 tablets up to four times a day when required", 8, true},
      {"1-2 tablets when required, max 6 a day", 6, false},
      {"2 tablets 2-3 times a day, max 4 tablets a day", 4, false},
      {"1-2 daily for 7 days then 1 daily", 2, true},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const DosageReading reading = ReadDosageText(c.text);
    REQUIRE(reading.units_per_day.has_value());
    CHECK(*reading.units_per_day == doctest::Approx(c.units_per_day));
    CHECK(reading.range_upper == c.range_upper);
  }
  CHECK_FALSE(ReadDosageText("1-2 tablets as directed").range_upper);
}

}  // TEST_SUITE

}  // namespace medload
