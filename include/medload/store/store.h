// The store: one SQLite file holding the imported practices, patients, dispensings and
// completed reviews, the import runs with their rejected rows, and caches for later
// modules (product resolutions, saved runs). It does not interpret the records: measures
// are computed elsewhere from what the read API returns.
#pragma once

#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "medload/core/data_coverage.h"
#include "medload/core/records.h"
#include "medload/core/shard.h"
#include "medload/core/status.h"

struct sqlite3;

namespace medload {

// The schema version this build writes; older stores are migrated forward on Open.
inline constexpr int kStoreSchemaVersion = 7;

// The most counting dispensings of one patient that reads hold (the latest ones): memory
// stays bounded whatever one id's history holds (a feed that gives every item one id, a
// test id). 20,000 is over a century of a patient on fifteen monthly medicines; past it the
// older dispensings are left out of every figure, and outputs say so
// (docs/reliability.md, "Bounded memory").
inline constexpr size_t kMaxDispensingsPerPatient = 20000;

// What bringing the packed copy of the histories up to date did.
struct PackOutcome {
  bool was_current = false;  // nothing to do: the copy named the newest dispensing
  bool whole = false;        // every history packed again, else only the touched patients'
  long patients = 0;         // the histories written
};

struct StoreOptions {
  // How long a writer waits for another process's write transaction to finish.
  int busy_timeout_ms = 30000;
  // True: fail with Input when the file does not exist yet, is empty, or is an empty
  // SQLite database (commands that only read).
  bool must_exist = false;
  // True (commands that only read): a store this user may not write, or whose folder
  // cannot take its -wal and -shm files, is opened read-only instead of refused. The
  // store then writes nothing: no packed copy, no cached resolutions, no saved runs.
  bool read_only_allowed = false;
  // The most counting dispensings of one patient that reads hold (the latest ones).
  size_t max_dispensings_per_patient = kMaxDispensingsPerPatient;
};

// Everything the store keeps about one patient, in the order cohort runs need it.
struct PatientHistory {
  std::string patient_id;
  std::optional<PatientRecord> registry;       // the registry row, if imported
  std::vector<DispensingRecord> dispensings;   // counting dispensings, by date then id
                                               // (the latest max_dispensings_per_patient)
  long dropped = 0;  // older counting dispensings left out by that bound
};

// Provenance figures for a run: the span of the data and the size of each table.
struct StoreSummary {
  std::optional<Date> earliest_dispensed;  // counting dispensings only (with those a shard
                                           // store's imports left to other shards); absent if none
  std::optional<Date> latest_dispensed;
  long practices = 0;
  long patients = 0;
  long dispensings = 0;           // every stored dispensing, whatever its status
  long counting_dispensings = 0;  // status empty or "completed"
  long not_counting_dispensings = 0;
  long reviews = 0;
  long import_runs = 0;
  long rejected_rows = 0;
};

// One import of one file (the import_runs table).
struct ImportRunRecord {
  long id = 0;
  std::string kind;     // "dispensing", "patients", "practices", "reviews"
  std::string file;
  std::string started;  // UTC, ISO 8601 date and time
  std::string outcome;  // "running", "committed" or "rolled_back"
  long read = 0;
  long imported = 0;
  long duplicates = 0;
  long rejected = 0;
};

// Where the dispensings stood when figures were counted: the newest dispensing id and the
// newest edit note (an update or delete of a dispensing), 0 when none.
struct DataMarks {
  long newest_dispensing = 0;
  long newest_edit = 0;
};

// One saved entry of census figures (Store::SavedCensusFigures).
struct SavedFigures {
  std::string census_date;  // ISO
  DataMarks marks;
  std::string figures;      // JSON text, as saved
  bool intact = false;      // the figures match the digest saved with them
};

// A half-open range [from, to) of patient ids in bytewise order; an empty bound is open
// (from "" starts at the first patient, to "" runs to the last).
struct PatientIdRange {
  std::string from;
  std::string to;
};

// A read snapshot (see Store::BeginSnapshot). Ends on destruction. Move-only.
class StoreSnapshot {
 public:
  StoreSnapshot(StoreSnapshot&& other) noexcept : db_(std::exchange(other.db_, nullptr)) {}
  StoreSnapshot& operator=(StoreSnapshot&&) = delete;
  StoreSnapshot(const StoreSnapshot&) = delete;
  StoreSnapshot& operator=(const StoreSnapshot&) = delete;
  ~StoreSnapshot();

