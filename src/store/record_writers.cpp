#include "store/record_writers.h"

#include <optional>

#include "medload/store/importer.h"

namespace medload {
namespace {

std::optional<std::string> IsoOrNull(const std::optional<Date>& date) {
  if (!date) return std::nullopt;
  return date->ToIso();
}

void BindOptionalText(Statement& stmt, int index, const std::optional<std::string>& text) {
  if (text) stmt.BindText(index, *text);
  else stmt.BindNull(index);
}

bool SameOptionalText(const Statement& stmt, int column, const std::optional<std::string>& text) {
  if (stmt.ColumnIsNull(column)) return !text.has_value();
  return text.has_value() && stmt.ColumnText(column) == *text;
}

// YYYY-MM-DD into `out`, reusing its buffer (this runs once per imported row).
void AssignIso(Date date, std::string& out) {
  const int year = date.year();
  const int month = date.month();
  const int day = date.day();
  const char text[10] = {static_cast<char>('0' + year / 1000 % 10), static_cast<char>('0' + year / 100 % 10),
                         static_cast<char>('0' + year / 10 % 10),   static_cast<char>('0' + year % 10),
                         '-',
                         static_cast<char>('0' + month / 10),       static_cast<char>('0' + month % 10),
                         '-',
                         static_cast<char>('0' + day / 10),         static_cast<char>('0' + day % 10)};
  out.assign(text, sizeof text);
}

}  // namespace

Status DispensingWriter::Prepare(sqlite3* db, WriteSource source) {
  db_ = db;
  source_ = source;
  Result<Statement> insert = Statement::Prepare(
      db,
      "INSERT INTO dispensings (dedup_key, record_id, patient_id, practice, dispensed_on,"
      " product, code, code_system, quantity, unit, days_supply, dosage,"
      " structured_units_per_day, structured_as_needed, status, source_line, run_id,"
      " structured_unit)"
      " VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17,"
      " ?18)"
      " ON CONFLICT (dedup_key) DO NOTHING");
  if (!insert.ok()) return insert.status();
  insert_ = std::move(insert.value());
  Result<Statement> update = Statement::Prepare(
      db,
      "UPDATE dispensings SET status = ?2, run_id = ?3, source_line = ?4"
      " WHERE dedup_key = ?1 AND status <> ?2");
  if (!update.ok()) return update.status();
  update_status_ = std::move(update.value());
  insert_.BindInt(17, source_.run_id);
  return Status::Ok();
}

Result<WriteOutcome> DispensingWriter::Write(const DispensingRecord& record, size_t line,
                                             bool update_status) {
  key_ = DispensingKey(record);
  AssignIso(record.dispensed_on, date_);
  insert_.BindText(1, key_);
  insert_.BindText(2, record.record_id);
  insert_.BindText(3, record.patient_id);
  insert_.BindText(4, record.practice);
  insert_.BindText(5, date_);
  insert_.BindText(6, record.product);
  insert_.BindText(7, record.code);
  insert_.BindText(8, record.code_system);
  insert_.BindDouble(9, record.quantity);
  insert_.BindText(10, record.unit);
  insert_.BindOptionalInt(11, record.days_supply);
  insert_.BindText(12, record.dosage);
  insert_.BindOptionalDouble(13, record.structured_units_per_day);
  insert_.BindInt(14, record.structured_as_needed ? 1 : 0);
  insert_.BindText(15, record.status);
  insert_.BindInt(16, static_cast<int64_t>(line));
  insert_.BindText(18, record.structured_unit);
  if (Status status = insert_.Run(); !status.ok()) return status;
  if (ChangedRows(db_) == 1) return WriteOutcome::kImported;
  if (!update_status || record.record_id.empty()) return WriteOutcome::kDuplicate;
  update_status_.BindText(1, key_);
  update_status_.BindText(2, record.status);
  update_status_.BindInt(3, source_.run_id);
  update_status_.BindInt(4, static_cast<int64_t>(line));
  if (Status status = update_status_.Run(); !status.ok()) return status;
  return ChangedRows(db_) == 1 ? WriteOutcome::kUpdated : WriteOutcome::kDuplicate;
}

Status PatientWriter::Prepare(sqlite3* db, WriteSource source) {
  run_id_ = source.run_id;
  Result<Statement> select = Statement::Prepare(
      db,
      "SELECT birth_date, birth_year_only, sex, practice, registered_from, registered_to"
      " FROM patients WHERE patient_id = ?1");
  if (!select.ok()) return select.status();
  select_ = std::move(select.value());
  Result<Statement> upsert = Statement::Prepare(
      db,
      "INSERT INTO patients (patient_id, birth_date, birth_year_only, sex, practice,"
      " registered_from, registered_to, run_id) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8)"
      " ON CONFLICT (patient_id) DO UPDATE SET birth_date = excluded.birth_date,"
      " birth_year_only = excluded.birth_year_only, sex = excluded.sex,"
      " practice = excluded.practice, registered_from = excluded.registered_from,"
      " registered_to = excluded.registered_to, run_id = excluded.run_id");
  if (!upsert.ok()) return upsert.status();
  upsert_ = std::move(upsert.value());
  return Status::Ok();
}

Result<WriteOutcome> PatientWriter::Write(const PatientRecord& patient) {
  const std::optional<std::string> birth = IsoOrNull(patient.birth_date);
  const std::optional<std::string> from = IsoOrNull(patient.registered_from);
  const std::optional<std::string> to = IsoOrNull(patient.registered_to);
  select_.BindText(1, patient.patient_id);
  Result<bool> found = select_.Step();
  if (!found.ok()) return found.status();
  const bool same = *found && SameOptionalText(select_, 0, birth) &&
                    (select_.ColumnInt(1) != 0) == patient.birth_year_only &&
                    select_.ColumnText(2) == patient.sex &&
                    select_.ColumnText(3) == patient.practice &&
                    SameOptionalText(select_, 4, from) && SameOptionalText(select_, 5, to);
  const bool existed = *found;
  select_.Reset();
  if (same) return WriteOutcome::kDuplicate;
  upsert_.BindText(1, patient.patient_id);
  BindOptionalText(upsert_, 2, birth);
  upsert_.BindInt(3, patient.birth_year_only ? 1 : 0);
  upsert_.BindText(4, patient.sex);
  upsert_.BindText(5, patient.practice);
  BindOptionalText(upsert_, 6, from);
  BindOptionalText(upsert_, 7, to);
  upsert_.BindInt(8, run_id_);
  if (Status status = upsert_.Run(); !status.ok()) return status;
  return existed ? WriteOutcome::kUpdated : WriteOutcome::kImported;
}

Status PracticeWriter::Prepare(sqlite3* db, WriteSource source) {
  run_id_ = source.run_id;
  Result<Statement> select = Statement::Prepare(
      db, "SELECT name, network, list_size FROM practices WHERE practice = ?1");
  if (!select.ok()) return select.status();
  select_ = std::move(select.value());
  Result<Statement> upsert = Statement::Prepare(
      db,
      "INSERT INTO practices (practice, name, network, list_size, run_id)"
      " VALUES (?1, ?2, ?3, ?4, ?5) ON CONFLICT (practice) DO UPDATE SET"
      " name = excluded.name, network = excluded.network, list_size = excluded.list_size,"
      " run_id = excluded.run_id");
  if (!upsert.ok()) return upsert.status();
  upsert_ = std::move(upsert.value());
  return Status::Ok();
}

Result<WriteOutcome> PracticeWriter::Write(const PracticeRecord& practice) {
  select_.BindText(1, practice.practice);
  Result<bool> found = select_.Step();
  if (!found.ok()) return found.status();
  const std::optional<long> stored_size =
      *found && !select_.ColumnIsNull(2) ? std::optional<long>(select_.ColumnInt(2)) : std::nullopt;
  const bool same = *found && select_.ColumnText(0) == practice.name &&
                    select_.ColumnText(1) == practice.network && stored_size == practice.list_size;
  const bool existed = *found;
  select_.Reset();
  if (same) return WriteOutcome::kDuplicate;
  upsert_.BindText(1, practice.practice);
  upsert_.BindText(2, practice.name);
  upsert_.BindText(3, practice.network);
  upsert_.BindOptionalInt(4, practice.list_size);
  upsert_.BindInt(5, run_id_);
  if (Status status = upsert_.Run(); !status.ok()) return status;
  return existed ? WriteOutcome::kUpdated : WriteOutcome::kImported;
}

Status ReviewWriter::Prepare(sqlite3* db, WriteSource source) {
  db_ = db;
  run_id_ = source.run_id;
  Result<Statement> insert = Statement::Prepare(
      db,
      "INSERT INTO reviews (patient_id, reviewed_on, run_id) VALUES (?1, ?2, ?3)"
      " ON CONFLICT (patient_id, reviewed_on) DO NOTHING");
  if (!insert.ok()) return insert.status();
  insert_ = std::move(insert.value());
  return Status::Ok();
}

Result<WriteOutcome> ReviewWriter::Write(const ReviewRecord& review) {
  const std::string on = review.reviewed_on.ToIso();
  insert_.BindText(1, review.patient_id);
  insert_.BindText(2, on);
  insert_.BindInt(3, run_id_);
  if (Status status = insert_.Run(); !status.ok()) return status;
  return ChangedRows(db_) == 1 ? WriteOutcome::kImported : WriteOutcome::kDuplicate;
}

}  // namespace medload
