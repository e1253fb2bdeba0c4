// `medload import` as a process: killed at random points, out of disk space, beside other
// imports and a report, and fed hostile files. Runs the real binary (MEDLOAD_BINARY).
#include <doctest/doctest.h>
#include <nlohmann/json.hpp>
#include <sqlite3.h>
#include <sys/stat.h>

#include <chrono>
#include <random>
#include <set>
#include <thread>

#include "cli/medload_process.h"
#include "cli/output_checks.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

// `rows` valid dispensing rows whose record ids start with `prefix`.
std::string DispensingRows(const std::string& prefix, int rows) {
  std::string text = "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply,dosage\n";
  for (int i = 0; i < rows; ++i) {
    text += prefix + std::to_string(i) + ",P" + std::to_string(i % 211) + ",XA1,2024-0" +
            std::to_string(1 + i % 9) + "-" + std::to_string(10 + i % 18) +
            ",Amitriptyline 10mg tablets,28,28,one at night\n";
  }
  return text;
}

// One number from the store, read through a separate connection as another program would.
long QueryNumber(const std::string& db_path, const std::string& sql, const std::string& bound = "") {
  sqlite3* db = nullptr;
  long value = -1;
  if (sqlite3_open_v2(db_path.c_str(), &db, SQLITE_OPEN_READWRITE, nullptr) == SQLITE_OK) {
    sqlite3_busy_timeout(db, 600000);
    sqlite3_stmt* stmt = nullptr;
    if (sqlite3_prepare_v2(db, sql.c_str(), -1, &stmt, nullptr) == SQLITE_OK) {
      if (!bound.empty()) sqlite3_bind_text(stmt, 1, bound.c_str(), -1, SQLITE_TRANSIENT);
      if (sqlite3_step(stmt) == SQLITE_ROW) value = static_cast<long>(sqlite3_column_int64(stmt, 0));
    }
    sqlite3_finalize(stmt);
  }
  sqlite3_close(db);
  return value;
}

std::string IntegrityCheck(const std::string& db_path) {
  sqlite3* db = nullptr;
  std::string result = "cannot open";
  if (sqlite3_open_v2(db_path.c_str(), &db, SQLITE_OPEN_READWRITE, nullptr) == SQLITE_OK) {
    sqlite3_busy_timeout(db, 600000);
    sqlite3_stmt* stmt = nullptr;
    if (sqlite3_prepare_v2(db, "PRAGMA integrity_check", -1, &stmt, nullptr) == SQLITE_OK &&
        sqlite3_step(stmt) == SQLITE_ROW) {
      result = reinterpret_cast<const char*>(sqlite3_column_text(stmt, 0));
    }
    sqlite3_finalize(stmt);
  }
  sqlite3_close(db);
  return result;
}

long RowsWithPrefix(const std::string& db_path, const std::string& prefix) {
  return QueryNumber(db_path, "SELECT COUNT(*) FROM dispensings WHERE substr(record_id, 1, length(?1)) = ?1",
                     prefix);
}

}  // namespace

