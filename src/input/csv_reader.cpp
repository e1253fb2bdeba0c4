#include "medload/input/csv_reader.h"

#include <algorithm>
#include <cstdint>
#include <cstring>
#include <istream>

#include "input/read_chunk.h"
#include "medload/core/text.h"

namespace medload {
namespace {

constexpr size_t kChunkBytes = 256 * 1024;

// Length of the well-formed UTF-8 sequence starting at text[i], or 0 (RFC 3629, table 3-7
// of The Unicode Standard: no overlong forms, no surrogates, nothing above U+10FFFF).
size_t Utf8SequenceLength(std::string_view text, size_t i) {
  const auto byte = [&](size_t k) { return static_cast<uint8_t>(text[k]); };
  const uint8_t lead = byte(i);
  size_t length = 0;
  uint8_t low = 0x80;
  uint8_t high = 0xBF;
  if (lead >= 0xC2 && lead <= 0xDF) length = 2;
  else if (lead >= 0xE0 && lead <= 0xEF) length = 3;
  else if (lead >= 0xF0 && lead <= 0xF4) length = 4;
  else return 0;
  if (lead == 0xE0) low = 0xA0;
  if (lead == 0xED) high = 0x9F;
  if (lead == 0xF0) low = 0x90;
  if (lead == 0xF4) high = 0x8F;
  if (i + length > text.size()) return 0;
  if (byte(i + 1) < low || byte(i + 1) > high) return 0;
  for (size_t k = 2; k < length; ++k) {
    if (byte(i + k) < 0x80 || byte(i + k) > 0xBF) return 0;
  }
  return length;
}

}  // namespace

std::string_view CsvFaultName(CsvFault fault) {
  switch (fault) {
    case CsvFault::kNone: return "";
    case CsvFault::kInvalidUtf8: return "invalid_utf8";
    case CsvFault::kFieldTooLong: return "field_too_long";
    case CsvFault::kRecordTooLong: return "record_too_long";
    case CsvFault::kTooManyFields: return "too_many_fields";
    case CsvFault::kUnclosedQuote: return "unclosed_quote";
  }
  return "";
}

bool IsValidUtf8(std::string_view text) {
  size_t i = 0;
  while (i < text.size()) {
    // Fast path: eight ASCII bytes at a time.
    if (i + 8 <= text.size()) {
      uint64_t block = 0;
      std::memcpy(&block, text.data() + i, 8);
      if ((block & 0x8080808080808080ULL) == 0) {
        i += 8;
        continue;
      }
    }
    if (static_cast<uint8_t>(text[i]) < 0x80) {
      ++i;
      continue;
    }
    const size_t length = Utf8SequenceLength(text, i);
    if (length == 0) return false;
    i += length;
  }
  return true;
}

std::optional<size_t> WellFormedFieldCount(std::string_view line) {
  size_t fields = 1;
  size_t i = 0;
  for (;;) {
    if (i < line.size() && line[i] == '"') {
      ++i;
      for (;;) {  // a quoted field: it must close on this line
        if (i >= line.size()) return std::nullopt;
        if (line[i] != '"') {
          ++i;
        } else if (i + 1 < line.size() && line[i + 1] == '"') {
          i += 2;
        } else {
          ++i;
          break;
        }
      }
      if (i < line.size() && line[i] != ',') return std::nullopt;  // text after the quote
    } else {
      while (i < line.size() && line[i] != ',') {
        if (line[i] == '"') return std::nullopt;  // a quote inside an unquoted field
        ++i;
      }
    }
    if (i >= line.size()) return fields;
    ++i;  // the comma
    ++fields;
  }
}

CsvReader::CsvReader(std::istream& in, CsvLimits limits, size_t first_line)
    : in_(in), limits_(limits), chunk_(kChunkBytes), first_line_(first_line), line_(first_line) {}

bool CsvReader::Fill() {
  if (eof_) return false;
  chunk_.resize(kChunkBytes);  // back to its size after a replay made it larger
  pos_ = 0;
  end_ = ReadChunk(in_, chunk_, eof_, read_failed_);
  if (end_ == 0) return false;
  read_any_ = true;
  last_byte_ = chunk_[end_ - 1];
  return true;
}

bool CsvReader::AtEnd() { return pos_ >= end_ && !Fill(); }

size_t CsvReader::lines() const {
  const bool open_last_line = read_any_ && last_byte_ != '\n' && last_byte_ != '\r';
  return line_ - first_line_ + (open_last_line ? 1 : 0);
}

void CsvReader::SkipByteOrderMark() {
  if (AtEnd()) return;
  if (end_ - pos_ >= 3 && std::memcmp(chunk_.data() + pos_, "\xEF\xBB\xBF", 3) == 0) pos_ += 3;
}

void CsvReader::AppendText(const char* data, size_t size) {
  if (text_.size() + size > limits_.max_record_bytes) {
    text_.append(data, limits_.max_record_bytes - std::min(text_.size(), limits_.max_record_bytes));
    if (fault_ == CsvFault::kNone) fault_ = CsvFault::kRecordTooLong;
    return;
  }
  text_.append(data, size);
}

void CsvReader::AppendField(const char* data, size_t size) {
  if (fault_ != CsvFault::kNone) return;  // the fields of a faulty record are not kept
  if (field_data_.size() - field_start_ + size > limits_.max_field_bytes) {
    fault_ = CsvFault::kFieldTooLong;
    return;
  }
  field_data_.append(data, size);
}

// Record text, unless the record already spans lines and this would take it past the
// record limit: then scanning stops there (the quote that opened it is taken as stray).
bool CsvReader::Take(const char* data, size_t size) {
  if (record_lines_ > 1 && text_.size() + size > limits_.max_record_bytes) {
    stopped_ = true;
    return false;
  }
  AppendText(data, size);
  return true;
}

void CsvReader::EndField() {
  ++fields_seen_;
  if (fault_ != CsvFault::kNone) return;
  if (field_data_.size() - field_start_ > limits_.max_field_bytes) {
    fault_ = CsvFault::kFieldTooLong;
    return;
  }
  if (field_spans_.size() >= limits_.max_fields) {
    fault_ = CsvFault::kTooManyFields;
    return;
  }
  field_spans_.emplace_back(field_start_, field_data_.size() - field_start_);
  field_start_ = field_data_.size();
}

void CsvReader::FinishRecord(CsvRow& row) {
  if (fault_ == CsvFault::kNone && !IsValidUtf8(text_)) fault_ = CsvFault::kInvalidUtf8;
  row.fault = fault_;
  row.text = text_;
  row.fields.clear();
  if (fault_ != CsvFault::kNone) return;
  for (const auto& [start, size] : field_spans_) {
    row.fields.emplace_back(field_data_.data() + start, size);
  }
}

void CsvReader::StartRecord() {
  text_.clear();
  field_data_.clear();
  field_spans_.clear();
  field_start_ = 0;
  fields_seen_ = 0;
  saw_quote_ = false;
  fault_ = CsvFault::kNone;
  record_lines_ = 1;
  first_break_ = 0;
  first_break_size_ = 0;
  first_line_fault_ = CsvFault::kNone;
  stopped_ = false;
  ended_at_line_end_ = false;
}

void CsvReader::ConsumeLfAfterCr() {
  if (!AtEnd() && chunk_[pos_] == '\n') ++pos_;
}

// A line end inside quotes (LF, CRLF or CR alone at chunk_[pos_]): data of the field, and
// a new physical line of the record. Line ends are not held to the record limit (they
// are at most two bytes, and the next data byte is).
void CsvReader::QuotedLineEnd(char c) {
  if (record_lines_ == 1) {
    first_line_fault_ = fault_;
    first_break_ = text_.size();
  }
  ++pos_;
  text_ += c;
  AppendField(&c, 1);
  size_t size = 1;
  if (c == '\r' && !AtEnd() && chunk_[pos_] == '\n') {
    ++pos_;
    text_ += '\n';
    AppendField("\n", 1);
    size = 2;
  }
  if (record_lines_ == 1) first_break_size_ = size;
  ++line_;
  ++record_lines_;
  // The first line alone broke the record limit (its text is cut, so it cannot be read
  // again): the record ends here, and the next line starts the next one.
  if (first_line_fault_ == CsvFault::kRecordTooLong) stopped_ = true;
  if (record_lines_ > limits_.max_record_lines) stopped_ = true;
}

// Inside quotes: a run of data, a line end (data too), or a quote that may close the field.
void CsvReader::ScanQuoted(ScanState& state) {
  const char* chunk = chunk_.data();
  size_t run = pos_;
  while (run < end_ && chunk[run] != '"' && chunk[run] != '\n' && chunk[run] != '\r') ++run;
  if (run > pos_) {
    if (!Take(chunk + pos_, run - pos_)) return;
    AppendField(chunk + pos_, run - pos_);
    pos_ = run;
    return;
  }
  const char c = chunk[pos_];
  if (c != '"') {
    QuotedLineEnd(c);
    return;
  }
  if (!Take(&c, 1)) return;
  ++pos_;
  state = ScanState::kAfterQuote;
}

// Outside quotes, one step from chunk_[pos_] = `c` (not a line end). False when scanning
// stopped at the limit of a record spanning lines.
bool CsvReader::ScanData(char c, ScanState& state) {
  if (c == '"' && (state == ScanState::kAfterQuote || state == ScanState::kFieldStart)) {
    if (!Take(&c, 1)) return false;
    ++pos_;
    if (state == ScanState::kAfterQuote) AppendField(&c, 1);  // a doubled quote inside quotes
    else saw_quote_ = true;
    state = ScanState::kQuoted;
    return true;
  }
  if (c == ',') {
    if (!Take(&c, 1)) return false;
    ++pos_;
    EndField();
    state = ScanState::kFieldStart;
    return true;
  }
  // Data: an unquoted field, a stray quote, or text after a closing quote (kept).
  const char* chunk = chunk_.data();
  size_t run = pos_ + 1;
  while (run < end_ && chunk[run] != ',' && chunk[run] != '\n' && chunk[run] != '\r') ++run;
  if (!Take(chunk + pos_, run - pos_)) return false;
  AppendField(chunk + pos_, run - pos_);
  pos_ = run;
  state = ScanState::kUnquoted;
  return true;
}

CsvReader::ScanState CsvReader::ScanRecord() {
  ScanState state = ScanState::kFieldStart;
  while (!stopped_ && !AtEnd()) {
    if (state == ScanState::kQuoted) {
      ScanQuoted(state);
      continue;
    }
    const char c = chunk_[pos_];
    if (c == '\n' || c == '\r') {
      ++pos_;
      if (c == '\r') ConsumeLfAfterCr();
      ++line_;
      ended_at_line_end_ = true;
      break;
    }
    if (!ScanData(c, state)) break;
  }
  return state;
}

// Ends the record; true when its quote is stray (see Next).
bool CsvReader::EndRecord(ScanState state) {
  if (stopped_) return true;
  if (state == ScanState::kQuoted) {  // the input ended inside quotes
    if (record_lines_ > 1) return true;
    if (fault_ == CsvFault::kNone) fault_ = CsvFault::kUnclosedQuote;
  }
  EndField();
  return record_lines_ > 1 && Damaged();
}

// A record that closed its quotes on a later line is still the work of a stray quote when
// its width is not the header's, or when one of its later lines is a record on its own.
bool CsvReader::Damaged() const {
  if (expected_fields_ < 2) return false;
  if (fields_seen_ != expected_fields_) return true;
  std::string_view rest(text_);
  rest.remove_prefix(first_break_ + first_break_size_);
  for (;;) {
    const size_t end = rest.find_first_of("\r\n");
    const std::string_view line = rest.substr(0, end);
    if (!IsBlank(line) && WellFormedFieldCount(line) == expected_fields_) return true;
    if (end == std::string_view::npos) return false;
    const bool crlf = rest[end] == '\r' && end + 1 < rest.size() && rest[end + 1] == '\n';
    rest.remove_prefix(end + (crlf ? 2 : 1));
  }
}

// The record becomes its first line alone; the bytes after that line are read again, from
// the line after it.
void CsvReader::TakeFirstLineOnly(CsvRow& row) {
  const size_t replay_from = first_break_ + first_break_size_;
  std::vector<char> merged;
  if (first_line_fault_ != CsvFault::kRecordTooLong && replay_from < text_.size()) {
    merged.assign(text_.begin() + static_cast<std::ptrdiff_t>(replay_from), text_.end());
    if (ended_at_line_end_) merged.push_back('\n');  // the record's own line end
  }
  if (!merged.empty()) {
    merged.insert(merged.end(), chunk_.begin() + static_cast<std::ptrdiff_t>(pos_),
                  chunk_.begin() + static_cast<std::ptrdiff_t>(end_));
    chunk_ = std::move(merged);
    pos_ = 0;
    end_ = chunk_.size();
  }
  text_.resize(first_break_);
  line_ = row.line + 1;
  fault_ = first_line_fault_ != CsvFault::kNone ? first_line_fault_ : CsvFault::kUnclosedQuote;
  record_lines_ = 1;
}

bool CsvReader::Next(CsvRow& row) {
  if (!started_) {
    SkipByteOrderMark();
    started_ = true;
  }
  for (;;) {
    StartRecord();
    row.line = line_;
    if (AtEnd()) return false;
    if (EndRecord(ScanRecord())) TakeFirstLineOnly(row);
    row.line_count = record_lines_;
    if (!saw_quote_ && fault_ == CsvFault::kNone && field_spans_.size() == 1 && IsBlank(text_)) {
      ++blank_lines_;
      continue;
    }
    FinishRecord(row);
    return true;
  }
}

}  // namespace medload
