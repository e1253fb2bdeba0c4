#include "medload/store/store.h"

#include <doctest/doctest.h>
#include <sqlite3.h>
#include <sys/stat.h>
#include <unistd.h>

#include <thread>

#include "store/sqlite.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

// Runs SQL on a separate raw connection (to look at the file as another program would).
std::string QueryText(const std::string& path, const char* sql) {
  sqlite3* db = nullptr;
  sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr);
  sqlite3_stmt* stmt = nullptr;
  std::string result;
  if (sqlite3_prepare_v2(db, sql, -1, &stmt, nullptr) == SQLITE_OK && sqlite3_step(stmt) == SQLITE_ROW) {
    const unsigned char* text = sqlite3_column_text(stmt, 0);
    result = text != nullptr ? reinterpret_cast<const char*>(text) : "";
  }
  sqlite3_finalize(stmt);
  sqlite3_close(db);
  return result;
}

void ExecRaw(const std::string& path, const char* sql) {
  sqlite3* db = nullptr;
  sqlite3_open(path.c_str(), &db);
  sqlite3_exec(db, sql, nullptr, nullptr, nullptr);
  sqlite3_close(db);
}

}  // namespace

TEST_SUITE("store/store") {

TEST_CASE("opening a new store creates the schema at the current version in WAL mode") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
    Result<int> version = store->SchemaVersion();
    REQUIRE(version.ok());
    CHECK(*version == kStoreSchemaVersion);
  }
  CHECK(QueryText(path, "PRAGMA journal_mode") == "wal");
  for (const char* table : {"practices", "patients", "dispensings", "reviews", "import_runs",
                            "rejected_rows", "product_resolutions", "runs", "patient_identifiers",
                            "fhir_medications"}) {
    CAPTURE(table);
    const std::string sql =
        std::string("SELECT name FROM sqlite_schema WHERE type = 'table' AND name = '") + table + "'";
    CHECK(QueryText(path, sql.c_str()) == table);
  }
  CHECK(QueryText(path, "SELECT name FROM sqlite_schema WHERE name = 'dispensings_by_patient'") ==
        "dispensings_by_patient");
}

TEST_CASE("reopening a store keeps its data and does not migrate again") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
    REQUIRE(store->SaveRun("cohort", "items>=10", "2024-01-31", "{\"n\":1}").ok());
  }
  Result<Store> again = Store::Open(path);
  REQUIRE(again.ok());
  Result<std::optional<std::string>> run = again->LatestRun("cohort", "items>=10", "2024-02-29");
  REQUIRE(run.ok());
  CHECK(run->value_or("") == "{\"n\":1}");
}

TEST_CASE("a store in a folder that does not exist is an input error naming the path") {
  TempFolder folder;
  const std::string path = folder.File("no-such-folder/medload.db");
  Result<Store> store = Store::Open(path);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().code() == StatusCode::kInput);
  CHECK(store.status().message().find(path) != std::string::npos);
}

TEST_CASE("a read-only store file is an input error naming the path") {
  if (geteuid() == 0) {
    MESSAGE("skipped: file permissions do not bind the superuser");
    return;
  }
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  { REQUIRE(Store::Open(path).ok()); }
  REQUIRE(::chmod(path.c_str(), 0444) == 0);
  Result<Store> store = Store::Open(path);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().code() == StatusCode::kInput);
  CHECK(store.status().message().find(path) != std::string::npos);
}

TEST_CASE("a file that is not a SQLite database is an input error naming the path") {
  TempFolder folder;
  const std::string path = folder.Write("notes.db", std::string(4096, 'x'));
  Result<Store> store = Store::Open(path);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().code() == StatusCode::kInput);
  CHECK(store.status().message().find(path) != std::string::npos);
}

