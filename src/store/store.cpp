// Opening the store, its schema and migrations, and the small key-value caches (product
// resolutions, saved runs). The read API over the imported records is in store_read.cpp.
#include "medload/store/store.h"

#include <sqlite3.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <thread>
#include <utility>

#include "medload/format/private_file.h"
#include "store/sqlite.h"

namespace medload {
namespace {

// Forward migrations: step i takes a store from user_version i to i + 1. Never edit a
// step that has shipped; append a new one.
constexpr std::array<const char*, kStoreSchemaVersion> kMigrations = {
    R"sql(
CREATE TABLE import_runs (
  id INTEGER PRIMARY KEY,
  kind TEXT NOT NULL,
  file TEXT NOT NULL,
  started TEXT NOT NULL,
  finished TEXT,
  outcome TEXT NOT NULL DEFAULT 'running',
  read INTEGER NOT NULL DEFAULT 0,
  imported INTEGER NOT NULL DEFAULT 0,
  duplicates INTEGER NOT NULL DEFAULT 0,
  rejected INTEGER NOT NULL DEFAULT 0,
  not_counted INTEGER NOT NULL DEFAULT 0
);
CREATE TABLE practices (
  practice TEXT PRIMARY KEY,
  name TEXT NOT NULL DEFAULT '',
  network TEXT NOT NULL DEFAULT '',
  list_size INTEGER,
  run_id INTEGER REFERENCES import_runs(id)
);
CREATE TABLE patients (
  patient_id TEXT PRIMARY KEY,
  birth_date TEXT,
  birth_year_only INTEGER NOT NULL DEFAULT 0,
  sex TEXT NOT NULL DEFAULT '',
  practice TEXT NOT NULL DEFAULT '',
  registered_from TEXT,
  registered_to TEXT,
  run_id INTEGER REFERENCES import_runs(id)
);
CREATE TABLE dispensings (
  id INTEGER PRIMARY KEY,
  dedup_key TEXT NOT NULL UNIQUE,
  record_id TEXT NOT NULL DEFAULT '',
  patient_id TEXT NOT NULL,
  practice TEXT NOT NULL DEFAULT '',
  dispensed_on TEXT NOT NULL,
  product TEXT NOT NULL DEFAULT '',
  code TEXT NOT NULL DEFAULT '',
  code_system TEXT NOT NULL DEFAULT '',
  quantity REAL NOT NULL,
  unit TEXT NOT NULL DEFAULT '',
  days_supply INTEGER,
  dosage TEXT NOT NULL DEFAULT '',
  structured_units_per_day REAL,
  structured_as_needed INTEGER NOT NULL DEFAULT 0,
  status TEXT NOT NULL DEFAULT '',
  source_file TEXT NOT NULL,
  source_line INTEGER NOT NULL,
  run_id INTEGER NOT NULL REFERENCES import_runs(id)
);
CREATE INDEX dispensings_by_patient ON dispensings(patient_id, dispensed_on);
CREATE TABLE reviews (
  patient_id TEXT NOT NULL,
  reviewed_on TEXT NOT NULL,
  run_id INTEGER REFERENCES import_runs(id),
  PRIMARY KEY (patient_id, reviewed_on)
) WITHOUT ROWID;
CREATE TABLE rejected_rows (
  id INTEGER PRIMARY KEY,
  run_id INTEGER NOT NULL REFERENCES import_runs(id),
  line INTEGER NOT NULL,
  reason TEXT NOT NULL,
  message TEXT NOT NULL,
  original_row TEXT NOT NULL
);
CREATE INDEX rejected_rows_by_run ON rejected_rows(run_id, line);
CREATE TABLE product_resolutions (
  product TEXT NOT NULL,
  code TEXT NOT NULL,
  code_system TEXT NOT NULL,
  formulary_checksum TEXT NOT NULL,
  resolution TEXT NOT NULL,
  PRIMARY KEY (product, code, code_system, formulary_checksum)
) WITHOUT ROWID;
CREATE TABLE runs (
  id INTEGER PRIMARY KEY,
  kind TEXT NOT NULL,
  criteria_key TEXT NOT NULL,
  run_date TEXT NOT NULL,
  payload TEXT NOT NULL,
  UNIQUE (kind, criteria_key, run_date)
);
)sql",
    // 1 -> 2: a dispensing names its file through its import run (run_id), not in every
    // row; with source_line, (run_id, source_line) is where the row was last read.
    R"sql(
ALTER TABLE dispensings DROP COLUMN source_file;
)sql",
    // 2 -> 3: a packed copy of each patient's counting dispensings, which the ordered pass
    // reads while it is current: while the state row names the newest dispensing. An update
    // or delete of any dispensing removes the state row (an insert raises the newest id).
    // Keyed by patient without a rowid, so that the pass reads it in key order, in place.
    R"sql(
CREATE TABLE packed_histories (
  patient_id TEXT PRIMARY KEY,
  packed BLOB NOT NULL
) WITHOUT ROWID;
CREATE TABLE packed_histories_state (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  newest_dispensing INTEGER
);
CREATE TRIGGER dispensing_updated_unpacks AFTER UPDATE ON dispensings
  BEGIN DELETE FROM packed_histories_state; END;
CREATE TRIGGER dispensing_deleted_unpacks AFTER DELETE ON dispensings
  BEGIN DELETE FROM packed_histories_state; END;
)sql",
    // 3 -> 4: the unit of a structured FHIR dose (mg, administrations...; '' = the
    // quantity's unit), so the packed copy is built again in its new layout; the
    // identifiers of FHIR Patient resources, through which a dispense's subject given by
    // identifier or urn:uuid is found; and the FHIR Medication resources dispenses name.
    R"sql(
