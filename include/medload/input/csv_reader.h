// A streaming RFC 4180 CSV reader: one record at a time from a std::istream, with the
// physical lines it spans and its original text, bounded memory on hostile input and a
// UTF-8 check. A stray quote costs one line, never the records after it. It does not know
// what the columns mean (see csv_records.h).
#pragma once

#include <cstddef>
#include <iosfwd>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// Bounds that keep memory fixed whatever the input. A record that breaks one of the first
// three is still read to its end (so the next record starts in the right place) and comes
// back with a fault instead of its fields. A record whose quoted field runs over line
// ends is held to max_record_lines and max_record_bytes: past either, the quote is taken
// as stray (see CsvReader::Next).
struct CsvLimits {
  size_t max_field_bytes = 64 * 1024;     // one field, after unquoting
  size_t max_record_bytes = 1024 * 1024;  // one record, as written (quotes, inner line ends)
  size_t max_fields = 512;                // fields in one record
  size_t max_record_lines = 16;           // physical lines one record may span
};

enum class CsvFault {
  kNone,
  kInvalidUtf8,     // the record's bytes are not valid UTF-8
  kFieldTooLong,    // a field is longer than max_field_bytes
  kRecordTooLong,   // the record is longer than max_record_bytes
  kTooManyFields,   // more than max_fields fields
  kUnclosedQuote,   // a quote opened on this line does not close into a valid record:
                    // the record is this one line, and reading goes on at the next
};

// "invalid_utf8", "field_too_long", "record_too_long", "too_many_fields", "unclosed_quote"
// ("" for kNone).
std::string_view CsvFaultName(CsvFault fault);

// One record. The views point into the reader's buffers and are valid until the next
// call to CsvReader::Next.
struct CsvRow {
  size_t line = 0;                       // 1-based physical line where the record starts
  size_t line_count = 1;                 // physical lines the record spans (1 unless a
                                         // quoted field holds line ends)
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
  // tabs). A UTF-8 byte-order mark at the start is dropped; LF, CRLF and a CR alone each
  // end a line (a file may mix them); inside quotes, commas, doubled quotes and line ends
  // are data. A quote inside an unquoted field, or text after a closing quote, is kept as
  // data. Returns false at the end of the input (check read_failed() for an I/O error).
  //
  // A record whose quoted field runs over a line end is taken whole only when it ends
  // within the limits, and, once ExpectFields(n) is set (n >= 2), has n fields and none of
  // its later lines is on its own a well-formed record of n fields. Otherwise the quote is
  // stray: the record is its first line alone, with fault kUnclosedQuote, and reading
  // starts again at the line after it.
  bool Next(CsvRow& row);

  // The number of fields every record should have (the header's), used to judge records
  // that span lines. 0 (the default): not known.
  void ExpectFields(size_t fields) { expected_fields_ = fields; }

  // Blank lines skipped so far.
  size_t blank_lines() const { return blank_lines_; }
  // Physical lines read so far: line ends, plus a last line without one. After the last
  // record, every line of the input: blank lines + the lines of every record.
  size_t lines() const;
  // True if the stream reported an I/O error (badbit) rather than a clean end.
  bool read_failed() const { return read_failed_; }

 private:
  enum class ScanState { kFieldStart, kUnquoted, kQuoted, kAfterQuote };

  bool Fill();
  bool AtEnd();
  void StartRecord();
  ScanState ScanRecord();
  void ScanQuoted(ScanState& state);
  bool ScanData(char c, ScanState& state);
  void QuotedLineEnd(char c);
  void ConsumeLfAfterCr();
  bool Take(const char* data, size_t size);
  bool EndRecord(ScanState state);
  bool Damaged() const;
  void TakeFirstLineOnly(CsvRow& row);
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
  size_t first_line_ = 1;
  size_t line_ = 1;
  size_t blank_lines_ = 0;
  size_t expected_fields_ = 0;
  bool read_any_ = false;       // some byte was read
  char last_byte_ = '\n';       // the last byte read from the stream
  // The current record: its text, unquoted field bytes and (start, size) of each field.
  std::string text_;
  std::string field_data_;
  std::vector<std::pair<size_t, size_t>> field_spans_;
  size_t field_start_ = 0;
  size_t fields_seen_ = 0;      // fields ended, kept or not
  bool saw_quote_ = false;
  CsvFault fault_ = CsvFault::kNone;
  // A record spanning lines: how many, where its first inner line end sits in text_ (and
  // how long it is), the fault of the first line alone, and whether scanning stopped at a
  // limit before the record ended.
  size_t record_lines_ = 1;
  size_t first_break_ = 0;
  size_t first_break_size_ = 0;
  CsvFault first_line_fault_ = CsvFault::kNone;
  bool stopped_ = false;
  bool ended_at_line_end_ = false;  // the record ended at a line end outside quotes
};

// True if `text` is well-formed UTF-8 (no overlong forms, surrogates or values above
// U+10FFFF).
bool IsValidUtf8(std::string_view text);

// The number of fields of `line` (one physical line, without its line end) when it is on
// its own a well-formed RFC 4180 record: every quote opens a field and closes it on this
// line, followed by a comma or the line's end. nullopt otherwise.
std::optional<size_t> WellFormedFieldCount(std::string_view line);

}  // namespace medload