TEST_CASE("a file that is not a medload store is refused for reading, saying what it is") {
  TempFolder folder;
  folder.Write("empty.db", "");
  folder.Write("notes.db", "plain text notes, not a database\n");
  ExecRaw(folder.File("other.db"), "CREATE TABLE contacts (name TEXT); INSERT INTO contacts VALUES ('x');");
  ExecRaw(folder.File("blank.db"), "CREATE TABLE t (x); DROP TABLE t;");
  struct Case {
    std::string file;
    std::string message;
  };
  const Case cases[] = {
      {"empty.db", "\"" + folder.File("empty.db") +
                       "\" is an empty file, not a medload store: import data into it first, or give --db the path of a store"},
      {"notes.db", "\"" + folder.File("notes.db") +
                       "\" is not a medload store: it is not a SQLite database (give --db the path of a store made by "
                       "'medload import')"},
      {"other.db", "\"" + folder.File("other.db") +
                       "\" is a SQLite database without medload's tables (another program's file?); give --db the path "
                       "of a store made by 'medload import'"},
      {"blank.db", "\"" + folder.File("blank.db") +
                       "\" is an empty SQLite database, not a medload store: import data into it first, or give --db "
                       "the path of a store"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.file);
    const std::string before = QueryText(folder.File(c.file), "PRAGMA journal_mode");
    Result<Store> store = Store::Open(folder.File(c.file), StoreOptions{30000, true, true});
    REQUIRE_FALSE(store.ok());
    CHECK(store.status().code() == StatusCode::kInput);
    CHECK(store.status().message() == c.message);
    CHECK(QueryText(folder.File(c.file), "PRAGMA journal_mode") == before);  // not switched to WAL
  }
  // An import never turns another program's database into a store; an empty file it may.
  Result<Store> other = Store::Open(folder.File("other.db"));
  REQUIRE_FALSE(other.ok());
  CHECK(other.status().message() == cases[2].message);
  CHECK(QueryText(folder.File("other.db"), "SELECT COUNT(*) FROM sqlite_master") == "1");
  CHECK(Store::Open(folder.File("empty.db")).ok());
}

TEST_CASE("a store that may only be read is opened read-only and writes nothing") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
    REQUIRE(ExecSql(store->handle(),
                    "INSERT INTO import_runs (id, kind, file, started) VALUES (1, 'dispensing', 'f', 'now');"
                    "INSERT INTO dispensings (dedup_key, patient_id, dispensed_on, product, quantity, source_line,"
                    " run_id) VALUES ('r:1', 'P1', '2024-01-05', 'X', 28, 2, 1)")
                .ok());
  }
  Result<Store> store = Store::Open(path, StoreOptions{30000, true, true});
  REQUIRE(store.ok());
  CHECK_FALSE(store->read_only());  // this user may write it: opened as usual
  REQUIRE(::chmod(path.c_str(), 0444) == 0);
  if (geteuid() == 0) {
    MESSAGE("the superuser may write any file: the rest needs another user");
    return;
  }
  Result<Store> read_only = Store::Open(path, StoreOptions{30000, true, true});
  REQUIRE(read_only.ok());
  CHECK(read_only->read_only());
  CHECK(read_only->DispensingsOf("P1")->size() == 1);
  CHECK(read_only->RefreshPackedHistories().ok());
  CHECK_FALSE(read_only->PackedHistoriesCurrent().value());
  CHECK(read_only->SaveRun("review", "k", "2024-01-31", "{}").ok());
  CHECK_FALSE(read_only->LatestRun("review", "k", "2025-01-01")->has_value());
  CHECK_FALSE(read_only->PackHistoriesNow().ok());
}

TEST_CASE("packing now packs once, then finds the copy current") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  REQUIRE(ExecSql(store->handle(),
                  "INSERT INTO import_runs (id, kind, file, started) VALUES (1, 'dispensing', 'f', 'now');"
                  "INSERT INTO dispensings (dedup_key, patient_id, dispensed_on, product, quantity, source_line,"
                  " run_id) VALUES ('r:1', 'P1', '2024-01-05', 'X', 28, 2, 1), ('r:2', 'P2', '2024-01-05', 'X', 28,"
                  " 3, 1)")
              .ok());
  CHECK_FALSE(store->PackedHistoriesCurrent().value());
  const PackOutcome first = store->PackHistoriesNow().value();
  CHECK_FALSE(first.was_current);
  CHECK(first.whole);
  CHECK(first.patients == 2);
  CHECK(store->PackedHistoriesCurrent().value());
  const PackOutcome again = store->PackHistoriesNow().value();
  CHECK(again.was_current);
  CHECK(again.patients == 0);
}

TEST_CASE("a store from a newer medload is refused rather than damaged") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  { REQUIRE(Store::Open(path).ok()); }
  ExecRaw(path, "PRAGMA user_version = 99");
  Result<Store> store = Store::Open(path);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().message().find("schema version 99") != std::string::npos);
}