ALTER TABLE dispensings ADD COLUMN structured_unit TEXT NOT NULL DEFAULT '';
DELETE FROM packed_histories;
DELETE FROM packed_histories_state;
CREATE TABLE patient_identifiers (
  system TEXT NOT NULL,
  value TEXT NOT NULL,
  patient_id TEXT NOT NULL,
  run_id INTEGER REFERENCES import_runs(id),
  PRIMARY KEY (value, system, patient_id)
) WITHOUT ROWID;
CREATE TABLE fhir_medications (
  medication_id TEXT PRIMARY KEY,
  product TEXT NOT NULL,
  code TEXT NOT NULL DEFAULT '',
  code_system TEXT NOT NULL DEFAULT '',
  run_id INTEGER REFERENCES import_runs(id)
) WITHOUT ROWID;
)sql",
    // 4 -> 5: a rejected row is kept once, whichever import rejected it last: row_key is
    // a hash of the input kind, the line and the row as written (rows stored before this
    // version have none, and stay as they were). A packed history holds at most the
    // latest kMaxDispensingsPerPatient dispensings and says how many older ones it left
    // out; the copy is packed again.
    R"sql(
ALTER TABLE rejected_rows ADD COLUMN row_key TEXT;
CREATE UNIQUE INDEX rejected_rows_by_key ON rejected_rows(row_key);
ALTER TABLE packed_histories ADD COLUMN dropped INTEGER NOT NULL DEFAULT 0;
DELETE FROM packed_histories;
DELETE FROM packed_histories_state;
)sql",
    // 5 -> 6: a store may hold one shard of the network's patients (import --shard K/N):
    // which shard it holds, the data coverage of the rows its imports left to other
    // shards (first and latest counting dispensing per practice named, '' for none), and
    // each run's count of those rows.
    R"sql(
CREATE TABLE store_shard (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  shard INTEGER NOT NULL,
  shards INTEGER NOT NULL
);
CREATE TABLE other_shard_coverage (
  practice TEXT PRIMARY KEY,
  first_dispensed TEXT NOT NULL,
  latest_dispensed TEXT NOT NULL
) WITHOUT ROWID;
ALTER TABLE import_runs ADD COLUMN other_shards INTEGER NOT NULL DEFAULT 0;
)sql",
    // 6 -> 7: saved census figures (store/census_figures.cpp): each report's per-practice
    // counts on a census date, under a key of everything but the dispensings they depend
    // on, with the newest dispensing and the newest edit when they were counted. An update
    // of a dispensing notes the earlier of its dates, a delete notes '' (every date).
    R"sql(
CREATE TABLE census_figures (
  settings_key TEXT NOT NULL,
  census_date TEXT NOT NULL,
  newest_dispensing INTEGER NOT NULL,
  newest_edit INTEGER NOT NULL,
  figures TEXT NOT NULL,
  digest TEXT NOT NULL,
  PRIMARY KEY (settings_key, census_date)
) WITHOUT ROWID;
CREATE TABLE dispensing_edits (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  earliest TEXT NOT NULL
);
CREATE TRIGGER dispensing_updated_notes_date AFTER UPDATE ON dispensings
  BEGIN INSERT INTO dispensing_edits (earliest) VALUES (MIN(old.dispensed_on, new.dispensed_on)); END;
CREATE TRIGGER dispensing_deleted_notes_date AFTER DELETE ON dispensings
  BEGIN INSERT INTO dispensing_edits (earliest) VALUES (''); END;
)sql",
};

