#include "medload/store/importer.h"

#include <doctest/doctest.h>
#include <signal.h>
#include <sqlite3.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <fstream>
#include <iterator>
#include <sstream>
#include <thread>

#include "store/read_patients.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

Result<ImportSummary> Import(Store& store, InputKind kind, const std::string& text,
                             const ImportOptions& options = {}) {
  std::istringstream in(text);
  return ImportStream(store, kind, in, "dispensing.csv", options);
}

Store Memory() {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  return std::move(store.value());
}

long Count(const Store& store, const char* sql) {
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), sql, -1, &stmt, nullptr) == SQLITE_OK);
  REQUIRE(sqlite3_step(stmt) == SQLITE_ROW);
  const long value = static_cast<long>(sqlite3_column_int64(stmt, 0));
  sqlite3_finalize(stmt);
  return value;
}

void CheckAddsUp(const ImportSummary& summary) {
  CHECK(summary.read == summary.imported + summary.duplicates + summary.rejected);
  long by_reason = 0;
  for (const auto& [reason, count] : summary.reasons) by_reason += count;
  CHECK(by_reason == summary.rejected);
}

// `rows` valid dispensing rows with record ids starting at `first`.
std::string DispensingFile(int first, int rows) {
  std::string text = "record_id,patient_id,dispensed_on,product,quantity,days_supply\n";
  for (int i = first; i < first + rows; ++i) {
    text += "R" + std::to_string(i) + ",P" + std::to_string(i % 97) + ",2024-01-" +
            std::to_string(1 + i % 28) + ",Amlodipine 5mg tablets,28,28\n";
  }
  return text;
}

const char* const kMixed =
    "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply\n"
    "R1,P1,A1,2024-01-05,Amlodipine 5mg tablets,28,28\n"
    "R2,P1,A1,2024-01-05,Sertraline 50mg tablets,28,28\n"
    "\n"
    "R3,,A1,2024-01-05,Sertraline 50mg tablets,28,28\n"
    "R4,P2,A1,2024-01-32,Sertraline 50mg tablets,28,28\n"
    "R5,P2,A1,2024-01-05,Sertraline 50mg tablets,lots,28\n"
    "R1,P1,A1,2024-01-05,Amlodipine 5mg tablets,28,28\n"
    "R6,P3,A1,2024-01-05,\"Co-codamol 30mg/500mg tablets\",100,25\n"
    "R7,P3,A1,2024-01-05,Omeprazole 20mg capsules,28\n";

}  // namespace

TEST_SUITE("store/importer") {

TEST_CASE("every row read is imported, a duplicate or rejected, and the counts add up") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, kMixed, options);
  REQUIRE(summary.ok());
  CHECK(summary->read == 8);
  CHECK(summary->imported == 3);
  CHECK(summary->duplicates == 1);
  CHECK(summary->rejected == 4);
  CHECK(summary->blank_lines == 1);
  CHECK(summary->reasons == std::map<std::string, long>{
                                {"bad_date", 1}, {"bad_quantity", 1}, {"field_count", 1}, {"missing_patient", 1}});
  CheckAddsUp(*summary);
  CHECK(summary->examples.front() == "dispensing.csv:5: patient_id: is empty");
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings") == 3);
  CHECK(Count(store, "SELECT COUNT(*) FROM rejected_rows") == 4);
  CHECK(Count(store, "SELECT line FROM rejected_rows ORDER BY line LIMIT 1") == 5);
  CHECK(Count(store, "SELECT source_line FROM dispensings WHERE record_id = 'R6'") == 9);
}

TEST_CASE("an import reads and writes with the large page cache and no map, then gives both back") {
  TempFolder folder;
  Result<Store> opened = Store::Open(folder.File("medload.db"));
  REQUIRE(opened.ok());
  Store& store = *opened;
  CHECK(Count(store, "PRAGMA cache_size") == -16384);
  CHECK(Count(store, "PRAGMA mmap_size") == 268435456);
  REQUIRE(Import(store, InputKind::kDispensing, DispensingFile(1, 5)).ok());
  CHECK(Count(store, "PRAGMA cache_size") == -16384);
  CHECK(Count(store, "PRAGMA mmap_size") == 268435456);
  REQUIRE(store.UseMemoryMap(false).ok());
  CHECK(Count(store, "PRAGMA mmap_size") == 0);
  REQUIRE(store.UseMemoryMap(true).ok());
  CHECK(Count(store, "PRAGMA mmap_size") == 268435456);
}

TEST_CASE("importing the same file twice imports nothing new") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> first = Import(store, InputKind::kDispensing, kMixed, options);
  Result<ImportSummary> second = Import(store, InputKind::kDispensing, kMixed, options);
  REQUIRE(first.ok());
  REQUIRE(second.ok());
  CHECK(second->imported == 0);
  CHECK(second->duplicates == first->imported + first->duplicates);
  CHECK(second->rejected == first->rejected);
  CheckAddsUp(*second);
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings") == 3);
}

