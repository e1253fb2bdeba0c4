// The import contract: one file (CSV or FHIR NDJSON) into the store in one transaction,
// every row imported, recognised as a duplicate or rejected with its line and reason, and
// the whole file rolled back when too many rows are rejected. It does not print anything;
// the summary it returns is written by store/import_summary.h.
#pragma once

#include <functional>
#include <iosfwd>
#include <string>
#include <string_view>

#include "medload/core/date.h"
#include "medload/core/shard.h"
#include "medload/core/status.h"
#include "medload/input/csv_records.h"
#include "medload/store/import_summary.h"
#include "medload/store/store.h"

namespace medload {

struct ImportOptions {
  ColumnMap columns;                       // --columns: header names for known columns (CSV)
  DateOrder date_order = DateOrder::kIso;  // --date-format: iso, dmy or mdy (CSV dates)
  double max_reject_rate = 0.05;           // --max-reject-rate: rejected/read above this
                                           // rolls the file back
  std::ostream* rejects = nullptr;         // --rejects: one CSV row per rejected row is
                                           // appended here (write WriteRejectsHeader first)
  size_t max_examples = 10;                // rejected-row messages kept in the summary
  long progress_every = 0;                 // call `progress` after every N rows (0: never)
  // Rows read so far, bytes of the input taken so far (read ahead of the rows by up to
  // 256 KiB) and the input's size in bytes (0 when unknown: standard input).
  std::function<void(long rows_read, uint64_t bytes_read, uint64_t bytes_total)> progress;
  // Called with each dispensing stored (new or changed, not a duplicate), e.g. to check
  // its product; the rows of a file rolled back were called too.
  std::function<void(const DispensingRecord&)> stored_dispensing;
  // --shard K/N: store only the rows of the patients of shard K of N (core/shard.h),
  // counting the others apart (ImportSummary::other_shards) and keeping the data coverage
  // of their dispensings. {1, 1}: every row (the default). CSV only.
  ShardSpec shard;
};

// Imports `in` as input of `kind`, naming it `file` in messages and in the store. The
// format is found from the content: a first non-blank character '{' is FHIR NDJSON
// (dispensing and patients only), anything else CSV. LF, CRLF and a CR alone each end a
// line, in any mix.
//
// On success the file's rows are committed in one transaction and the summary says how
// many were read, imported, duplicates, rejected and left to other shards (they always
// add up), and how many
// physical lines the file has: header + blank + the lines of the rows read. When rejected
// / read is above options.max_reject_rate (rejected counting the rows of other shards that
// their shard rejects: the whole file's rate), the transaction is rolled back, the run is
// recorded with outcome "rolled_back" and summary.rolled_back is true (still a success
// value: the caller maps it to exit code 3).
//
// Fails with Input, storing nothing, when the input cannot be read, has no header, a bad
// header (missing required columns), is FHIR NDJSON with options.shard split, does not fit
// the shard the store holds (store/shard_split.h), or the store fails (the message names
// the cause).
Result<ImportSummary> ImportStream(Store& store, InputKind kind, std::istream& in,
                                   std::string_view file, const ImportOptions& options);

// Opens `path` ("-" = standard input, named "<stdin>") and imports it as above. A missing
// or unreadable file is an Input failure naming the path.
Result<ImportSummary> ImportFile(Store& store, InputKind kind, const std::string& path,
                                 const ImportOptions& options);

// The duplicate key of a dispensing: "r:" + record_id when it has one, else "h:" + the
// hex SHA-256 (first 128 bits) of the normalised patient, date, product, code, code
// system, quantity, days supply, dosage and practice (text trimmed, ASCII lower case,
// runs of spaces as one).
std::string DispensingKey(const DispensingRecord& record);

// The normalised content that DispensingKey hashes for a row without a record id (patient,
// date, product, code, code system, quantity, days supply, dosage and practice), into
// `out`. Two rows with the same record id are the same dispensing only when this is the
// same for both.
void DispensingContent(const DispensingRecord& record, std::string& out);

}  // namespace medload
