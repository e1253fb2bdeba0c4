// The store's read API over imported records: one patient's history, the ordered pass
// over every patient, practices, reviews, product counts and provenance figures.
#include <algorithm>
#include <utility>

#include "medload/store/store.h"
#include "store/sqlite.h"

namespace medload {
namespace {

constexpr const char* kDispensingColumns =
    "record_id, patient_id, practice, dispensed_on, product, code, code_system, quantity,"
    " unit, days_supply, dosage, structured_units_per_day, structured_as_needed, status";

// The statuses that count in measures (spec: only "completed" or none).
constexpr const char* kCounting = "status IN ('', 'completed')";

constexpr const char* kPatientColumns =
    "patient_id, birth_date, birth_year_only, sex, practice, registered_from, registered_to";

std::optional<Date> ColumnDate(const Statement& stmt, int index) {
  if (stmt.ColumnIsNull(index)) return std::nullopt;
  return ParseDate(stmt.ColumnText(index));
}

// Fills `record` from a row selected with kDispensingColumns.
Status ReadDispensing(const Statement& stmt, DispensingRecord& record) {
  record.record_id.assign(stmt.ColumnText(0));
  record.patient_id.assign(stmt.ColumnText(1));
  record.practice.assign(stmt.ColumnText(2));
  const std::optional<Date> date = ColumnDate(stmt, 3);
  if (!date) {
    return Status::Input("store: dispensing of patient \"" + record.patient_id +
                         "\" has a malformed date \"" + std::string(stmt.ColumnText(3)) + "\"");
  }
  record.dispensed_on = *date;
  record.product.assign(stmt.ColumnText(4));
  record.code.assign(stmt.ColumnText(5));
  record.code_system.assign(stmt.ColumnText(6));
  record.quantity = stmt.ColumnDouble(7);
  record.unit.assign(stmt.ColumnText(8));
  record.days_supply.reset();
  if (!stmt.ColumnIsNull(9)) record.days_supply = static_cast<int>(stmt.ColumnInt(9));
  record.dosage.assign(stmt.ColumnText(10));
  record.structured_units_per_day.reset();
  if (!stmt.ColumnIsNull(11)) record.structured_units_per_day = stmt.ColumnDouble(11);
  record.structured_as_needed = stmt.ColumnInt(12) != 0;
  record.status.assign(stmt.ColumnText(13));
  return Status::Ok();
}

PatientRecord ReadPatient(const Statement& stmt) {
  PatientRecord patient;
  patient.patient_id.assign(stmt.ColumnText(0));
  patient.birth_date = ColumnDate(stmt, 1);
  patient.birth_year_only = stmt.ColumnInt(2) != 0;
  patient.sex.assign(stmt.ColumnText(3));
  patient.practice.assign(stmt.ColumnText(4));
  patient.registered_from = ColumnDate(stmt, 5);
  patient.registered_to = ColumnDate(stmt, 6);
  return patient;
}

Result<std::vector<DispensingRecord>> SelectDispensings(sqlite3* db, std::string_view patient_id,
                                                        bool counting_only) {
  std::string sql = std::string("SELECT ") + kDispensingColumns +
                    " FROM dispensings WHERE patient_id = ?1";
  if (counting_only) sql += std::string(" AND ") + kCounting;
  sql += " ORDER BY dispensed_on, id";
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, patient_id);
  std::vector<DispensingRecord> records;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    if (Status status = ReadDispensing(*stmt, records.emplace_back()); !status.ok()) {
      return status;
    }
  }
  return records;
}

// Runs a query of one integer (a count); 0 when it returns no row.
Result<long> QueryCount(sqlite3* db, const char* sql) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return *row ? static_cast<long>(stmt->ColumnInt(0)) : 0L;
}

