#include "store/dispensing_rows.h"

#include <algorithm>
#include <string>

namespace medload {

std::optional<Date> ColumnDate(const Statement& stmt, int index) {
  if (stmt.ColumnIsNull(index)) return std::nullopt;
  return ParseDate(stmt.ColumnText(index));
}

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
  record.structured_unit.assign(stmt.ColumnText(14));
  return Status::Ok();
}

void SlideIfFull(std::vector<DispensingRecord>& records, size_t& used, size_t cap, long& dropped) {
  if (used < 2 * cap) return;
  std::move(records.begin() + static_cast<std::ptrdiff_t>(cap),
            records.begin() + static_cast<std::ptrdiff_t>(used), records.begin());
  used = cap;
  dropped += static_cast<long>(cap);
}

void KeepLatest(std::vector<DispensingRecord>& records, size_t& used, size_t cap, long& dropped) {
  if (used <= cap) return;
  const size_t extra = used - cap;
  std::move(records.begin() + static_cast<std::ptrdiff_t>(extra),
            records.begin() + static_cast<std::ptrdiff_t>(used), records.begin());
  used = cap;
  dropped += static_cast<long>(extra);
}

Result<std::vector<DispensingRecord>> SelectDispensings(sqlite3* db, std::string_view patient_id,
                                                        bool counting_only, size_t cap, long* dropped_out) {
  std::string sql = std::string("SELECT ") + kDispensingColumns +
                    " FROM dispensings WHERE patient_id = ?1";
  if (counting_only) sql += std::string(" AND ") + kCounting;
  sql += " ORDER BY dispensed_on, id";
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  stmt->BindText(1, patient_id);
  std::vector<DispensingRecord> records;
  size_t used = 0;
  long dropped = 0;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    SlideIfFull(records, used, cap, dropped);
    if (used == records.size()) records.emplace_back();
    if (Status status = ReadDispensing(*stmt, records[used++]); !status.ok()) return status;
  }
  KeepLatest(records, used, cap, dropped);
  records.resize(used);
  if (dropped_out != nullptr) *dropped_out = dropped;
  return records;
}

Result<long> QueryCount(sqlite3* db, const char* sql) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return *row ? static_cast<long>(stmt->ColumnInt(0)) : 0L;
}

}  // namespace medload
