#include "medload/input/csv_records.h"

#include <doctest/doctest.h>

#include <sstream>

#include "store/temp_folder.h"

namespace medload {
namespace {

const char* const kDispensingHeader =
    "record_id,patient_id,practice,dispensed_on,product,code,code_system,quantity,unit,"
    "days_supply,dosage";

// Reads a header line and one data line, and checks the data line as `kind`.
struct Parsed {
  std::optional<RowFault> fault;
  DispensingRecord dispensing;
  PatientRecord patient;
  PracticeRecord practice;
  ReviewRecord review;
};

Parsed ParseOne(InputKind kind, const std::string& header, const std::string& line,
                DateOrder order = DateOrder::kIso) {
  std::istringstream in(header + "\n" + line + "\n");
  CsvReader reader(in);
  CsvRow row;
  REQUIRE(reader.Next(row));
  Result<HeaderLayout> layout = HeaderLayout::Find(kind, row, {}, "dispensing.csv");
  REQUIRE(layout.ok());
  REQUIRE(reader.Next(row));
  const RowContext context{"dispensing.csv", order};
  Parsed parsed;
  switch (kind) {
    case InputKind::kDispensing: parsed.fault = ParseDispensingRow(row, *layout, context, parsed.dispensing); break;
    case InputKind::kPatients: parsed.fault = ParsePatientRow(row, *layout, context, parsed.patient); break;
    case InputKind::kPractices: parsed.fault = ParsePracticeRow(row, *layout, context, parsed.practice); break;
    case InputKind::kReviews: parsed.fault = ParseReviewRow(row, *layout, context, parsed.review); break;
  }
  return parsed;
}

Status HeaderStatus(InputKind kind, const std::string& header, const ColumnMap& map = {}) {
  std::istringstream in(header + "\n");
  CsvReader reader(in);
  CsvRow row;
  REQUIRE(reader.Next(row));
  Result<HeaderLayout> layout = HeaderLayout::Find(kind, row, map, "dispensing.csv");
  return layout.ok() ? Status::Ok() : layout.status();
}

}  // namespace

TEST_SUITE("input/csv_records") {

TEST_CASE("a valid dispensing row fills every field, trimmed") {
  const Parsed parsed = ParseOne(InputKind::kDispensing, kDispensingHeader,
                                 "R1, P001 ,A81001,2024-03-01,\"Co-codamol 30mg/500mg tablets\",321,"
                                 "dm+d,100,tablet,25,\"2 tablets four times a day, when required\"");
  REQUIRE_FALSE(parsed.fault.has_value());
  const DispensingRecord& r = parsed.dispensing;
  CHECK(r.record_id == "R1");
  CHECK(r.patient_id == "P001");
  CHECK(r.practice == "A81001");
  CHECK(r.dispensed_on.ToIso() == "2024-03-01");
  CHECK(r.product == "Co-codamol 30mg/500mg tablets");
  CHECK(r.code == "321");
  CHECK(r.code_system == "dm+d");
  CHECK(r.quantity == 100);
  CHECK(r.unit == "tablet");
  CHECK(r.days_supply == 25);
  CHECK(r.dosage == "2 tablets four times a day, when required");
  CHECK(r.status.empty());
}

TEST_CASE("each fault of a dispensing row has its reason and exact message") {
  struct Case {
    const char* line;
    const char* reason;
    const char* message;
  };
  const Case cases[] = {
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,abc,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"abc\" is not a number"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,0,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"0\" is not above zero"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,-28,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"-28\" is not above zero"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,\"2,5\",,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"2,5\" is not a number"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,nan,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"nan\" is not a number"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,1e308,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"1e308\" is above 1000000, the largest plausible quantity (check the unit)"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,1000001,,,", "bad_quantity",
       "dispensing.csv:2: quantity: \"1000001\" is above 1000000, the largest plausible quantity (check the unit)"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,3651,", "bad_days_supply",
       "dispensing.csv:2: days_supply: \"3651\" is above 3650 days (ten years)"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,,,,", "missing_quantity",
       "dispensing.csv:2: quantity: is empty"},
      {"R1,P1,A1,2024-02-30,Amlodipine 5mg tablets,,,28,,,", "bad_date",
       "dispensing.csv:2: dispensed_on: \"2024-02-30\" is not a real date (expected YYYY-MM-DD)"},
      {"R1,P1,A1,01/03/2024,Amlodipine 5mg tablets,,,28,,,", "bad_date",
       "dispensing.csv:2: dispensed_on: \"01/03/2024\" is not a real date (expected YYYY-MM-DD); it reads as a "
       "day-first or a month-first date: use --date-format dmy (DD/MM/YYYY) or mdy (MM/DD/YYYY)"},
      {"R1,P1,A1,31/03/2024,Amlodipine 5mg tablets,,,28,,,", "bad_date",
       "dispensing.csv:2: dispensed_on: \"31/03/2024\" is not a real date (expected YYYY-MM-DD); it reads as a "
       "day-first date: use --date-format dmy"},
      {"R1,P1,A1,2024-13-01,Amlodipine 5mg tablets,,,28,,,", "bad_date",
       "dispensing.csv:2: dispensed_on: \"2024-13-01\" is not a real date (expected YYYY-MM-DD)"},
      {"R1,P1,A1,,Amlodipine 5mg tablets,,,28,,,", "missing_date",
       "dispensing.csv:2: dispensed_on: is empty"},
      {"R1, ,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,,", "missing_patient",
       "dispensing.csv:2: patient_id: is empty"},
      {"R1,P1,A1,2024-03-01,,,,28,,,", "missing_product",
       "dispensing.csv:2: product: product and code are both empty"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,7.5,", "bad_days_supply",
       "dispensing.csv:2: days_supply: \"7.5\" is not a whole number of days"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,0,", "bad_days_supply",
       "dispensing.csv:2: days_supply: \"0\" is not above zero"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,x,", "bad_days_supply",
       "dispensing.csv:2: days_supply: \"x\" is not a whole number of days"},
      {"R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28", "field_count",
       "dispensing.csv:2: row: has 8 fields, the header has 11"},
      {"R1,P1,A1,2024-03-01,Amlodipine\xFF,,,28,,,", "invalid_utf8",
       "dispensing.csv:2: row: is not valid UTF-8 (save the file as UTF-8)"},
      {"R1,P1,A1,2024-03-01,\"Amlodipine,,,28,,,", "unclosed_quote",
       "dispensing.csv:2: row: a quoted field opened on this line never closes into a valid row; only this "
       "line is rejected, the next line is read as a new row"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.line);
    const Parsed parsed = ParseOne(InputKind::kDispensing, kDispensingHeader, c.line);
    REQUIRE(parsed.fault.has_value());
    CHECK(parsed.fault->reason == c.reason);
    CHECK(parsed.fault->message == c.message);
  }
}

TEST_CASE("over-long fields and records are rejected as too long") {
  const std::string line = "R1,P1,A1,2024-03-01," + std::string(70000, 'x') + ",,,28,,,";
  const Parsed parsed = ParseOne(InputKind::kDispensing, kDispensingHeader, line);
  REQUIRE(parsed.fault.has_value());
  CHECK(parsed.fault->reason == "too_long");
  CHECK(parsed.fault->message == "dispensing.csv:2: row: a field is longer than 64 KiB");
}

TEST_CASE("records over the reader's bounds have their own messages") {
  const auto fault_of = [](const std::string& text, CsvLimits limits) {
    std::istringstream in(std::string(kDispensingHeader) + "\n" + text + "\n");
    CsvReader reader(in, limits);
    CsvRow row;
    REQUIRE(reader.Next(row));
    Result<HeaderLayout> layout = HeaderLayout::Find(InputKind::kDispensing, row, {}, "d.csv");
    REQUIRE(layout.ok());
    REQUIRE(reader.Next(row));
    DispensingRecord record;
    std::optional<RowFault> fault = ParseDispensingRow(row, *layout, {"d.csv", DateOrder::kIso}, record);
    REQUIRE(fault.has_value());
    return *fault;
  };
  CsvLimits small_record;
  small_record.max_record_bytes = 120;  // the header fits, the row does not
  const RowFault long_record =
      fault_of("R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,," + std::string(100, 'x'), small_record);
  CHECK(long_record.reason == "too_long");
  CHECK(long_record.message == "d.csv:2: row: the record is longer than 1 MiB");
  CsvLimits few_fields;
  few_fields.max_fields = 11;
  const RowFault many = fault_of("R1,P1,A1,2024-03-01,Amlodipine 5mg tablets,,,28,,,,extra", few_fields);
  CHECK(many.reason == "field_count");
  CHECK(many.message == "d.csv:2: row: has too many fields, the header has 11");
}

TEST_CASE("quantities are read without the locale and days supply may be written 28.0") {
  const Parsed parsed = ParseOne(InputKind::kDispensing, kDispensingHeader,
                                 "R1,P1,A1,2024-03-01,Lactulose 3.35g/5ml oral solution,,,"
                                 "300.5,ml,28.0,");
  REQUIRE_FALSE(parsed.fault.has_value());
  CHECK(parsed.dispensing.quantity == doctest::Approx(300.5));
  CHECK(parsed.dispensing.days_supply == 28);
}

TEST_CASE("a code alone is enough to name the product") {
  const Parsed parsed = ParseOne(InputKind::kDispensing, kDispensingHeader,
                                 "R1,P1,A1,2024-03-01,,C09AA05,ATC,28,,,");
  REQUIRE_FALSE(parsed.fault.has_value());
  CHECK(parsed.dispensing.code == "C09AA05");
}

TEST_CASE("dates follow --date-format") {
  const char* header = "patient_id,dispensed_on,product,quantity";
  Parsed dmy = ParseOne(InputKind::kDispensing, header, "P1,05/01/2024,X,1", DateOrder::kDmy);
  REQUIRE_FALSE(dmy.fault.has_value());
  CHECK(dmy.dispensing.dispensed_on.ToIso() == "2024-01-05");
  Parsed mdy = ParseOne(InputKind::kDispensing, header, "P1,05/01/2024,X,1", DateOrder::kMdy);
  CHECK(mdy.dispensing.dispensed_on.ToIso() == "2024-05-01");
  Parsed bad = ParseOne(InputKind::kDispensing, header, "P1,13/13/2024,X,1", DateOrder::kDmy);
  REQUIRE(bad.fault.has_value());
  CHECK(bad.fault->message ==
        "dispensing.csv:2: dispensed_on: \"13/13/2024\" is not a real date (expected DD/MM/YYYY)");
}

TEST_CASE("headers match in any order and case, and extra columns are ignored") {
  const Parsed parsed = ParseOne(InputKind::kDispensing, " Quantity ,EXTRA,Dispensed On,Patient-ID,product",
                                 "28,whatever,2024-03-01,P9,Sertraline 50mg tablets");
  REQUIRE_FALSE(parsed.fault.has_value());
  CHECK(parsed.dispensing.patient_id == "P9");
  CHECK(parsed.dispensing.quantity == 28);
}

TEST_CASE("a header without required columns names all of them") {
  Status status = HeaderStatus(InputKind::kDispensing, "record_id,practice,unit");
  REQUIRE_FALSE(status.ok());
  CHECK(status.code() == StatusCode::kInput);
  CHECK(status.message() ==
        "dispensing.csv:1: header: missing required columns: patient_id, dispensed_on, quantity, "
        "product or code (name them in the header, or map your names with --columns)");
}

TEST_CASE("a column named twice in the header is an error") {
  Status status = HeaderStatus(InputKind::kDispensing, "patient_id,dispensed_on,product,quantity,Patient_ID");
  REQUIRE_FALSE(status.ok());
  CHECK(status.message() ==
        "dispensing.csv:1: header: column \"patient_id\" appears twice (columns 1 and 5)");
}

TEST_CASE("a column mapping points known columns at other header names") {
  Result<ColumnMap> map = ParseColumnMap(
      R"({"patient_id": "NHS Number", "dispensed_on": "Date Dispensed", "quantity": "Qty"})",
      "map.json", InputKind::kDispensing);
  REQUIRE(map.ok());
  CHECK(HeaderStatus(InputKind::kDispensing, "NHS Number,Date Dispensed,Drug,Qty,product", *map).ok());
  Status missing = HeaderStatus(InputKind::kDispensing, "patient_id,Date Dispensed,Qty,product", *map);
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.message() ==
        "dispensing.csv:1: header: missing required columns: nhs_number (for patient_id) (name them "
        "in the header, or map your names with --columns)");
}