Result<std::vector<ReviewRecord>> SelectReviews(sqlite3* db, std::optional<std::string_view> patient) {
  std::string sql = "SELECT patient_id, reviewed_on FROM reviews";
  if (patient) sql += " WHERE patient_id = ?1";
  sql += " ORDER BY patient_id, reviewed_on";
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  if (patient) stmt->BindText(1, *patient);
  std::vector<ReviewRecord> reviews;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    const std::optional<Date> on = ColumnDate(*stmt, 1);
    if (!on) return Status::Input("store: a review has a malformed date");
    reviews.push_back({std::string(stmt->ColumnText(0)), *on});
  }
  return reviews;
}

}  // namespace

Result<std::vector<DispensingRecord>> Store::DispensingsOf(std::string_view patient_id) const {
  return SelectDispensings(db_, patient_id, true);
}

Result<std::vector<DispensingRecord>> Store::AllDispensingsOf(std::string_view patient_id) const {
  return SelectDispensings(db_, patient_id, false);
}

Result<std::optional<PatientRecord>> Store::PatientOf(std::string_view patient_id) const {
  Result<Statement> stmt = Statement::Prepare(
      db_, std::string("SELECT ") + kPatientColumns + " FROM patients WHERE patient_id = ?1");
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, patient_id);
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row) return std::optional<PatientRecord>();
  return std::optional<PatientRecord>(ReadPatient(*stmt));
}

Status Store::ForEachPatient(const std::function<bool(const PatientHistory&)>& visit) const {
  // Two cursors in the same bytewise patient_id order, merged: one pass, no per-patient
  // query. The dispensings cursor walks the (patient_id, dispensed_on) index.
  Result<Statement> patients = Statement::Prepare(
      db_, std::string("SELECT ") + kPatientColumns + " FROM patients ORDER BY patient_id");
  if (!patients.ok()) return patients.status();
  Result<Statement> dispensings = Statement::Prepare(
      db_, std::string("SELECT ") + kDispensingColumns + " FROM dispensings WHERE " + kCounting +
               " ORDER BY patient_id, dispensed_on, id");
  if (!dispensings.ok()) return dispensings.status();
  Result<bool> patient_row = patients->Step();
  Result<bool> dispensing_row = dispensings->Step();
  PatientHistory history;
  // Records beyond the current patient's count wait here with their string buffers, so
  // that reading the next patient reuses memory instead of allocating per field.
  std::vector<DispensingRecord> spare;
  while (patient_row.ok() && dispensing_row.ok() && (*patient_row || *dispensing_row)) {
    const std::string_view registry_id = *patient_row ? patients->ColumnText(0) : "";
    const std::string_view dispensed_id = *dispensing_row ? dispensings->ColumnText(1) : "";
    if (!*patient_row) history.patient_id.assign(dispensed_id);
    else if (!*dispensing_row) history.patient_id.assign(registry_id);
    else history.patient_id.assign(std::min(registry_id, dispensed_id));
    history.registry.reset();
    size_t used = 0;
    if (*patient_row && registry_id == history.patient_id) {
      history.registry = ReadPatient(*patients);
      patient_row = patients->Step();
    }
    while (dispensing_row.ok() && *dispensing_row &&
           dispensings->ColumnText(1) == history.patient_id) {
      if (used == history.dispensings.size()) {
        history.dispensings.emplace_back();
        if (!spare.empty()) {
          history.dispensings.back() = std::move(spare.back());
          spare.pop_back();
        }
      }
      Status status = ReadDispensing(*dispensings, history.dispensings[used++]);
      if (!status.ok()) return status;
      dispensing_row = dispensings->Step();
    }
    while (history.dispensings.size() > used) {
      spare.push_back(std::move(history.dispensings.back()));
      history.dispensings.pop_back();
    }
    if (!dispensing_row.ok()) break;
    if (!visit(history)) return Status::Ok();
  }
  if (!patient_row.ok()) return patient_row.status();
  if (!dispensing_row.ok()) return dispensing_row.status();
  return Status::Ok();
}