TEST_SUITE("cli/cmd_import") {

TEST_CASE("an import killed at random points leaves a whole store with all or none of the file") {
  constexpr int kKills = 24;
  constexpr int kRows = 4000;
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string db = folder.File("medload.db");
  std::vector<std::string> files;
  for (int i = 0; i < kKills; ++i) {
    files.push_back(folder.Write("k" + std::to_string(i) + ".csv", DispensingRows("K" + std::to_string(i) + "-", kRows)));
  }
  // The same files unkilled, into another store: the counts to reach, and how long one
  // import takes here (only to spread the kill points over it; nothing is asserted on time).
  const auto started = std::chrono::steady_clock::now();
  ProcessResult reference =
      RunMedload({"--db", "reference.db", "--quiet", "--format", "json", "import", "dispensing", files[0]}, run);
  const auto one_import = std::chrono::steady_clock::now() - started;
  REQUIRE(reference.exit_code == 0);
  const nlohmann::json unkilled = nlohmann::json::parse(reference.out)["files"][0];
  REQUIRE(unkilled["imported"] == kRows);
  REQUIRE(RunMedload({"--db", "medload.db", "--quiet", "import", "dispensing",
                      folder.Write("base.csv", DispensingRows("B-", 50))},
                     run)
              .exit_code == 0);

  std::mt19937 random(20240917);  // seeded: the same kill points on every run
  const auto span_us = std::max<long>(1000, static_cast<long>(
      std::chrono::duration_cast<std::chrono::microseconds>(one_import).count()));
  std::uniform_int_distribution<long> delay_us(0, span_us);
  long expected = 50;
  int killed_midway = 0;
  std::vector<bool> complete(kKills, false);
  for (int i = 0; i < kKills; ++i) {
    CAPTURE(i);
    const pid_t child = StartMedload({"--db", "medload.db", "--quiet", "import", "dispensing", files[static_cast<size_t>(i)]}, run);
    REQUIRE(child > 0);
    std::this_thread::sleep_for(std::chrono::microseconds(delay_us(random)));
    kill(child, SIGKILL);
    const ProcessResult result = WaitMedload(child, run);
    CHECK((result.signal == SIGKILL || result.exit_code == 0));  // killed, or done before
    CHECK(IntegrityCheck(db) == "ok");
    const long rows = RowsWithPrefix(db, "K" + std::to_string(i) + "-");
    CHECK((rows == 0 || rows == kRows));  // all or none, never part
    complete[static_cast<size_t>(i)] = rows == kRows;
    if (rows == 0) ++killed_midway;
    expected += rows;
    CHECK(QueryNumber(db, "SELECT COUNT(*) FROM dispensings") == expected);
    CHECK(QueryNumber(db, "SELECT COUNT(*) FROM import_runs WHERE outcome <> 'committed'") == 0);
  }
  MESSAGE(kKills << " kills, " << killed_midway << " before the commit, " << kKills - killed_midway
                 << " after it");

  // A re-run of every file completes the killed ones and finds the others already stored.
  std::vector<std::string> args = {"--db", "medload.db", "--quiet", "--format", "json", "import", "dispensing"};
  args.insert(args.end(), files.begin(), files.end());
  ProcessResult rerun = RunMedload(args, run);
  REQUIRE(rerun.exit_code == 0);
  const nlohmann::json summary = nlohmann::json::parse(rerun.out);
  REQUIRE(summary["files"].size() == static_cast<size_t>(kKills));
  for (size_t i = 0; i < files.size(); ++i) {
    CAPTURE(i);
    const nlohmann::json& file = summary["files"][i];
    CHECK(file["read"] == unkilled["read"]);
    CHECK(file["rejected"] == unkilled["rejected"]);
    // A killed file goes in as the unkilled import did; a completed one is all duplicates.
    CHECK(file["imported"] == (complete[i] ? 0 : unkilled["imported"].get<long>()));
    CHECK(file["duplicates"] == (complete[i] ? kRows : 0));
    CHECK(RowsWithPrefix(db, "K" + std::to_string(i) + "-") == RowsWithPrefix(folder.File("reference.db"), "K0-"));
  }
  CHECK(QueryNumber(db, "SELECT COUNT(*) FROM dispensings") == 50 + kKills * kRows);
  CHECK(IntegrityCheck(db) == "ok");
}

TEST_CASE("a full disk fails the import with exit 2, names the file and stores nothing of it") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string db = folder.File("medload.db");
  REQUIRE(RunMedload({"--db", "medload.db", "--quiet", "import", "dispensing",
                      folder.Write("first.csv", DispensingRows("F-", 20))}, run)
              .exit_code == 0);
  const std::string big = folder.Write("big.csv", DispensingRows("G-", 20000));
  struct stat info {};
  REQUIRE(::stat(db.c_str(), &info) == 0);
  // Writes past the store file's size plus 256 KiB fail (EFBIG; SIGXFSZ is ignored), as
  // on a disk that fills up while the file's rows are being written. Source: POSIX
  // setrlimit(), RLIMIT_FSIZE.
  ProcessOptions limited = run;
  limited.file_size_limit = static_cast<rlim_t>(info.st_size) + 256 * 1024;
  ProcessResult full = RunMedload({"--db", "medload.db", "import", "dispensing", big}, limited);
  CHECK(full.signal == 0);
  CHECK(full.exit_code == 2);
  CHECK(full.err.find("medload: " + big + ": store: ") != std::string::npos);
  CHECK(full.err.find("a file size limit was reached") != std::string::npos);
  CHECK(full.err.find("nothing from this file was stored") != std::string::npos);
  CHECK(IntegrityCheck(db) == "ok");
  CHECK(RowsWithPrefix(db, "G-") == 0);
  CHECK(RowsWithPrefix(db, "F-") == 20);
  CHECK(QueryNumber(db, "SELECT COUNT(*) FROM import_runs") == 1);
  // With space again, the same file goes in whole.
  ProcessResult again = RunMedload({"--db", "medload.db", "--quiet", "import", "dispensing", big}, run);
  CHECK(again.exit_code == 0);
  CHECK(RowsWithPrefix(db, "G-") == 20000);
}