TEST_CASE("rows without a record id are duplicates when their normalised content is the same") {
  Store store = Memory();
  const std::string file =
      "patient_id,dispensed_on,product,quantity,dosage\n"
      "P1,2024-01-05,Amlodipine 5mg tablets,28,one daily\n"
      "P1,2024-01-05,  AMLODIPINE  5mg   tablets ,28.0,One  daily\n"
      "P1,2024-01-05,Amlodipine 5mg tablets,56,one daily\n"
      "P1,2024-01-06,Amlodipine 5mg tablets,28,one daily\n";
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, file);
  REQUIRE(summary.ok());
  CHECK(summary->imported == 3);
  CHECK(summary->duplicates == 1);
}

TEST_CASE("the duplicate key is the record id when there is one, else a content hash") {
  DispensingRecord a;
  a.patient_id = "P1";
  a.dispensed_on = Date::FromCivil(2024, 1, 5);
  a.product = "Amlodipine 5mg tablets";
  a.quantity = 28;
  DispensingRecord b = a;
  b.product = " amlodipine 5MG  tablets";
  CHECK(DispensingKey(a) == DispensingKey(b));
  CHECK(DispensingKey(a).size() == 2 + 32);
  CHECK(DispensingKey(a).rfind("h:", 0) == 0);
  b.quantity = 56;
  CHECK(DispensingKey(a) != DispensingKey(b));
  b = a;
  b.days_supply = 28;
  CHECK(DispensingKey(a) != DispensingKey(b));
  b = a;
  b.practice = "A2";
  CHECK(DispensingKey(a) != DispensingKey(b));
  b = a;
  b.dosage = "one daily";
  CHECK(DispensingKey(a) != DispensingKey(b));
  a.record_id = "RX-1";
  CHECK(DispensingKey(a) == "r:RX-1");
}

TEST_CASE("a file whose reject rate is above the limit is rolled back whole") {
  Store store = Memory();
  // 1 of 10 rows rejected: 0.1 is above 0.05 (the default) but not above 0.1.
  std::string file = DispensingFile(1, 9) + "R99,P1,2024-01-01,Amlodipine 5mg tablets,0,28\n";
  Result<ImportSummary> rolled = Import(store, InputKind::kDispensing, file);
  REQUIRE(rolled.ok());
  CHECK(rolled->rolled_back);
  CHECK(rolled->read == 10);
  CheckAddsUp(*rolled);
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings") == 0);
  CHECK(Count(store, "SELECT COUNT(*) FROM rejected_rows") == 0);
  CHECK(Count(store, "SELECT COUNT(*) FROM import_runs WHERE outcome = 'rolled_back'") == 1);
  CHECK(RollbackMessage(*rolled) ==
        "dispensing.csv: 1 of 10 rows rejected (10%), above --max-reject-rate 0.05: the file was "
        "rolled back and nothing from it was stored");
  ImportOptions at_limit;
  at_limit.max_reject_rate = 0.1;
  Result<ImportSummary> kept = Import(store, InputKind::kDispensing, file, at_limit);
  REQUIRE(kept.ok());
  CHECK_FALSE(kept->rolled_back);
  CHECK(kept->imported == 9);
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings") == 9);
}

TEST_CASE("a zero reject rate rolls back on the first rejected row") {
  Store store = Memory();
  ImportOptions strict;
  strict.max_reject_rate = 0;
  Result<ImportSummary> summary =
      Import(store, InputKind::kDispensing, DispensingFile(1, 1000) + "R-bad,P1,2024-01-01,X,0,1\n", strict);
  REQUIRE(summary.ok());
  CHECK(summary->rolled_back);
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings") == 0);
}

TEST_CASE("a bad header stores nothing and names the missing columns") {
  Store store = Memory();
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, "patient,date,drug\nP1,2024-01-01,X\n");
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().code() == StatusCode::kInput);
  CHECK(summary.status().message().rfind("dispensing.csv:1: header: missing required columns: patient_id", 0) == 0);
  CHECK(Count(store, "SELECT COUNT(*) FROM import_runs") == 0);
}

TEST_CASE("an empty input is an input error") {
  Store store = Memory();
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, "\n\n");
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().message() == "dispensing.csv: is empty; expected a header row naming the columns");
}

TEST_CASE("a missing file is an input error naming it") {
  Store store = Memory();
  Result<ImportSummary> summary = ImportFile(store, InputKind::kDispensing, "/no/such/file.csv", {});
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().code() == StatusCode::kInput);
  CHECK(summary.status().message() == "/no/such/file.csv: cannot be read (missing, or no permission)");
}

TEST_CASE("rejected rows are written to the rejects stream with line, reason and original text") {
  Store store = Memory();
  std::ostringstream rejects;
  ImportOptions options;
  options.max_reject_rate = 1;
  options.rejects = &rejects;
  REQUIRE(Import(store, InputKind::kDispensing, kMixed, options).ok());
  const std::string text = rejects.str();
  CHECK(text.find("dispensing.csv,5,missing_patient,dispensing.csv:5: patient_id: is empty,"
                  "\"R3,,A1,2024-01-05,Sertraline 50mg tablets,28,28\"\n") != std::string::npos);
  CHECK(text.find("dispensing.csv,10,field_count,") != std::string::npos);
}

