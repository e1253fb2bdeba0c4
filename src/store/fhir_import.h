// The FHIR NDJSON part of an import: stores MedicationDispense, Patient (with its
// identifiers) and Medication lines, and settles what a dispense names outside its own
// line: a subject given by identifier or urn:uuid, a Medication resource by id. A
// dispense whose patient or medication is not loaded yet waits for the end of the file
// (a later line may bring it), then is stored or rejected. Private to src/store.
#pragma once

#include <string_view>

#include "medload/core/records.h"
#include "medload/input/csv_records.h"
#include "medload/input/fhir_reader.h"
#include "medload/store/import_summary.h"
#include "store/record_writers.h"
#include "store/sqlite.h"

namespace medload {

// What the importer's per-file session does with each row (see importer.cpp).
class RowSink {
 public:
  virtual ~RowSink() = default;
  // One more row read.
  virtual void Tick() = 0;
  virtual Status Reject(size_t line, const RowFault& fault, std::string_view original) = 0;
  // A registry, Medication or review row written.
  virtual void Count(WriteOutcome outcome) = 0;
  // A dispensing written from `line`.
  virtual Status CountDispensing(const DispensingRecord& record, size_t line, WriteOutcome outcome) = 0;
};

// Imports every item of `reader` into `db` for an import of `kind` (dispensing or
// patients), counting each in `sink` and `summary`. How subjects and Medication
// references are found is documented in docs/input-formats.md. Fails only on a storage
// error.
Status ImportFhirItems(InputKind kind, FhirReader& reader, sqlite3* db, WriteSource source,
                       RowSink& sink, ImportSummary& summary);

}  // namespace medload