TEST_CASE("two imports and a report at the same time give counts that add up and a report of one snapshot") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string db = folder.File("medload.db");
  REQUIRE(RunMedload({"--db", "medload.db", "--quiet", "import", "practices",
                      folder.Write("practices.csv", "practice,name,network,list_size\nXA1,Invented Alder,Invented Net,900\n")},
                     run)
              .exit_code == 0);
  REQUIRE(RunMedload({"--db", "medload.db", "--quiet", "import", "dispensing",
                      folder.Write("base.csv", DispensingRows("B-", 500))}, run)
              .exit_code == 0);
  folder.Write("network.json",
               R"({"title":"Invented","network":"Invented Net","on":"2024-09-30","months":2,"criteria":["items>=1"]})");
  const std::string a = folder.Write("a.csv", DispensingRows("A-", 3000));
  const std::string b = folder.Write("b.csv", DispensingRows("C-", 3000));
  const pid_t first = StartMedload({"--db", "medload.db", "--quiet", "import", "dispensing", a}, run, "a");
  const pid_t second = StartMedload({"--db", "medload.db", "--quiet", "import", "dispensing", b}, run, "b");
  const pid_t report = StartMedload({"--db", "medload.db", "--quiet", "report", "--config", "network.json", "--out", "out"},
                                    run, "report");
  const ProcessResult a_done = WaitMedload(first, run, "a");
  const ProcessResult b_done = WaitMedload(second, run, "b");
  const ProcessResult report_done = WaitMedload(report, run, "report");
  CHECK_MESSAGE(a_done.exit_code == 0, a_done.err);
  CHECK_MESSAGE(b_done.exit_code == 0, b_done.err);
  REQUIRE_MESSAGE(report_done.exit_code == 0, report_done.err);
  CHECK(QueryNumber(db, "SELECT COUNT(*) FROM dispensings") == 6500);
  CHECK(QueryNumber(db, "SELECT COALESCE(SUM(imported), 0) FROM import_runs WHERE kind = 'dispensing'") == 6500);
  CHECK(IntegrityCheck(db) == "ok");
  // The report saw the store before, between or after the imports, never half of one.
  const nlohmann::json provenance = nlohmann::json::parse(ReadWholeFile(folder.File("out/run.json")));
  const long seen = provenance["data"]["dispensings"];
  CHECK(std::set<long>{500, 3500, 6500}.count(seen) == 1);
  CHECK(provenance["data"]["counting_dispensings"] == seen);
  CHECK(provenance["data"]["not_counting_dispensings"] == 0);
  const long runs = provenance["data"]["import_runs"];
  CHECK(runs == 2 + (seen - 500) / 3000);  // practices, base, and each import it saw
}

