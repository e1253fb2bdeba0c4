// Reading ahead during an import: a second thread reads, parses and checks CSV rows while
// the calling thread stores them. Rows are handed over in batches through two bounded
// queues (filled batches one way, emptied ones back), so memory stays fixed and every row
// reaches the calling thread in input order. It knows nothing of SQLite, counts or
// rejects; it does not read FHIR. Private to src/store.
#pragma once

#include <cstddef>
#include <exception>
#include <optional>
#include <string>
#include <thread>
#include <vector>

#include "medload/core/bounded_queue.h"
#include "medload/core/status.h"
#include "medload/input/csv_reader.h"
#include "medload/input/csv_records.h"

namespace medload {

// One row as the reading thread left it.
template <typename Record>
struct CheckedRow {
  Record record;                  // parsed; unspecified when `fault` is set
  size_t line = 0;                // where the row starts
  size_t line_count = 1;          // physical lines it spans
  std::string text;               // the row as written (CsvRow::text)
  std::optional<RowFault> fault;  // set: the row is to be rejected
};

struct ReadAheadShape {
  size_t rows_per_batch = 1024;
  size_t batches = 4;  // in flight at once, filled or being filled or stored
};

namespace row_pipeline {

template <typename Record>
struct Batch {
  std::vector<CheckedRow<Record>> rows;
  size_t used = 0;
};

// The reading thread's loop: fills free batches with checked rows until the input ends or
// the calling thread closes the queues. `check(row, record)` -> optional<RowFault>.
template <typename Record, typename Check>
void FillBatches(CsvReader& reader, Check& check, size_t rows_per_batch, BoundedQueue<Batch<Record>*>& free,
                 BoundedQueue<Batch<Record>*>& full, std::exception_ptr& failure) {
  try {
    CsvRow row;
    while (std::optional<Batch<Record>*> next = free.Pop()) {
      Batch<Record>& batch = **next;
      batch.used = 0;
      while (batch.used < rows_per_batch && reader.Next(row)) {
        if (batch.rows.size() == batch.used) batch.rows.emplace_back();
        CheckedRow<Record>& slot = batch.rows[batch.used++];
        slot.line = row.line;
        slot.line_count = row.line_count;
        slot.text.assign(row.text);
        slot.fault = check(row, slot.record);
      }
      const bool last = batch.used < rows_per_batch;
      if (!full.Push(&batch) || last) break;
    }
  } catch (...) {
    failure = std::current_exception();
  }
  full.Close();
}

}  // namespace row_pipeline

// Reads every remaining row of `reader` on a second thread, where `check(const CsvRow&,
// Record&) -> std::optional<RowFault>` parses and checks it, and calls `take(const
// CheckedRow<Record>&) -> Status` on the calling thread for each row in input order.
// Stops at the first take that fails and returns its status; the reading thread has
// stopped by the time this returns (rows it read beyond that point are dropped). An
// exception thrown by `check` is thrown again here. `check` must not touch what `take`
// touches; `reader` is used by the reading thread only until this returns.
template <typename Record, typename Check, typename Take>
Status ReadAheadRows(CsvReader& reader, Check check, Take take, ReadAheadShape shape = {}) {
  using Batch = row_pipeline::Batch<Record>;
  const size_t rows_per_batch = shape.rows_per_batch < 1 ? 1 : shape.rows_per_batch;
  std::vector<Batch> batches(shape.batches < 1 ? 1 : shape.batches);
  BoundedQueue<Batch*> free(batches.size());
  BoundedQueue<Batch*> full(batches.size());
  for (Batch& batch : batches) free.Push(&batch);
  std::exception_ptr failure;
  std::thread reading([&] {
    row_pipeline::FillBatches<Record>(reader, check, rows_per_batch, free, full, failure);
  });
  // Closing both queues stops the reading thread wherever it waits; joined on every path.
  struct Stop {
    BoundedQueue<Batch*>& free;
    BoundedQueue<Batch*>& full;
    std::thread& reading;
    ~Stop() {
      free.Close();
      full.Close();
      if (reading.joinable()) reading.join();
    }
  } stop{free, full, reading};
  Status status = Status::Ok();
  while (status.ok()) {
    const std::optional<Batch*> next = full.Pop();
    if (!next) break;
    for (size_t i = 0; i < (*next)->used && status.ok(); ++i) status = take((*next)->rows[i]);
    free.Push(*next);
  }
  free.Close();
  full.Close();
  reading.join();
  if (failure) std::rethrow_exception(failure);
  return status;
}

}  // namespace medload