TEST_CASE("a bad column mapping names the offending key by JSON pointer") {
  struct Case {
    const char* json;
    const char* message;
  };
  const Case cases[] = {
      {R"({"quantiy": "Qty"})",
       "map.json: /quantiy: not a column of dispensing input (one of record_id, patient_id, "
       "practice, dispensed_on, product, code, code_system, quantity, unit, days_supply, dosage)"},
      {R"({"quantity": 3})", "map.json: /quantity: must be a non-empty string, the header name in your file"},
      {R"({"quantity": ""})", "map.json: /quantity: must be a non-empty string, the header name in your file"},
      {R"(["quantity"])", "map.json: must be a JSON object of column name -> header name"},
      {R"({"quantity": )",
       "map.json:1:14: not valid JSON: syntax error while parsing value - unexpected end of input; expected '[', "
       "'{', or a literal"},
      {R"({"a/b": "x"})",
       "map.json: /a~1b: not a column of dispensing input (one of record_id, patient_id, practice, "
       "dispensed_on, product, code, code_system, quantity, unit, days_supply, dosage)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.json);
    Result<ColumnMap> map = ParseColumnMap(c.json, "map.json", InputKind::kDispensing);
    REQUIRE_FALSE(map.ok());
    CHECK(map.status().code() == StatusCode::kInput);
    CHECK(map.status().message() == c.message);
  }
}

TEST_CASE("a mapping file is read from disk and a missing one is an input error") {
  TempFolder folder;
  const std::string path = folder.Write("map.json", R"({"patient_id": "Patient"})");
  Result<ColumnMap> map = LoadColumnMap(path, InputKind::kDispensing);
  REQUIRE(map.ok());
  CHECK(map->at("patient_id") == "Patient");
  Result<ColumnMap> missing = LoadColumnMap(folder.File("nope.json"), InputKind::kDispensing);
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.status().message().find("nope.json") != std::string::npos);
}

