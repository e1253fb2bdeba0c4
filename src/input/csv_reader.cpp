#include "medload/input/csv_reader.h"

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

CsvReader::CsvReader(std::istream& in, CsvLimits limits, size_t first_line)
    : in_(in), limits_(limits), chunk_(kChunkBytes), line_(first_line) {}

bool CsvReader::Fill() {
  if (eof_) return false;
  pos_ = 0;
  end_ = ReadChunk(in_, chunk_, eof_, read_failed_);
  return end_ > 0;
}

bool CsvReader::AtEnd() { return pos_ >= end_ && !Fill(); }

void CsvReader::SkipByteOrderMark() {
  if (AtEnd()) return;
  if (end_ - pos_ >= 3 && std::memcmp(chunk_.data() + pos_, "\xEF\xBB\xBF", 3) == 0) pos_ += 3;
}

void CsvReader::AppendText(const char* data, size_t size) {
  if (text_.size() + size > limits_.max_record_bytes) {
    text_.append(data, limits_.max_record_bytes - text_.size());
    if (fault_ == CsvFault::kNone) fault_ = CsvFault::kRecordTooLong;
    return;
  }
  text_.append(data, size);
}

void CsvReader::AppendField(const char* data, size_t size) {
  if (fault_ != CsvFault::kNone) return;  // the fields of a faulty record are not kept
  // One byte over the limit is let in: it may be the CR of a CRLF, dropped at the line
  // end. EndField checks the field as kept.
  if (field_data_.size() - field_start_ + size > limits_.max_field_bytes + 1) {
    fault_ = CsvFault::kFieldTooLong;
    return;
  }
  field_data_.append(data, size);
}

void CsvReader::EndField() {
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
  saw_quote_ = false;
  fault_ = CsvFault::kNone;
}

// Inside quotes: a run of data, a line end (data too), or a quote that may close the field.
void CsvReader::ScanQuoted(ScanState& state) {
  const char* chunk = chunk_.data();
  size_t run = pos_;
  while (run < end_ && chunk[run] != '"' && chunk[run] != '\n') ++run;
  if (run > pos_) {
    AppendText(chunk + pos_, run - pos_);
    AppendField(chunk + pos_, run - pos_);
    pos_ = run;
    return;
  }
  const char c = chunk[pos_++];
  AppendText(&c, 1);
  if (c == '\n') {
    ++line_;
    AppendField(&c, 1);
  } else {
    state = ScanState::kAfterQuote;
  }
}

CsvReader::ScanState CsvReader::ScanRecord() {
  ScanState state = ScanState::kFieldStart;
  while (!AtEnd()) {
    if (state == ScanState::kQuoted) {
      ScanQuoted(state);
      continue;
    }
    const char* chunk = chunk_.data();
    const char c = chunk[pos_++];
    if (c == '\n') {
      ++line_;
      break;
    }
    AppendText(&c, 1);
    if (c == '"' && state == ScanState::kAfterQuote) {  // a doubled quote inside quotes
      AppendField(&c, 1);
      state = ScanState::kQuoted;
    } else if (c == ',') {
      EndField();
      state = ScanState::kFieldStart;
    } else if (c == '"' && state == ScanState::kFieldStart) {
      saw_quote_ = true;
      state = ScanState::kQuoted;
    } else {
      // Data: an unquoted field, a stray quote, or text after a closing quote (kept).
      AppendField(&c, 1);
      size_t run = pos_;
      while (run < end_ && chunk[run] != ',' && chunk[run] != '\n') ++run;
      AppendText(chunk + pos_, run - pos_);
      AppendField(chunk + pos_, run - pos_);
      pos_ = run;
      state = ScanState::kUnquoted;
    }
  }
  return state;
}

void CsvReader::EndRecord(ScanState state) {
  if (state == ScanState::kQuoted && fault_ == CsvFault::kNone) fault_ = CsvFault::kUnclosedQuote;
  // CRLF: the CR before the line end belongs to neither the text nor the last field.
  if (!text_.empty() && text_.back() == '\r' && state != ScanState::kQuoted) {
    text_.pop_back();
    if (state == ScanState::kUnquoted && field_data_.size() > field_start_ &&
        field_data_.back() == '\r') {
      field_data_.pop_back();
    }
  }
  EndField();
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
    EndRecord(ScanRecord());
    if (!saw_quote_ && fault_ == CsvFault::kNone && field_spans_.size() == 1 && IsBlank(text_)) {
      ++blank_lines_;
      continue;
    }
    FinishRecord(row);
    return true;
  }
}

}  // namespace medload
