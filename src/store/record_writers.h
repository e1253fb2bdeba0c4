// Writers that put one validated record into the store inside the importer's
// transaction, each with one prepared statement reused for every row, and say whether the
// row was new, changed a stored row, or was already there. Private to src/store.
#pragma once

#include <string>
#include <string_view>

#include "medload/core/records.h"
#include "medload/core/status.h"
#include "store/sqlite.h"

namespace medload {

enum class WriteOutcome {
  kImported,   // a new row
  kUpdated,    // an existing row changed (registry rows; a dispense's FHIR status)
  kDuplicate,  // already stored, nothing changed
  kConflict,   // the record id is stored for a dispensing with other content: not stored
};

// Where the rows being written came from.
struct WriteSource {
  long run_id = 0;
  std::string_view file;
};

class DispensingWriter {
 public:
  // Prepares the statements. REQUIRES: `db` outlives the writer.
  Status Prepare(sqlite3* db, WriteSource source);
  // Stores the dispensing under DispensingKey(record) unless that key is stored already.
  // A stored row with the same record id is the same dispensing only when its content
  // (DispensingContent) is the same: otherwise the result is kConflict and nothing
  // changes (conflict() says where the stored one came from). With `update_status`
  // (FHIR), a stored dispense with the same record id and content whose status differs
  // takes the new status (kUpdated).
  Result<WriteOutcome> Write(const DispensingRecord& record, size_t line, bool update_status);

  // After kConflict: where the stored dispensing was read, `"FILE" line N`.
  const std::string& conflict() const { return conflict_; }

 private:
  Result<bool> SameAsStored(const DispensingRecord& record);

  sqlite3* db_ = nullptr;
  WriteSource source_;
  Statement insert_;
  Statement update_status_;
  Statement select_stored_;
  std::string key_;
  std::string date_;
  std::string content_;
  std::string stored_content_;
  DispensingRecord stored_;
  std::string conflict_;
};

// Registry rows: inserted, or updated when any field differs (re-imports are upserts).
class PatientWriter {
 public:
  Status Prepare(sqlite3* db, WriteSource source);
  Result<WriteOutcome> Write(const PatientRecord& patient);

 private:
  Statement select_;
  Statement upsert_;
  long run_id_ = 0;
};

class PracticeWriter {
 public:
  Status Prepare(sqlite3* db, WriteSource source);
  Result<WriteOutcome> Write(const PracticeRecord& practice);

 private:
  Statement select_;
  Statement upsert_;
  long run_id_ = 0;
};

// Completed reviews: a (patient, date) pair is stored once.
class ReviewWriter {
 public:
  Status Prepare(sqlite3* db, WriteSource source);
  Result<WriteOutcome> Write(const ReviewRecord& review);

 private:
  sqlite3* db_ = nullptr;
  Statement insert_;
  long run_id_ = 0;
};

}  // namespace medload
