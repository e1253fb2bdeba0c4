#include "store/history_packing.h"

#include <algorithm>
#include <span>
#include <string_view>
#include <utility>

#include "store/dispensing_rows.h"
#include "store/packed_history.h"

namespace medload {
namespace {

constexpr const char* kWriteHistory =
    "INSERT OR REPLACE INTO packed_histories (patient_id, packed, dropped) VALUES (?1, ?2, ?3)";

// Packs the first `used` of `records` (one patient's, in the pass's order) and writes them.
Status WriteHistory(Statement& write, std::string_view patient_id,
                    const std::vector<DispensingRecord>& records, size_t used, long dropped) {
  const std::string packed = PackHistory(std::span<const DispensingRecord>(records.data(), used));
  write.BindText(1, patient_id);
  write.BindBlob(2, packed);
  write.BindInt(3, dropped);
  return write.Run();
}

bool DispensedEarlier(const DispensingRecord& a, const DispensingRecord& b) {
  return a.dispensed_on < b.dispensed_on;
}

// One patient's packing again: their packed copy, with the dispensings imported since it
// was packed merged in.
class TouchedHistory {
 public:
  TouchedHistory(sqlite3* db, Statement read_packed, Statement write, size_t cap)
      : db_(db), read_packed_(std::move(read_packed)), write_(std::move(write)), cap_(cap) {}

  // The next newer dispensing of the patient being gathered (the rows come in patient,
  // date, id order), read from `row`.
  Status Add(const Statement& row) {
    SlideIfFull(later_, later_used_, cap_, later_dropped_);
    if (later_used_ == later_.size()) later_.emplace_back();
    return ReadDispensing(row, later_[later_used_++]);
  }
  bool empty() const { return later_used_ == 0; }
  const std::string& patient_id() const { return later_[0].patient_id; }

  // Merges what was gathered into the patient's packed copy and writes it.
  Status Flush() {
    if (later_used_ == 0) return Status::Ok();
    const std::string patient_id = later_[0].patient_id;
    Result<bool> merged = MergeIntoCopy(patient_id);
    if (!merged.ok()) return merged.status();
    Status status = *merged ? WriteHistory(write_, patient_id, history_, used_, dropped_)
                            : RepackFromTable(patient_id);
    later_used_ = 0;
    later_dropped_ = 0;
    return status;
  }

 private:
  // Reads the packed copy into history_ and merges the newer dispensings in; false when
  // the history must be read from the table instead (it has no packed row, it left older
  // dispensings out, or its copy cannot be read).
  Result<bool> MergeIntoCopy(const std::string& patient_id) {
    read_packed_.Reset();
    read_packed_.BindText(1, patient_id);
    Result<bool> row = read_packed_.Step();
    if (!row.ok()) return row.status();
    used_ = 0;
    dropped_ = later_dropped_;
    // No packed row: a patient new to the copy, whose rows the table gives as cheaply
    // (and rightly, should the row have been removed by hand).
    if (!*row || read_packed_.ColumnInt(1) != 0) return false;
    if (!UnpackHistory(read_packed_.ColumnBlob(0), patient_id, history_, spare_).ok()) return false;
    used_ = history_.size();
    const size_t packed_count = used_;
    for (size_t i = 0; i < later_used_; ++i) {
      if (used_ == history_.size()) history_.emplace_back();
      std::swap(history_[used_++], later_[i]);
    }
    // Stable: of one date, the packed dispensings (lower ids) stay before the newer.
    if (packed_count > 0 && DispensedEarlier(history_[packed_count], history_[packed_count - 1])) {
      const auto begin = history_.begin();
      std::inplace_merge(begin, begin + static_cast<std::ptrdiff_t>(packed_count),
                         begin + static_cast<std::ptrdiff_t>(used_), DispensedEarlier);
    }
    KeepLatest(history_, used_, cap_, dropped_);
    return true;
  }

