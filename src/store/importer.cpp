// The import of one file: format detection, the per-file transaction, counting and
// rejecting rows, and the reject-rate rollback.
#include "medload/store/importer.h"

#include <algorithm>
#include <array>
#include <charconv>
#include <cstring>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <optional>
#include <streambuf>
#include <type_traits>

#include "medload/core/clock.h"
#include "medload/core/hash.h"
#include "medload/input/csv_reader.h"
#include "medload/input/fhir_reader.h"
#include "medload/input/input_hints.h"
#include "store/control_characters.h"
#include "store/record_checks.h"
#include "store/fhir_import.h"
#include "store/record_writers.h"
#include "store/registry_check.h"
#include "store/shard_split.h"
#include "store/sqlite.h"

namespace medload {
namespace {

// Below this many expected rows the per-patient index is always kept up to date row by row.
constexpr uint64_t kDeferMinRows = 20000;
// Rough bytes per row, to guess a file's rows from its size.
constexpr uint64_t kCsvBytesPerRow = 80;
constexpr uint64_t kNdjsonBytesPerRow = 600;

// Serves bytes already read (to look at the start of the input) and then the rest of
// the stream, so that the readers see the input whole. With `lone_cr_ends_line` (NDJSON,
// whose reader ends lines at LF), a CR not followed by LF is served as LF, so that a
// file with CR-only line ends, or a block of them inside an LF file, is read line by line.
// (The CSV reader ends lines at a CR alone itself.)
class PrefixedBuffer : public std::streambuf {
 public:
  PrefixedBuffer(std::string head, std::istream& rest, bool lone_cr_ends_line)
      : head_(std::move(head)), rest_(rest), lone_cr_ends_line_(lone_cr_ends_line), bytes_read_(head_.size()) {}
  bool failed() const { return rest_.bad(); }
  // Bytes taken from the input so far (read ahead of the rows parsed by up to a buffer).
  uint64_t bytes_read() const { return bytes_read_; }

 protected:
  int_type underflow() override {
    if (gptr() < egptr()) return traits_type::to_int_type(*gptr());
    for (;;) {
      size_t size = 0;
      if (carried_cr_) buffer_[size++] = '\r';
      carried_cr_ = false;
      const size_t got = Read(buffer_.data() + size, buffer_.size() - size);
      size += got;
      if (size == 0) return traits_type::eof();
      // A CR at the end of what was read may be the first half of a CRLF: held back until
      // the next byte is known.
      if (lone_cr_ends_line_ && got > 0 && buffer_[size - 1] == '\r') {
        carried_cr_ = true;
        --size;
      }
      if (size == 0) continue;
      if (lone_cr_ends_line_) TranslateLoneCr(size);
      setg(buffer_.data(), buffer_.data(), buffer_.data() + size);
      return traits_type::to_int_type(*gptr());
    }
  }

 private:
  size_t Read(char* into, size_t room) {
    if (head_used_ < head_.size()) {
      const size_t take = std::min(room, head_.size() - head_used_);
      std::memcpy(into, head_.data() + head_used_, take);
      head_used_ += take;
      return take;
    }
    rest_.read(into, static_cast<std::streamsize>(room));
    const size_t got = static_cast<size_t>(std::max<std::streamsize>(0, rest_.gcount()));
    bytes_read_ += got;
    return got;
  }

  void TranslateLoneCr(size_t size) {
    for (size_t i = 0; i < size; ++i) {
      if (buffer_[i] == '\r' && (i + 1 == size || buffer_[i + 1] != '\n')) buffer_[i] = '\n';
    }
  }

  std::string head_;
  size_t head_used_ = 0;
  std::istream& rest_;
  bool lone_cr_ends_line_;
  bool carried_cr_ = false;
  uint64_t bytes_read_;
  std::array<char, 256 * 1024> buffer_{};
};

// True when the first character after a byte-order mark and white space is '{'.
bool LooksLikeNdjson(std::string_view head) {
  if (head.substr(0, 3) == "\xEF\xBB\xBF") head.remove_prefix(3);
  const size_t first = head.find_first_not_of(" \t\r\n");
  return first != std::string_view::npos && head[first] == '{';
}

// The identity of a rejected row across imports: the same row as written, on the same
// line of an input of the same kind (the first 128 bits of a SHA-256, in hex).
std::string RejectedRowKey(std::string_view kind, size_t line, std::string_view original) {
  std::string text(kind);
  text += '\x1f';
  text += std::to_string(line);
  text += '\x1f';
  text += original;
  return Sha256Hex(text).substr(0, 32);
}

// Counts, the --rejects output, the rejected_rows table, the registry check and the run
// row of one file, inside the file's transaction.
class Session : public RowSink {
 public:
  Session(Store& store, InputKind kind, ImportSummary& summary, const ImportOptions& options)
      : store_(store), db_(store.handle()), summary_(summary), options_(options), split_(options.shard, kind) {}

