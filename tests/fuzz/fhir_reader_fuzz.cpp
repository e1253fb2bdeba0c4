// libFuzzer target: the FHIR R4 NDJSON reader (input/fhir_reader.h). The input is one NDJSON
// file of MedicationDispense, Patient and Medication resources.
//
// Invariants:
// - nothing is lost: every physical line is either a blank line or exactly one item
//   (a dispense, a patient or a rejection), on its own line number, lines going forward;
// - the same holds with a small line limit, which only turns lines into too_long rejections;
// - a rejection names `FILE:LINE: ` and a reason; a dispense has a patient (a FHIR id
//   from a literal reference) or a subject to resolve (an identifier value, a urn:uuid),
//   a product or a Medication id to look up, a real date, a finite quantity above zero, a
//   days supply above zero, a status of the value set, and a finite non-negative
//   structured dose; a patient has a FHIR id and a known sex; a Medication has a FHIR id
//   and a product.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <sstream>
#include <string>
#include <string_view>

#include "fuzz/fuzz_check.h"
#include "medload/input/fhir_reader.h"

namespace medload {
namespace {

const std::string kFile = "fuzz.ndjson";

size_t PhysicalLines(std::string_view input) {
  if (input.empty()) return 0;
  size_t lines = 0;
  for (char c : input) lines += c == '\n' ? 1 : 0;
  return input.back() == '\n' ? lines : lines + 1;
}

bool KnownStatus(std::string_view status) {
  for (std::string_view code : MedicationDispenseStatuses()) {
    if (code == status) return true;
  }
  return false;
}

// 1 to 64 of [A-Za-z0-9-.], not "." or ".." (FHIR R4 id, as the reader reads it).
bool LooksLikeFhirId(std::string_view id) {
  if (id.empty() || id.size() > 64 || id == "." || id == "..") return false;
  for (char c : id) {
    const bool ok = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') ||
                    c == '-' || c == '.';
    if (!ok) return false;
  }
  return true;
}

void CheckDispense(const FhirItem& item) {
  const DispensingRecord& record = item.dispense;
  if (item.subject.form == SubjectForm::kLiteral) {
    FuzzCheck(LooksLikeFhirId(record.patient_id), "a literal subject is a FHIR id");
  } else {
    FuzzCheck(record.patient_id.empty() && !item.subject.value.empty(),
              "an identifier or urn subject is left to the importer, never taken as the patient id");
    FuzzCheck(item.subject.form != SubjectForm::kUrn || StartsWith(item.subject.value, "urn:uuid:"),
              "a urn subject is a urn:uuid");
  }
  FuzzCheck(record.record_id.empty() || LooksLikeFhirId(record.record_id), "a record id is a FHIR id");
  FuzzCheck(!record.product.empty() || !item.medication_reference.empty(),
            "a dispense has a product, or a Medication to look up");
  FuzzCheck(item.medication_reference.empty() || LooksLikeFhirId(item.medication_reference),
            "a Medication reference is a FHIR id");
  FuzzCheck(std::isfinite(record.quantity) && record.quantity > 0, "quantity is finite and above 0");
  FuzzCheck(!record.days_supply || *record.days_supply > 0, "days supply is above 0");
  FuzzCheck(IsValidCivil(record.dispensed_on.year(), record.dispensed_on.month(),
                         record.dispensed_on.day()),
            "the dispensing date is a real date");
  FuzzCheck(KnownStatus(record.status), "the status is a FHIR MedicationDispense status");
  FuzzCheck(!record.structured_units_per_day || (std::isfinite(*record.structured_units_per_day) &&
                                                 *record.structured_units_per_day >= 0),
            "a structured dose is finite and not negative");
}

void CheckPatient(const PatientRecord& record) {
  FuzzCheck(LooksLikeFhirId(record.patient_id), "a patient has a FHIR id");
  FuzzCheck(record.sex.empty() || record.sex == "female" || record.sex == "male" ||
                record.sex == "other" || record.sex == "unknown",
            "sex is one of the four words");
}

// Reads everything; returns the number of items and checks each.
size_t ReadAll(std::string_view input, size_t max_line_bytes, size_t& too_long) {
  std::istringstream in{std::string(input)};
  FhirReader reader(in, kFile, max_line_bytes);
  FhirItem item;
  size_t items = 0;
  size_t previous = 0;
  too_long = 0;
  while (reader.Next(item)) {
    ++items;
    FuzzCheck(item.line > previous, "lines go forward");
    previous = item.line;
    FuzzCheck(item.text.size() <= max_line_bytes, "text is cut at the line limit");
    switch (item.kind) {
      case FhirItemKind::kDispense: CheckDispense(item); break;
      case FhirItemKind::kPatient: CheckPatient(item.patient); break;
      case FhirItemKind::kMedication:
        FuzzCheck(LooksLikeFhirId(item.medication.id) && !item.medication.product.empty(),
                  "a Medication has a FHIR id and a product");
        break;
      case FhirItemKind::kRejected:
        FuzzCheck(!item.fault.reason.empty(), "a rejection has a reason");
        FuzzCheck(StartsWith(item.fault.message, kFile + ":" + std::to_string(item.line) + ": "),
                  "a rejection message starts FILE:LINE:");
        too_long += item.fault.reason == "too_long" ? 1 : 0;
        break;
    }
  }
  FuzzCheck(!reader.read_failed(), "a string stream never fails to read");
  FuzzCheck(items + reader.blank_lines() == PhysicalLines(input),
            "nothing lost: lines = items + blank lines");
  return items;
}

}  // namespace
}  // namespace medload

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace medload;
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  size_t too_long = 0;
  const size_t items = ReadAll(input, 1024 * 1024, too_long);
  FuzzCheck(too_long == 0 || size > 1024 * 1024, "no line is too long under the default limit");
  size_t small_too_long = 0;
  const size_t small_items = ReadAll(input, 64, small_too_long);
  FuzzCheck(small_items >= items, "a line limit loses no line");
  return 0;
}
