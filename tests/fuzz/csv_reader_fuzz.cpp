// libFuzzer target: the streaming CSV reader (input/csv_reader.h) and the row checks of the
// four tabular inputs (input/csv_records.h). The input is one CSV file.
//
// Invariants:
// - with no limits in the way, a record has either fields or a fault (invalid UTF-8, or an
//   unclosed quote on the last record), and lines only go forward;
// - writing every good record back out (each field quoted) and reading it again gives the
//   same fields;
// - with small limits, every record is still found on the same line: a record within the
//   limits has the same fields, a record over them has the fault that names the limit it
//   broke (and a faulty record has no fields);
// - nothing is lost: after the header, each record is parsed or rejected, a rejection names
//   `FILE:LINE: ` and a reason, and a parsed record keeps the documented value rules.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <map>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

#include "fuzz/fuzz_check.h"
#include "medload/input/csv_reader.h"
#include "medload/input/csv_records.h"

namespace medload {
namespace {

constexpr std::string_view kFile = "fuzz.csv";

struct ReadRecord {
  size_t line = 0;
  std::vector<std::string> fields;
  std::string text;
  CsvFault fault = CsvFault::kNone;
};

std::vector<ReadRecord> ReadAll(std::string_view input, const CsvLimits& limits) {
  std::istringstream in{std::string(input)};
  CsvReader reader(in, limits);
  std::vector<ReadRecord> records;
  CsvRow row;
  while (reader.Next(row)) {
    ReadRecord record{row.line, {}, std::string(row.text), row.fault};
    for (std::string_view field : row.fields) record.fields.emplace_back(field);
    records.push_back(std::move(record));
  }
  FuzzCheck(!reader.read_failed(), "a string stream never fails to read");
  return records;
}

size_t LongestField(const ReadRecord& record) {
  size_t longest = 0;
  for (const std::string& field : record.fields) longest = std::max(longest, field.size());
  return longest;
}

void CheckReference(std::string_view input, const std::vector<ReadRecord>& records) {
  // A line ends at LF, CRLF or a CR alone (the reader's rule).
  size_t line_ends = 0;
  for (size_t i = 0; i < input.size(); ++i) {
    line_ends += input[i] == '\n' || (input[i] == '\r' && (i + 1 == input.size() || input[i + 1] != '\n')) ? 1 : 0;
  }
  size_t previous = 0;
  for (size_t i = 0; i < records.size(); ++i) {
    const ReadRecord& record = records[i];
    FuzzCheck(record.line > previous && record.line <= line_ends + 1, "lines go forward");
    previous = record.line;
    FuzzCheck(record.fault == CsvFault::kNone || record.fields.empty(), "a faulty record has no fields");
    FuzzCheck(record.fault != CsvFault::kNone || !record.fields.empty(), "a good record has a field");
    FuzzCheck(record.fault == CsvFault::kNone || record.fault == CsvFault::kInvalidUtf8 ||
                  record.fault == CsvFault::kUnclosedQuote,
              "without limits the only faults are invalid UTF-8 and an unclosed quote");
    // An unclosed quote costs its own line and reading starts again at the next one, so a
    // later record may follow it (on a later line, checked above).
    FuzzCheck(record.fault != CsvFault::kNone || IsValidUtf8(record.text), "a good record is UTF-8");
  }
}

void CheckRoundTrip(const std::vector<ReadRecord>& records) {
  std::string written;
  std::vector<const ReadRecord*> good;
  for (const ReadRecord& record : records) {
    if (record.fault != CsvFault::kNone) continue;
    good.push_back(&record);
    for (size_t f = 0; f < record.fields.size(); ++f) {
      if (f > 0) written += ',';
      written += '"';
      for (char c : record.fields[f]) written += c == '"' ? std::string("\"\"") : std::string(1, c);
      written += '"';
    }
    written += '\n';
  }
  const size_t bound = written.size() + 1;
  const std::vector<ReadRecord> again = ReadAll(written, {bound, bound, bound});
  FuzzCheck(again.size() == good.size(), "round trip: as many records");
  for (size_t i = 0; i < again.size(); ++i) {
    FuzzCheck(again[i].fault == CsvFault::kNone, "round trip: no fault");
    FuzzCheck(again[i].fields == good[i]->fields, "round trip: the same fields");
  }
}

// Small limits against the reference read (no limits in the way).
void CheckLimits(const std::vector<ReadRecord>& reference, const std::vector<ReadRecord>& limited,
                 const CsvLimits& limits) {
  std::map<size_t, const ReadRecord*> by_line;
  for (const ReadRecord& record : reference) by_line[record.line] = &record;
  size_t matched = 0;
  for (const ReadRecord& record : limited) {
    FuzzCheck(record.text.size() <= limits.max_record_bytes, "text is cut at the record limit");
    FuzzCheck(record.fault == CsvFault::kNone || record.fields.empty(), "a faulty record has no fields");
    const auto found = by_line.find(record.line);
    // A record the full read does not have starts on a line inside a record that went over
    // a limit: past a limit reading starts again at the next line, so it may be anything.
    if (found == by_line.end()) continue;
    ++matched;
    const ReadRecord& full = *found->second;
    if (full.fault != CsvFault::kNone) {
      FuzzCheck(record.fault != CsvFault::kNone, "a faulty record stays faulty under limits");
      continue;
    }
    const bool field_over = LongestField(full) > limits.max_field_bytes;
    const bool count_over = full.fields.size() > limits.max_fields;
    const bool text_over = full.text.size() + 1 > limits.max_record_bytes;  // + a CR
    switch (record.fault) {
      case CsvFault::kNone:
        FuzzCheck(record.fields == full.fields, "a record within the limits keeps its fields");
        break;
      case CsvFault::kFieldTooLong:
        FuzzCheck(field_over, "field_too_long only when a field is over the field limit");
        break;
      case CsvFault::kTooManyFields:
        FuzzCheck(count_over, "too_many_fields only when there are too many fields");
        break;
      case CsvFault::kRecordTooLong:
        FuzzCheck(text_over, "record_too_long only when the record is over the record limit");
        break;
      case CsvFault::kInvalidUtf8:
      case CsvFault::kUnclosedQuote:
        // A multi-line quoted record cut by a limit is rejected by its first line and
        // reading starts again at the next, so line-by-line agreement with the full read
        // ends there; the checks above still hold for every record.
        break;
    }
  }
  FuzzCheck(matched <= reference.size(), "no record is matched twice");
}

void CheckFault(const RowFault& fault, size_t line) {
  FuzzCheck(!fault.reason.empty(), "a rejection has a reason");
  FuzzCheck(StartsWith(fault.message, std::string(kFile) + ":" + std::to_string(line) + ": "),
            "a rejection message starts FILE:LINE:");
}

bool ValidDate(Date date) { return IsValidCivil(date.year(), date.month(), date.day()); }

bool Trimmed(std::string_view value) {
  return value.empty() || (value.front() != ' ' && value.front() != '\t' && value.back() != ' ' &&
                           value.back() != '\t');
}

void CheckDispensing(const DispensingRecord& record) {
  FuzzCheck(!record.patient_id.empty() && Trimmed(record.patient_id), "a dispensing has a patient");
  FuzzCheck(!record.product.empty() || !record.code.empty(), "a dispensing has a product or code");
  FuzzCheck(std::isfinite(record.quantity) && record.quantity > 0, "quantity is finite and above 0");
  FuzzCheck(!record.days_supply || *record.days_supply > 0, "days supply is above 0");
  FuzzCheck(ValidDate(record.dispensed_on), "the dispensing date is a real date");
}

void CheckPatient(const PatientRecord& record) {
  FuzzCheck(!record.patient_id.empty(), "a patient has an id");
  FuzzCheck(record.sex.empty() || record.sex == "female" || record.sex == "male" ||
                record.sex == "other" || record.sex == "unknown",
            "sex is one of the four words");
  FuzzCheck(!record.registered_from || !record.registered_to ||
                *record.registered_from <= *record.registered_to,
            "registration does not end before it starts");
  FuzzCheck(!record.birth_date || ValidDate(*record.birth_date), "a birth date is a real date");
}

template <typename Record, typename Parse, typename Check>
void ParseRows(const std::vector<ReadRecord>& records, const HeaderLayout& layout,
               const RowContext& context, Parse parse, Check check) {
  Record out;
  size_t parsed = 0;
  size_t rejected = 0;
  for (size_t i = 1; i < records.size(); ++i) {
    CsvRow row;
    row.line = records[i].line;
    row.text = records[i].text;
    row.fault = records[i].fault;
    for (const std::string& field : records[i].fields) row.fields.emplace_back(field);
    if (std::optional<RowFault> fault = parse(row, layout, context, out)) {
      CheckFault(*fault, row.line);
      ++rejected;
      continue;
    }
    FuzzCheck(row.fault == CsvFault::kNone, "a faulty CSV record is never parsed");
    FuzzCheck(row.fields.size() == layout.field_count(), "a parsed row has the header's width");
    check(out);
    ++parsed;
  }
  FuzzCheck(parsed + rejected + 1 == records.size(), "nothing lost: rows = parsed + rejected");
}

void CheckRecords(const std::vector<ReadRecord>& records, DateOrder order) {
  if (records.empty()) return;
  CsvRow header;
  header.line = records[0].line;
  header.text = records[0].text;
  header.fault = records[0].fault;
  for (const std::string& field : records[0].fields) header.fields.emplace_back(field);
  const RowContext context{kFile, order};
  for (InputKind kind : {InputKind::kDispensing, InputKind::kPatients, InputKind::kPractices,
                         InputKind::kReviews}) {
    Result<HeaderLayout> layout = HeaderLayout::Find(kind, header, ColumnMap(), kFile);
    if (!layout.ok()) {
      FuzzCheck(StartsWith(layout.status().message(), std::string(kFile) + ":"),
                "a header fault names the file");
      continue;
    }
    FuzzCheck(layout->field_count() == header.fields.size(), "the layout has the header's width");
    for (size_t c = 0; c < ColumnsOf(kind).size(); ++c) {
      const size_t at = layout->Position(c);
      FuzzCheck(at == HeaderLayout::kAbsent || at < layout->field_count(), "a column is in the header");
    }
    switch (kind) {
      case InputKind::kDispensing:
        ParseRows<DispensingRecord>(records, *layout, context, ParseDispensingRow, CheckDispensing);
        break;
      case InputKind::kPatients:
        ParseRows<PatientRecord>(records, *layout, context, ParsePatientRow, CheckPatient);
        break;
      case InputKind::kPractices:
        ParseRows<PracticeRecord>(records, *layout, context, ParsePracticeRow,
                                  [](const PracticeRecord& r) {
                                    FuzzCheck(!r.practice.empty(), "a practice has a code");
                                    FuzzCheck(!r.list_size || *r.list_size > 0, "list size above 0");
                                  });
        break;
      case InputKind::kReviews:
        ParseRows<ReviewRecord>(records, *layout, context, ParseReviewRow, [](const ReviewRecord& r) {
          FuzzCheck(!r.patient_id.empty(), "a review has a patient");
          FuzzCheck(ValidDate(r.reviewed_on), "a review date is a real date");
        });
        break;
    }
  }
}

}  // namespace
}  // namespace medload

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace medload;
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  const CsvLimits unlimited{size + 1, size + 1, size + 1};
  const std::vector<ReadRecord> reference = ReadAll(input, unlimited);
  CheckReference(input, reference);
  CheckRoundTrip(reference);
  const CsvLimits small{7, 40, 5};
  CheckLimits(reference, ReadAll(input, small), small);
  // Under 512 bytes the default limits cannot be reached: the reference read is that read
  // (each reader allocates a 256 KiB buffer, the main cost of an execution).
  const DateOrder order = static_cast<DateOrder>(size % 3);
  CheckRecords(size < 512 ? reference : ReadAll(input, CsvLimits()), order);
  return 0;
}