  ~Session() override {
    transaction_.reset();  // ends the transaction (rolling back unless committed) first
    (void)SetMemoryMap(db_, true);
    (void)SetPageCache(db_, false);
  }
  Session(const Session&) = delete;
  Session& operator=(const Session&) = delete;

  Status Begin() {
    if (Status status = SetMemoryMap(db_, false); !status.ok()) return status;
    if (Status status = SetPageCache(db_, true); !status.ok()) return status;
    Result<Transaction> transaction = Transaction::Begin(db_);
    if (!transaction.ok()) return transaction.status();
    transaction_.emplace(std::move(transaction.value()));
    Result<std::optional<ShardSpec>> held = store_.HeldShard();
    if (!held.ok()) return held.status();
    if (Status status = split_.Claim(db_, *held, summary_.file); !status.ok()) return status;
    if (Status status = InsertRun("running"); !status.ok()) return status;
    // A row rejected again by a re-import of its file is kept once, under the new run.
    Result<Statement> reject = Statement::Prepare(
        db_,
        "INSERT INTO rejected_rows (run_id, line, reason, message, original_row, row_key)"
        " VALUES (?1, ?2, ?3, ?4, ?5, ?6) ON CONFLICT (row_key) DO UPDATE SET"
        " run_id = excluded.run_id, reason = excluded.reason, message = excluded.message");
    if (!reject.ok()) return reject.status();
    insert_reject_ = std::move(reject.value());
    return registry_.Prepare(db_, summary_.format == "fhir");
  }

  WriteSource source() const { return {summary_.run_id, summary_.file}; }

  // For a load larger than the dispensings already stored, dropping the per-patient index
  // and building it again before the commit is cheaper than inserting every row into it
  // in file order. Both happen inside the file's transaction, so the index is never
  // missing for other connections, and a rollback restores it.
  Status DeferPatientIndexIfLarge(uint64_t expected_rows) {
    if (expected_rows < kDeferMinRows) return Status::Ok();
    Result<Statement> stmt = Statement::Prepare(db_, "SELECT COALESCE(MAX(id), 0) FROM dispensings");
    if (!stmt.ok()) return stmt.status();
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    const auto stored = static_cast<uint64_t>(stmt->ColumnInt(0));
    stmt->Reset();  // an open read cursor on the table would block the DROP
    if (stored * 2 > expected_rows) return Status::Ok();
    if (Status status = ExecSql(db_, "DROP INDEX dispensings_by_patient"); !status.ok()) return status;
    patient_index_deferred_ = true;
    return Status::Ok();
  }
  bool patient_index_live() const { return !patient_index_deferred_; }

  // True when `row` belongs to another shard's store (import --shard).
  bool Elsewhere(const CsvRow& row, const HeaderLayout& layout) const { return split_.Elsewhere(row, layout); }

  // A row left to another shard: counted apart, with whether its own shard rejects it
  // (`faulty`, for the file's reject rate); a valid dispensing widens the other shards'
  // coverage.
  template <typename Record>
  void LeaveElsewhere(const Record& record, bool faulty) {
    ++summary_.other_shards;
    if (faulty) ++summary_.other_shards_rejected;
    if constexpr (std::is_same_v<Record, DispensingRecord>) {
      if (!faulty) split_.NoteElsewhere(record);
    }
  }
  sqlite3* db() const { return db_; }

  // Progress tells how far through `source` (of `size_bytes`, 0 if unknown) the file is.
  void ReportBytesOf(const PrefixedBuffer* source, uint64_t size_bytes) {
    source_ = source;
    size_bytes_ = size_bytes;
  }

  // One more row read, spanning `lines` physical lines; reports progress.
  void Tick(size_t lines) override {
    ++summary_.read;
    summary_.row_lines += static_cast<long>(lines);
    if (lines > 1) ++summary_.multiline_rows;
    if (options_.progress_every > 0 && options_.progress &&
        summary_.read % options_.progress_every == 0) {
      options_.progress(summary_.read, source_ != nullptr ? source_->bytes_read() : 0, size_bytes_);
    }
  }