 private:
  friend class Store;
  explicit StoreSnapshot(sqlite3* db) : db_(db) {}
  sqlite3* db_ = nullptr;
};

// Reads every patient in turn, in the order and with the content Store::Patients gives,
// into a history the caller owns: its string and vector buffers are reused from one
// patient to the next. The Store must outlive the cursor.
class PatientCursor {
 public:
  PatientCursor(PatientCursor&&) noexcept;
  PatientCursor& operator=(PatientCursor&&) noexcept;
  ~PatientCursor();

  // Fills `into` with the next patient and returns true, or returns false after the last.
  // Fails with Input on a storage error or a malformed stored date.
  Result<bool> Next(PatientHistory& into);

 private:
  friend class Store;
  struct State;
  explicit PatientCursor(std::unique_ptr<State> state);
  std::unique_ptr<State> state_;
};

class Store {
 public:
  // Creates or opens the store at `path` (":memory:" for a private in-memory store), in WAL
  // mode with foreign keys on, and migrates its schema to kStoreSchemaVersion in one
  // transaction. A new store file (and so its -wal and -shm files) is created readable by
  // its owner only (mode 0600). Fails with Input naming the path and saying what the file
  // is when it is not a medload store: not a SQLite database, a SQLite database of another
  // program (tables, but not medload's), or (with must_exist) an empty file or an empty
  // database; also when the folder is missing, the file is read-only (unless
  // read_only_allowed), or the store is from a newer medload. A read-only store must
  // already have the current schema.
  static Result<Store> Open(const std::string& path, const StoreOptions& options = {});

  Store(Store&& other) noexcept;
  Store& operator=(Store&& other) noexcept;
  Store(const Store&) = delete;
  Store& operator=(const Store&) = delete;
  ~Store();

  const std::string& path() const { return path_; }
  // True when opened read-only (StoreOptions::read_only_allowed): writes are skipped.
  bool read_only() const { return read_only_; }
  // The most counting dispensings of one patient that reads hold (StoreOptions).
  size_t history_bound() const { return max_dispensings_; }
  // The schema version recorded in the file (kStoreSchemaVersion after a successful Open).
  Result<int> SchemaVersion() const;

  // One patient's counting dispensings (status empty or "completed"), in dispensed_on
  // order, then in import order: the latest max_dispensings_per_patient of them, and
  // `dropped` (may be null) says how many older ones were left out. Empty when the
  // patient is unknown.
  Result<std::vector<DispensingRecord>> DispensingsOf(std::string_view patient_id,
                                                      long* dropped = nullptr) const;
  // Every stored dispensing of the patient, whatever its status, in the same order, up to
  // the same bound (the latest ones); `dropped` (may be null) as above.
  Result<std::vector<DispensingRecord>> AllDispensingsOf(std::string_view patient_id,
                                                         long* dropped = nullptr) const;
  // How many of the patient's dispensings up to and including `on` have a status that
  // does not count (anything but "completed"), by status; empty when there are none.
  Result<std::map<std::string, long>> NotCountingOf(std::string_view patient_id, Date on) const;
  // The patient's registry row, or nullopt when none was imported.
  Result<std::optional<PatientRecord>> PatientOf(std::string_view patient_id) const;

