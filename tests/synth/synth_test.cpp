#include "medload/synth/synth.h"

#include <doctest/doctest.h>

#include <charconv>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "medload/input/csv_reader.h"
#include "medload/input/csv_records.h"
#include "medload/input/fhir_reader.h"

namespace medload {

namespace {

namespace fs = std::filesystem;

// A fresh temporary folder, removed when the test ends.
class TempFolder {
 public:
  explicit TempFolder(const std::string& name)
      : path_(fs::temp_directory_path() / ("medload_synth_test_" + name)) {
    fs::remove_all(path_);
  }
  ~TempFolder() { fs::remove_all(path_); }
  std::string path() const { return path_.string(); }
  std::string file(const std::string& name) const { return (path_ / name).string(); }

 private:
  fs::path path_;
};

std::string ReadAll(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream text;
  text << in.rdbuf();
  return text.str();
}

std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

// Splits one CSV record (RFC 4180; no embedded line breaks in these files).
std::vector<std::string> SplitCsv(const std::string& line) {
  std::vector<std::string> fields(1);
  bool quoted = false;
  for (size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted) {
      if (c == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        fields.back() += '"';
        ++i;
      } else if (c == '"') {
        quoted = false;
      } else {
        fields.back() += c;
      }
    } else if (c == '"') {
      quoted = true;
    } else if (c == ',') {
      fields.emplace_back();
    } else {
      fields.back() += c;
    }
  }
  return fields;
}

bool IsPositiveWhole(const std::string& text) {
  int value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  return error == std::errc() && end == text.data() + text.size() && value > 0;
}

// Runs every row of a CSV file through the import checks; returns the rows read, and
// fails the test on the first fault.
template <typename Record, typename Parse>
long CheckCsvImport(const std::string& path, InputKind kind, Parse parse) {
  std::ifstream in(path, std::ios::binary);
  CsvReader reader(in);
  CsvRow row;
  REQUIRE(reader.Next(row));
  Result<HeaderLayout> layout = HeaderLayout::Find(kind, row, {}, path);
  REQUIRE(layout.ok());
  const RowContext context{path, DateOrder::kIso};
  Record record;
  long rows = 0;
  while (reader.Next(row)) {
    const std::optional<RowFault> fault = parse(row, *layout, context, record);
    if (fault) FAIL(fault->message);
    ++rows;
  }
  return rows;
}

SynthOptions SmallOptions(uint64_t seed) {
  SynthOptions options;
  options.patients = 400;
  options.months = 6;
  options.seed = seed;
  return options;
}

}  // namespace