  Status Reject(size_t line, const RowFault& fault, std::string_view original) override {
    ++summary_.rejected;
    ++summary_.reasons[fault.reason];
    if (summary_.examples.size() < options_.max_examples) summary_.examples.push_back(fault.message);
    if (options_.rejects != nullptr) {
      WriteRejectRow(*options_.rejects, summary_.file, line, fault.reason, fault.message, original);
    }
    insert_reject_.BindInt(1, summary_.run_id);
    insert_reject_.BindInt(2, static_cast<int64_t>(line));
    insert_reject_.BindText(3, fault.reason);
    insert_reject_.BindText(4, fault.message);
    insert_reject_.BindText(5, original);
    reject_key_ = RejectedRowKey(summary_.kind, line, original);  // bound without a copy
    insert_reject_.BindText(6, reject_key_);
    return insert_reject_.Run();
  }

  void Count(WriteOutcome outcome) override {
    if (outcome == WriteOutcome::kDuplicate) {
      ++summary_.duplicates;
      return;
    }
    ++summary_.imported;
    if (outcome == WriteOutcome::kUpdated) ++summary_.updated;
  }

  // A record id conflict is a rejected row, named by the record id's field ("record_id",
  // or "/id" in FHIR); any other outcome is counted.
  Status CountDispensing(const DispensingRecord& record, size_t line, WriteOutcome outcome,
                         const DispensingWriter& writer, std::string_view text) override {
    if (outcome == WriteOutcome::kConflict) {
      const std::string_view field = summary_.format == "fhir" ? "/id" : "record_id";
      const RowFault fault{"record_id_conflict",
                           FaultMessage(summary_.file, line, field,
                                        QuoteForMessage(record.record_id) +
                                            " is already stored for a different dispensing (read from " +
                                            writer.conflict() + "); a record id must name one dispensing only")};
      return Reject(line, fault, text);
    }
    Count(outcome);
    if (outcome == WriteOutcome::kDuplicate) return Status::Ok();
    if (options_.stored_dispensing) options_.stored_dispensing(record);
    return registry_.Note(record.patient_id, line);
  }

  // Commits, or rolls back when the reject rate is above the limit.
  Status Finish() {
    // The rate is the whole file's: rows of other shards that their own shard rejects
    // count, so that every shard, and an import of the whole file, decide alike.
    summary_.rolled_back = summary_.read > 0 && static_cast<double>(summary_.rejected + summary_.other_shards_rejected) >
                                                    options_.max_reject_rate * static_cast<double>(summary_.read);
    if (summary_.rolled_back) {
      transaction_->Rollback();
      // Keep a trace of the attempt, outside the rolled-back transaction.
      Result<Transaction> trace = Transaction::Begin(db_);
      if (!trace.ok()) return trace.status();
      if (Status status = InsertRun("rolled_back"); !status.ok()) return status;
      return trace->Commit();
    }
    if (summary_.kind == InputKindName(InputKind::kDispensing)) {
      if (Status status = registry_.Finish(summary_); !status.ok()) return status;
    }
    if (Status status = split_.SaveCoverage(db_); !status.ok()) return status;
    if (patient_index_deferred_) {
      // The same definition as in the schema (store.cpp, version 1).
      Status status = ExecSql(db_, "CREATE INDEX dispensings_by_patient ON dispensings(patient_id, dispensed_on)");
      if (!status.ok()) return status;
    }
    if (Status status = UpdateRun("committed"); !status.ok()) return status;
    return transaction_->Commit();
  }

 private:
  Status InsertRun(std::string_view outcome) {
    Result<Statement> insert = Statement::Prepare(
        db_, "INSERT INTO import_runs (kind, file, started, outcome) VALUES (?1, ?2, ?3, ?4)");
    if (!insert.ok()) return insert.status();
    const std::string started = UtcNow();
    insert->BindText(1, summary_.kind);
    insert->BindText(2, summary_.file);
    insert->BindText(3, started);
    insert->BindText(4, outcome);
    if (Status status = insert->Run(); !status.ok()) return status;
    summary_.run_id = static_cast<long>(LastInsertId(db_));
    return UpdateRun(outcome);
  }