TEST_CASE("rejected rows of a long file keep their input order in the summary, the rejects file and the store") {
  // 5,000 rows; every 250th has an impossible date and every 600th no patient.
  std::string text = "record_id,patient_id,dispensed_on,product,quantity,days_supply\n";
  std::vector<long> bad_lines;
  for (int i = 1; i <= 5000; ++i) {
    const bool bad_date = i % 250 == 0;
    const bool no_patient = !bad_date && i % 600 == 0;
    if (bad_date || no_patient) bad_lines.push_back(i + 1);
    text += "R" + std::to_string(i) + "," + (no_patient ? "" : "P" + std::to_string(i % 97)) + "," +
            (bad_date ? "2024-02-30" : "2024-01-05") + ",Amlodipine 5mg tablets,28,28\n";
  }
  Store store = Memory();
  std::ostringstream rejects;
  ImportOptions options;
  options.rejects = &rejects;
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, text, options);
  REQUIRE(summary.ok());
  CheckAddsUp(*summary);
  CHECK(summary->rejected == static_cast<long>(bad_lines.size()));
  REQUIRE(summary->examples.size() == 10);
  for (size_t i = 0; i < summary->examples.size(); ++i) {
    CAPTURE(i);
    CHECK(summary->examples[i].rfind("dispensing.csv:" + std::to_string(bad_lines[i]) + ": ", 0) == 0);
  }
  std::vector<long> written;
  std::istringstream lines(rejects.str());
  for (std::string line; std::getline(lines, line);) {
    if (line.rfind("dispensing.csv,", 0) == 0) written.push_back(std::stol(line.substr(15)));
  }
  CHECK(written == bad_lines);
  std::vector<long> stored;
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), "SELECT line FROM rejected_rows ORDER BY id", -1, &stmt, nullptr) ==
          SQLITE_OK);
  while (sqlite3_step(stmt) == SQLITE_ROW) stored.push_back(static_cast<long>(sqlite3_column_int64(stmt, 0)));
  sqlite3_finalize(stmt);
  CHECK(stored == bad_lines);
}

TEST_CASE("a column mapping and a day-first date order apply to every row") {
  Store store = Memory();
  ImportOptions options;
  options.columns = {{"patient_id", "NHS Number"}, {"dispensed_on", "Date"}, {"quantity", "Qty"}};
  options.date_order = DateOrder::kDmy;
  Result<ImportSummary> summary =
      Import(store, InputKind::kDispensing, "NHS Number,Date,Product,Qty\n943 476 5919,05/01/2024,X,3\n", options);
  REQUIRE(summary.ok());
  CHECK(summary->imported == 1);
  Result<std::vector<DispensingRecord>> records = store.DispensingsOf("943 476 5919");
  REQUIRE(records.ok());
  REQUIRE(records->size() == 1);
  CHECK((*records)[0].dispensed_on.ToIso() == "2024-01-05");
}

TEST_CASE("an import reads without the memory map and turns it back on afterwards") {
  TempFolder folder;
  Result<Store> on_disk = Store::Open(folder.File("medload.db"));
  REQUIRE(on_disk.ok());
  CHECK(Count(*on_disk, "PRAGMA mmap_size") > 0);
  long during = -1;
  ImportOptions options;
  options.progress_every = 10;
  options.progress = [&](long, uint64_t, uint64_t) { during = Count(*on_disk, "PRAGMA mmap_size"); };
  std::istringstream in(DispensingFile(0, 20));
  REQUIRE(ImportStream(*on_disk, InputKind::kDispensing, in, "d.csv", options).ok());
  CHECK(during == 0);
  CHECK(Count(*on_disk, "PRAGMA mmap_size") > 0);
}

TEST_CASE("line ends of a CR alone are line ends, and rows keep their line numbers") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> summary = Import(
      store, InputKind::kDispensing,
      "patient_id,dispensed_on,product,quantity\rP1,2024-01-05,X,1\rP2,2024-01-32,X,1\r\"P3\",2024-01-06,X,2\r",
      options);
  REQUIRE(summary.ok());
  CHECK(summary->read == 3);
  CHECK(summary->imported == 2);
  REQUIRE(summary->examples.size() == 1);
  CHECK(summary->examples.front().rfind("dispensing.csv:3: dispensed_on: ", 0) == 0);
  CHECK(Count(store, "SELECT source_line FROM dispensings WHERE patient_id = 'P3'") == 4);
}

TEST_CASE("a record id reused for another patient's dispensing is a conflict, not a duplicate") {
  const auto file = [](const std::string& patient, const std::string& product) {
    std::string text = "record_id,patient_id,dispensed_on,product,quantity\n";
    for (int i = 1; i <= 200; ++i) {
      text += std::to_string(i) + "," + patient + ",2024-01-05," + product + "," + std::to_string(i) + "\n";
    }
    return text;
  };
  Store store = Memory();
  REQUIRE(Import(store, InputKind::kDispensing, file("PA", "Amlodipine 5mg tablets")).ok());
  // The same ids for another patient: rejected, and over the reject rate the file is
  // rolled back.
  Result<ImportSummary> other = Import(store, InputKind::kDispensing, file("PB", "Amlodipine 5mg tablets"));
  REQUIRE(other.ok());
  CheckAddsUp(*other);
  CHECK(other->duplicates == 0);
  CHECK(other->rejected == 200);
  CHECK(other->reasons == std::map<std::string, long>{{"record_id_conflict", 200}});
  CHECK(other->rolled_back);
  CHECK(other->examples.front() ==
        "dispensing.csv:2: record_id: \"1\" is already stored for a different dispensing (read from "
        "\"dispensing.csv\" line 2); a record id must name one dispensing only");
  // The same ids and content, written differently: duplicates.
  Result<ImportSummary> again = Import(store, InputKind::kDispensing, file("PA", " AMLODIPINE  5mg tablets"));
  REQUIRE(again.ok());
  CHECK(again->duplicates == 200);
  CHECK(again->rejected == 0);
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings WHERE patient_id = 'PB'") == 0);
  // FHIR: a dispense id already stored for another patient.
  ImportOptions keep;
  keep.max_reject_rate = 1;
  Result<ImportSummary> fhir = Import(
      store, InputKind::kDispensing,
      R"({"resourceType":"MedicationDispense","id":"1","status":"completed","subject":{"reference":"Patient/PC"},)"
      R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})" "\n",
      keep);
  REQUIRE(fhir.ok());
  CHECK(fhir->reasons == std::map<std::string, long>{{"record_id_conflict", 1}});
  CHECK(fhir->examples.front().rfind("dispensing.csv:1: /id: \"1\" is already stored", 0) == 0);
}

