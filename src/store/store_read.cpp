// The store's read API over imported records: one patient's history, the ordered pass
// over every patient, practices, reviews, product counts and provenance figures.
#include <algorithm>
#include <map>
#include <span>
#include <utility>

#include "medload/store/store.h"
#include "store/dispensing_rows.h"
#include "store/packed_history.h"
#include "store/sqlite.h"

namespace medload {
namespace {

constexpr const char* kPatientColumns =
    "patient_id, birth_date, birth_year_only, sex, practice, registered_from, registered_to";

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

Result<std::vector<DispensingRecord>> Store::DispensingsOf(std::string_view patient_id, long* dropped) const {
  return SelectDispensings(db_, patient_id, true, max_dispensings_, dropped);
}

Result<std::vector<DispensingRecord>> Store::AllDispensingsOf(std::string_view patient_id, long* dropped) const {
  return SelectDispensings(db_, patient_id, false, max_dispensings_, dropped);
}

Result<std::map<std::string, long>> Store::NotCountingOf(std::string_view patient_id, Date on) const {
  Result<Statement> stmt = Statement::Prepare(
      db_, std::string("SELECT status, COUNT(*) FROM dispensings WHERE patient_id = ?1 AND"
                       " dispensed_on <= ?2 AND NOT ") + kCounting + " GROUP BY status ORDER BY status");
  if (!stmt.ok()) return stmt.status();
  const std::string on_iso = on.ToIso();
  stmt->BindText(1, patient_id);
  stmt->BindText(2, on_iso);
  std::map<std::string, long> counts;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    counts[std::string(stmt->ColumnText(0))] = static_cast<long>(stmt->ColumnInt(1));
  }
  return counts;
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

// Two cursors in the same bytewise patient_id order, merged: one pass, no per-patient
// query. The dispensings cursor reads the packed copy of each history when it is current,
// else walks the (patient_id, dispensed_on) index of the dispensings.
struct PatientCursor::State {
  Statement patients;
  Statement dispensings;
  bool packed = false;  // `dispensings` reads packed_histories (patient_id, packed, dropped)
  size_t cap = kMaxDispensingsPerPatient;  // the most dispensings a history holds
  PatientIdRange range;  // the bounds the statements are bound to (they must outlive it)
  Result<bool> patient_row = false;
  Result<bool> dispensing_row = false;
  // Records beyond a patient's count wait here with their string buffers, so that reading
  // the next patient reuses memory instead of allocating per field.
  std::vector<DispensingRecord> own_spare;
  std::vector<DispensingRecord>* spare = &own_spare;  // the caller's pool, or own_spare
};

PatientCursor::PatientCursor(std::unique_ptr<State> state) : state_(std::move(state)) {}
PatientCursor::PatientCursor(PatientCursor&&) noexcept = default;
PatientCursor& PatientCursor::operator=(PatientCursor&&) noexcept = default;
PatientCursor::~PatientCursor() = default;

Result<bool> PatientCursor::Next(PatientHistory& into) {
  State& s = *state_;
  if (!s.patient_row.ok()) return s.patient_row.status();
  if (!s.dispensing_row.ok()) return s.dispensing_row.status();
  if (!*s.patient_row && !*s.dispensing_row) return false;
  const std::string_view registry_id = *s.patient_row ? s.patients.ColumnText(0) : "";
  const int id_column = s.packed ? 0 : 1;
  const std::string_view dispensed_id = *s.dispensing_row ? s.dispensings.ColumnText(id_column) : "";
  if (!*s.patient_row) into.patient_id.assign(dispensed_id);
  else if (!*s.dispensing_row) into.patient_id.assign(registry_id);
  else into.patient_id.assign(std::min(registry_id, dispensed_id));
  into.registry.reset();
  into.dropped = 0;
  if (*s.patient_row && registry_id == into.patient_id) {
    into.registry = ReadPatient(s.patients);
    s.patient_row = s.patients.Step();
  }
  if (s.packed) {
    if (*s.dispensing_row && s.dispensings.ColumnText(0) == into.patient_id) {
      if (Status status = UnpackHistory(s.dispensings.ColumnBlob(1), into.patient_id,
                                        into.dispensings, *s.spare);
          !status.ok()) {
        return status;
      }
      into.dropped = static_cast<long>(s.dispensings.ColumnInt(2));
      size_t used = into.dispensings.size();  // a copy packed with a larger bound
      KeepLatest(into.dispensings, used, s.cap, into.dropped);
      into.dispensings.resize(used);
      s.dispensing_row = s.dispensings.Step();
    } else {
      while (!into.dispensings.empty()) {
        s.spare->push_back(std::move(into.dispensings.back()));
        into.dispensings.pop_back();
      }
    }
    if (!s.dispensing_row.ok()) return s.dispensing_row.status();
    return true;
  }
  size_t used = 0;
  while (s.dispensing_row.ok() && *s.dispensing_row && s.dispensings.ColumnText(1) == into.patient_id) {
    SlideIfFull(into.dispensings, used, s.cap, into.dropped);
    if (used == into.dispensings.size()) {
      into.dispensings.emplace_back();
      if (!s.spare->empty()) {
        into.dispensings.back() = std::move(s.spare->back());
        s.spare->pop_back();
      }
    }
    if (Status status = ReadDispensing(s.dispensings, into.dispensings[used++]); !status.ok()) return status;
    s.dispensing_row = s.dispensings.Step();
  }
  KeepLatest(into.dispensings, used, s.cap, into.dropped);
  while (into.dispensings.size() > used) {
    s.spare->push_back(std::move(into.dispensings.back()));
    into.dispensings.pop_back();
  }
  if (!s.dispensing_row.ok()) return s.dispensing_row.status();
  return true;
}

Result<PatientCursor> Store::Patients() const { return Patients(PatientIdRange{}); }

Result<PatientCursor> Store::Patients(const PatientIdRange& range,
                                     std::vector<DispensingRecord>* spare) const {
  auto state = std::make_unique<PatientCursor::State>();
  state->range = range;
  state->cap = max_dispensings_;
  if (spare != nullptr) state->spare = spare;
  // Bounds only where the range has them, so that SQLite stops the index walk at `to`.
  std::string bounds;
  if (!range.from.empty()) bounds += " AND patient_id >= ?1";
  if (!range.to.empty()) bounds += " AND patient_id < ?2";
  Result<Statement> patients = Statement::Prepare(
      db_, std::string("SELECT ") + kPatientColumns + " FROM patients WHERE 1" + bounds +
               " ORDER BY patient_id");
  if (!patients.ok()) return patients.status();
  // The packed copy only inside a snapshot, where the check and the reading see the same
  // store.
  if (InSnapshot()) {
    Result<bool> current = PackedHistoriesCurrent();
    if (!current.ok()) return current.status();
    state->packed = *current;
  }
  Result<Statement> dispensings =
      state->packed
          ? Statement::Prepare(db_, "SELECT patient_id, packed, dropped FROM packed_histories WHERE 1" +
                                        bounds + " ORDER BY patient_id")
          : Statement::Prepare(db_, std::string("SELECT ") + kDispensingColumns +
                                        " FROM dispensings WHERE " + kCounting + bounds +
                                        " ORDER BY patient_id, dispensed_on, id");
  if (!dispensings.ok()) return dispensings.status();
  for (Statement* stmt : {&patients.value(), &dispensings.value()}) {
    if (!state->range.from.empty()) stmt->BindText(1, state->range.from);
    if (!state->range.to.empty()) stmt->BindText(2, state->range.to);
  }
  state->patients = std::move(patients).value();
  state->dispensings = std::move(dispensings).value();
  state->patient_row = state->patients.Step();
  state->dispensing_row = state->dispensings.Step();
  return PatientCursor(std::move(state));
}

Result<std::vector<PatientIdRange>> Store::PatientRanges(size_t patients_per_range) const {
  if (patients_per_range == 0) patients_per_range = 1;
  // Every n-th id of the registry starts a range; the dispensings' ids (a walk of their
  // index) when the registry is too small to share out.
  std::vector<std::string> starts;
  for (const char* sql : {"SELECT patient_id FROM patients ORDER BY patient_id",
                          "SELECT DISTINCT patient_id FROM dispensings ORDER BY patient_id"}) {
    Result<Statement> stmt = Statement::Prepare(db_, sql);
    if (!stmt.ok()) return stmt.status();
    starts.clear();
    size_t seen = 0;
    for (;;) {
      Result<bool> row = stmt->Step();
      if (!row.ok()) return row.status();
      if (!*row) break;
      if (seen > 0 && seen % patients_per_range == 0) starts.emplace_back(stmt->ColumnText(0));
      ++seen;
    }
    if (seen >= 2 * patients_per_range) break;
  }
  std::vector<PatientIdRange> ranges(starts.size() + 1);
  for (size_t i = 0; i < starts.size(); ++i) {
    ranges[i].to = starts[i];
    ranges[i + 1].from = starts[i];
  }
  return ranges;
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

namespace {

// Rows of (practice, first, latest) as spans; a malformed date names the store.
Result<PracticeSpans> ReadSpans(sqlite3* db, const char* sql, const std::string& path) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  PracticeSpans spans;
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    const std::optional<Date> first = ColumnDate(*stmt, 1);
    const std::optional<Date> latest = ColumnDate(*stmt, 2);
    if (!first || !latest) return Status::Input(path + ": a stored dispensing date is malformed");
    spans[std::string(stmt->ColumnText(0))] = DataSpan{*first, *latest};
  }
  return spans;
}

}  // namespace

Result<PracticeSpans> Store::PracticeDataSpans() const {
  Result<PracticeSpans> spans = ReadSpans(
      db_, "SELECT CASE WHEN d.practice <> '' THEN d.practice ELSE COALESCE(p.practice, '') END AS owner,"
           " MIN(d.dispensed_on), MAX(d.dispensed_on) FROM dispensings d"
           " LEFT JOIN patients p ON p.patient_id = d.patient_id"
           " WHERE d.status IN ('', 'completed') GROUP BY owner", path_);
  if (!spans.ok()) return spans.status();
  Result<PracticeSpans> others = OtherShardCoverage();
  if (!others.ok()) return others.status();
  others->erase("");  // attributed by their own shard's store only
  MergeSpans(*spans, *others);
  return spans;
}

Result<PracticeSpans> Store::OtherShardCoverage() const {
  return ReadSpans(db_, "SELECT practice, first_dispensed, latest_dispensed FROM other_shard_coverage", path_);
}

Result<std::optional<ShardSpec>> Store::HeldShard() const {
  Result<Statement> stmt = Statement::Prepare(db_, "SELECT shard, shards FROM store_shard WHERE id = 1");
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  if (!*row) return std::optional<ShardSpec>();
  const int64_t index = stmt->ColumnInt(0);
  const int64_t count = stmt->ColumnInt(1);
  if (count < 1 || index < 1 || index > count || count > UINT32_MAX) {
    return Status::Input(path_ + ": the stored shard " + std::to_string(index) + "/" + std::to_string(count) +
                         " is malformed");
  }
  return std::optional<ShardSpec>(ShardSpec{static_cast<uint32_t>(index), static_cast<uint32_t>(count)});
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
  // A shard's store spans the whole network's data (the rows its imports left to others).
  Result<PracticeSpans> others = OtherShardCoverage();
  if (!others.ok()) return others.status();
  for (const auto& [practice, other] : *others) {
    if (!summary.earliest_dispensed || other.first < *summary.earliest_dispensed) summary.earliest_dispensed = other.first;
    if (!summary.latest_dispensed || *summary.latest_dispensed < other.latest) summary.latest_dispensed = other.latest;
  }
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
