#include "store/shard_split.h"

#include "medload/input/fhir_reader.h"
#include "store/dispensing_rows.h"

namespace medload {
namespace {

size_t PatientColumn(InputKind kind) {
  const std::vector<ColumnSpec>& columns = ColumnsOf(kind);
  for (size_t i = 0; i < columns.size(); ++i) {
    if (columns[i].name == "patient_id") return i;
  }
  return HeaderLayout::kAbsent;
}

bool Split(ShardSpec shard) { return shard.count > 1; }

// Whether the store holds any patient's rows (registry, dispensings, reviews).
Result<bool> HoldsPatientRows(sqlite3* db) {
  Result<long> rows = QueryCount(
      db, "SELECT (SELECT COUNT(*) FROM (SELECT 1 FROM patients LIMIT 1)) +"
          " (SELECT COUNT(*) FROM (SELECT 1 FROM dispensings LIMIT 1)) +"
          " (SELECT COUNT(*) FROM (SELECT 1 FROM reviews LIMIT 1))");
  if (!rows.ok()) return rows.status();
  return *rows > 0;
}

}  // namespace

ShardSplit::ShardSplit(ShardSpec shard, InputKind kind)
    : shard_(shard), kind_(kind), patient_column_(PatientColumn(kind)) {}

Status ShardSplit::Claim(sqlite3* db, const std::optional<ShardSpec>& held, std::string_view file) const {
  const std::string where = std::string(file) + ": ";
  if (!Split(shard_)) {
    if (!held || kind_ == InputKind::kPractices) return Status::Ok();
    return Status::Input(where + "the store holds shard " + ShardName(*held) +
                         " of the network's patients: import with --shard " + ShardName(*held) +
                         " (or into a store of the whole network)");
  }
  if (held) {
    if (*held == shard_) return Status::Ok();
    return Status::Input(where + "the store holds shard " + ShardName(*held) + ", not " + ShardName(shard_) +
                         ": each shard goes into a store of its own");
  }
  Result<bool> holds_rows = HoldsPatientRows(db);
  if (!holds_rows.ok()) return holds_rows.status();
  if (*holds_rows) {
    return Status::Input(where + "the store already holds rows imported without --shard; shard " +
                         ShardName(shard_) + " goes into a store of its own");
  }
  Result<Statement> insert = Statement::Prepare(db, "INSERT INTO store_shard (id, shard, shards) VALUES (1, ?1, ?2)");
  if (!insert.ok()) return insert.status();
  insert->BindInt(1, shard_.index);
  insert->BindInt(2, shard_.count);
  return insert->Run();
}

bool ShardSplit::Elsewhere(const CsvRow& row, const HeaderLayout& layout) const {
  if (!Split(shard_) || patient_column_ == HeaderLayout::kAbsent) return false;
  if (row.fault != CsvFault::kNone || row.fields.size() != layout.field_count()) return false;
  const std::string_view patient = layout.Value(row, patient_column_);
  return !patient.empty() && !InShard(patient, shard_);
}

void ShardSplit::NoteElsewhere(const DispensingRecord& record) {
  if (StatusCounts(record.status)) AddToSpans(elsewhere_, record.practice, record.dispensed_on);
}

Status ShardSplit::SaveCoverage(sqlite3* db) const {
  if (elsewhere_.empty()) return Status::Ok();
  Result<Statement> upsert = Statement::Prepare(
      db,
      "INSERT INTO other_shard_coverage (practice, first_dispensed, latest_dispensed) VALUES (?1, ?2, ?3)"
      " ON CONFLICT (practice) DO UPDATE SET"
      " first_dispensed = MIN(first_dispensed, excluded.first_dispensed),"
      " latest_dispensed = MAX(latest_dispensed, excluded.latest_dispensed)");
  if (!upsert.ok()) return upsert.status();
  for (const auto& [practice, span] : elsewhere_) {
    const std::string first = span.first.ToIso();
    const std::string latest = span.latest.ToIso();
    upsert->BindText(1, practice);
    upsert->BindText(2, first);
    upsert->BindText(3, latest);
    if (Status status = upsert->Run(); !status.ok()) return status;
  }
  return Status::Ok();
}

}  // namespace medload
