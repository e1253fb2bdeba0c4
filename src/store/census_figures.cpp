// Saved census figures: the store side of the report's figures kept between runs (the
// marks that date them, what changed since, the entries with their digests, the
// registry's digest). What the figures hold and when they are served is the report's
// business (report/census_cache.h).
#include "medload/core/hash.h"
#include "medload/store/store.h"
#include "store/dispensing_rows.h"
#include "store/sqlite.h"

namespace medload {

Result<DataMarks> Store::CurrentDataMarks() const {
  Result<long> dispensing = QueryCount(db_, "SELECT IFNULL(MAX(id), 0) FROM dispensings");
  if (!dispensing.ok()) return dispensing.status();
  // AUTOINCREMENT: an edit note's id is never used again, even after the notes are cleared.
  Result<long> edit =
      QueryCount(db_, "SELECT IFNULL((SELECT seq FROM sqlite_sequence WHERE name = 'dispensing_edits'), 0)");
  if (!edit.ok()) return edit.status();
  return DataMarks{*dispensing, *edit};
}

namespace {

// The smallest text the query gives for `bound`, or nullopt when its rows are none.
Result<std::optional<std::string>> EarliestText(sqlite3* db, const char* sql, long bound) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  stmt->BindInt(1, bound);
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row || stmt->ColumnIsNull(0)) return std::optional<std::string>();
  return std::optional<std::string>(std::string(stmt->ColumnText(0)));
}

}  // namespace

Result<std::optional<std::string>> Store::EarliestChangeSince(const DataMarks& marks) const {
  // Ids above the mark are the dispensings added since (a delete, which could let an id be
  // used again, is itself noted as a change of every date).
  auto added = EarliestText(db_, "SELECT MIN(dispensed_on) FROM dispensings WHERE id > ?1", marks.newest_dispensing);
  if (!added.ok()) return added.status();
  auto edited = EarliestText(db_, "SELECT MIN(earliest) FROM dispensing_edits WHERE id > ?1", marks.newest_edit);
  if (!edited.ok()) return edited.status();
  if (!*added) return *edited;
  if (!*edited) return *added;
  return std::optional<std::string>(std::min(**added, **edited));
}

Result<std::vector<SavedFigures>> Store::SavedCensusFigures(std::string_view settings_key) const {
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "SELECT census_date, newest_dispensing, newest_edit, figures, digest FROM census_figures"
      " WHERE settings_key = ?1 ORDER BY census_date");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, settings_key);
  std::vector<SavedFigures> saved;
  while (true) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    SavedFigures entry;
    entry.census_date = std::string(stmt->ColumnText(0));
    entry.marks = DataMarks{static_cast<long>(stmt->ColumnInt(1)), static_cast<long>(stmt->ColumnInt(2))};
    entry.figures = std::string(stmt->ColumnText(3));
    entry.intact = Sha256Hex(entry.figures) == stmt->ColumnText(4);
    saved.push_back(std::move(entry));
  }
  return saved;
}

Status Store::SaveCensusFigures(std::string_view settings_key, std::string_view date_iso, const DataMarks& marks,
                                std::string_view figures_json) {
  if (read_only_ || InSnapshot()) return Status::Ok();
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "INSERT INTO census_figures (settings_key, census_date, newest_dispensing, newest_edit, figures, digest)"
      " VALUES (?1, ?2, ?3, ?4, ?5, ?6) ON CONFLICT (settings_key, census_date) DO UPDATE SET"
      " newest_dispensing = excluded.newest_dispensing, newest_edit = excluded.newest_edit,"
      " figures = excluded.figures, digest = excluded.digest");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, settings_key);
  stmt->BindText(2, date_iso);
  stmt->BindInt(3, marks.newest_dispensing);
  stmt->BindInt(4, marks.newest_edit);
  stmt->BindText(5, figures_json);
  const std::string digest = Sha256Hex(figures_json);  // bound without a copy: outlives Run
  stmt->BindText(6, digest);
  return stmt->Run();
}

Result<long> Store::ClearCensusFigures() {
  if (read_only_) return Status::Input("store \"" + path_ + "\": opened read-only, nothing can be cleared");
  Result<Transaction> transaction = Transaction::Begin(db_);
  if (!transaction.ok()) return transaction.status();
  Result<long> entries = QueryCount(db_, "SELECT COUNT(*) FROM census_figures");
  if (!entries.ok()) return entries.status();
  if (Status status = ExecSql(db_, "DELETE FROM census_figures; DELETE FROM dispensing_edits;"); !status.ok()) {
    return status;
  }
  if (Status status = transaction->Commit(); !status.ok()) return status;
  return *entries;
}

Result<std::string> Store::RegistryDigest() const {
  // Unit separators between fields and record separators between rows, NULL as a mark of
  // its own, so that no two different tables give the same text.
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "SELECT 'practice', practice, name, network, IFNULL(list_size, '-') FROM practices"
      " UNION ALL SELECT 'patient', patient_id, IFNULL(birth_date, '-') || ':' || birth_year_only, sex,"
      " practice || ':' || IFNULL(registered_from, '-') || ':' || IFNULL(registered_to, '-') FROM patients"
      // A shard store's coverage of the rows left to other shards moves a practice's data
      // coverage, which the figures depend on, without any dispensing of this store changing.
      " UNION ALL SELECT 'other shards', practice, first_dispensed, latest_dispensed, '-' FROM other_shard_coverage"
      " UNION ALL SELECT 'shard', shard, shards, '-', '-' FROM store_shard");
  if (!stmt.ok()) return stmt.status();
  std::string text;
  while (true) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    for (int column = 0; column < 5; ++column) text.append(stmt->ColumnText(column)).append(1, '\x1f');
    text.append(1, '\x1e');
  }
  return Sha256Hex(text);
}

}  // namespace medload