// Whether `table` has a column `column` (names are this file's constants, not data).
Result<bool> HasColumn(sqlite3* db, const char* table, const char* column) {
  Result<Statement> stmt = Statement::Prepare(db, "SELECT COUNT(*) FROM pragma_table_info(?1) WHERE name = ?2");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, table);
  stmt->BindText(2, column);
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return *row && stmt->ColumnInt(0) > 0;
}

bool FileExists(const std::string& path) {
  struct stat info {};
  return ::stat(path.c_str(), &info) == 0;
}

// Once per process, before SQLite starts: no memory-use statistics, which SQLite keeps
// under one process-wide lock taken on every allocation (it is built without lookaside
// memory, so that is every row), and which two connections read on two threads at once
// would fight over. Nothing here reads the statistics.
void ConfigureSqliteOnce() {
  static const bool configured = [] {
    sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0);
    return true;
  }();
  static_cast<void>(configured);
}

}  // namespace

Result<Store> Store::Open(const std::string& path, const StoreOptions& options) {
  ConfigureSqliteOnce();
  const bool in_memory = path == ":memory:";
  if (options.must_exist && !in_memory && !FileExists(path)) {
    return Status::Input("no store at \"" + path + "\": import data first, or give --db PATH");
  }
  if (!in_memory) {
    if (Status status = CheckStoreFile(path, options.must_exist); !status.ok()) return status;
  }
  // A store this user may not write: read-only for commands that only read.
  if (options.read_only_allowed && !in_memory && ::access(path.c_str(), W_OK) != 0) {
    return OpenReadOnly(path, options);
  }
  if (!in_memory && !path.empty() && !FileExists(path)) {
    // A new store holds patient-level data: created owner-only, so that SQLite, which
    // gives its -wal and -shm files the mode of the database file, creates them so too.
    // A failure here (no such folder) is reported by the open below, in its own words.
    (void)PreparePrivateFile(path);
  }
  sqlite3* db = nullptr;
  const int flags = SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE | SQLITE_OPEN_NOMUTEX;
  if (sqlite3_open_v2(path.c_str(), &db, flags, nullptr) != SQLITE_OK) {
    std::string reason = db != nullptr ? sqlite3_errmsg(db) : "out of memory";
    sqlite3_close(db);
    return Status::Input("cannot open the store \"" + path + "\": " + reason +
                         " (does the folder exist, and may it be written?)");
  }
  Store store(db, path);
  if (sqlite3_db_readonly(db, "main") == 1) {
    if (options.read_only_allowed) return OpenReadOnly(path, options);
    return Status::Input("cannot write the store \"" + path +
                         "\": the file is read-only; run this command as a user who may write it, or give --db a "
                         "store that can be written");
  }
  sqlite3_busy_timeout(db, options.busy_timeout_ms);
  // Before anything is written: another program's database is never turned into a store.
  if (Status status = store.CheckIdentity(options.must_exist); !status.ok()) {
    const int error = sqlite3_errcode(db) & 0xff;
    if (options.read_only_allowed && (error == SQLITE_CANTOPEN || error == SQLITE_READONLY)) {
      return OpenReadOnly(path, options);
    }
    return status;
  }
  if (Status status = store.Configure(options); !status.ok()) {
    // The folder cannot take the -wal and -shm files: read-only for commands that read.
    if (options.read_only_allowed && !in_memory) return OpenReadOnly(path, options);
    return status;
  }
  if (Status status = store.Migrate(); !status.ok()) return status;
  return store;
}

Store::Store(Store&& other) noexcept
    : db_(std::exchange(other.db_, nullptr)),
      path_(std::move(other.path_)),
      busy_timeout_ms_(other.busy_timeout_ms_),
      read_only_(other.read_only_),
      max_dispensings_(other.max_dispensings_) {}

Store& Store::operator=(Store&& other) noexcept {
  if (this != &other) {
    sqlite3_close(db_);
    db_ = std::exchange(other.db_, nullptr);
    path_ = std::move(other.path_);
    busy_timeout_ms_ = other.busy_timeout_ms_;
    read_only_ = other.read_only_;
    max_dispensings_ = other.max_dispensings_;
  }
  return *this;
}

Store::~Store() { sqlite3_close(db_); }

