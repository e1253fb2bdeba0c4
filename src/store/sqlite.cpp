#include "store/sqlite.h"

#include <sqlite3.h>

#include <cerrno>
#include <utility>

namespace medload {
namespace {

// Plain words for a write that failed for want of space. SQLite says "database or disk is
// full" for a short write and "disk I/O error" when the system refuses a write outright
// (EFBIG past a file size limit, EDQUOT over a quota); its saved errno is not reliable by
// then, so any failed write gets the note.
std::string DiskNote(sqlite3* db) {
  if (db == nullptr) return "";
  const int code = sqlite3_extended_errcode(db);
  if ((code & 0xff) == SQLITE_FULL) return " (the store's disk is full, or a file size limit was reached)";
  const int error = sqlite3_system_errno(db);
  if (code == SQLITE_IOERR_WRITE ||
      ((code & 0xff) == SQLITE_IOERR && (error == ENOSPC || error == EFBIG || error == EDQUOT))) {
    return " (a write to the store failed: its disk may be full, or a file size limit was reached)";
  }
  return "";
}

}  // namespace

std::string SqliteError(sqlite3* db, std::string_view context) {
  std::string message(context);
  message += ": ";
  message += db != nullptr ? sqlite3_errmsg(db) : "out of memory";
  message += DiskNote(db);
  return message;
}

Status ExecSql(sqlite3* db, const char* sql) {
  char* error = nullptr;
  if (sqlite3_exec(db, sql, nullptr, nullptr, &error) != SQLITE_OK) {
    std::string message = error != nullptr ? error : sqlite3_errmsg(db);
    sqlite3_free(error);
    return Status::Input("store: " + message + DiskNote(db));
  }
  return Status::Ok();
}

Status SetMemoryMap(sqlite3* db, bool on) {
  // 256 MiB: a store of about a million dispensings is read wholly through the map; a
  // larger one reads the rest through SQLite's page cache, so the process's resident size
  // (mapped file pages count in it) stays bounded however large the store grows.
  return ExecSql(db, on ? "PRAGMA mmap_size=268435456" : "PRAGMA mmap_size=0");
}

Status SetPageCache(sqlite3* db, bool importing) {
  return ExecSql(db, importing ? "PRAGMA cache_size=-65536" : "PRAGMA cache_size=-16384");
}

int ChangedRows(sqlite3* db) { return sqlite3_changes(db); }

int64_t LastInsertId(sqlite3* db) { return sqlite3_last_insert_rowid(db); }

Result<Statement> Statement::Prepare(sqlite3* db, std::string_view sql) {
  sqlite3_stmt* stmt = nullptr;
  // SQLITE_PREPARE_PERSISTENT: these statements are reused for many rows.
  const int rc = sqlite3_prepare_v3(db, sql.data(), static_cast<int>(sql.size()),
                                    SQLITE_PREPARE_PERSISTENT, &stmt, nullptr);
  if (rc != SQLITE_OK) {
    sqlite3_finalize(stmt);
    return Status::Input(SqliteError(db, "store: preparing a statement"));
  }
  return Statement(stmt);
}

Statement::Statement(Statement&& other) noexcept : stmt_(std::exchange(other.stmt_, nullptr)) {}

Statement& Statement::operator=(Statement&& other) noexcept {
  if (this != &other) {
    sqlite3_finalize(stmt_);
    stmt_ = std::exchange(other.stmt_, nullptr);
  }
  return *this;
}

Statement::~Statement() { sqlite3_finalize(stmt_); }

void Statement::BindText(int index, std::string_view text) {
  sqlite3_bind_text(stmt_, index, text.data(), static_cast<int>(text.size()), SQLITE_STATIC);
}

void Statement::BindBlob(int index, std::string_view bytes) {
  sqlite3_bind_blob(stmt_, index, bytes.data(), static_cast<int>(bytes.size()), SQLITE_STATIC);
}

void Statement::BindInt(int index, int64_t value) { sqlite3_bind_int64(stmt_, index, value); }

void Statement::BindDouble(int index, double value) { sqlite3_bind_double(stmt_, index, value); }

void Statement::BindNull(int index) { sqlite3_bind_null(stmt_, index); }

void Statement::BindOptionalInt(int index, std::optional<int64_t> value) {
  if (value) BindInt(index, *value);
  else BindNull(index);
}

void Statement::BindOptionalDouble(int index, std::optional<double> value) {
  if (value) BindDouble(index, *value);
  else BindNull(index);
}

Result<bool> Statement::Step() {
  const int rc = sqlite3_step(stmt_);
  if (rc == SQLITE_ROW) return true;
  if (rc == SQLITE_DONE) return false;
  sqlite3* db = sqlite3_db_handle(stmt_);
  std::string message = SqliteError(db, "store");
  sqlite3_reset(stmt_);
  return Status::Input(std::move(message));
}

Status Statement::Run() {
  Result<bool> stepped = Step();
  Reset();
  return stepped.ok() ? Status::Ok() : stepped.status();
}

void Statement::Reset() { sqlite3_reset(stmt_); }

std::string_view Statement::ColumnText(int index) const {
  const auto* text = reinterpret_cast<const char*>(sqlite3_column_text(stmt_, index));
  if (text == nullptr) return {};
  return {text, static_cast<size_t>(sqlite3_column_bytes(stmt_, index))};
}

std::string_view Statement::ColumnBlob(int index) const {
  const auto* bytes = static_cast<const char*>(sqlite3_column_blob(stmt_, index));
  if (bytes == nullptr) return {};
  return {bytes, static_cast<size_t>(sqlite3_column_bytes(stmt_, index))};
}

int64_t Statement::ColumnInt(int index) const { return sqlite3_column_int64(stmt_, index); }

double Statement::ColumnDouble(int index) const { return sqlite3_column_double(stmt_, index); }

bool Statement::ColumnIsNull(int index) const {
  return sqlite3_column_type(stmt_, index) == SQLITE_NULL;
}

Result<Transaction> Transaction::Begin(sqlite3* db) {
  if (Status status = ExecSql(db, "BEGIN IMMEDIATE"); !status.ok()) return status;
  return Transaction(db);
}

Result<std::optional<Transaction>> Transaction::TryBegin(sqlite3* db, int busy_timeout_ms) {
  sqlite3_busy_timeout(db, 0);
  const int rc = sqlite3_exec(db, "BEGIN IMMEDIATE", nullptr, nullptr, nullptr);
  sqlite3_busy_timeout(db, busy_timeout_ms);
  if (rc == SQLITE_OK) return std::optional<Transaction>(Transaction(db));
  if ((rc & 0xff) == SQLITE_BUSY) return std::optional<Transaction>();
  return Status::Input(SqliteError(db, "store: starting a write"));
}

Transaction::Transaction(Transaction&& other) noexcept : db_(std::exchange(other.db_, nullptr)) {}

Transaction::~Transaction() { Rollback(); }

Status Transaction::Commit() {
  if (db_ == nullptr) return Status::Input("store: commit after the transaction ended");
  Status status = ExecSql(db_, "COMMIT");
  if (status.ok()) db_ = nullptr;
  return status;
}

void Transaction::Rollback() {
  if (db_ == nullptr) return;
  // The result is ignored on purpose: after some errors SQLite has already rolled back.
  sqlite3_exec(db_, "ROLLBACK", nullptr, nullptr, nullptr);
  db_ = nullptr;
}

}  // namespace medload
