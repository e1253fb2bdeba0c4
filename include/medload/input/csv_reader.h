// A streaming RFC 4180 CSV reader: one record at a time from a std::istream, with the
// physical line it starts on and its original text, bounded memory on hostile input and
// a UTF-8 check. It does not know what the columns mean (see csv_records.h).
#pragma once

#include <cstddef>
#include <iosfwd>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// Bounds that keep memory fixed whatever the input. A record that breaks one is still
// read to its end (so the next record starts in the right place) and comes back with a
// fault instead of its fields.
struct CsvLimits {
  size_t max_field_bytes = 64 * 1024;     // one field, after unquoting
  size_t max_record_bytes = 1024 * 1024;  // one record, as written (quotes, line ends)
  size_t max_fields = 512;                // fields in one record
};

enum class CsvFault {
  kNone,
  kInvalidUtf8,     // the record's bytes are not valid UTF-8
  kFieldTooLong,    // a field is longer than max_field_bytes
  kRecordTooLong,   // the record is longer than max_record_bytes
  kTooManyFields,   // more than max_fields fields
  kUnclosedQuote,   // the input ended inside a quoted field
};

// "invalid_utf8", "field_too_long", "record_too_long", "too_many_fields", "unclosed_quote"
// ("" for kNone).
std::string_view CsvFaultName(CsvFault fault);

// One record. The views point into the reader's buffers and are valid until the next
// call to CsvReader::Next.
struct CsvRow {
  size_t line = 0;                       // 1-based physical line where the record starts
  std::vector<std::string_view> fields;  // unquoted values; empty when fault != kNone
  std::string_view text;                 // the record as written, without its line end
                                         // (cut at max_record_bytes)
  CsvFault fault = CsvFault::kNone;
};

class CsvReader {
 public:
  // Reads from `in`, which must outlive the reader. `first_line` is the physical line
  // number of the first byte not yet read (when a caller has already consumed lines).
  explicit CsvReader(std::istream& in, CsvLimits limits = {}, size_t first_line = 1);

  CsvReader(const CsvReader&) = delete;
  CsvReader& operator=(const CsvReader&) = delete;

  // Reads the next record into `row`, skipping blank lines (empty or only spaces and
  // tabs). A UTF-8 byte-order mark at the start is dropped; CRLF and LF both end a line;
  // inside quotes, commas, doubled quotes and line ends are data. A quote inside an
  // unquoted field, or text after a closing quote, is kept as data. Returns false at the
  // end of the input (check read_failed() for an I/O error).
  bool Next(CsvRow& row);

  // Blank lines skipped so far.
  size_t blank_lines() const { return blank_lines_; }
  // True if the stream reported an I/O error (badbit) rather than a clean end.
  bool read_failed() const { return read_failed_; }

 private:
  enum class ScanState { kFieldStart, kUnquoted, kQuoted, kAfterQuote };

  bool Fill();
  bool AtEnd();
  void StartRecord();
  ScanState ScanRecord();
  void ScanQuoted(ScanState& state);
  void EndRecord(ScanState state);
  void EndField();
  void FinishRecord(CsvRow& row);
  void AppendText(const char* data, size_t size);
  void AppendField(const char* data, size_t size);
  void SkipByteOrderMark();

  std::istream& in_;
  CsvLimits limits_;
  std::vector<char> chunk_;
  size_t pos_ = 0;
  size_t end_ = 0;
  bool eof_ = false;
  bool read_failed_ = false;
  bool started_ = false;
  size_t line_ = 1;
  size_t blank_lines_ = 0;
  // The current record: its text, unquoted field bytes and (start, size) of each field.
  std::string text_;
  std::string field_data_;
  std::vector<std::pair<size_t, size_t>> field_spans_;
  size_t field_start_ = 0;
  bool saw_quote_ = false;
  CsvFault fault_ = CsvFault::kNone;
};

// True if `text` is well-formed UTF-8 (no overlong forms, surrogates or values above
// U+10FFFF).
bool IsValidUtf8(std::string_view text);

}  // namespace medload
