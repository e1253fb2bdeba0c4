// The shard side of an import with --shard K/N: which rows belong to another shard's
// store, the data coverage of the dispensings left to other shards (so that a shard's
// store knows the whole network's coverage), and the store's record of the shard it
// holds. It neither parses nor stores rows. Private to src/store.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "medload/core/data_coverage.h"
#include "medload/core/records.h"
#include "medload/core/shard.h"
#include "medload/core/status.h"
#include "medload/input/csv_records.h"
#include "store/sqlite.h"

namespace medload {

class ShardSplit {
 public:
  // `shard` {1, 1} is no split: every row belongs here.
  ShardSplit(ShardSpec shard, InputKind kind);

  // Inside the file's transaction: checks that the store, holding `held`
  // (Store::HeldShard), holds this import's shard, and
  // records the shard on a sharded store's first import. Fails with Input, naming `file`,
  // when a split import meets a store holding another shard or the whole network's rows,
  // or an import of patients' rows without --shard meets a store holding a shard
  // (practices go to every shard, with or without --shard).
  Status Claim(sqlite3* db, const std::optional<ShardSpec>& held, std::string_view file) const;

  // True when `row` names a patient of another shard. A row whose patient cannot be read
  // (a CSV fault, a wrong field count, an empty patient_id) belongs to every shard.
  // Practices rows belong to every shard.
  bool Elsewhere(const CsvRow& row, const HeaderLayout& layout) const;

  // Widens the coverage of other shards' data with a valid dispensing left to them
  // (counting statuses only, as the store's own coverage).
  void NoteElsewhere(const DispensingRecord& record);

  // Adds the coverage noted to the store's other_shard_coverage, inside the transaction.
  Status SaveCoverage(sqlite3* db) const;

 private:
  ShardSpec shard_;
  InputKind kind_;
  size_t patient_column_;  // index in ColumnsOf(kind_); kAbsent for practices
  PracticeSpans elsewhere_;
};

}  // namespace medload