TEST_SUITE("synth/synth") {

TEST_CASE("the same options give identical bytes and another seed different ones") {
  TempFolder first("same_a");
  TempFolder second("same_b");
  TempFolder other("same_c");
  REQUIRE(WriteSynthData(SmallOptions(5), first.path()).ok());
  REQUIRE(WriteSynthData(SmallOptions(5), second.path()).ok());
  REQUIRE(WriteSynthData(SmallOptions(6), other.path()).ok());
  for (const char* name : {"practices.csv", "patients.csv", "dispensing.csv", "reviews.csv"}) {
    CAPTURE(name);
    const std::string bytes = ReadAll(first.file(name));
    CHECK_FALSE(bytes.empty());
    CHECK(bytes == ReadAll(second.file(name)));
  }
  CHECK(ReadAll(first.file("dispensing.csv")) != ReadAll(other.file("dispensing.csv")));
  CHECK(ReadAll(first.file("patients.csv")) != ReadAll(other.file("patients.csv")));
}

TEST_CASE("the summary counts match the rows of every file") {
  TempFolder folder("counts");
  Result<SynthSummary> summary = WriteSynthData(SmallOptions(8), folder.path());
  REQUIRE(summary.ok());
  CHECK(summary->patients == 400);
  CHECK(summary->practices == 3);
  CHECK(summary->registered_patients <= 400);
  CHECK(summary->registered_patients > 390);
  CHECK(summary->from.ToIso() == "2026-05-01");
  CHECK(summary->to.ToIso() == "2026-10-31");
  REQUIRE(summary->files.size() == 4);
  for (const SynthFileSummary& file : summary->files) {
    CAPTURE(file.name);
    const std::vector<std::string> lines = Lines(ReadAll(folder.file(file.name)));
    CHECK(lines.size() == file.rows + 1);  // a header line
  }
  CHECK(summary->files[2].rows == summary->dispensing_rows);
  CHECK(summary->dispensing_rows > 400 * 6 / 12 * 10);  // about 19 items a person a year
}

TEST_CASE("every dispensing row passes the import checks of the spec") {
  TempFolder folder("valid");
  SynthOptions options = SmallOptions(9);
  options.patients = 1500;
  REQUIRE(WriteSynthData(options, folder.path()).ok());
  const std::vector<std::string> lines = Lines(ReadAll(folder.file("dispensing.csv")));
  REQUIRE(lines.size() > 1000);
  CHECK(lines[0] ==
        "record_id,patient_id,practice,dispensed_on,product,code,code_system,quantity,unit,"
        "days_supply,dosage");
  std::set<std::string> record_ids;
  std::set<std::string> practices;
  const Date from = Date::FromCivil(2026, 5, 1);
  const Date to = Date::FromCivil(2026, 10, 31);
  long text_without_days = 0;
  long non_medicines = 0;
  for (size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = SplitCsv(lines[i]);
    CAPTURE(lines[i]);
    REQUIRE(f.size() == 11);
    CHECK(record_ids.insert(f[0]).second);
    CHECK_FALSE(f[1].empty());
    practices.insert(f[2]);
    // docs/input-formats.md: a real calendar date; quantity > 0; days supply whole days > 0.
    const std::optional<Date> on = ParseDate(f[3]);
    REQUIRE(on.has_value());
    CHECK(*on >= from);
    CHECK(*on <= to);
    CHECK_FALSE(f[4].empty());
    double quantity = 0;
    const auto parsed = std::from_chars(f[7].data(), f[7].data() + f[7].size(), quantity);
    CHECK(parsed.ec == std::errc());
    CHECK(quantity > 0);
    if (!f[9].empty()) CHECK(IsPositiveWhole(f[9]));
    if (f[9].empty() && !f[10].empty()) ++text_without_days;
    for (const char* word : {"strips", "lancets", "needles", "stockings", "dressing", "swabs"}) {
      if (f[4].find(word) != std::string::npos) ++non_medicines;
    }
  }
  const double rows = static_cast<double>(lines.size() - 1);
  CHECK(static_cast<double>(text_without_days) / rows > 0.2);  // about 30%
  CHECK(static_cast<double>(non_medicines) / rows > 0.005);    // a few per cent
  CHECK(practices.size() == 3);
}

TEST_CASE("registry rows are valid and ids are unique") {
  TempFolder folder("registry");
  REQUIRE(WriteSynthData(SmallOptions(10), folder.path()).ok());
  const std::vector<std::string> lines = Lines(ReadAll(folder.file("patients.csv")));
  CHECK(lines[0] == "patient_id,birth_date,sex,practice,registered_from,registered_to");
  std::set<std::string> ids;
  for (size_t i = 1; i < lines.size(); ++i) {
    const std::vector<std::string> f = SplitCsv(lines[i]);
    CAPTURE(lines[i]);
    REQUIRE(f.size() == 6);
    CHECK(ids.insert(f[0]).second);
    CHECK((f[1].size() == 4 || ParseDate(f[1]).has_value()));
    CHECK((f[2] == "female" || f[2] == "male" || f[2] == "unknown"));
    if (!f[4].empty() && !f[5].empty()) CHECK(*ParseDate(f[4]) <= *ParseDate(f[5]));
  }
  const std::vector<std::string> practices = Lines(ReadAll(folder.file("practices.csv")));
  CHECK(practices[0] == "practice,name,network,list_size");
  CHECK(practices.size() == 4);
}

TEST_CASE("the FHIR form writes one MedicationDispense or Patient resource per line") {
  TempFolder folder("fhir");
  SynthOptions options = SmallOptions(11);
  options.format = SynthFormat::kFhir;
  Result<SynthSummary> summary = WriteSynthData(options, folder.path());
  REQUIRE(summary.ok());
  CHECK(fs::exists(folder.file("practices.csv")));
  CHECK(fs::exists(folder.file("reviews.csv")));
  std::map<std::string, long> statuses;
  long dispenses = 0;
  for (const std::string& line : Lines(ReadAll(folder.file("dispensing.ndjson")))) {
    const nlohmann::json resource = nlohmann::json::parse(line);
    // Source: HL7 FHIR R4 MedicationDispense: status 1..1, medication[x] 1..1.
    REQUIRE(resource.at("resourceType") == "MedicationDispense");
    REQUIRE(resource.contains("status"));
    REQUIRE(resource.contains("medicationCodeableConcept"));
    CHECK(resource.at("subject").at("reference").get<std::string>().rfind("Patient/", 0) == 0);
    CHECK(resource.at("quantity").at("value").get<double>() > 0);
    CHECK(ParseDate(resource.at("whenHandedOver").get<std::string>()).has_value());
    ++statuses[resource.at("status").get<std::string>()];
    ++dispenses;
  }
  CHECK(dispenses == static_cast<long>(summary->dispensing_rows));
  CHECK(statuses["completed"] > dispenses * 9 / 10);
  CHECK(statuses["entered-in-error"] + statuses["cancelled"] > 0);
  CHECK(statuses.size() <= 3);
  long patients = 0;
  for (const std::string& line : Lines(ReadAll(folder.file("patients.ndjson")))) {
    const nlohmann::json resource = nlohmann::json::parse(line);
    CHECK(resource.at("resourceType") == "Patient");
    CHECK(resource.contains("id"));
    CHECK(resource.contains("birthDate"));
    ++patients;
  }
  CHECK(patients == static_cast<long>(summary->registered_patients));
}

TEST_CASE("the FHIR form holds the same completed dispensings as the CSV form") {
  TempFolder csv("same_csv");
  TempFolder fhir("same_fhir");
  SynthOptions options = SmallOptions(12);
  Result<SynthSummary> csv_summary = WriteSynthData(options, csv.path());
  options.format = SynthFormat::kFhir;
  REQUIRE(WriteSynthData(options, fhir.path()).ok());
  REQUIRE(csv_summary.ok());
  long completed = 0;
  for (const std::string& line : Lines(ReadAll(fhir.file("dispensing.ndjson")))) {
    if (nlohmann::json::parse(line).at("status") == "completed") ++completed;
  }
  CHECK(completed == static_cast<long>(csv_summary->dispensing_rows));
}

TEST_CASE("the project's own import checks accept every row of both forms") {
  TempFolder csv("import_csv");
  TempFolder fhir("import_fhir");
  SynthOptions options = SmallOptions(13);
  options.patients = 1500;
  Result<SynthSummary> csv_summary = WriteSynthData(options, csv.path());
  options.format = SynthFormat::kFhir;
  Result<SynthSummary> fhir_summary = WriteSynthData(options, fhir.path());
  REQUIRE(csv_summary.ok());
  REQUIRE(fhir_summary.ok());
  CHECK(CheckCsvImport<DispensingRecord>(csv.file("dispensing.csv"), InputKind::kDispensing,
                                         ParseDispensingRow) ==
        static_cast<long>(csv_summary->dispensing_rows));
  CHECK(CheckCsvImport<PatientRecord>(csv.file("patients.csv"), InputKind::kPatients,
                                      ParsePatientRow) ==
        static_cast<long>(csv_summary->registered_patients));
  CHECK(CheckCsvImport<PracticeRecord>(csv.file("practices.csv"), InputKind::kPractices,
                                       ParsePracticeRow) == 3);
  CHECK(CheckCsvImport<ReviewRecord>(csv.file("reviews.csv"), InputKind::kReviews,
                                     ParseReviewRow) == static_cast<long>(csv_summary->reviews));
  long dispenses = 0;
  long structured = 0;
  for (const char* name : {"dispensing.ndjson", "patients.ndjson"}) {
    std::ifstream in(fhir.file(name), std::ios::binary);
    FhirReader reader(in, name);
    FhirItem item;
    while (reader.Next(item)) {
      if (item.kind == FhirItemKind::kRejected) FAIL(item.fault.message);
      if (item.kind != FhirItemKind::kDispense) continue;
      ++dispenses;
      if (item.dispense.structured_units_per_day) ++structured;
    }
  }
  CHECK(dispenses == static_cast<long>(fhir_summary->dispensing_rows));
  CHECK(structured > dispenses / 10);  // about 40% of lines with a structured dosage
}

TEST_CASE("options out of range are usage errors naming the option") {
  SynthOptions options = SmallOptions(1);
  options.patients = 0;
  Status status = CheckSynthOptions(options);
  CHECK(status.code() == StatusCode::kUsage);
  CHECK(status.message() == "patients 0 is out of range: give 1 to 50000000");
  options = SmallOptions(1);
  options.months = 0;
  CHECK(CheckSynthOptions(options).message() == "months 0 is out of range: give 1 to 240");
  options.months = 241;
  CHECK(CheckSynthOptions(options).code() == StatusCode::kUsage);
  CHECK(CheckSynthOptions(SmallOptions(1)).ok());
  TempFolder folder("bad");
  options = SmallOptions(1);
  options.patients = 0;
  CHECK(WriteSynthData(options, folder.path()).status().code() == StatusCode::kUsage);
}

TEST_CASE("a folder that cannot be created is an input error") {
  TempFolder folder("blocked");
  fs::create_directories(folder.path());
  std::ofstream(folder.file("plain-file")) << "x";
  Result<SynthSummary> summary = WriteSynthData(SmallOptions(1), folder.file("plain-file"));
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().code() == StatusCode::kInput);
}

TEST_CASE("the bundled demo patients regenerate byte for byte") {
  // demo-patients/README.md gives the command; these are its options.
  const fs::path demo = MEDLOAD_SOURCE_DEMO;
  REQUIRE(fs::exists(demo / "dispensing.csv"));
  TempFolder folder("demo");
  SynthOptions options;
  options.patients = 2500;
  options.months = 15;
  options.seed = 2026;
  REQUIRE(WriteSynthData(options, folder.path()).ok());
  for (const char* name : {"practices.csv", "patients.csv", "dispensing.csv", "reviews.csv"}) {
    CAPTURE(name);
    CHECK(ReadAll(folder.file(name)) == ReadAll((demo / name).string()));
  }
}

}  // TEST_SUITE

}  // namespace medload
