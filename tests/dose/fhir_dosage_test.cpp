#include "medload/dose/fhir_dosage.h"

#include <doctest/doctest.h>

#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

using nlohmann::json;

// A Dosage with doseQuantity and timing.repeat; element names from HL7 FHIR R4,
// datatypes: Dosage (doseAndRate.doseQuantity) and Timing.repeat.
json Dosage(double value, const char* unit, int frequency, double period,
            const char* period_unit) {
  json dosage = json::parse(R"({"doseAndRate": [{"doseQuantity": {}}], "timing": {"repeat": {}}})");
  dosage["doseAndRate"][0]["doseQuantity"] = {{"value", value}, {"unit", unit}};
  dosage["timing"]["repeat"] = {
      {"frequency", frequency}, {"period", period}, {"periodUnit", period_unit}};
  return dosage;
}

}  // namespace

TEST_SUITE("dose/fhir_dosage") {

TEST_CASE("a dose quantity times the frequency per period gives units per day") {
  // Source: HL7 FHIR R4 Timing.repeat: frequency events per period of periodUnit.
  const DosageReading reading = ReadFhirDosage(Dosage(2, "tablet", 3, 1, "d"));
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(6));
  CHECK(reading.unit == "tablet");
  CHECK(reading.understanding == Understanding::kFull);
  CHECK_FALSE(reading.as_needed);
  CHECK(reading.note.empty());
}

TEST_CASE("the worked oral solution example reads as 15 mL a day") {
  // Source: QI-Core MedicationDispense days-supply example (references.md): 5 mL three
  // times a day; 450 mL then lasts 30 days (see supply_test.cpp).
  const DosageReading reading = ReadFhirDosage(Dosage(5, "mL", 3, 1, "d"));
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(15));
  CHECK(reading.unit == "ml");
}

TEST_CASE("every period unit of Timing.repeat converts to days") {
  // Source: HL7 FHIR R4 Timing.repeat.periodUnit value set: s | min | h | d | wk | mo | a.
  // A month is read as 30 days and a year as 365 (the project's choice, as for text).
  struct Case {
    const char* unit;
    double period;
    double per_day;
  };
  const Case cases[] = {{"s", 86400, 1},    {"min", 1440, 1},    {"h", 4, 6},
                        {"d", 2, 0.5},      {"wk", 1, 1.0 / 7},  {"mo", 1, 1.0 / 30},
                        {"a", 1, 1.0 / 365}};
  for (const Case& c : cases) {
    CAPTURE(c.unit);
    const DosageReading reading = ReadFhirDosage(Dosage(1, "tablet", 1, c.period, c.unit));
    REQUIRE(reading.units_per_day);
    CHECK(*reading.units_per_day == doctest::Approx(c.per_day));
  }
}

TEST_CASE("frequencyMax and a dose range use the upper values and period the shorter") {
  // Source: HL7 FHIR R4 Timing.repeat.frequencyMax / periodMax ("every 4 to 6 hours" is
  // period 4, periodMax 6) and Dosage.doseAndRate.doseRange.
  const json dosage = json::parse(R"({
    "doseAndRate": [{"doseRange": {"low": {"value": 1, "unit": "tablet"},
                                   "high": {"value": 2, "unit": "tablet"}}}],
    "timing": {"repeat": {"frequency": 1, "frequencyMax": 2, "period": 4, "periodMax": 6,
                          "periodUnit": "h"}}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(2 * 2 * 6));
}

TEST_CASE("as needed with maxDosePerPeriod uses the maximum per day") {
  // Source: HL7 FHIR R4 Dosage.asNeeded[x] and Dosage.maxDosePerPeriod (a Ratio).
  json dosage = Dosage(2, "tablet", 4, 1, "d");
  dosage["asNeededBoolean"] = true;
  dosage["maxDosePerPeriod"] = json::parse(R"({
    "numerator": {"value": 6, "unit": "tablet"},
    "denominator": {"value": 24, "unit": "h", "code": "h"}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  CHECK(reading.as_needed);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(6));
}

TEST_CASE("as needed by a codeable concept without a maximum uses the frequency") {
  json dosage = Dosage(1, "tablet", 3, 1, "d");
  dosage["asNeededCodeableConcept"] = {{"text", "pain"}};
  const DosageReading reading = ReadFhirDosage(dosage);
  CHECK(reading.as_needed);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(3));
}