TEST_CASE("re-importing a file keeps each of its rejected rows once in the store") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  for (int run = 0; run < 3; ++run) {
    REQUIRE(Import(store, InputKind::kDispensing, kMixed, options).ok());
  }
  CHECK(Count(store, "SELECT COUNT(*) FROM rejected_rows") == 4);
  CHECK(Count(store, "SELECT COUNT(DISTINCT run_id) FROM rejected_rows") == 1);
  CHECK(Count(store, "SELECT MIN(run_id) FROM rejected_rows") == 3);  // the latest run
}

TEST_CASE("a stray quote rejects its own line only, and every physical line is counted") {
  // 2,000 rows; a quote opens a field on row 1,000 and, in the second file, a later row
  // holds a quoted field that would close it.
  for (const bool closed_later : {false, true}) {
    CAPTURE(closed_later);
    std::string text = "record_id,patient_id,dispensed_on,product,quantity,days_supply\n";
    for (int i = 1; i <= 2000; ++i) {
      const std::string product = i == 1000                    ? "\"Amlodipine 5mg tablets"
                                  : closed_later && i == 1010 ? "\"Amlodipine, 5mg\""
                                                              : "Amlodipine 5mg tablets";
      text += "S" + std::to_string(i) + ",P" + std::to_string(i % 97) + ",2024-01-05," + product + ",28,28\n";
    }
    Store store = Memory();
    Result<ImportSummary> summary = Import(store, InputKind::kDispensing, text);
    REQUIRE(summary.ok());
    CheckAddsUp(*summary);
    CHECK(summary->read == 2000);
    CHECK(summary->imported == 1999);
    CHECK(summary->reasons == std::map<std::string, long>{{"unclosed_quote", 1}});
    CHECK(summary->examples.front().rfind("dispensing.csv:1001: row: a quoted field opened on this line", 0) == 0);
    CHECK(summary->lines == 2001);
    CHECK(summary->lines == summary->header_lines + summary->blank_lines + summary->row_lines);
    CHECK(Count(store, "SELECT source_line FROM dispensings WHERE record_id = 'S1001'") == 1002);
  }
}

TEST_CASE("a block of CR-only lines inside an LF file is read line by line, in CSV and in FHIR") {
  std::string csv = "record_id,patient_id,dispensed_on,product,quantity\n";
  std::string fhir;
  for (int i = 1; i <= 100; ++i) {
    const char* end = i >= 30 && i < 69 ? "\r" : "\n";
    csv += "M" + std::to_string(i) + ",P1,2024-01-05,X," + std::to_string(i) + end;
    fhir += R"({"resourceType":"MedicationDispense","id":"f)" + std::to_string(i) +
            R"(","status":"completed","subject":{"reference":"Patient/P1"},"medicationCodeableConcept":{"text":"X"},)"
            R"("quantity":{"value":1},"whenHandedOver":"2024-01-02"})" + end;
  }
  Store store = Memory();
  for (const std::string& text : {csv, fhir}) {
    Result<ImportSummary> summary = Import(store, InputKind::kDispensing, text);
    REQUIRE(summary.ok());
    CHECK(summary->read == 100);
    CHECK(summary->imported == 100);
    CHECK(summary->rejected == 0);
    CHECK(summary->lines == summary->header_lines + 100);
  }
  CHECK(Count(store, "SELECT source_line FROM dispensings WHERE record_id = 'M69'") == 70);
}

TEST_CASE("a quoted line break inside a row is one row of two lines in the line count") {
  Store store = Memory();
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing,
                                         "patient_id,dispensed_on,product,quantity,dosage\n"
                                         "P1,2024-01-05,X,28,\"take one\ndaily\"\n\nP2,2024-01-05,X,28,\n");
  REQUIRE(summary.ok());
  CHECK(summary->read == 2);
  CHECK(summary->imported == 2);
  CHECK(summary->lines == 5);
  CHECK(summary->header_lines == 1);
  CHECK(summary->blank_lines == 1);
  CHECK(summary->row_lines == 3);
  CHECK(summary->multiline_rows == 1);
}