  Status RepackFromTable(const std::string& patient_id) {
    long dropped = 0;
    Result<std::vector<DispensingRecord>> records = SelectDispensings(db_, patient_id, true, cap_, &dropped);
    if (!records.ok()) return records.status();
    return WriteHistory(write_, patient_id, *records, records->size(), dropped);
  }

  sqlite3* db_;
  Statement read_packed_;
  Statement write_;
  size_t cap_;
  std::vector<DispensingRecord> later_;  // the newer dispensings of one patient
  size_t later_used_ = 0;
  long later_dropped_ = 0;
  std::vector<DispensingRecord> history_;  // the merged history
  size_t used_ = 0;
  long dropped_ = 0;
  std::vector<DispensingRecord> spare_;
};

}  // namespace

Result<long> PackEveryHistory(sqlite3* db, size_t cap) {
  if (Status status = ExecSql(db, "DELETE FROM packed_histories"); !status.ok()) return status;
  Result<Statement> read = Statement::Prepare(
      db, std::string("SELECT ") + kDispensingColumns + " FROM dispensings WHERE " + kCounting +
              " ORDER BY patient_id, dispensed_on, id");
  if (!read.ok()) return read.status();
  Result<Statement> write = Statement::Prepare(db, kWriteHistory);
  if (!write.ok()) return write.status();
  std::vector<DispensingRecord> records;
  size_t used = 0;
  long dropped = 0;
  long written = 0;
  const auto flush = [&]() -> Status {
    if (used == 0) return Status::Ok();
    KeepLatest(records, used, cap, dropped);
    Status status = WriteHistory(*write, records[0].patient_id, records, used, dropped);
    used = 0;
    dropped = 0;
    ++written;
    return status;
  };
  for (;;) {
    Result<bool> row = read->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    if (used > 0 && read->ColumnText(1) != records[0].patient_id) {
      if (Status status = flush(); !status.ok()) return status;
    }
    SlideIfFull(records, used, cap, dropped);
    if (used == records.size()) records.emplace_back();
    if (Status status = ReadDispensing(*read, records[used++]); !status.ok()) return status;
  }
  if (Status status = flush(); !status.ok()) return status;
  return written;
}

Result<long> PackTouchedHistories(sqlite3* db, long packed_up_to, size_t cap,
                                  std::vector<std::string>* touched) {
  // NOT INDEXED: the newer rows by their id (a range of the table's key), sorted, rather
  // than a walk of the whole per-patient index.
  Result<Statement> read = Statement::Prepare(
      db, std::string("SELECT ") + kDispensingColumns + " FROM dispensings NOT INDEXED WHERE id > ?1 AND " +
              kCounting + " ORDER BY patient_id, dispensed_on, id");
  if (!read.ok()) return read.status();
  read->BindInt(1, packed_up_to);
  Result<Statement> read_packed =
      Statement::Prepare(db, "SELECT packed, dropped FROM packed_histories WHERE patient_id = ?1");
  if (!read_packed.ok()) return read_packed.status();
  Result<Statement> write = Statement::Prepare(db, kWriteHistory);
  if (!write.ok()) return write.status();
  TouchedHistory history(db, std::move(read_packed).value(), std::move(write).value(), cap);
  long written = 0;
  const auto flush = [&]() -> Status {
    if (history.empty()) return Status::Ok();
    if (touched != nullptr) touched->push_back(history.patient_id());
    ++written;
    return history.Flush();
  };
  for (;;) {
    Result<bool> row = read->Step();
    if (!row.ok()) return row.status();
    if (!*row) break;
    if (!history.empty() && read->ColumnText(1) != history.patient_id()) {
      if (Status status = flush(); !status.ok()) return status;
    }
    if (Status status = history.Add(*read); !status.ok()) return status;
  }
  if (Status status = flush(); !status.ok()) return status;
  return written;
}

}  // namespace medload