TEST_CASE("a regular dose above its maxDosePerPeriod is limited to the maximum") {
  json dosage = Dosage(3, "tablet", 4, 1, "d");
  dosage["maxDosePerPeriod"] =
      json::parse(R"({"numerator": {"value": 8}, "denominator": {"value": 1, "code": "d"}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(8));
}

TEST_CASE("a maximum in another unit than the dose is not used") {
  json dosage = Dosage(2, "tablet", 4, 1, "d");
  dosage["asNeededBoolean"] = true;
  dosage["maxDosePerPeriod"] = json::parse(R"({"numerator": {"value": 4, "unit": "g"}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(8));
  CHECK(reading.note == "maxDosePerPeriod is in mg, the dose in tablet");
}

TEST_CASE("repeat.when codes count administrations when there is no frequency") {
  // Source: HL7 FHIR R4 EventTiming: MORN, NIGHT; C = at a meal (three a day).
  json dosage = json::parse(R"({"doseAndRate": [{"doseQuantity": {"value": 1}}],
                                "timing": {"repeat": {"when": ["MORN", "NIGHT"]}}})");
  REQUIRE(ReadFhirDosage(dosage).units_per_day);
  CHECK(*ReadFhirDosage(dosage).units_per_day == doctest::Approx(2));
  dosage["timing"]["repeat"]["when"] = json::array({"C"});
  CHECK(*ReadFhirDosage(dosage).units_per_day == doctest::Approx(3));
  dosage["timing"]["repeat"] =
      json::parse(R"({"timeOfDay": ["08:00:00", "14:00:00", "20:00:00"]})");
  CHECK(*ReadFhirDosage(dosage).units_per_day == doctest::Approx(3));
}

TEST_CASE("a timing code such as BID gives the frequency") {
  // Source: HL7 FHIR R4 TimingAbbreviation value set (BID, TID, QID, Q4H, ...).
  const json dosage = json::parse(R"({
    "doseAndRate": [{"doseQuantity": {"value": 2, "unit": "puff"}}],
    "timing": {"code": {"coding": [{"code": "BID"}]}}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(4));
  CHECK(reading.unit == "puff");
}

TEST_CASE("without a structured dose the text is read instead") {
  const json dosage = json::parse(R"({
    "text": "one tablet three times a day",
    "timing": {"repeat": {"frequency": 3, "period": 1, "periodUnit": "d"}}})");
  const DosageReading reading = ReadFhirDosage(dosage);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(3));
  CHECK(reading.note == "no structured dose and frequency: read from the text");
}

TEST_CASE("structured as-needed survives a fallback to text without an as-needed phrase") {
  const json dosage =
      json::parse(R"({"text": "1-2 tablets every 4 hours", "asNeededBoolean": true})");
  const DosageReading reading = ReadFhirDosage(dosage);
  CHECK(reading.as_needed);
  REQUIRE(reading.units_per_day);
  CHECK(*reading.units_per_day == doctest::Approx(12));
}

TEST_CASE("a frequency without a dose gives administrations a day when the text gives nothing") {
  // Source: HL7 FHIR R4 Dosage.timing (Timing.code BID; Timing.repeat) with no
  // Dosage.doseAndRate: how much each time is left to the supply calculation.
  struct Case {
    const char* dosage;
    double per_day;
  };
  const Case cases[] = {
      {R"({"timing": {"code": {"coding": [{"code": "BID"}]}}})", 2},
      {R"({"timing": {"repeat": {"frequency": 1, "period": 8, "periodUnit": "h"}}})", 3},
      {R"({"timing": {"repeat": {"when": ["MORN", "HS"]}}, "text": "as directed"})", 2},
      {R"({"asNeededBoolean": true, "timing": {"repeat": {"frequency": 4, "period": 1, "periodUnit": "d"}}})", 4},
  };
  for (const Case& c : cases) {
    CAPTURE(c.dosage);
    const DosageReading reading = ReadFhirDosage(json::parse(c.dosage));
    REQUIRE(reading.units_per_day);
    CHECK(*reading.units_per_day == doctest::Approx(c.per_day));
    CHECK(reading.unit == kAdministrationUnit);
    CHECK(reading.understanding == Understanding::kPartial);
  }
  // A text that gives a dose wins over the bare frequency.
  const DosageReading text = ReadFhirDosage(
      json::parse(R"({"text": "two tablets twice a day", "timing": {"code": {"coding": [{"code": "BID"}]}}})"));
  REQUIRE(text.units_per_day);
  CHECK(*text.units_per_day == doctest::Approx(4));
  CHECK(text.unit == "tablet");
}

TEST_CASE("a dose unit that is not known stays as written, never taken for the quantity's") {
  const DosageReading reading = ReadFhirDosage(Dosage(2, "mmol", 1, 1, "d"));
  REQUIRE(reading.units_per_day);
  CHECK(reading.unit == "mmol");
  CHECK(reading.note == "/doseAndRate/0/doseQuantity/unit \"mmol\" is not a known dose unit");
}

TEST_CASE("values of the wrong type are named by pointer and never throw") {
  const json dosage = json::parse(R"({
    "doseAndRate": [{"doseQuantity": {"value": "two"}}],
    "timing": {"repeat": {"frequency": 2, "period": 1, "periodUnit": "fortnight"}}})");
  DosageReading reading;
  CHECK_NOTHROW(reading = ReadFhirDosage(dosage));
  CHECK_FALSE(reading.units_per_day);
  CHECK(reading.understanding == Understanding::kUnknown);
  CHECK(reading.note ==
        "/doseAndRate/0/doseQuantity/value is not a positive number; "
        "/timing/repeat/periodUnit \"fortnight\" is not s|min|h|d|wk|mo|a; "
        "no structured dose and frequency and no text");
}

