// A streaming reader of FHIR R4 bulk-data NDJSON (one resource per line): turns each
// MedicationDispense into a DispensingRecord and each Patient into a PatientRecord, or
// into a rejected row naming the bad element by its JSON pointer. It does not store, and
// it keeps every dispense whatever its status (counting is the store's read API's job).
#pragma once

#include <cstddef>
#include <iosfwd>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/records.h"
#include "medload/input/csv_records.h"

namespace medload {

// The MedicationDispense.status codes of FHIR R4 (value set medicationdispense-status).
const std::vector<std::string_view>& MedicationDispenseStatuses();

// True for the statuses that count in measures: "completed", or none at all.
bool StatusCounts(std::string_view status);

enum class FhirItemKind { kDispense, kPatient, kRejected };

// One non-blank line of the input. Only the member named by `kind` is meaningful; the
// text view is valid until the next FhirReader::Next.
struct FhirItem {
  FhirItemKind kind = FhirItemKind::kRejected;
  size_t line = 0;             // 1-based physical line
  std::string_view text;       // the line as written (cut at the line limit)
  DispensingRecord dispense;   // kDispense
  PatientRecord patient;       // kPatient
  RowFault fault;              // kRejected
};

class FhirReader {
 public:
  // Reads from `in`, which must outlive the reader, for messages naming `file`.
  // `first_line` is the physical line number of the first byte not yet read.
  FhirReader(std::istream& in, std::string file, size_t max_line_bytes = 1024 * 1024,
             size_t first_line = 1);

  FhirReader(const FhirReader&) = delete;
  FhirReader& operator=(const FhirReader&) = delete;

  // Reads the next non-blank line into `item`. Returns false at the end of the input.
  // Rejects (kRejected) a line that is too long, not UTF-8, not JSON, not an object, of
  // another resourceType, or whose elements break the rules in docs/input-formats.md.
  bool Next(FhirItem& item);

  size_t blank_lines() const { return blank_lines_; }
  bool read_failed() const { return read_failed_; }

 private:
  bool Fill();
  bool ReadLine();
  void Interpret(FhirItem& item);

  std::istream& in_;
  std::string file_;
  size_t max_line_bytes_;
  std::vector<char> chunk_;
  size_t pos_ = 0;
  size_t end_ = 0;
  bool eof_ = false;
  bool read_failed_ = false;
  bool started_ = false;
  size_t next_line_ = 1;
  size_t blank_lines_ = 0;
  std::string line_text_;
  bool line_too_long_ = false;
};

}  // namespace medload