TEST_CASE("must_exist refuses a missing store without creating it") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  StoreOptions options;
  options.must_exist = true;
  Result<Store> store = Store::Open(path, options);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().message().find(path) != std::string::npos);
  struct stat info {};
  CHECK(::stat(path.c_str(), &info) != 0);
}

TEST_CASE("two processes' worth of connections can open a new store at the same time") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  std::string faults[4];
  std::vector<std::thread> threads;
  for (std::string& fault : faults) {
    threads.emplace_back([&path, &fault] {
      Result<Store> store = Store::Open(path);
      fault = store.ok() ? "" : store.status().message();
    });
  }
  for (std::thread& thread : threads) thread.join();
  for (const std::string& fault : faults) CHECK(fault == "");
  CHECK(QueryText(path, "PRAGMA user_version") == std::to_string(kStoreSchemaVersion));
}

TEST_CASE("a saved resolution is found only under its own key and checksum") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  REQUIRE(store->SaveResolution("Amlodipine 5mg tablets", "", "", "sum1", "{\"a\":1}").ok());
  auto hit = store->CachedResolution("Amlodipine 5mg tablets", "", "", "sum1");
  REQUIRE(hit.ok());
  CHECK(hit->value_or("") == "{\"a\":1}");
  auto other_checksum = store->CachedResolution("Amlodipine 5mg tablets", "", "", "sum2");
  REQUIRE(other_checksum.ok());
  CHECK_FALSE(other_checksum->has_value());
  auto other_code = store->CachedResolution("Amlodipine 5mg tablets", "X1", "", "sum1");
  REQUIRE(other_code.ok());
  CHECK_FALSE(other_code->has_value());
  REQUIRE(store->SaveResolution("Amlodipine 5mg tablets", "", "", "sum1", "{\"a\":2}").ok());
  CHECK(store->CachedResolution("Amlodipine 5mg tablets", "", "", "sum1")->value_or("") == "{\"a\":2}");
}

TEST_CASE("the latest run is the newest one strictly before the date, and saves replace") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  REQUIRE(store->SaveRun("report", "net", "2024-01-31", "jan").ok());
  REQUIRE(store->SaveRun("report", "net", "2024-02-29", "feb").ok());
  REQUIRE(store->SaveRun("report", "other", "2024-03-31", "other").ok());
  CHECK(store->LatestRun("report", "net", "2024-03-31")->value_or("") == "feb");
  CHECK(store->LatestRun("report", "net", "2024-02-29")->value_or("") == "jan");
  CHECK_FALSE(store->LatestRun("report", "net", "2024-01-31")->has_value());
  REQUIRE(store->SaveRun("report", "net", "2024-02-29", "feb again").ok());
  CHECK(store->LatestRun("report", "net", "2024-12-31")->value_or("") == "feb again");
}

TEST_CASE("a new store and its -wal and -shm files are readable by their owner only") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  const mode_t old_mask = ::umask(022);
  Result<Store> store = Store::Open(path);
  ::umask(old_mask);
  REQUIRE(store.ok());
  REQUIRE(store->SaveRun("k", "key", "2024-01-01", "{}").ok());  // the WAL now holds a frame
  for (const char* suffix : {"", "-wal", "-shm"}) {
    CAPTURE(suffix);
    struct stat info {};
    REQUIRE(::stat((path + suffix).c_str(), &info) == 0);
    CHECK((info.st_mode & 0777) == 0600);
  }
}

TEST_CASE("reads inside a snapshot do not see what another connection commits meanwhile") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  {
    Result<StoreSnapshot> snapshot = store->BeginSnapshot();
    REQUIRE(snapshot.ok());
    CHECK(store->Summary()->practices == 0);
    // Another writer is not blocked by the snapshot...
    ExecRaw(path, "INSERT INTO practices (practice) VALUES ('XA1')");
    CHECK(QueryText(path, "SELECT COUNT(*) FROM practices") == "1");
    // ...and the snapshot does not see its row.
    CHECK(store->Summary()->practices == 0);
    CHECK(store->Practices()->empty());
    // The resolution cache is not written inside a snapshot (it would take the write lock).
    CHECK(store->SaveResolution("X", "", "", "sum", "{}").ok());
    CHECK_FALSE(store->BeginSnapshot().ok());  // one at a time
  }
  CHECK(store->Summary()->practices == 1);
  CHECK_FALSE(store->CachedResolution("X", "", "", "sum")->has_value());
  REQUIRE(store->SaveResolution("X", "", "", "sum", "{}").ok());
  CHECK(store->CachedResolution("X", "", "", "sum")->has_value());
}