TEST_CASE("odd JSON values give an empty or unknown reading") {
  CHECK(ReadFhirDosage(json::object()).understanding == Understanding::kEmpty);
  CHECK(ReadFhirDosage(json::array()).understanding == Understanding::kUnknown);
  CHECK(ReadFhirDosage(json(42)).note == "the Dosage is not a JSON object");
  CHECK_NOTHROW(ReadFhirDosage(
      json::parse(R"({"doseAndRate": 7, "timing": "daily", "maxDosePerPeriod": []})")));
  CHECK_NOTHROW(ReadFhirDosage(json::parse(R"({"doseAndRate": [null]})")));
  CHECK_NOTHROW(ReadFhirDosage(json::parse(R"({"doseAndRate": [{"doseRange": 3}]})")));
  CHECK_NOTHROW(ReadFhirDosage(json::parse(R"({"timing": {"repeat": [], "code": 1}})")));
  CHECK_NOTHROW(ReadFhirDosage(json::parse(R"({"maxDosePerPeriod": {"numerator": 5}})")));
}

TEST_CASE("concurrent Dosage elements add up and sequential ones are stages in order") {
  // Source: HL7 FHIR R4 Dosage.sequence: the same sequence number means concurrent.
  json morning = Dosage(2, "tablet", 1, 1, "d");
  json night = Dosage(1, "tablet", 1, 1, "d");
  const DosageReading concurrent = ReadFhirDosageList(json::array({morning, night}));
  REQUIRE(concurrent.units_per_day);
  CHECK(*concurrent.units_per_day == doctest::Approx(3));

  morning["sequence"] = 1;
  night["sequence"] = 2;
  const DosageReading sequential = ReadFhirDosageList(json::array({night, morning}));
  REQUIRE(sequential.units_per_day);
  CHECK(*sequential.units_per_day == doctest::Approx(2));  // sequence 1 comes first
  CHECK(sequential.stages.empty());
  CHECK(sequential.note == "a sequence has no boundsDuration: its dose is taken to continue");
  CHECK(ReadFhirDosageList(json::array()).understanding == Understanding::kEmpty);
  CHECK(ReadFhirDosageList(json("text")).understanding == Understanding::kEmpty);
}

TEST_CASE("sequences with a bounds duration are the stages of a taper, never its highest") {
  // Source: HL7 FHIR R4 Timing.repeat.boundsDuration: how long the sequence lasts.
  json first = Dosage(3, "tablet", 1, 1, "d");
  json second = Dosage(2, "tablet", 1, 1, "d");
  json third = Dosage(1, "tablet", 1, 1, "d");
  first["sequence"] = 1;
  second["sequence"] = 2;
  third["sequence"] = 3;
  first["timing"]["repeat"]["boundsDuration"] = {{"value", 1}, {"unit", "week"}, {"code", "wk"}};
  second["timing"]["repeat"]["boundsDuration"] = {{"value", 7}, {"code", "d"}};
  const DosageReading taper = ReadFhirDosageList(json::array({third, second, first}));
  REQUIRE(taper.units_per_day);
  CHECK(*taper.units_per_day == doctest::Approx(3));
  REQUIRE(taper.stages.size() == 3);
  CHECK(taper.stages[0].days == 7);
  CHECK(taper.stages[1].days == 7);
  CHECK_FALSE(taper.stages[2].days);
  CHECK(UnitsPerDayOnDay(taper, 7) == doctest::Approx(2));
  CHECK(UnitsPerDayOnDay(taper, 14) == doctest::Approx(1));
  CHECK(taper.note == "the dose changes: read in 3 stages, the first one's units per day shown");
}

TEST_CASE("a dose and frequency too large for a finite daily amount give no units per day") {
  // Found by the dosage_text fuzz target: 1e308 doses twice every 1e-300 seconds came out
  // as an infinite amount per day.
  const DosageReading reading = ReadFhirDosage(Dosage(1e308, "tablet", 2, 1e-300, "s"));
  CHECK_FALSE(reading.units_per_day);
  CHECK(reading.understanding == Understanding::kUnknown);
  CHECK(reading.note.find("no finite amount per day") != std::string::npos);
}

TEST_CASE("concurrent parts adding up past the largest number give no units per day") {
  const json list = json::array({Dosage(1e308, "tablet", 1, 1, "d"), Dosage(1e308, "tablet", 1, 1, "d")});
  const DosageReading reading = ReadFhirDosageList(list);
  CHECK_FALSE(reading.units_per_day);
  CHECK(reading.understanding == Understanding::kUnknown);
}

}  // TEST_SUITE

}  // namespace medload
