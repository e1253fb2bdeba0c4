// A streaming reader of FHIR R4 bulk-data NDJSON (one resource per line): turns each
// MedicationDispense into a DispensingRecord, each Patient into a PatientRecord with its
// identifiers and each Medication into a product reading, or into a rejected row naming
// the bad element by its JSON pointer. It does not store, and it does not resolve what a
// line refers to outside itself (a subject given by identifier or urn:uuid, a Medication
// resource on another line): the importer does, against what is loaded.
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

// True for the statuses that count in measures: "completed", or none at all (CSV rows
// have none; a MedicationDispense without a status is rejected).
bool StatusCounts(std::string_view status);

enum class FhirItemKind { kDispense, kPatient, kMedication, kRejected };

// How a MedicationDispense named its patient (HL7 FHIR R4 references.html).
enum class SubjectForm {
  kLiteral,     // subject.reference "Patient/ID" (or an absolute URL): patient_id is ID
  kIdentifier,  // subject.identifier: system and value; the importer finds the patient
  kUrn,         // subject.reference "urn:uuid:...": the importer finds the patient
};

struct FhirSubject {
  SubjectForm form = SubjectForm::kLiteral;
  std::string system;  // kIdentifier: Identifier.system (may be empty)
  std::string value;   // kIdentifier: Identifier.value; kUrn: the whole "urn:uuid:..."
};

// One Patient.identifier (or an entry's fullUrl, as system "urn:ietf:rfc:3986").
struct FhirIdentifier {
  std::string system;
  std::string value;
};

// What a Medication resource says about the product, read as for a dispense's
// medication (see docs/input-formats.md): a readable product text and a code.
struct FhirMedicationRecord {
  std::string id;           // Medication.id, a FHIR id
  std::string product;      // never empty
  std::string code;         // may be empty
  std::string code_system;  // the formulary's name for a known system, else as written
};

// The code system name medload's formulary uses for a FHIR system URI: "RxNorm",
// "SNOMED CT", "dm+d" (https://dmd.nhs.uk, and SNOMED CT codes of the UK drug extension,
// namespace 1000001), "ATC"; any other system as written.
std::string FormularyCodeSystem(std::string_view system_uri, std::string_view code);

// One non-blank line of the input. Only the members named by `kind` are meaningful; the
// text view is valid until the next FhirReader::Next.
struct FhirItem {
  FhirItemKind kind = FhirItemKind::kRejected;
  size_t line = 0;             // 1-based physical line
  std::string_view text;       // the line as written (cut at the line limit)
  DispensingRecord dispense;   // kDispense; patient_id is empty unless subject is kLiteral
  FhirSubject subject;         // kDispense
  // kDispense: the id of a Medication resource named by medicationReference
  // ("Medication/ID"), for the importer to look up; empty when the line says it all.
  std::string medication_reference;
  PatientRecord patient;                   // kPatient
  std::vector<FhirIdentifier> identifiers; // kPatient
  FhirMedicationRecord medication;         // kMedication
  RowFault fault;                          // kRejected
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
  // A line may also be a Bundle entry, {"fullUrl": ..., "resource": {...}}.
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
