// The store's packed copy of each history: whether it is current, and bringing it up to
// date after an import (by the first pass, or `medload store pack`), for every patient or
// only for those the imports since the last packing touched (store/history_packing.h).
#include <optional>

#include "medload/store/store.h"
#include "store/dispensing_rows.h"
#include "store/history_packing.h"
#include "store/sqlite.h"

namespace medload {
namespace {

// The newest dispensing id the copy was packed with (0 when the store had none); none
// when there is no state row: never packed, or a dispensing was updated or deleted since.
Result<std::optional<long>> PackedUpTo(sqlite3* db) {
  Result<Statement> stmt =
      Statement::Prepare(db, "SELECT IFNULL(newest_dispensing, 0) FROM packed_histories_state WHERE id = 1");
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row) return std::optional<long>();
  return std::optional<long>(static_cast<long>(stmt->ColumnInt(0)));
}

}  // namespace

Result<bool> Store::PackedHistoriesCurrent() const {
  Result<long> current = QueryCount(
      db_,
      "SELECT EXISTS (SELECT 1 FROM packed_histories_state WHERE id = 1 AND"
      " newest_dispensing IS (SELECT MAX(id) FROM dispensings))");
  if (!current.ok()) return current.status();
  return *current != 0;
}

Status Store::RefreshPackedHistories() const {
  if (InSnapshot() || read_only_) return Status::Ok();
  Result<bool> current = PackedHistoriesCurrent();
  if (!current.ok()) return current.status();
  if (*current) return Status::Ok();
  Result<std::optional<Transaction>> transaction = Transaction::TryBegin(db_, busy_timeout_ms_);
  if (!transaction.ok()) return transaction.status();
  if (!transaction->has_value()) return Status::Ok();  // an import is writing: read the table
  current = PackedHistoriesCurrent();  // another process may have packed meanwhile
  if (!current.ok()) return current.status();
  if (*current) return Status::Ok();
  if (Result<PackOutcome> packed = PackHistories(); !packed.ok()) return packed.status();
  return (*transaction)->Commit();
}

Result<PackOutcome> Store::PackHistoriesNow() {
  if (read_only_) return Status::Input("store \"" + path_ + "\": opened read-only, it cannot be packed");
  Result<bool> current = PackedHistoriesCurrent();
  if (!current.ok()) return current.status();
  if (*current) return PackOutcome{true, false, 0};
  Result<Transaction> transaction = Transaction::Begin(db_);  // waits like an import
  if (!transaction.ok()) return transaction.status();
  current = PackedHistoriesCurrent();  // another process may have packed meanwhile
  if (!current.ok()) return current.status();
  if (*current) return PackOutcome{true, false, 0};
  Result<PackOutcome> packed = PackHistories();
  if (!packed.ok()) return packed.status();
  if (Status status = transaction->Commit(); !status.ok()) return status;
  return packed;
}

Result<PackOutcome> Store::PackHistories() const {
  Result<std::optional<long>> packed_up_to = PackedUpTo(db_);
  if (!packed_up_to.ok()) return packed_up_to.status();
  Result<long> newest = QueryCount(db_, "SELECT IFNULL(MAX(id), 0) FROM dispensings");
  if (!newest.ok()) return newest.status();
  // Only the touched patients while the copy's state stands and at most half the rows are
  // newer than it (ids count rows: inserts only raise them); otherwise, as after the
  // first import, every history in one walk of the per-patient index, with no sort.
  const bool touched_only = packed_up_to->has_value() && (*newest - **packed_up_to) * 2 <= *newest;
  Result<long> written = touched_only ? PackTouchedHistories(db_, **packed_up_to, max_dispensings_)
                                      : PackEveryHistory(db_, max_dispensings_);
  if (!written.ok()) return written.status();
  Status state = ExecSql(db_,
                         "INSERT OR REPLACE INTO packed_histories_state (id, newest_dispensing)"
                         " VALUES (1, (SELECT MAX(id) FROM dispensings))");
  if (!state.ok()) return state;
  return PackOutcome{false, !touched_only, *written};
}

}  // namespace medload