Result<std::vector<PracticeRecord>> Store::Practices() const {
  Result<Statement> stmt = Statement::Prepare(
      db_, "SELECT practice, name, network, list_size FROM practices ORDER BY practice");
  if (!stmt.ok()) return stmt.status();
  std::vector<PracticeRecord> practices;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    PracticeRecord& practice = practices.emplace_back();
    practice.practice.assign(stmt->ColumnText(0));
    practice.name.assign(stmt->ColumnText(1));
    practice.network.assign(stmt->ColumnText(2));
    if (!stmt->ColumnIsNull(3)) practice.list_size = static_cast<long>(stmt->ColumnInt(3));
  }
  return practices;
}

Result<std::vector<ReviewRecord>> Store::ReviewsOf(std::string_view patient_id) const {
  return SelectReviews(db_, patient_id);
}

Result<std::vector<ReviewRecord>> Store::Reviews() const { return SelectReviews(db_, std::nullopt); }

Result<std::vector<ProductCount>> Store::ProductCounts() const {
  Result<Statement> stmt = Statement::Prepare(
      db_, std::string("SELECT product, code, code_system, COUNT(*) AS items,"
                       " COUNT(DISTINCT patient_id) FROM dispensings WHERE ") +
               kCounting +
               " GROUP BY product, code, code_system ORDER BY items DESC, product, code,"
               " code_system");
  if (!stmt.ok()) return stmt.status();
  std::vector<ProductCount> counts;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    counts.push_back({std::string(stmt->ColumnText(0)), std::string(stmt->ColumnText(1)),
                      std::string(stmt->ColumnText(2)), static_cast<long>(stmt->ColumnInt(3)),
                      static_cast<long>(stmt->ColumnInt(4))});
  }
  return counts;
}

Result<StoreSummary> Store::Summary() const {
  StoreSummary summary;
  Result<Statement> span = Statement::Prepare(
      db_, std::string("SELECT MIN(dispensed_on), MAX(dispensed_on), COUNT(*) FROM dispensings"
                       " WHERE ") + kCounting);
  if (!span.ok()) return span.status();
  Result<bool> row = span->Step();
  if (!row.ok()) return row.status();
  summary.earliest_dispensed = ColumnDate(*span, 0);
  summary.latest_dispensed = ColumnDate(*span, 1);
  summary.counting_dispensings = static_cast<long>(span->ColumnInt(2));
  const std::pair<long*, const char*> counts[] = {
      {&summary.practices, "SELECT COUNT(*) FROM practices"},
      {&summary.patients, "SELECT COUNT(*) FROM patients"},
      {&summary.dispensings, "SELECT COUNT(*) FROM dispensings"},
      {&summary.reviews, "SELECT COUNT(*) FROM reviews"},
      {&summary.import_runs, "SELECT COUNT(*) FROM import_runs"},
      {&summary.rejected_rows, "SELECT COUNT(*) FROM rejected_rows"},
  };
  for (const auto& [field, sql] : counts) {
    Result<long> count = QueryCount(db_, sql);
    if (!count.ok()) return count.status();
    *field = *count;
  }
  summary.not_counting_dispensings = summary.dispensings - summary.counting_dispensings;
  return summary;
}

Result<std::vector<ImportRunRecord>> Store::ImportRuns() const {
  Result<Statement> stmt = Statement::Prepare(
      db_,
      "SELECT id, kind, file, started, outcome, read, imported, duplicates, rejected"
      " FROM import_runs ORDER BY id");
  if (!stmt.ok()) return stmt.status();
  std::vector<ImportRunRecord> runs;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    ImportRunRecord& run = runs.emplace_back();
    run.id = static_cast<long>(stmt->ColumnInt(0));
    run.kind.assign(stmt->ColumnText(1));
    run.file.assign(stmt->ColumnText(2));
    run.started.assign(stmt->ColumnText(3));
    run.outcome.assign(stmt->ColumnText(4));
    run.read = static_cast<long>(stmt->ColumnInt(5));
    run.imported = static_cast<long>(stmt->ColumnInt(6));
    run.duplicates = static_cast<long>(stmt->ColumnInt(7));
    run.rejected = static_cast<long>(stmt->ColumnInt(8));
  }
  return runs;
}

}  // namespace medload