TEST_CASE("hostile bytes in a file are rejected row by row and the counts still add up") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  std::string text = "record_id,patient_id,practice,dispensed_on,product,quantity\n";
  text += "H1,P1,XA1,2024-01-02,Amlodipine 5mg tablets,28\n";
  text += std::string("H2,P") + '\0' + "2,XA1,2024-01-02,Amlodipine 5mg tablets,28\n";  // a NUL byte
  text += "H3,P3,XA1,2024-01-02,Amlodipine \xC3\x28 tablets,28\n";                 // invalid UTF-8
  text += "H4,P4,XA1,2024-01-02," + std::string(2 * 1024 * 1024, 'x') + ",28\n";    // a huge field
  text += "H5,P5,XA1,2024-01-02,Amlodipine 5mg tablets,28" + std::string(2000000, ',') + "\n";  // two million columns
  text += "@SUM(A1),=HYPERLINK(1),XA1,2024-02-30,+X,28\n";  // formula cells, rejected (date)
  text += "=cmd|' /C calc'!A0,P9,XA1,2024-13-01,X,1\n";       // and again
  text += "H7,<script>alert(1)</script>,XA1,2024-01-02,Amlodipine 5mg tablets,28\n";
  text += "H8,P8,XA1,2024-01-02,Amlodipine 5mg tablets,-3\n";
  ProcessResult result = RunMedload({"--db", "medload.db", "--quiet", "--format", "json", "import", "dispensing",
                                     folder.Write("hostile.csv", text), "--max-reject-rate", "1",
                                     "--rejects", "rejects.csv"},
                                    run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  const nlohmann::json summary = nlohmann::json::parse(result.out);
  CHECK(summary["read"] == 9);
  CHECK(summary["read"].get<long>() == summary["imported"].get<long>() + summary["duplicates"].get<long>() +
                                           summary["rejected"].get<long>());
  CHECK(summary["rejected"] == 7);
  CHECK(summary["reasons"]["control_character"] == 1);  // the NUL byte
  // Every cell of the rejects file that a spreadsheet would run as a formula is neutralised.
  const std::string rejects = ReadWholeFile(folder.File("rejects.csv"));
  CHECK(rejects.rfind("\"# CAUTION: ", 0) == 0);
  CHECK_FALSE(HasFormulaCell(rejects.substr(rejects.find('\n') + 1)));
  CHECK(rejects.find("'@SUM(A1)") != std::string::npos);
  CHECK(rejects.find("'=cmd") != std::string::npos);
  // Over-long rows are kept in part only (the first MiB of each of the two huge rows).
  CHECK(rejects.size() < 2 * 1024 * 1024 + 64 * 1024);
  struct stat info {};
  REQUIRE(::stat(folder.File("rejects.csv").c_str(), &info) == 0);
  CHECK((info.st_mode & 0777) == 0600);  // rejected rows carry patient identifiers
}

TEST_CASE("CR-only line ends are read as line ends") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string text =
      "record_id,patient_id,dispensed_on,product,quantity\rR1,P1,2024-01-02,X,1\rR2,P2,2024-01-03,X,2\r";
  ProcessResult result = RunMedload({"--db", "medload.db", "--quiet", "--format", "json", "import", "dispensing",
                                     folder.Write("cr.csv", text), "--max-reject-rate", "1"},
                                    run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  const nlohmann::json summary = nlohmann::json::parse(result.out);
  CHECK(summary["read"].get<long>() == summary["imported"].get<long>() + summary["duplicates"].get<long>() +
                                           summary["rejected"].get<long>());
  CHECK(summary["read"] == 2);
  CHECK(summary["imported"] == 2);
}

// A FHIR dispense of `product` with `status` (HL7 FHIR R4 MedicationDispense).
std::string Dispense(const std::string& id, const std::string& product, const std::string& status) {
  return "{\"resourceType\":\"MedicationDispense\",\"id\":\"" + id + "\",\"status\":\"" + status +
         "\",\"subject\":{\"reference\":\"Patient/P9\"},\"medicationCodeableConcept\":{\"text\":\"" + product +
         "\"},\"quantity\":{\"value\":28,\"unit\":\"tablet\"},\"whenHandedOver\":\"2024-03-02\"}\n";
}