TEST_CASE("a store of schema version 1 migrates to the current version and keeps its dispensings") {
  TempFolder folder;
  const std::string path = folder.File("v1.db");
  // The version 1 dispensings table, as a store written by that schema holds it.
  ExecRaw(path,
          "CREATE TABLE import_runs (id INTEGER PRIMARY KEY, kind TEXT NOT NULL, file TEXT NOT NULL,"
          " started TEXT NOT NULL, finished TEXT, outcome TEXT NOT NULL DEFAULT 'running',"
          " read INTEGER NOT NULL DEFAULT 0, imported INTEGER NOT NULL DEFAULT 0,"
          " duplicates INTEGER NOT NULL DEFAULT 0, rejected INTEGER NOT NULL DEFAULT 0,"
          " not_counted INTEGER NOT NULL DEFAULT 0);"
          "CREATE TABLE dispensings (id INTEGER PRIMARY KEY, dedup_key TEXT NOT NULL UNIQUE,"
          " record_id TEXT NOT NULL DEFAULT '', patient_id TEXT NOT NULL,"
          " practice TEXT NOT NULL DEFAULT '', dispensed_on TEXT NOT NULL,"
          " product TEXT NOT NULL DEFAULT '', code TEXT NOT NULL DEFAULT '',"
          " code_system TEXT NOT NULL DEFAULT '', quantity REAL NOT NULL,"
          " unit TEXT NOT NULL DEFAULT '', days_supply INTEGER, dosage TEXT NOT NULL DEFAULT '',"
          " structured_units_per_day REAL, structured_as_needed INTEGER NOT NULL DEFAULT 0,"
          " status TEXT NOT NULL DEFAULT '', source_file TEXT NOT NULL,"
          " source_line INTEGER NOT NULL, run_id INTEGER NOT NULL REFERENCES import_runs(id));"
          "CREATE INDEX dispensings_by_patient ON dispensings(patient_id, dispensed_on);"
          "CREATE TABLE rejected_rows (id INTEGER PRIMARY KEY, run_id INTEGER NOT NULL REFERENCES"
          " import_runs(id), line INTEGER NOT NULL, reason TEXT NOT NULL, message TEXT NOT NULL,"
          " original_row TEXT NOT NULL);"
          "INSERT INTO import_runs (kind, file, started, outcome) VALUES"
          " ('dispensing', 'old.csv', '2024-01-01T00:00:00Z', 'committed');"
          "INSERT INTO dispensings (dedup_key, record_id, patient_id, dispensed_on, product,"
          " quantity, source_file, source_line, run_id) VALUES"
          " ('r:d1', 'd1', 'P1', '2024-01-05', 'Amlodipine 5mg tablets', 28, 'old.csv', 2, 1);"
          "PRAGMA user_version=1;");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
    CHECK(store->SchemaVersion().value() == kStoreSchemaVersion);
    Result<std::vector<DispensingRecord>> kept = store->DispensingsOf("P1");
    REQUIRE(kept.ok());
    REQUIRE(kept->size() == 1);
    CHECK((*kept)[0].product == "Amlodipine 5mg tablets");
    // Version 3's packed copy starts empty and stale, and packs what version 1 held.
    CHECK_FALSE(store->PackedHistoriesCurrent().value());
    REQUIRE(store->RefreshPackedHistories().ok());
    CHECK(store->PackedHistoriesCurrent().value());
  }
  CHECK(QueryText(path, "SELECT COUNT(*) FROM pragma_table_info('dispensings') WHERE name = 'source_file'") == "0");
  CHECK(QueryText(path, "SELECT patient_id FROM packed_histories") == "P1");
  CHECK(QueryText(path, "SELECT i.file || ':' || d.source_line FROM dispensings d JOIN import_runs i"
                        " ON i.id = d.run_id") == "old.csv:2");
  CHECK(QueryText(path, "SELECT '[' || structured_unit || ']' FROM dispensings") == "[]");
}