  // Every patient that has a registry row or a counting dispensing, in patient_id order
  // (bytewise), with the registry row and all counting dispensings in date order, as a
  // cursor (see PatientCursor): one ordered pass over the tables, memory for one patient
  // at a time. Fails with Input on a storage error.
  Result<PatientCursor> Patients() const;
  // The same pass over the patients of one range only. Records a history no longer needs
  // wait in `spare` (the cursor's own pool if null) with their string buffers, for reuse:
  // a pool that outlives the cursor keeps them across ranges.
  Result<PatientCursor> Patients(const PatientIdRange& range,
                                 std::vector<DispensingRecord>* spare = nullptr) const;
  // Brings the store's packed copy of every patient's history (one row per patient, which
  // the pass reads in about a fifth of the time of the dispensings themselves) up to date
  // with the dispensings, when it is not: after an import, the first pass's caller pays
  // for packing. Outside a snapshot only (inside one it does nothing). Best effort, and
  // never waits: when another connection holds the write lock (an import), it does
  // nothing and the pass reads the dispensings. Logically const: what the read functions
  // return is the same with or without the copy. Fails with Input on a storage error.
  Status RefreshPackedHistories() const;
  // Whether the packed copy matches the dispensings as this connection sees them.
  Result<bool> PackedHistoriesCurrent() const;
  // Brings the packed copy up to date now, waiting for the write lock as an import does
  // (the busy timeout), for `medload store pack`: once after an import, so that readers
  // of a store they may not write (shared storage, batch arrays) read the copy. Returns
  // what it did (see PackOutcome). Fails with Input when the store is read-only, on a
  // storage error, or when the lock did not come in time.
  Result<PackOutcome> PackHistoriesNow();
  // Consecutive ranges that together hold every patient id once, in order, each with
  // about `patients_per_range` patients of the registry (of the dispensings when the
  // registry has fewer than two ranges' worth), so that the pass can be shared out by
  // range. At least one range.
  Result<std::vector<PatientIdRange>> PatientRanges(size_t patients_per_range) const;

  // All practices, by practice code.
  Result<std::vector<PracticeRecord>> Practices() const;
  // The practice codes the store knows, sorted, empty codes left out: those of the
  // practices table, of registry rows and of the dispensings a shard's store left to
  // other shards (OtherShardCoverage), and with `with_dispensings` also those named by
  // dispensings (a walk of the table: slower on a large store).
  Result<std::vector<std::string>> PracticeCodes(bool with_dispensings) const;
  // One patient's completed reviews, oldest first.
  Result<std::vector<ReviewRecord>> ReviewsOf(std::string_view patient_id) const;
  // Every completed review, by patient then date.
  Result<std::vector<ReviewRecord>> Reviews() const;
  // Distinct (product, code, code_system) among counting dispensings with their item and
  // patient counts: most items first, then by product, code and system.
  Result<std::vector<ProductCount>> ProductCounts() const;
  // Date span and row counts, for run provenance.
  Result<StoreSummary> Summary() const;
  // Each practice's first and latest counting dispensing (data coverage): a dispensing
  // belongs to the practice it names, else to its patient's registry practice, else to ""
  // (as the patient pass gathers them, PassFacts::practice_spans). One walk of the table.
  // Rows that imports with --shard left to other shards count too, by the practice they
  // name (a row naming none widens no practice's span here: its own shard's store
  // attributes it to its patient's registry practice).
  Result<PracticeSpans> PracticeDataSpans() const;
  // The shard of the network's patients this store holds (import --shard K/N), or nullopt
  // for a store of the whole network (or a new one).
  Result<std::optional<ShardSpec>> HeldShard() const;
  // The data coverage of the counting dispensings that imports with --shard read and left
  // to other shards, by the practice each names ("" for those naming none). Empty for a
  // store of the whole network.
  Result<PracticeSpans> OtherShardCoverage() const;
  // Every import run, oldest first.
  Result<std::vector<ImportRunRecord>> ImportRuns() const;

  // Starts a read snapshot: until the returned object is destroyed, every read through
  // this store sees the data as committed when the first of them ran, whatever imports
  // commit meanwhile in other connections (which are not blocked), so that a run's counts
  // agree with each other. SaveResolution does nothing while a snapshot is open (the cache
  // is best effort; a write would hold the store's write lock to the snapshot's end).
  // Fails with Input when a transaction is already open on this connection.
  Result<StoreSnapshot> BeginSnapshot() const;
  // True while a snapshot (or any transaction) is open on this connection.
  bool InSnapshot() const;
  // Stops (false) or resumes (true) reading this connection through its memory map.
  // Stopping releases the file pages it had mapped from the process's resident size,
  // unless a statement still holds one (then nothing changes); while peers read (their
  // own maps), this connection's earlier reads then stop counting twice.
  Status UseMemoryMap(bool on) const;
  // Another connection to this store's file, inside a snapshot that shows exactly the
  // data this connection's open snapshot shows (checked by the last import run, which
  // every import adds in its own transaction), for reading on another thread. Its
  // snapshot ends when it is destroyed. Fails with Input when this connection has no
  // snapshot, the store lives in memory, or an import committed between the two
  // snapshots; the caller then reads on this connection alone.
  Result<Store> OpenPeer() const;

