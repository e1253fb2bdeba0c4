// One table per class of instruction that dosage-text readers commonly get wrong:
// intervals, maxima, strengths in the text, abbreviations, meals and bedtime, negatives,
// misspellings, the as-needed flag, and text whose amount per day cannot be known.
#include <doctest/doctest.h>

#include <optional>
#include <string>

#include "medload/dose/dosage_text.h"

namespace medload {
namespace {

struct Case {
  const char* text;
  std::optional<double> units_per_day;  // empty: cannot be known
  bool as_needed;
};

constexpr bool kPrn = true;
constexpr bool kRegular = false;
const std::optional<double> kUnknown = std::nullopt;

void CheckAll(const Case* begin, const Case* end) {
  for (const Case* c = begin; c != end; ++c) {
    CAPTURE(c->text);
    const DosageReading reading = ReadDosageText(c->text);
    CAPTURE(reading.note);
    CHECK(reading.units_per_day.has_value() == c->units_per_day.has_value());
    if (reading.units_per_day && c->units_per_day) {
      CHECK(*reading.units_per_day == doctest::Approx(*c->units_per_day));
    }
    CHECK(reading.as_needed == c->as_needed);
  }
}

template <size_t N>
void CheckAll(const Case (&cases)[N]) {
  CheckAll(cases, cases + N);
}

}  // namespace

TEST_SUITE("dose/dosage_classes") {

TEST_CASE("interval phrases count administrations from the shortest interval") {
  // Common practice: "N-hourly" and "qNh" mean every N hours (24/N a day); a range of
  // intervals gives its maximum at the shorter one; alternate days are one every 2 days.
  const Case cases[] = {
      {"2 tablets 6-hourly", 8, kRegular},
      {"2 tablets 6 hourly", 8, kRegular},
      {"one 8-hrly", 3, kRegular},
      {"1 tab po q6h", 4, kRegular},
      {"1 cap q 8 h", 3, kRegular},
      {"one every 4 to 6 hours", 6, kRegular},
      {"1-2 4-6 hourly prn", 12, kPrn},
      {"2 puffs q4-6h prn", 12, kPrn},
      {"one tablet every other day", 0.5, kRegular},
      {"one alt die", 0.5, kRegular},
      {"one tablet alternate mornings", 0.5, kRegular},
      {"one every other night", 0.5, kRegular},
      {"1 tab qod", 0.5, kRegular},
      {"one eod", 0.5, kRegular},
      {"apply one patch every 72 hours", 1.0 / 3, kRegular},
      {"1 od x 28/7", 1, kRegular},  // x 28/7: for 28 days, not 28 times
  };
  CheckAll(cases);
}

TEST_CASE("a stated maximum caps the count and each of several maxima limits it") {
  // docs/dosage-text.md (As needed): as needed with a maximum uses the maximum; a range
  // uses its upper value. The lowest of several limits wins.
  const Case cases[] = {
      {"two tablets up to four times a day, max 8 in 24 hours", 8, kPrn},
      {"2 tablets up to 4 times a day, maximum 6 tablets in 24 hours", 6, kPrn},
      {"1-2 tablets every 4 hours when required, max 8 in 24 hours", 8, kPrn},
      {"two every 4 hours, max 6 in 24 hours", 6, kRegular},
      {"1 tab 6 hourly prn, max 4 doses in 24 hours", 4, kPrn},
      {"1-2 puffs up to 4 times a day, not more than 8 puffs in 24 hours", 8, kPrn},
      {"1-2 tablets up to four times a day when required", 8, kPrn},
  };
  CheckAll(cases);
}

TEST_CASE("a strength written in the text is read and left out of the dose") {
  // Common practice: labels and prescriptions repeat the strength beside the dose; the
  // dose is the count of tablets, capsules or ml.
  const Case cases[] = {
      {"take 1 tablet (500mg) three times a day", 3, kRegular},
      {"Paracetamol 500mg - 2 tabs qds", 8, kRegular},
      {"one tablet (40mg) once daily", 1, kRegular},
      {"Take ONE (40mg) tablet daily", 1, kRegular},
      {"take 2 x 500mg tablets four times a day", 8, kRegular},
      {"metformin 500mg tablets: 1 tds with meals", 3, kRegular},
      {"amlodipine 5mg one daily", 1, kRegular},
      {"Oramorph 10mg/5ml: 5ml four hourly when required", 30, kPrn},
      {"take one 500mg tablet twice daily", 2, kRegular},
      // The dose said again in brackets counts once.
      {"10mg (1 tablet) daily", 10, kRegular},
      // A mass alone is the dose.
      {"take 500mg three times a day", 1500, kRegular},
      {"Methotrexate 10mg once a week on Monday", 10.0 / 7, kRegular},
      {"500mg 3 times a day", 1500, kRegular},
  };
  CheckAll(cases);
}

TEST_CASE("Latin and US abbreviations read as pharmacists read them") {
  // Common practice: i, ii, iii (Roman numerals) before a unit; po by mouth; ac before
  // meals; pc after meals; hs at bedtime; ou both eyes; au both ears; gtt drops; alt die
  // alternate days; "1 x bd" one twice a day.
  const Case cases[] = {
      {"ii tabs po bid", 4, kRegular},
      {"i tab tid", 3, kRegular},
      {"i po qid", 4, kRegular},
      {"iii tabs nocte", 3, kRegular},
      {"1 tab ac & hs", 4, kRegular},
      {"1 cap pc", 3, kRegular},
      {"1 drop ou bid", 4, kRegular},
      {"2 gtts au tid", 12, kRegular},
      {"1 gtt os qhs", 1, kRegular},
      {"1 x bd", 2, kRegular},
      {"2 x tds", 6, kRegular},
      {"1 tab po q am", 1, kRegular},
      {"1 tab q hs", 1, kRegular},
      {"sig: 1 po bid", 2, kRegular},
  };
  CheckAll(cases);
}

TEST_CASE("meals and bedtime named together add up") {
  // Common practice: three main meals a day; a bedtime dose named with them is a fourth.
  const Case cases[] = {
      {"one tablet after meals and at bedtime", 4, kRegular},
      {"one with meals and at night", 4, kRegular},
      {"one tablet with meals", 3, kRegular},
      {"one before breakfast and evening meal", 2, kRegular},
      {"one three times a day with meals", 3, kRegular},
  };
  CheckAll(cases);
}

TEST_CASE("negatives and removals add no dose") {
  // Common practice: "not at night", "do not take with milk", "remove at night" say when
  // not to take a dose or how to stop one.
  const Case cases[] = {
      {"one tablet four times a day (not at night)", 4, kRegular},
      {"take one tablet twice a day - do not take at night", 2, kRegular},
      {"one tablet daily do not take with milk", 1, kRegular},
      {"apply one patch in the morning and remove at night", 1, kRegular},
      {"one tablet at night, avoid at lunchtime", 1, kRegular},
      {"do not exceed 8 tablets in 24 hours", 8, kRegular},
      {"one daily except on sundays", 6.0 / 7, kRegular},
  };
  CheckAll(cases);
}

TEST_CASE("common misspellings read as the word meant and the reading says so") {
  struct Typo {
    const char* text;
    double units_per_day;
    const char* note;
  };
  // Common practice: swapped, missing or doubled letters in everyday dosage words.
  const Typo cases[] = {
      {"take one tablet tiwce a day", 2, "read \"tiwce\" as \"twice\""},
      {"one tablet twcie daily", 2, "read \"twcie\" as \"twice\""},
      {"one tablet dialy", 1, "read \"dialy\" as \"daily\""},
      {"take one tablest three times a day", 3, "read \"tablest\" as \"tablets\""},
      {"one capsuel at nigth", 1, "read \"capsuel\" as \"capsule\"; read \"nigth\" as \"night\""},
      {"one tablet in the morining", 1, "read \"morining\" as \"morning\""},
  };
  for (const Typo& c : cases) {
    CAPTURE(c.text);
    const DosageReading reading = ReadDosageText(c.text);
    REQUIRE(reading.units_per_day);
    CHECK(*reading.units_per_day == doctest::Approx(c.units_per_day));
    CHECK(reading.understanding == Understanding::kPartial);
    CHECK(reading.note == c.note);
  }
  // A changed letter in a short word is not corrected: "might" must not become "night".
  const DosageReading might = ReadDosageText("one at lunchtime, might cause drowsiness");
  CHECK(*might.units_per_day == 1);
  CHECK(might.note.find("as \"night\"") == std::string::npos);
}

TEST_CASE("the as-needed flag follows the words that say so") {
  // docs/dosage-text.md (As needed); common practice: "up to" leaves the number of doses
  // to the patient; a maximum alone ("max 8") limits a regular dose.
  const Case cases[] = {
      {"one or two tablets up to four times a day when required", 8, kPrn},
      {"1 tablet up to twice a day", 2, kPrn},
      {"up to 2 tablets four times a day", 8, kPrn},
      {"2 qds prn", 8, kPrn},
      {"1 nocte if required", 1, kPrn},
      {"one tablet when required", kUnknown, kPrn},
      {"two tablets four times a day, maximum 8 in 24 hours", 8, kRegular},
      {"one tablet three times a day", 3, kRegular},
  };
  CheckAll(cases);
}

TEST_CASE("text whose amount per day cannot be known reads as unknown, never a guess") {
  // Common practice: "as directed" (mdu, ut dict), dosing by a blood test or a sliding
  // scale, a single dose and a taper by a rule leave the daily amount to another record.
  const Case cases[] = {
      {"as directed", kUnknown, kRegular},
      {"mdu", kUnknown, kRegular},
      {"m.d.u.", kUnknown, kRegular},
      {"ut dict", kUnknown, kRegular},
      {"as per INR", kUnknown, kRegular},
      {"inject as per sliding scale", kUnknown, kRegular},
      {"two tablets stat", kUnknown, kRegular},
      {"apply thinly", kUnknown, kRegular},
      {"40mg daily for 5 days, then reduce", kUnknown, kRegular},
      {"wean off over 4 weeks", kUnknown, kRegular},
      {"when required", kUnknown, kPrn},
  };
  CheckAll(cases);
}

}  // TEST_SUITE

}  // namespace medload