TEST_CASE("a store of schema version 3 migrates: its packed copy is dropped, FHIR link tables are added") {
  TempFolder folder;
  const std::string path = folder.File("v3.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
  }
  // Take the store back to what version 3 held, with a packed copy in the old layout.
  ExecRaw(path,
          "DROP TABLE store_shard; DROP TABLE other_shard_coverage; ALTER TABLE import_runs DROP COLUMN other_shards;"
          "DROP INDEX rejected_rows_by_key; ALTER TABLE rejected_rows DROP COLUMN row_key;"
          "ALTER TABLE packed_histories DROP COLUMN dropped;"
          "DROP TABLE patient_identifiers; DROP TABLE fhir_medications;"
          "ALTER TABLE dispensings DROP COLUMN structured_unit;"
          "INSERT INTO packed_histories (patient_id, packed) VALUES ('P1', x'01');"
          "INSERT INTO packed_histories_state (id, newest_dispensing) VALUES (1, NULL);"
          "DROP TRIGGER dispensing_updated_notes_date; DROP TRIGGER dispensing_deleted_notes_date;"
          "DROP TABLE census_figures; DROP TABLE dispensing_edits;"
          "PRAGMA user_version=3;");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  CHECK(store->SchemaVersion().value() == kStoreSchemaVersion);
  CHECK(QueryText(path, "SELECT COUNT(*) FROM packed_histories") == "0");
  CHECK_FALSE(store->PackedHistoriesCurrent().value());
  CHECK(QueryText(path, "SELECT COUNT(*) FROM patient_identifiers") == "0");
  CHECK(QueryText(path, "SELECT COUNT(*) FROM fhir_medications") == "0");
  CHECK(QueryText(path, "SELECT COUNT(*) FROM pragma_table_info('rejected_rows') WHERE name = 'row_key'") == "1");
  CHECK(QueryText(path, "SELECT COUNT(*) FROM pragma_table_info('packed_histories') WHERE name = 'dropped'") == "1");
}

TEST_CASE("a store of schema version 4 migrates: rejected rows get a key, packed histories a count left out") {
  TempFolder folder;
  const std::string path = folder.File("v4.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
  }
  // Version 4 as released: no row_key, no dropped; a rejected row and a packed copy of
  // that layout that claims to be current.
  ExecRaw(path,
          "DROP TABLE store_shard; DROP TABLE other_shard_coverage; ALTER TABLE import_runs DROP COLUMN other_shards;"
          "DROP INDEX rejected_rows_by_key; ALTER TABLE rejected_rows DROP COLUMN row_key;"
          "ALTER TABLE packed_histories DROP COLUMN dropped;"
          "INSERT INTO import_runs (id, kind, file, started) VALUES (1, 'dispensing', 'old.csv', 'then');"
          "INSERT INTO rejected_rows (run_id, line, reason, message, original_row)"
          " VALUES (1, 2, 'bad_date', 'old.csv:2: dispensed_on: bad', 'x');"
          "INSERT INTO packed_histories (patient_id, packed) VALUES ('P1', x'01');"
          "INSERT INTO packed_histories_state (id, newest_dispensing) VALUES (1, NULL);"
          "DROP TRIGGER dispensing_updated_notes_date; DROP TRIGGER dispensing_deleted_notes_date;"
          "DROP TABLE census_figures; DROP TABLE dispensing_edits;"
          "PRAGMA user_version=4;");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  CHECK(store->SchemaVersion().value() == kStoreSchemaVersion);
  // The old rejected row is kept as it was, without a key.
  CHECK(QueryText(path, "SELECT reason || ':' || IFNULL(row_key, 'none') FROM rejected_rows") == "bad_date:none");
  // The packed copy is dropped and stale, so that it is packed again with the bound.
  CHECK(QueryText(path, "SELECT COUNT(*) FROM packed_histories") == "0");
  CHECK_FALSE(store->PackedHistoriesCurrent().value());
  CHECK(QueryText(path, "SELECT COUNT(*) FROM pragma_table_info('packed_histories') WHERE name = 'dropped'") == "1");
}

TEST_CASE("a store of schema version 5 migrates: it holds the whole network, and its runs no other shards' rows") {
  TempFolder folder;
  const std::string path = folder.File("v5.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
  }
  ExecRaw(path, "DROP TABLE store_shard; DROP TABLE other_shard_coverage; ALTER TABLE import_runs DROP COLUMN other_shards;"
                "DROP TRIGGER dispensing_updated_notes_date; DROP TRIGGER dispensing_deleted_notes_date;"
                "DROP TABLE census_figures; DROP TABLE dispensing_edits;"
                "INSERT INTO import_runs (id, kind, file, started) VALUES (1, 'dispensing', 'old.csv', 'then');"
                "PRAGMA user_version=5;");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  CHECK(store->SchemaVersion().value() == kStoreSchemaVersion);
  CHECK_FALSE(store->HeldShard().value().has_value());
  CHECK(store->OtherShardCoverage().value().empty());
  CHECK(QueryText(path, "SELECT other_shards FROM import_runs") == "0");
}