TEST_CASE("patient rows take a birth year alone as 1 July and normalise sex") {
  const char* header = "patient_id,birth_date,sex,practice,registered_from,registered_to";
  Parsed year = ParseOne(InputKind::kPatients, header, "P1,1948,F,A1,,");
  REQUIRE_FALSE(year.fault.has_value());
  CHECK(year.patient.birth_date->ToIso() == "1948-07-01");  // docs/input-formats.md
  CHECK(year.patient.birth_year_only);
  CHECK(year.patient.sex == "female");
  Parsed month = ParseOne(InputKind::kPatients, header, "P1,1948-03,male,A1,2001-02-03,2020-01-01");
  REQUIRE_FALSE(month.fault.has_value());
  CHECK(month.patient.birth_date->ToIso() == "1948-03-15");
  CHECK_FALSE(month.patient.birth_year_only);
  CHECK(month.patient.sex == "male");
  CHECK(month.patient.registered_to->ToIso() == "2020-01-01");
  Parsed full = ParseOne(InputKind::kPatients, header, "P1,1948-03-09,U,A1,,");
  CHECK(full.patient.birth_date->ToIso() == "1948-03-09");
  CHECK(full.patient.sex == "unknown");
}

TEST_CASE("each fault of a patient row has its reason and exact message") {
  const char* header = "patient_id,birth_date,sex,practice,registered_from,registered_to";
  struct Case {
    const char* line;
    const char* reason;
    const char* message;
  };
  const Case cases[] = {
      {",1948,F,A1,,", "missing_patient", "dispensing.csv:2: patient_id: is empty"},
      {"P1,1948-02-30,F,A1,,", "bad_date",
       "dispensing.csv:2: birth_date: \"1948-02-30\" is not a real date or a year (expected "
       "YYYY-MM-DD or YYYY)"},
      {"P1,1948,X,A1,,", "bad_sex",
       "dispensing.csv:2: sex: \"X\" is not one of female, male, other, unknown (or F, M, O, U)"},
      {"P1,1948,F,A1,2020-13-01,", "bad_date",
       "dispensing.csv:2: registered_from: \"2020-13-01\" is not a real date (expected YYYY-MM-DD)"},
      {"P1,1948,F,A1,2021-01-01,2020-01-01", "bad_registration",
       "dispensing.csv:2: registered_to: \"2020-01-01\" is before registered_from \"2021-01-01\""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.line);
    const Parsed parsed = ParseOne(InputKind::kPatients, header, c.line);
    REQUIRE(parsed.fault.has_value());
    CHECK(parsed.fault->reason == c.reason);
    CHECK(parsed.fault->message == c.message);
  }
}