// Invented product names beside bundled ones; the kinds are the resolver's (docs/formulary.md).
TEST_CASE("the import counts apart the stored dispensings of products not fully recognised") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string file = folder.Write("d.csv",
                                        "record_id,patient_id,dispensed_on,product,quantity\n"
                                        "R1,P1,2024-01-02,Amitriptyline 10mg tablets,28\n"
                                        "R2,P1,2024-01-02,Zorblaxine 5mg tablets,28\n"
                                        "R3,P2,2024-01-03,Zorblaxine 5mg tablets,28\n"
                                        "R4,P2,2024-01-03,Frobazine 10mg and paracetamol 500mg tablets,28\n"
                                        "R5,P3,2024-01-04,Oxybutinin 5mg tabs,28\n");
  std::vector<std::string> args = {"--db", "medload.db", "--formulary", MEDLOAD_SOURCE_FORMULARY, "--quiet",
                                   "--format", "json", "import", "dispensing", file};
  ProcessResult result = RunMedload(args, run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  nlohmann::json summary = nlohmann::json::parse(result.out);
  const nlohmann::json expected = {{"approximate", 1}, {"partial", 1}, {"unmatched", 2}};
  CHECK(summary["product_flags"] == expected);
  CHECK(summary["files"][0]["product_flags"] == expected);
  // Imported again: every row a duplicate, nothing stored, nothing flagged.
  result = RunMedload(args, run);
  REQUIRE(result.exit_code == 0);
  CHECK(nlohmann::json::parse(result.out)["product_flags"] == nlohmann::json::object());
  // A dispense whose status does not count is stored but not flagged, as it is not counted.
  args.back() = folder.Write("d.ndjson", "{\"resourceType\":\"Patient\",\"id\":\"P9\"}\n" +
                                             Dispense("f1", "Oxybutinin 5mg tabs", "completed") +
                                             Dispense("f2", "Zorblaxine 5mg tablets", "cancelled"));
  result = RunMedload(args, run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  summary = nlohmann::json::parse(result.out);
  CHECK(summary["imported"] == 3);
  CHECK(summary["product_flags"] == nlohmann::json{{"approximate", 1}});
}

TEST_CASE("an import with a formulary that does not load still imports and says the products were not checked") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ProcessResult result =
      RunMedload({"--db", "medload.db", "--formulary", folder.File("no-such-formulary"), "--quiet", "import",
                  "dispensing", folder.Write("d.csv", "record_id,patient_id,dispensed_on,product,quantity\nR1,P1,2024-01-02,X,1\n")},
                 run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  CHECK(result.err == "medload: products not checked: formulary " + folder.File("no-such-formulary") +
                          " does not load (medload formulary check lists its faults)\n");
  CHECK(QueryNumber(folder.File("medload.db"), "SELECT COUNT(*) FROM dispensings") == 1);
}

TEST_CASE("deeply nested or truncated JSON in a column map and in FHIR input is an error, not a crash") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const std::string deep = std::string(100000, '[') + std::string(100000, ']');
  for (const std::string& map : {deep, std::string(R"({"patient_id": "NHS)"), std::string("{\"a\":")}) {
    folder.Write("columns.json", map);
    ProcessResult result = RunMedload({"--db", "medload.db", "import", "dispensing",
                                       folder.Write("d.csv", "patient_id,dispensed_on,product,quantity\nP1,2024-01-01,X,1\n"),
                                       "--columns", "columns.json"},
                                      run);
    CHECK(result.signal == 0);
    CHECK(result.exit_code == 2);
    CHECK(result.err.find("columns.json") != std::string::npos);
  }
  const std::string fhir = "{\"resourceType\":\"MedicationDispense\",\"contained\":" + deep + "}\n" +
                           "{\"resourceType\":\"MedicationDispense\",\"subject\":{\"reference\n" +
                           R"({"resourceType":"MedicationDispense","id":"m1","status":"completed","subject":{"reference":"Patient/P1"},)"
                           R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})" "\n";
  ProcessResult result = RunMedload({"--db", "medload.db", "--quiet", "--format", "json", "import", "dispensing",
                                     folder.Write("d.ndjson", fhir), "--max-reject-rate", "1"},
                                    run);
  CHECK(result.signal == 0);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  const nlohmann::json summary = nlohmann::json::parse(result.out);
  CHECK(summary["read"] == 3);
  CHECK(summary["imported"] == 1);
  CHECK(summary["rejected"] == 2);
}

}  // TEST_SUITE

}  // namespace medload