TEST_CASE("identifiers holding a line break, tab or bidi control are rejected, in CSV and in FHIR") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  // U+202E RIGHT-TO-LEFT OVERRIDE; source: Unicode Standard Annex #9, table 4.
  Result<ImportSummary> csv = Import(store, InputKind::kDispensing,
                                     "record_id,patient_id,practice,dispensed_on,product,quantity\n"
                                     "R1,\"P1\nP2\",A1,2024-01-05,X,1\n"
                                     "R2,P\xE2\x80\xAE" "3,A1,2024-01-05,X,1\n"
                                     "R3,P4,\"A\t1\",2024-01-05,X,1\n"
                                     "R\xE2\x81\xA6" "4,P5,A1,2024-01-05,X,1\n"
                                     "R5,P6,A1,2024-01-05,X,1\n",
                                     options);
  REQUIRE(csv.ok());
  CHECK(csv->read == 5);
  CHECK(csv->imported == 1);
  CHECK(csv->reasons == std::map<std::string, long>{{"bad_identifier", 4}});
  CHECK(csv->examples == std::vector<std::string>{
                             "dispensing.csv:2: patient_id: holds the character \\x0a; identifiers must be plain text (it "
                             "would reorder or break the lines of every output naming it)",
                             "dispensing.csv:4: patient_id: holds the character \\u202E; identifiers must be plain text "
                             "(it would reorder or break the lines of every output naming it)",
                             "dispensing.csv:5: practice: holds the character \\x09; identifiers must be plain text (it "
                             "would reorder or break the lines of every output naming it)",
                             "dispensing.csv:6: record_id: holds the character \\u2066; identifiers must be plain text "
                             "(it would reorder or break the lines of every output naming it)"});
  Result<ImportSummary> patients = Import(store, InputKind::kPatients,
                                          "patient_id,birth_date\nP\xE2\x80\x8F" "7,1950\n", options);
  REQUIRE(patients.ok());
  CHECK(patients->reasons == std::map<std::string, long>{{"bad_identifier", 1}});
  Result<ImportSummary> fhir = Import(
      store, InputKind::kDispensing,
      R"({"resourceType":"MedicationDispense","id":"m8","status":"completed","subject":{"reference":"Patient/P\u202e8"},)"
      R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})" "\n",
      options);
  REQUIRE(fhir.ok());
  // In FHIR the reader refuses it first: a reference's id is a FHIR id (FHIR R4, 2.24.0.1 "id").
  CHECK(fhir->reasons == std::map<std::string, long>{{"bad_reference", 1}});
  CHECK(fhir->examples.front() == "dispensing.csv:1: /subject/reference: \"Patient/P\xE2\x80\xAE" "8\" has an id that "
                                  "is not a FHIR id (1 to 64 of A-Z a-z 0-9 - .)");
}

TEST_CASE("a quantity, days supply or strength beyond plausible bounds is rejected with its reason") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing,
                                         "patient_id,dispensed_on,product,quantity,days_supply\n"
                                         "P1,2024-01-05,Amlodipine 5mg tablets,1e308,28\n"
                                         "P2,2024-01-05,Amlodipine 5mg tablets,28,10000\n"
                                         "P3,2024-01-05,Amlodipine 5000000mg tablets,28,28\n"
                                         "P4,2024-01-05,Benzathine benzylpenicillin 2400000 units injection,1,28\n"
                                         "P5,2024-01-05,Hydrocortisone 150% cream,1,28\n"
                                         "P6,2024-01-05,Glucose 75g sachets,1,\n",
                                         options);
  REQUIRE(summary.ok());
  CheckAddsUp(*summary);
  CHECK(summary->imported == 2);
  CHECK(summary->reasons == std::map<std::string, long>{
                                {"bad_days_supply", 1}, {"bad_quantity", 1}, {"implausible_strength", 2}});
  CHECK(summary->examples[2] ==
        "dispensing.csv:4: product: \"Amlodipine 5000000mg tablets\": a strength of 5000000 mg is above the "
        "plausible 1000000 mg; check the description");
  CHECK(summary->examples[3] ==
        "dispensing.csv:6: product: \"Hydrocortisone 150% cream\": a strength of 150 % is above the plausible "
        "100 %; check the description");
}