  Status UpdateRun(std::string_view outcome) {
    Result<Statement> update = Statement::Prepare(
        db_,
        "UPDATE import_runs SET finished = ?2, outcome = ?3, read = ?4, imported = ?5,"
        " duplicates = ?6, rejected = ?7, not_counted = ?8, other_shards = ?9 WHERE id = ?1");
    if (!update.ok()) return update.status();
    long not_counted = 0;
    for (const auto& [status, count] : summary_.not_counted) not_counted += count;
    const std::string finished = UtcNow();
    update->BindInt(1, summary_.run_id);
    update->BindText(2, finished);
    update->BindText(3, outcome);
    update->BindInt(4, summary_.read);
    update->BindInt(5, summary_.imported);
    update->BindInt(6, summary_.duplicates);
    update->BindInt(7, summary_.rejected);
    update->BindInt(8, not_counted);
    update->BindInt(9, summary_.other_shards);
    return update->Run();
  }

  Store& store_;
  sqlite3* db_;
  ImportSummary& summary_;
  const ImportOptions& options_;
  std::optional<Transaction> transaction_;
  Statement insert_reject_;
  std::string reject_key_;
  RegistryCheck registry_;
  bool patient_index_deferred_ = false;
  const PrefixedBuffer* source_ = nullptr;
  uint64_t size_bytes_ = 0;
  ShardSplit split_;
};

// Reads every CSV row after the header: `parse` checks it, `store` stores it (and counts).
template <typename Record, typename Parse, typename Store>
Status ImportCsvRows(CsvReader& reader, const HeaderLayout& layout, const RowContext& context,
                     Session& session, Parse parse, Store store) {
  Record record;
  CsvRow row;
  PlausibleProducts plausible;  // descriptions repeat: each is read once per file
  while (reader.Next(row)) {
    session.Tick(row.line_count);
    const bool elsewhere = session.Elsewhere(row, layout);
    std::optional<RowFault> fault;
    // The reader's own faults (UTF-8, length) come first; then control characters.
    if (row.fault == CsvFault::kNone) fault = ControlCharacterFault(context.file, row.line, row.text, false);
    if (!fault) fault = parse(row, layout, context, record);
    if (!fault) fault = RecordFault(record, context.file, row.line, FieldNames::kCsv, &plausible);
    if (elsewhere) {  // checked all the same: whether its own shard rejects it counts
      session.LeaveElsewhere(record, fault.has_value());
      continue;
    }
    if (fault) {
      if (Status status = session.Reject(row.line, *fault, row.text); !status.ok()) return status;
      continue;
    }
    if (Status status = store(record, row.line, row.text); !status.ok()) return status;
  }
  return Status::Ok();
}

template <typename Writer, typename Record, typename Parse>
Status ImportCsvWith(CsvReader& reader, const HeaderLayout& layout, const RowContext& context,
                     Session& session, Parse parse) {
  Writer writer;
  if (Status status = writer.Prepare(session.db(), session.source()); !status.ok()) return status;
  return ImportCsvRows<Record>(reader, layout, context, session, parse,
                               [&](const Record& record, size_t, std::string_view) -> Status {
                                 Result<WriteOutcome> outcome = writer.Write(record);
                                 if (!outcome.ok()) return outcome.status();
                                 session.Count(*outcome);
                                 return Status::Ok();
                               });
}

// Valid dispensing rows held back and written in (patient, date, line) order: inserting
// into the per-patient index in key order is several times cheaper than in file order,
// and memory stays bounded by the batch.
class DispensingBatch {
 public:
  static constexpr size_t kRows = 65536;

  DispensingBatch(DispensingWriter& writer, Session& session) : writer_(writer), session_(session) {}

  Status Add(const DispensingRecord& record, size_t line, std::string_view text) {
    if (size_ == records_.size()) records_.emplace_back();
    records_[size_].record = record;  // reuses the slot's string capacity
    records_[size_].line = line;
    records_[size_].text.assign(text);  // for a rejected row, should the record id clash
    ++size_;
    return size_ == kRows ? Flush() : Status::Ok();
  }

  Status Flush() {
    order_.resize(size_);
    for (size_t i = 0; i < size_; ++i) order_[i] = &records_[i];
    std::sort(order_.begin(), order_.end(), [](const Slot* a, const Slot* b) {
      if (const int c = a->record.patient_id.compare(b->record.patient_id); c != 0) return c < 0;
      if (a->record.dispensed_on != b->record.dispensed_on) return a->record.dispensed_on < b->record.dispensed_on;
      return a->line < b->line;
    });
    size_ = 0;
    for (const Slot* slot : order_) {
      Result<WriteOutcome> outcome = writer_.Write(slot->record, slot->line, false);
      if (!outcome.ok()) return outcome.status();
      Status status = session_.CountDispensing(slot->record, slot->line, *outcome, writer_, slot->text);
      if (!status.ok()) return status;
    }
    return Status::Ok();
  }