Status Store::Configure(const StoreOptions& options) {
  sqlite3_busy_timeout(db_, options.busy_timeout_ms);
  busy_timeout_ms_ = options.busy_timeout_ms;
  max_dispensings_ = std::max<size_t>(1, options.max_dispensings_per_patient);
  // The page size applies only when the file is new (before WAL is set): 16 KiB pages
  // make bulk imports cheaper (fewer pages and writes). WAL lets readers run beside one
  // writer and survives a killed writer; synchronous=NORMAL is durable across process
  // crashes in WAL mode (only power loss may lose the last commit). The page cache is the
  // reading one (SetPageCache); temporary sort data stays in files so that memory does
  // not grow with the store.
  const char* pragmas =
      "PRAGMA page_size=16384; PRAGMA journal_mode=WAL; PRAGMA synchronous=NORMAL;"
      " PRAGMA foreign_keys=ON;";
  // Switching a new file to WAL needs its exclusive lock, and SQLite does not call the busy
  // handler for it (a connection holding a read lock could deadlock waiting): when several
  // processes open a new store at once, the losers are told "database is locked" at once.
  // They wait here instead, within the same busy timeout.
  Status status = ExecSql(db_, pragmas);
  const auto give_up = std::chrono::steady_clock::now() +
                       std::chrono::milliseconds(options.busy_timeout_ms);
  while (!status.ok() && sqlite3_errcode(db_) == SQLITE_BUSY &&
         std::chrono::steady_clock::now() < give_up) {
    std::this_thread::sleep_for(std::chrono::milliseconds(2));
    status = ExecSql(db_, pragmas);
  }
  if (!status.ok()) {
    return Status::Input("cannot use the store \"" + path_ + "\": " + status.message());
  }
  if (Status cache = SetPageCache(db_, false); !cache.ok()) return cache;
  return SetMemoryMap(db_, true);
}

Result<int> Store::SchemaVersion() const {
  Result<Statement> stmt = Statement::Prepare(db_, "PRAGMA user_version");
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return static_cast<int>(stmt->ColumnInt(0));
}

Status Store::Migrate() {
  // A current store needs no write lock: commands that only read never wait for an import.
  Result<int> seen = SchemaVersion();
  if (!seen.ok()) {
    return Status::Input("cannot use the store \"" + path_ + "\": " + seen.status().message());
  }
  if (*seen == kStoreSchemaVersion) return Status::Ok();
  // Otherwise inside the write transaction, so that two processes opening a new store at
  // once cannot both create the tables.
  Result<Transaction> transaction = Transaction::Begin(db_);
  if (!transaction.ok()) {
    return Status::Input("cannot use the store \"" + path_ + "\": " +
                         transaction.status().message());
  }
  Result<int> version = SchemaVersion();
  if (!version.ok()) return version.status();
  if (*version > kStoreSchemaVersion) {
    return Status::Input("the store \"" + path_ + "\" has schema version " +
                         std::to_string(*version) + ", newer than this medload understands (" +
                         std::to_string(kStoreSchemaVersion) + "); use a newer medload");
  }
  if (*version == kStoreSchemaVersion) return Status::Ok();  // another process migrated it
  if (*version == 4) {
    // A version 4 written by a development build that numbered its own changes 4 (rejected
    // rows with a key, no FHIR dose units) is not the released 4: refused, not damaged.
    Result<bool> keyed = HasColumn(db_, "rejected_rows", "row_key");
    if (!keyed.ok()) return keyed.status();
    if (*keyed) {
      return Status::Input("the store \"" + path_ + "\" has a schema version 4 of a development build of medload, "
                           "which this medload cannot migrate; import its files into a new store");
    }
  }
  for (int step = *version; step < kStoreSchemaVersion; ++step) {
    if (Status status = ExecSql(db_, kMigrations[static_cast<size_t>(step)]); !status.ok()) {
      return Status::Input("migrating the store \"" + path_ + "\" to version " +
                           std::to_string(step + 1) + ": " + status.message());
    }
  }
  const std::string set_version = "PRAGMA user_version=" + std::to_string(kStoreSchemaVersion);
  if (Status status = ExecSql(db_, set_version.c_str()); !status.ok()) return status;
  return transaction->Commit();
}

Result<std::optional<std::string>> Store::CachedResolution(std::string_view product,
                                                           std::string_view code,
                                                           std::string_view code_system,
                                                           std::string_view checksum) const {
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "SELECT resolution FROM product_resolutions WHERE product = ?1 AND code = ?2"
      " AND code_system = ?3 AND formulary_checksum = ?4");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, product);
  stmt->BindText(2, code);
  stmt->BindText(3, code_system);
  stmt->BindText(4, checksum);
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row) return std::optional<std::string>();
  return std::optional<std::string>(std::string(stmt->ColumnText(0)));
}

