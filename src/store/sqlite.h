// RAII wrappers over the SQLite C API for the store's own code (src/store): a prepared
// Statement with bound values only, and a Transaction that rolls back unless committed.
// Private to the store; other modules use the typed API in medload/store/store.h.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

#include "medload/core/status.h"

struct sqlite3;
struct sqlite3_stmt;

namespace medload {

// The message of the connection's last error, prefixed by `context` ("insert: ...").
std::string SqliteError(sqlite3* db, std::string_view context);

// Runs SQL without parameters (schema, pragmas, BEGIN/COMMIT). Returns Input on failure.
Status ExecSql(sqlite3* db, const char* sql);

// Turns reading through a memory map on or off for the connection. On (the store's
// default), the ordered pass over every patient, whose table lookups follow the
// per-patient index rather than the file's order, takes about half the time; the map
// holds file pages, not process memory. Imports turn it off: it slows their writes.
Status SetMemoryMap(sqlite3* db, bool on);

// Sets the connection's page cache: 16 MiB for reading (what lies beyond the memory map),
// 64 MiB while importing, where the dispensings' unique-key index, written in key order
// rather than file order, visits its pages again and again.
Status SetPageCache(sqlite3* db, bool importing);

// Rows changed by the connection's last INSERT, UPDATE or DELETE.
int ChangedRows(sqlite3* db);

// The rowid of the connection's last successful INSERT.
int64_t LastInsertId(sqlite3* db);

// One prepared statement. Move-only; finalised on destruction.
class Statement {
 public:
  Statement() = default;
  // Prepares `sql` on `db`. Fails with Input naming the statement's fault.
  static Result<Statement> Prepare(sqlite3* db, std::string_view sql);

  Statement(Statement&& other) noexcept;
  Statement& operator=(Statement&& other) noexcept;
  Statement(const Statement&) = delete;
  Statement& operator=(const Statement&) = delete;
  ~Statement();

  // Parameters are numbered from 1. Text is NOT copied: the bytes must stay alive and
  // unchanged until the next Step() has returned.
  void BindText(int index, std::string_view text);
  void BindBlob(int index, std::string_view bytes);
  void BindInt(int index, int64_t value);
  void BindDouble(int index, double value);
  void BindNull(int index);
  void BindOptionalInt(int index, std::optional<int64_t> value);
  void BindOptionalDouble(int index, std::optional<double> value);

  // Advances: true when a row is ready, false when the statement is done. A failure
  // (constraint, I/O, busy after the timeout) is an Input status with SQLite's message.
  Result<bool> Step();
  // Runs a statement that returns no rows, then resets it for reuse.
  Status Run();
  // Makes the statement ready to run again; bindings are kept until rebound.
  void Reset();

  // Columns are numbered from 0. Text views are valid until the next Step() or Reset().
  std::string_view ColumnText(int index) const;
  std::string_view ColumnBlob(int index) const;
  int64_t ColumnInt(int index) const;
  double ColumnDouble(int index) const;
  bool ColumnIsNull(int index) const;

 private:
  explicit Statement(sqlite3_stmt* stmt) : stmt_(stmt) {}
  sqlite3_stmt* stmt_ = nullptr;
};

// A write transaction. Begin takes the write lock at once (BEGIN IMMEDIATE), waiting up to
// the connection's busy timeout for another writer. Rolls back on destruction unless
// Commit() succeeded.
class Transaction {
 public:
  static Result<Transaction> Begin(sqlite3* db);
  // Begin without waiting: nullopt when another connection holds the write lock. The
  // connection's busy timeout is set back to `busy_timeout_ms` afterwards.
  static Result<std::optional<Transaction>> TryBegin(sqlite3* db, int busy_timeout_ms);

  Transaction(Transaction&& other) noexcept;
  Transaction& operator=(Transaction&&) = delete;
  Transaction(const Transaction&) = delete;
  Transaction& operator=(const Transaction&) = delete;
  ~Transaction();

  Status Commit();
  // Rolls back now; later calls and the destructor do nothing.
  void Rollback();

 private:
  explicit Transaction(sqlite3* db) : db_(db) {}
  sqlite3* db_ = nullptr;
};

}  // namespace medload