TEST_CASE("practice and review rows are checked") {
  const char* practices = "practice,name,network,list_size";
  Parsed ok = ParseOne(InputKind::kPractices, practices, "A1,Ash Row Surgery,North,8500");
  REQUIRE_FALSE(ok.fault.has_value());
  CHECK(ok.practice.list_size == 8500);
  Parsed bad = ParseOne(InputKind::kPractices, practices, "A1,Ash Row Surgery,North,lots");
  REQUIRE(bad.fault.has_value());
  CHECK(bad.fault->reason == "bad_list_size");
  CHECK(bad.fault->message == "dispensing.csv:2: list_size: \"lots\" is not a whole number");
  Parsed empty = ParseOne(InputKind::kPractices, practices, ",Nameless,North,");
  CHECK(empty.fault->reason == "missing_practice");
  CHECK(empty.fault->message == "dispensing.csv:2: practice: is empty");
  Parsed zero = ParseOne(InputKind::kPractices, practices, "A1,Ash Row Surgery,North,0");
  CHECK(zero.fault->message == "dispensing.csv:2: list_size: \"0\" is not above zero");
  Parsed review = ParseOne(InputKind::kReviews, "patient_id,reviewed_on", "P1,2024-02-29");
  REQUIRE_FALSE(review.fault.has_value());
  CHECK(review.review.reviewed_on.ToIso() == "2024-02-29");
  Parsed no_date = ParseOne(InputKind::kReviews, "patient_id,reviewed_on", "P1,");
  CHECK(no_date.fault->message == "dispensing.csv:2: reviewed_on: is empty");
}

TEST_CASE("long values are cut in messages on a character boundary") {
  const std::string value = std::string(59, 'a') + "\xC3\xA9" + "tail";
  const std::string quoted = QuoteForMessage(value);
  CHECK(quoted == "\"" + std::string(59, 'a') + "...\"");
  CHECK(QuoteForMessage("short") == "\"short\"");
}

}  // TEST_SUITE

}  // namespace medload