TEST_CASE("a store of schema version 6 migrates: it has no saved census figures, and a later update is noted") {
  TempFolder folder;
  const std::string path = folder.File("v6.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
  }
  ExecRaw(path, "DROP TRIGGER dispensing_updated_notes_date; DROP TRIGGER dispensing_deleted_notes_date;"
                "DROP TABLE census_figures; DROP TABLE dispensing_edits;"
                "PRAGMA user_version=6;");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  CHECK(store->SchemaVersion().value() == kStoreSchemaVersion);
  CHECK(QueryText(path, "SELECT COUNT(*) FROM census_figures") == "0");
  CHECK(QueryText(path, "SELECT COUNT(*) FROM sqlite_schema WHERE type = 'trigger' AND name LIKE 'dispensing_%_notes_date'") == "2");
}

TEST_CASE("a version 4 of a development build, with keyed rejected rows, is refused and left unchanged") {
  TempFolder folder;
  const std::string path = folder.File("dev4.db");
  {
    Result<Store> store = Store::Open(path);
    REQUIRE(store.ok());
  }
  ExecRaw(path,
          "DROP TABLE store_shard; DROP TABLE other_shard_coverage; ALTER TABLE import_runs DROP COLUMN other_shards;"
          "DROP TABLE patient_identifiers; DROP TABLE fhir_medications;"
          "ALTER TABLE dispensings DROP COLUMN structured_unit; PRAGMA user_version=4;");
  Result<Store> store = Store::Open(path);
  REQUIRE_FALSE(store.ok());
  CHECK(store.status().code() == StatusCode::kInput);
  CHECK(store.status().message() == "the store \"" + path +
                                        "\" has a schema version 4 of a development build of medload, which this "
                                        "medload cannot migrate; import its files into a new store");
  CHECK(QueryText(path, "PRAGMA user_version") == "4");
}

TEST_CASE("a peer connection reads the same snapshot, and is refused when it could not") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  ExecRaw(path, "INSERT INTO import_runs (kind, file, started) VALUES ('practices', 'a.csv', 'now');"
                "INSERT INTO practices (practice) VALUES ('XA1')");
  CHECK_FALSE(store->OpenPeer().ok());  // no snapshot open
  {
    Result<StoreSnapshot> snapshot = store->BeginSnapshot();
    REQUIRE(snapshot.ok());
    CHECK(store->InSnapshot());
    Result<Store> peer = store->OpenPeer();
    REQUIRE(peer.ok());
    CHECK(peer->InSnapshot());
    // A practice committed now is seen by neither.
    ExecRaw(path, "INSERT INTO import_runs (kind, file, started) VALUES ('practices', 'b.csv', 'now');"
                  "INSERT INTO practices (practice) VALUES ('XB2')");
    CHECK(store->Practices()->size() == 1);
    CHECK(peer->Practices()->size() == 1);
    // A peer opened after that commit would see it: refused.
    CHECK_FALSE(store->OpenPeer().ok());
  }
  CHECK_FALSE(store->InSnapshot());
  Result<Store> memory = Store::Open(":memory:");
  REQUIRE(memory.ok());
  Result<StoreSnapshot> snapshot = memory->BeginSnapshot();
  REQUIRE(snapshot.ok());
  CHECK_FALSE(memory->OpenPeer().ok());  // nothing for another connection to open
}

TEST_CASE("a moved store keeps working and the moved-from one is empty") {
  Result<Store> opened = Store::Open(":memory:");
  REQUIRE(opened.ok());
  Store store = std::move(opened.value());
  Store moved = std::move(store);
  CHECK(moved.handle() != nullptr);
  CHECK(store.handle() == nullptr);  // NOLINT(bugprone-use-after-move): checking the contract
  CHECK(moved.SaveRun("k", "key", "2024-01-01", "{}").ok());
}

}  // TEST_SUITE

}  // namespace medload