Result<StoreSnapshot> Store::BeginSnapshot() const {
  if (sqlite3_get_autocommit(db_) == 0) {
    return Status::Input("store: a snapshot cannot start inside another transaction");
  }
  // A deferred BEGIN: the first read takes the WAL read mark that fixes the view.
  if (Status status = ExecSql(db_, "BEGIN DEFERRED"); !status.ok()) return status;
  return StoreSnapshot(db_);
}

bool Store::InSnapshot() const { return sqlite3_get_autocommit(db_) == 0; }

Status Store::UseMemoryMap(bool on) const { return SetMemoryMap(db_, on); }

namespace {

// The newest import run as this connection sees it: every import, committed or rolled
// back, adds its row in its own transaction, so two snapshots with the same newest run
// hold the same imported records.
Result<int64_t> NewestImportRun(sqlite3* db) {
  Result<Statement> stmt = Statement::Prepare(db, "SELECT COALESCE(MAX(id), 0) FROM import_runs");
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return *row ? stmt->ColumnInt(0) : 0;
}

}  // namespace

Result<Store> Store::OpenPeer() const {
  if (!InSnapshot()) return Status::Input("store: a peer connection needs an open snapshot");
  if (path_.empty() || path_ == ":memory:") {
    return Status::Input("store: a store in memory has no peer connection");
  }
  Result<int64_t> mine = NewestImportRun(db_);  // also fixes this snapshot's view
  if (!mine.ok()) return mine.status();
  StoreOptions options;
  options.must_exist = true;
  options.read_only_allowed = read_only_;
  options.max_dispensings_per_patient = max_dispensings_;
  Result<Store> peer = read_only_ ? OpenReadOnly(path_, options) : Store::Open(path_, options);
  if (!peer.ok()) return peer.status();
  // A smaller memory map (176 MiB) and page cache (8 MiB) than a store's own connection
  // (256 and 16): mapped file pages count in the process's resident size once per
  // connection that maps them, and two peers read one file, so that the two peers and the
  // store's own connection stay under 512 MB together however large the store grows.
  if (Status status = ExecSql(peer->db_, "PRAGMA mmap_size=184549376; PRAGMA cache_size=-8192;");
      !status.ok()) {
    return status;
  }
  if (Status status = ExecSql(peer->db_, "BEGIN DEFERRED"); !status.ok()) return status;
  Result<int64_t> theirs = NewestImportRun(peer->db_);
  if (!theirs.ok()) return theirs.status();
  if (*theirs != *mine) return Status::Input("store: an import committed while the run started");
  return peer;
}

StoreSnapshot::~StoreSnapshot() {
  // Only reads ran inside: ending it cannot fail in a way that loses anything.
  if (db_ != nullptr) sqlite3_exec(db_, "ROLLBACK", nullptr, nullptr, nullptr);
}

Status Store::SaveResolution(std::string_view product, std::string_view code,
                             std::string_view code_system, std::string_view checksum,
                             std::string_view resolution_json) {
  if (sqlite3_get_autocommit(db_) == 0 || read_only_) return Status::Ok();  // inside a snapshot, or read-only
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "INSERT INTO product_resolutions (product, code, code_system, formulary_checksum,"
      " resolution) VALUES (?1, ?2, ?3, ?4, ?5) ON CONFLICT DO UPDATE SET"
      " resolution = excluded.resolution");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, product);
  stmt->BindText(2, code);
  stmt->BindText(3, code_system);
  stmt->BindText(4, checksum);
  stmt->BindText(5, resolution_json);
  return stmt->Run();
}

Status Store::SaveRun(std::string_view kind, std::string_view key, std::string_view date_iso,
                      std::string_view payload_json) {
  if (read_only_) return Status::Ok();  // a store read where it cannot be written keeps no runs
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "INSERT INTO runs (kind, criteria_key, run_date, payload) VALUES (?1, ?2, ?3, ?4)"
      " ON CONFLICT (kind, criteria_key, run_date) DO UPDATE SET payload = excluded.payload");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, kind);
  stmt->BindText(2, key);
  stmt->BindText(3, date_iso);
  stmt->BindText(4, payload_json);
  return stmt->Run();
}

Result<std::optional<std::string>> Store::LatestRun(std::string_view kind,
                                                    std::string_view key,
                                                    std::string_view before_date_iso) const {
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "SELECT payload FROM runs WHERE kind = ?1 AND criteria_key = ?2 AND run_date < ?3"
      " ORDER BY run_date DESC LIMIT 1");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, kind);
  stmt->BindText(2, key);
  stmt->BindText(3, before_date_iso);
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row) return std::optional<std::string>();
  return std::optional<std::string>(std::string(stmt->ColumnText(0)));
}

}  // namespace medload