TEST_CASE("rows holding control characters are rejected, in CSV and in FHIR") {
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> csv = Import(store, InputKind::kDispensing,
                                     std::string("patient_id,dispensed_on,product,quantity\n"
                                                 "P1,2024-01-05,X,1\nP") +
                                         '\0' + "2,2024-01-05,X,1\nP3,2024-01-05,\x1B]0;title\x07X,1\n",
                                     options);
  REQUIRE(csv.ok());
  CHECK(csv->read == 3);
  CHECK(csv->imported == 1);
  CHECK(csv->reasons == std::map<std::string, long>{{"control_character", 2}});
  CHECK(csv->examples.front() == "dispensing.csv:3: row: holds the control character 0x00 (at byte 2); remove it from the file");
  Result<ImportSummary> fhir = Import(
      store, InputKind::kDispensing,
      R"({"resourceType":"MedicationDispense","id":"m9","status":"completed","subject":{"reference":"Patient/P9"},)"
      R"("medicationCodeableConcept":{"text":"X\u001b[2J"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})" "\n",
      options);
  REQUIRE(fhir.ok());
  CHECK(fhir->rejected == 1);
  CHECK(fhir->reasons == std::map<std::string, long>{{"control_character", 1}});
  CHECK(Count(store, "SELECT COUNT(*) FROM dispensings WHERE patient_id = 'P9'") == 0);
}

TEST_CASE("progress is reported every N rows with the bytes read and the file's size when known") {
  Store store = Memory();
  std::vector<long> reports;
  std::vector<uint64_t> bytes;
  std::vector<uint64_t> totals;
  ImportOptions options;
  options.progress_every = 100;
  options.progress = [&](long rows, uint64_t read, uint64_t total) {
    reports.push_back(rows);
    bytes.push_back(read);
    totals.push_back(total);
  };
  const std::string file = DispensingFile(0, 350);
  REQUIRE(Import(store, InputKind::kDispensing, file, options).ok());
  CHECK(reports == std::vector<long>{100, 200, 300});
  CHECK(totals == std::vector<uint64_t>{0, 0, 0});  // a stream: size unknown
  CHECK(std::is_sorted(bytes.begin(), bytes.end()));
  CHECK(bytes.back() <= file.size());
  CHECK(bytes.front() > 0);

  TempFolder folder;
  const std::string path = folder.Write("d.csv", DispensingFile(1000, 350));
  totals.clear();
  Store other = Memory();
  REQUIRE(ImportFile(other, InputKind::kDispensing, path, options).ok());
  REQUIRE(totals.size() == 3);
  CHECK(totals[0] == DispensingFile(1000, 350).size());
}

TEST_CASE("FHIR dispenses keep their status, and those that do not count are counted apart") {
  // Source: HL7 FHIR R4 MedicationDispense.status (value set medicationdispense-status).
  const auto dispense = [](const char* id, const char* status) {
    std::string line = std::string(R"({"resourceType":"MedicationDispense","id":")") + id + "\",";
    if (status != nullptr) line += std::string(R"("status":")") + status + "\",";
    return line + R"("subject":{"reference":"Patient/P1"},"medicationCodeableConcept":{"text":"X"},)"
                  R"("quantity":{"value":28},"whenHandedOver":"2024-01-02"})" "\n";
  };
  const std::string file = dispense("m1", "completed") + dispense("m2", "entered-in-error") +
                           dispense("m3", "cancelled") + dispense("m4", nullptr) +
                           R"({"resourceType":"Patient","id":"P1","birthDate":"1940","gender":"male"})" "\n";
  Store store = Memory();
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> summary = Import(store, InputKind::kDispensing, file, options);
  REQUIRE(summary.ok());
  CHECK(summary->format == "fhir");
  CHECK(summary->read == 5);
  CHECK(summary->imported == 4);
  CHECK(summary->reasons == std::map<std::string, long>{{"missing_status", 1}});  // m4: status is 1..1
  CHECK(summary->patients == 1);
  CHECK(summary->not_counted == std::map<std::string, long>{{"cancelled", 1}, {"entered-in-error", 1}});
  CHECK(store.DispensingsOf("P1")->size() == 1);
  CHECK(store.AllDispensingsOf("P1")->size() == 3);
  CHECK(store.PatientOf("P1")->has_value());
  // The source later marks m1 as entered in error: the stored status follows.
  Result<ImportSummary> again = Import(store, InputKind::kDispensing, dispense("m1", "entered-in-error"));
  REQUIRE(again.ok());
  CHECK(again->imported == 1);
  CHECK(again->updated == 1);
  CHECK(store.DispensingsOf("P1")->empty());
  Result<ImportSummary> same = Import(store, InputKind::kDispensing, file, options);
  REQUIRE(same.ok());
  CHECK(same->imported == 1);  // m1 back to completed
  CHECK(same->duplicates == 3);
  CHECK(same->rejected == 1);
}

TEST_CASE("FHIR input is refused for practices and reviews, and dispenses in a patients import are rejected") {
  Store store = Memory();
  const std::string patient = R"({"resourceType":"Patient","id":"P1"})" "\n";
  Result<ImportSummary> practices = Import(store, InputKind::kPractices, patient);
  REQUIRE_FALSE(practices.ok());
  CHECK(practices.status().message() ==
        "dispensing.csv: FHIR NDJSON is read for dispensing and patients only; practices must be CSV");
  ImportOptions options;
  options.max_reject_rate = 1;
  Result<ImportSummary> patients = Import(
      store, InputKind::kPatients,
      patient + R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Patient/P1"},)"
                R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})" "\n",
      options);
  REQUIRE(patients.ok());
  CHECK(patients->imported == 1);
  CHECK(patients->reasons == std::map<std::string, long>{{"unsupported_resource", 1}});
}

TEST_CASE("re-importing registry rows updates changed rows and counts unchanged ones as duplicates") {
  Store store = Memory();
  const char* header = "patient_id,birth_date,sex,practice\n";
  REQUIRE(Import(store, InputKind::kPatients, std::string(header) + "P1,1940,F,A1\nP2,1950,M,A1\n").ok());
  Result<ImportSummary> again =
      Import(store, InputKind::kPatients, std::string(header) + "P1,1940,F,A1\nP2,1950,M,B2\nP3,1960,F,B2\n");
  REQUIRE(again.ok());
  CHECK(again->imported == 2);
  CHECK(again->updated == 1);
  CHECK(again->duplicates == 1);
  CHECK((*store.PatientOf("P2"))->practice == "B2");
  const char* practices = "practice,name,network,list_size\n";
  REQUIRE(Import(store, InputKind::kPractices, std::string(practices) + "A1,Ash Row,North,9000\n").ok());
  Result<ImportSummary> practice_again =
      Import(store, InputKind::kPractices, std::string(practices) + "A1,Ash Row,North,9100\n");
  REQUIRE(practice_again.ok());
  CHECK(practice_again->updated == 1);
  Result<ImportSummary> reviews = Import(store, InputKind::kReviews,
                                         "patient_id,reviewed_on\nP1,2024-01-01\nP1,2024-01-01\n");
  REQUIRE(reviews.ok());
  CHECK(reviews->imported == 1);
  CHECK(reviews->duplicates == 1);
}

