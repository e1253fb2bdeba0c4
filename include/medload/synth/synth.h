// Writes a whole synthetic data set for an invented care network into a folder:
// practices, patients, dispensing lines and completed reviews, deterministic for a seed
// (the same options give the same bytes on every platform). It streams; memory does not
// grow with the number of patients. It does not load anything into a store.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/date.h"
#include "medload/core/status.h"

namespace medload {

enum class SynthFormat {
  kCsv,   // dispensing.csv, patients.csv
  kFhir,  // dispensing.ndjson, patients.ndjson (FHIR R4 bulk data)
};

// The last day covered when no end is given: 2026-10-31.
Date DefaultSynthEnd();

struct SynthOptions {
  uint64_t patients = 1000;   // --patients: patients in the data set (1 to 50,000,000)
  int months = 12;            // --months: whole months covered (1 to 240)
  uint64_t seed = 1;          // --seed: fixes every byte of the output
  Date end = DefaultSynthEnd();  // --end: the data end on the last day of this month
  SynthFormat format = SynthFormat::kCsv;  // --data-format csv|fhir
};

struct SynthFileSummary {
  std::string name;  // file name inside the folder
  uint64_t rows = 0; // data rows or resources, headers excluded
};

struct SynthSummary {
  std::string folder;
  std::string network;
  uint64_t seed = 0;
  SynthFormat format = SynthFormat::kCsv;
  Date from;                          // first day covered
  Date to;                            // last day covered
  uint64_t practices = 0;
  uint64_t patients = 0;              // everyone generated, temporary residents included
  uint64_t registered_patients = 0;   // rows in the patient registry
  uint64_t dispensing_rows = 0;       // lines or MedicationDispense resources written
  uint64_t reviews = 0;
  std::vector<SynthFileSummary> files;
};

// Checks the options' ranges. Returns Status::Usage naming the bad option.
Status CheckSynthOptions(const SynthOptions& options);

// Writes the data set into `folder` (created if missing; existing files of the same
// names are replaced): practices.csv, patients.csv or .ndjson, dispensing.csv or .ndjson,
// reviews.csv. Fails with Status::Usage for bad options, Status::Input when the folder or
// a file cannot be written.
Result<SynthSummary> WriteSynthData(const SynthOptions& options, const std::string& folder);

std::string_view SynthFormatName(SynthFormat format);  // "csv" or "fhir"

}  // namespace medload
