#include "store/sqlite.h"

#include <doctest/doctest.h>
#include <sqlite3.h>

namespace medload {
namespace {

// A private in-memory connection with one table.
struct Db {
  Db() {
    sqlite3_open(":memory:", &db);
    REQUIRE(ExecSql(db, "CREATE TABLE t (k TEXT PRIMARY KEY, n INTEGER, x REAL)").ok());
  }
  ~Db() { sqlite3_close(db); }
  long Rows() const {
    Result<Statement> count = Statement::Prepare(db, "SELECT COUNT(*) FROM t");
    REQUIRE(count.ok());
    REQUIRE(*count->Step());
    return static_cast<long>(count->ColumnInt(0));
  }
  sqlite3* db = nullptr;
};

}  // namespace

TEST_SUITE("store/sqlite") {

TEST_CASE("bound values round-trip, including text with quotes and NULLs") {
  Db db;
  Result<Statement> insert = Statement::Prepare(db.db, "INSERT INTO t VALUES (?1, ?2, ?3)");
  REQUIRE(insert.ok());
  const std::string tricky = "O'Brien'); DROP TABLE t; --";
  insert->BindText(1, tricky);
  insert->BindOptionalInt(2, std::nullopt);
  insert->BindOptionalDouble(3, 2.5);
  REQUIRE(insert->Run().ok());
  Result<Statement> select = Statement::Prepare(db.db, "SELECT k, n, x FROM t WHERE k = ?1");
  REQUIRE(select.ok());
  select->BindText(1, tricky);
  Result<bool> row = select->Step();
  REQUIRE(row.ok());
  REQUIRE(*row);
  CHECK(select->ColumnText(0) == tricky);
  CHECK(select->ColumnIsNull(1));
  CHECK(select->ColumnDouble(2) == 2.5);
  CHECK_FALSE(*select->Step());
}

TEST_CASE("a statement can be reused after Run with new bindings") {
  Db db;
  Result<Statement> insert = Statement::Prepare(db.db, "INSERT INTO t (k, n) VALUES (?1, ?2)");
  REQUIRE(insert.ok());
  for (int i = 0; i < 5; ++i) {
    const std::string key = "k" + std::to_string(i);
    insert->BindText(1, key);
    insert->BindInt(2, i);
    REQUIRE(insert->Run().ok());
    CHECK(ChangedRows(db.db) == 1);
  }
  CHECK(db.Rows() == 5);
}

TEST_CASE("a constraint failure is an input status with SQLite's message") {
  Db db;
  Result<Statement> insert = Statement::Prepare(db.db, "INSERT INTO t (k) VALUES ('same')");
  REQUIRE(insert.ok());
  REQUIRE(insert->Run().ok());
  Status again = insert->Run();
  REQUIRE_FALSE(again.ok());
  CHECK(again.code() == StatusCode::kInput);
  CHECK(again.message().find("UNIQUE constraint failed") != std::string::npos);
}

TEST_CASE("a malformed statement fails to prepare") {
  Db db;
  Result<Statement> bad = Statement::Prepare(db.db, "SELEC nothing");
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.status().message().find("syntax error") != std::string::npos);
}

TEST_CASE("a transaction rolls back unless it was committed") {
  Db db;
  {
    Result<Transaction> transaction = Transaction::Begin(db.db);
    REQUIRE(transaction.ok());
    REQUIRE(ExecSql(db.db, "INSERT INTO t (k) VALUES ('lost')").ok());
  }
  CHECK(db.Rows() == 0);
  {
    Result<Transaction> transaction = Transaction::Begin(db.db);
    REQUIRE(transaction.ok());
    REQUIRE(ExecSql(db.db, "INSERT INTO t (k) VALUES ('kept')").ok());
    REQUIRE(transaction->Commit().ok());
  }
  CHECK(db.Rows() == 1);
  {
    Result<Transaction> transaction = Transaction::Begin(db.db);
    REQUIRE(transaction.ok());
    REQUIRE(ExecSql(db.db, "INSERT INTO t (k) VALUES ('undone')").ok());
    transaction->Rollback();
    CHECK_FALSE(transaction->Commit().ok());
  }
  CHECK(db.Rows() == 1);
}

TEST_CASE("a moved statement is finalised once and keeps working") {
  Db db;
  Result<Statement> prepared = Statement::Prepare(db.db, "SELECT 41 + 1");
  REQUIRE(prepared.ok());
  Statement moved = std::move(prepared.value());
  Statement target;
  target = std::move(moved);
  REQUIRE(*target.Step());
  CHECK(target.ColumnInt(0) == 42);
}

}  // TEST_SUITE

}  // namespace medload