bool HasPatientIndex(const Store& store) {
  return Count(store, "SELECT COUNT(*) FROM sqlite_schema WHERE name = 'dispensings_by_patient'") == 1;
}

// The first page of the per-patient index: it changes when the index is built again.
long PatientIndexRoot(const Store& store) {
  return Count(store, "SELECT rootpage FROM sqlite_schema WHERE name = 'dispensings_by_patient'");
}

// `rows` rows of about 110 bytes, so that the file's size promises a large load.
std::string WideDispensingFile(int first, int rows) {
  std::string text = "record_id,patient_id,dispensed_on,product,quantity,days_supply,dosage\n";
  for (int i = first; i < first + rows; ++i) {
    text += "R" + std::to_string(i) + ",P" + std::to_string(i % 997) +
            ",2024-01-05,Salbutamol 100micrograms/dose inhaler CFC free,1,30,"
            "two puffs up to four times a day\n";
  }
  return text;
}

TEST_CASE("a load larger than the store rebuilds the per-patient index and keeps it usable") {
  TempFolder folder;
  Result<Store> store = Store::Open(folder.File("medload.db"));
  REQUIRE(store.ok());
  REQUIRE(Import(*store, InputKind::kDispensing, WideDispensingFile(0, 10)).ok());
  const long small_root = PatientIndexRoot(*store);
  REQUIRE(Import(*store, InputKind::kDispensing, WideDispensingFile(10, 10)).ok());
  CHECK(PatientIndexRoot(*store) == small_root);  // a small load updates the index row by row
  const std::string big = folder.Write("big.csv", WideDispensingFile(100, 30000));
  Result<ImportSummary> summary = ImportFile(*store, InputKind::kDispensing, big, {});
  REQUIRE(summary.ok());
  CHECK(summary->imported == 30000);
  CHECK(HasPatientIndex(*store));
  CHECK(PatientIndexRoot(*store) != small_root);  // built again after the rows went in
  long visited = 0;
  std::string previous;
  for (const PatientHistory& history : testing::ReadPatients(*store)) {
    CHECK(previous < history.patient_id);
    previous = history.patient_id;
    visited += static_cast<long>(history.dispensings.size());
  }
  CHECK(visited == 30020);
  CHECK(store->DispensingsOf("P5")->size() == 31);
}

TEST_CASE("a rolled-back large load leaves the per-patient index as it was") {
  TempFolder folder;
  Result<Store> store = Store::Open(folder.File("medload.db"));
  REQUIRE(store.ok());
  const long root = PatientIndexRoot(*store);
  const std::string bad =
      folder.Write("bad.csv", WideDispensingFile(0, 30000) + "R-x,P1,2024-01-01,X,0,1,\n");
  ImportOptions strict;
  strict.max_reject_rate = 0;
  Result<ImportSummary> rolled = ImportFile(*store, InputKind::kDispensing, bad, strict);
  REQUIRE(rolled.ok());
  CHECK(rolled->rolled_back);
  CHECK(HasPatientIndex(*store));
  CHECK(PatientIndexRoot(*store) == root);
  CHECK(store->Summary()->dispensings == 0);
}

TEST_CASE("a storage failure names the file and says nothing of it was stored") {
  TempFolder folder;
  Result<Store> store = Store::Open(folder.File("medload.db"));
  REQUIRE(store.ok());
  // The store allows no more pages than it has: the file's rows cannot be written.
  sqlite3_exec(store->handle(), "PRAGMA max_page_count = 1", nullptr, nullptr, nullptr);
  Result<ImportSummary> summary = Import(*store, InputKind::kDispensing, WideDispensingFile(0, 2000));
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().code() == StatusCode::kInput);
  CHECK(summary.status().message() ==
        "dispensing.csv: store: database or disk is full (the store's disk is full, or a file size limit was "
        "reached); nothing from this file was stored");
  CHECK(Count(*store, "SELECT COUNT(*) FROM dispensings") == 0);
  CHECK(Count(*store, "SELECT COUNT(*) FROM import_runs") == 0);
}

// The second of two imports waits for the first one's whole transaction. The store's
// default wait (30 s) is a product setting that a slow machine (a loaded CI runner, a
// sanitizer build) can exceed for 20,000 rows; these tests are about both completing, not
// about how fast, so they wait as long as it takes, and report why a side failed.
StoreOptions Patient() {
  StoreOptions options;
  options.busy_timeout_ms = 3600 * 1000;
  return options;
}