 private:
  struct Slot {
    DispensingRecord record;
    size_t line = 0;
    std::string text;
  };
  DispensingWriter& writer_;
  Session& session_;
  std::vector<Slot> records_;
  std::vector<const Slot*> order_;
  size_t size_ = 0;
};

Status ImportCsv(InputKind kind, CsvReader& reader, const HeaderLayout& layout,
                 const RowContext& context, Session& session) {
  switch (kind) {
    case InputKind::kDispensing: {
      DispensingWriter writer;
      if (Status status = writer.Prepare(session.db(), session.source()); !status.ok()) return status;
      if (!session.patient_index_live()) {  // rows go in file order: record ids ascend
        return ImportCsvRows<DispensingRecord>(
            reader, layout, context, session, ParseDispensingRow,
            [&](const DispensingRecord& record, size_t line, std::string_view text) -> Status {
              Result<WriteOutcome> outcome = writer.Write(record, line, false);
              if (!outcome.ok()) return outcome.status();
              return session.CountDispensing(record, line, *outcome, writer, text);
            });
      }
      DispensingBatch batch(writer, session);
      Status status = ImportCsvRows<DispensingRecord>(
          reader, layout, context, session, ParseDispensingRow,
          [&](const DispensingRecord& record, size_t line, std::string_view text) {
            return batch.Add(record, line, text);
          });
      return status.ok() ? batch.Flush() : status;
    }
    case InputKind::kPatients:
      return ImportCsvWith<PatientWriter, PatientRecord>(reader, layout, context, session, ParsePatientRow);
    case InputKind::kPractices:
      return ImportCsvWith<PracticeWriter, PracticeRecord>(reader, layout, context, session,
                                                           ParsePracticeRow);
    case InputKind::kReviews:
      return ImportCsvWith<ReviewWriter, ReviewRecord>(reader, layout, context, session, ParseReviewRow);
  }
  return Status::Ok();
}

// Reads the header and imports the CSV rows; a bad header stores nothing.
Status ImportCsvInput(InputKind kind, std::istream& in, const ImportOptions& options,
                      uint64_t size_bytes, Session& session, ImportSummary& summary,
                      bool& read_failed) {
  CsvReader reader(in);
  CsvRow header;
  if (!reader.Next(header)) {
    read_failed = reader.read_failed();
    return Status::Input(summary.file + ": is empty; expected a header row naming the columns");
  }
  Result<HeaderLayout> layout = HeaderLayout::Find(kind, header, options.columns, summary.file);
  if (!layout.ok()) return layout.status();
  reader.ExpectFields(layout->field_count());
  summary.header_lines = static_cast<long>(header.line_count);
  if (Status status = session.Begin(); !status.ok()) return status;
  if (kind == InputKind::kDispensing) {
    Status status = session.DeferPatientIndexIfLarge(size_bytes / kCsvBytesPerRow);
    if (!status.ok()) return status;
  }
  const RowContext context{summary.file, options.date_order};
  Status status = ImportCsv(kind, reader, *layout, context, session);
  summary.blank_lines = static_cast<long>(reader.blank_lines());
  summary.lines = static_cast<long>(reader.lines());
  read_failed = reader.read_failed();
  return status;
}

Status ImportFhirInput(InputKind kind, std::istream& in, uint64_t size_bytes, Session& session,
                       ImportSummary& summary, bool& read_failed) {
  if (kind != InputKind::kDispensing && kind != InputKind::kPatients) {
    return Status::Input(summary.file + ": FHIR NDJSON is read for dispensing and patients only; " +
                         std::string(InputKindName(kind)) + " must be CSV");
  }
  if (Status status = session.Begin(); !status.ok()) return status;
  if (kind == InputKind::kDispensing) {
    Status status = session.DeferPatientIndexIfLarge(size_bytes / kNdjsonBytesPerRow);
    if (!status.ok()) return status;
  }
  FhirReader reader(in, summary.file);
  Status status = ImportFhirItems(kind, reader, session.db(), session.source(), session, summary);
  summary.blank_lines = static_cast<long>(reader.blank_lines());
  summary.lines = summary.row_lines + summary.blank_lines;  // one resource a line
  read_failed = reader.read_failed();
  return status;
}

// Lower case ASCII, trimmed, runs of white space as one space.
void AppendNormalised(std::string& key, std::string_view text) {
  bool space = false;
  bool any = false;
  for (char c : text) {
    if (c == ' ' || c == '\t' || c == '\r' || c == '\n') {
      space = any;
      continue;
    }
    if (space) key += ' ';
    space = false;
    any = true;
    key += c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c;
  }
  key += '\x1f';
}

}  // namespace

void DispensingContent(const DispensingRecord& record, std::string& content) {
  content.clear();
  AppendNormalised(content, record.patient_id);
  content += record.dispensed_on.ToIso();
  content += '\x1f';
  AppendNormalised(content, record.product);
  AppendNormalised(content, record.code);
  AppendNormalised(content, record.code_system);
  char number[32];
  const auto written = std::to_chars(number, number + sizeof number, record.quantity);
  content.append(number, written.ptr);
  content += '\x1f';
  if (record.days_supply) content += std::to_string(*record.days_supply);
  content += '\x1f';
  AppendNormalised(content, record.dosage);
  AppendNormalised(content, record.practice);
}

std::string DispensingKey(const DispensingRecord& record) {
  if (!record.record_id.empty()) return "r:" + record.record_id;
  std::string content;
  content.reserve(256);
  DispensingContent(record, content);
  // The first 16 bytes of the digest (32 hex digits).
  return "h:" + Sha256Hex(content).substr(0, 32);
}

namespace {

// A storage failure (messages from src/store start "store") names the file being imported
// and says what became of it: its transaction was rolled back.
Status InFile(const ImportSummary& summary, Status status) {
  if (status.ok() || status.message().rfind("store", 0) != 0) return status;
  return Status::Input(summary.file + ": " + status.message() + "; nothing from this file was stored");
}

// ImportStream with the input's size in bytes when known (0 if not), to choose how to
// maintain the per-patient index.
Result<ImportSummary> ImportSized(Store& store, InputKind kind, std::istream& in,
                                  std::string_view file, const ImportOptions& options,
                                  uint64_t size_bytes) {
  ImportSummary summary;
  summary.file = std::string(file);
  summary.kind = std::string(InputKindName(kind));
  summary.max_reject_rate = options.max_reject_rate;
  std::string head(4096, '\0');
  in.read(head.data(), static_cast<std::streamsize>(head.size()));
  head.resize(static_cast<size_t>(in.gcount()));
  if (const auto compressed = CompressedFormat(head)) {
    return Status::Input(CompressedInputMessage(file, *compressed, InputKindName(kind)));
  }
  const bool ndjson = LooksLikeNdjson(head);
  summary.format = ndjson ? "fhir" : "csv";
  if (options.shard.count > 1) {
    summary.shard = ShardName(options.shard);
    // A FHIR dispense may name its patient by an identifier that a Patient resource of
    // another shard declares: the split needs every file's subjects settled first.
    if (ndjson) {
      return Status::Input(summary.file + ": --shard splits CSV files only; import FHIR NDJSON into a store of "
                           "the whole network");
    }
  }
  PrefixedBuffer buffer(std::move(head), in, ndjson);
  std::istream whole(&buffer);
  Session session(store, kind, summary, options);
  session.ReportBytesOf(&buffer, size_bytes);
  bool read_failed = false;
  Status status =
      ndjson ? ImportFhirInput(kind, whole, size_bytes, session, summary, read_failed)
             : ImportCsvInput(kind, whole, options, size_bytes, session, summary, read_failed);
  if (status.ok() && (read_failed || buffer.failed())) {
    status = Status::Input(summary.file + ": reading failed part way; nothing was stored");
  }
  if (!status.ok()) return InFile(summary, status);  // the session's transaction rolls back
  if (Status finished = session.Finish(); !finished.ok()) return InFile(summary, finished);
  return summary;
}

}  // namespace

Result<ImportSummary> ImportStream(Store& store, InputKind kind, std::istream& in,
                                   std::string_view file, const ImportOptions& options) {
  return ImportSized(store, kind, in, file, options, 0);
}

Result<ImportSummary> ImportFile(Store& store, InputKind kind, const std::string& path,
                                 const ImportOptions& options) {
  if (path == "-") return ImportStream(store, kind, std::cin, "<stdin>", options);
  std::ifstream in(path, std::ios::binary);
  if (!in) return Status::Input(path + ": cannot be read (missing, or no permission)");
  std::error_code error;
  const uintmax_t size = std::filesystem::file_size(path, error);
  return ImportSized(store, kind, in, path, options, error ? 0 : static_cast<uint64_t>(size));
}

}  // namespace medload