  // The resolution saved for this product under this formulary checksum, or nullopt.
  // `resolution` is opaque JSON text owned by the formulary module.
  Result<std::optional<std::string>> CachedResolution(std::string_view product,
                                                      std::string_view code,
                                                      std::string_view code_system,
                                                      std::string_view checksum) const;
  // Saves (or replaces) the resolution for the key above (nothing inside a snapshot or in
  // a read-only store).
  Status SaveResolution(std::string_view product, std::string_view code,
                        std::string_view code_system, std::string_view checksum,
                        std::string_view resolution_json);

  // Saves a run's JSON payload under (kind, key, date); a second save for the same three
  // replaces the first, so re-running a report is idempotent; nothing in a read-only
  // store. REQUIRES: ISO date.
  Status SaveRun(std::string_view kind, std::string_view key, std::string_view date_iso,
                 std::string_view payload_json);
  // The payload of the latest run of (kind, key) dated strictly before `before_date_iso`,
  // or nullopt when there is none.
  Result<std::optional<std::string>> LatestRun(std::string_view kind, std::string_view key,
                                               std::string_view before_date_iso) const;

  // Saved census figures (docs/report.md, "Saved census figures"): opaque JSON under a
  // settings key and a census date, with the data marks they were counted at.
  // The marks of the data as this connection sees them now (inside a snapshot: the
  // snapshot's).
  Result<DataMarks> CurrentDataMarks() const;
  // The earliest dispensing date that dispensings added after `marks`, or dispensings
  // updated or deleted after them, touch: nullopt when none was; "" when a dispensing was
  // deleted (every date may have changed).
  Result<std::optional<std::string>> EarliestChangeSince(const DataMarks& marks) const;
  // Every entry saved under `settings_key`, by census date; `intact` is false when the
  // figures no longer match the digest saved with them.
  Result<std::vector<SavedFigures>> SavedCensusFigures(std::string_view settings_key) const;
  // Saves (or replaces) the entry for (settings_key, census date); nothing in a read-only
  // store or inside a snapshot. REQUIRES: ISO date.
  Status SaveCensusFigures(std::string_view settings_key, std::string_view date_iso,
                           const DataMarks& marks, std::string_view figures_json);
  // Removes every saved entry and the edit notes; the number of entries removed.
  Result<long> ClearCensusFigures();
  // SHA-256 of the practices and patients tables' rows, in key order, and of a shard
  // store's shard and other shards' coverage: changes whenever an import (or anything
  // else) changes a row the census figures depend on besides the dispensings.
  Result<std::string> RegistryDigest() const;

  // The connection, for the store's own adapters in src/store (the importer). Other
  // modules use the typed functions above.
  sqlite3* handle() const { return db_; }

 private:
  Store(sqlite3* db, std::string path) : db_(db), path_(std::move(path)) {}
  // Opens `path` read-only (read_only_allowed), immutable when its folder cannot take the
  // -shm file SQLite needs and no -wal file holds changes.
  static Result<Store> OpenReadOnly(const std::string& path, const StoreOptions& options);
  // Fails with Input when the file at `path` is not a SQLite database or (with
  // `must_exist`) is empty, saying so. A missing file passes.
  static Status CheckStoreFile(const std::string& path, bool must_exist);
  // Fails with Input unless the database is a medload store (or, unless `must_exist`, a
  // new empty one), saying what it is instead.
  Status CheckIdentity(bool must_exist) const;
  // Brings packed_histories up to date inside `db_`'s write transaction: only the
  // histories of the patients with dispensings imported since the copy was last packed,
  // while its state row stands and those are at most half the store's; else every
  // history (store/history_packing.h). Either way the copy is the same, byte for byte.
  Result<PackOutcome> PackHistories() const;
  Status Configure(const StoreOptions& options);
  Status Migrate();

  sqlite3* db_ = nullptr;
  std::string path_;
  int busy_timeout_ms_ = 0;  // as opened (StoreOptions), for waits set back after a try
  bool read_only_ = false;
  size_t max_dispensings_ = kMaxDispensingsPerPatient;  // StoreOptions::max_dispensings_per_patient
};

}  // namespace medload