TEST_CASE("two imports into one store at the same time both complete") {
  TempFolder folder;
  const std::string db = folder.File("medload.db");
  { REQUIRE(Store::Open(db).ok()); }
  const std::string a = folder.Write("a.csv", DispensingFile(0, 20000));
  const std::string b = folder.Write("b.csv", DispensingFile(20000, 20000));
  long imported[2] = {};
  std::string failure[2] = {"did not run", "did not run"};
  const auto run = [&](int i, const std::string& file) {
    Result<Store> store = Store::Open(db, Patient());
    if (!store.ok()) {
      failure[i] = store.status().message();
      return;
    }
    Result<ImportSummary> summary = ImportFile(*store, InputKind::kDispensing, file, {});
    failure[i] = summary.ok() ? "" : summary.status().message();
    if (summary.ok()) imported[i] = summary->imported;
  };
  std::thread first(run, 0, a);
  std::thread second(run, 1, b);
  first.join();
  second.join();
  CHECK(failure[0] == "");
  CHECK(failure[1] == "");
  CHECK(imported[0] == 20000);
  CHECK(imported[1] == 20000);
  Result<Store> store = Store::Open(db);
  REQUIRE(store.ok());
  CHECK(store->Summary()->dispensings == 40000);
}

TEST_CASE("two processes importing into one store at the same time both complete") {
  TempFolder folder;
  const std::string db = folder.File("medload.db");
  { REQUIRE(Store::Open(db).ok()); }
  const std::string files[2] = {folder.Write("a.csv", DispensingFile(0, 20000)),
                                folder.Write("b.csv", DispensingFile(20000, 20000))};
  pid_t children[2] = {};
  for (int i = 0; i < 2; ++i) {
    children[i] = fork();
    REQUIRE(children[i] >= 0);
    if (children[i] == 0) {
      Result<Store> store = Store::Open(db, Patient());
      Status status = store.status();
      if (store.ok()) {
        Result<ImportSummary> summary = ImportFile(*store, InputKind::kDispensing, files[i], {});
        status = summary.status();
      }
      // Why a child failed, for the parent to show.
      std::ofstream(folder.File("child" + std::to_string(i) + ".txt")) << status.message();
      _exit(status.ok() ? 0 : 1);
    }
  }
  for (int i = 0; i < 2; ++i) {
    int status = 0;
    REQUIRE(waitpid(children[i], &status, 0) == children[i]);
    std::ifstream reason(folder.File("child" + std::to_string(i) + ".txt"));
    const std::string message((std::istreambuf_iterator<char>(reason)), std::istreambuf_iterator<char>());
    CAPTURE(message);
    CHECK(WIFEXITED(status));
    CHECK(WEXITSTATUS(status) == 0);
  }
  Result<Store> store = Store::Open(db);
  REQUIRE(store.ok());
  CHECK(store->Summary()->dispensings == 40000);
}

TEST_CASE("an import killed mid-transaction leaves the store intact and a re-run completes it") {
  TempFolder folder;
  const std::string db = folder.File("medload.db");
  const std::string file = folder.Write("big.csv", WideDispensingFile(0, 30000));
  {
    Result<Store> store = Store::Open(db);
    REQUIRE(store.ok());
    REQUIRE(Import(*store, InputKind::kDispensing, DispensingFile(100000, 10)).ok());
  }
  long root = 0;
  {
    Result<Store> store = Store::Open(db);
    REQUIRE(store.ok());
    root = PatientIndexRoot(*store);
  }
  int ready[2];
  REQUIRE(pipe(ready) == 0);
  const pid_t child = fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    Result<Store> store = Store::Open(db);
    ImportOptions options;
    options.progress_every = 20000;  // two thirds through the file, inside its transaction
    options.progress = [&](long, uint64_t, uint64_t) {
      const ssize_t written = write(ready[1], "x", 1);
      (void)written;
      for (;;) pause();
    };
    if (store.ok()) (void)ImportFile(*store, InputKind::kDispensing, file, options);
    _exit(0);
  }
  // Only the child may hold the write end: if it ends without reaching the pause, the read
  // sees the end of the pipe and the test fails instead of waiting for ever.
  close(ready[1]);
  char signal_byte = 0;
  const bool paused = read(ready[0], &signal_byte, 1) == 1;
  kill(child, SIGKILL);
  int status = 0;
  REQUIRE(waitpid(child, &status, 0) == child);
  close(ready[0]);
  REQUIRE(paused);
  CHECK(WIFSIGNALED(status));

  Result<Store> store = Store::Open(db);
  REQUIRE(store.ok());
  sqlite3_stmt* check = nullptr;
  REQUIRE(sqlite3_prepare_v2(store->handle(), "PRAGMA integrity_check", -1, &check, nullptr) == SQLITE_OK);
  REQUIRE(sqlite3_step(check) == SQLITE_ROW);
  CHECK(std::string(reinterpret_cast<const char*>(sqlite3_column_text(check, 0))) == "ok");
  sqlite3_finalize(check);
  CHECK(store->Summary()->dispensings == 10);  // only the earlier, committed file
  CHECK(HasPatientIndex(*store));  // dropped inside the killed transaction: back again
  CHECK(PatientIndexRoot(*store) == root);
  CHECK(store->Summary()->import_runs == 1);
  Result<ImportSummary> rerun = ImportFile(*store, InputKind::kDispensing, file, {});
  REQUIRE(rerun.ok());
  CHECK(rerun->imported == 30000);
  CHECK(store->Summary()->dispensings == 30010);
}

}  // TEST_SUITE

}  // namespace medload
