// Formats the synthetic records as the project's input files: CSV rows with the headers
// of the import commands, and FHIR R4 bulk-data NDJSON (MedicationDispense, Patient), and
// writes them through a large buffer. It decides nothing about the data itself.
#pragma once

#include <cstdio>
#include <string>
#include <string_view>

#include "medload/core/status.h"
#include "medload/synth/history.h"
#include "medload/synth/population.h"

namespace medload {

inline constexpr std::string_view kSynthPracticesHeader = "practice,name,network,list_size\n";
inline constexpr std::string_view kSynthPatientsHeader =
    "patient_id,birth_date,sex,practice,registered_from,registered_to\n";
inline constexpr std::string_view kSynthDispensingHeader =
    "record_id,patient_id,practice,dispensed_on,product,code,code_system,quantity,unit,"
    "days_supply,dosage\n";
inline constexpr std::string_view kSynthReviewsHeader = "patient_id,reviewed_on\n";

// Appends `field` to `out` as one CSV field (RFC 4180): quoted when it holds a comma, a
// quote or a line break, with quotes doubled.
void AppendCsvField(std::string& out, std::string_view field);

// Appends `text` to `out` as a JSON string literal (quotes included, escapes as needed).
void AppendJsonString(std::string& out, std::string_view text);

// Appends a quantity in the shortest form that reads back exactly ("28", "2.5").
void AppendNumber(std::string& out, double value);

// One row each, with the trailing line break; columns in the order of the headers above.
void AppendPracticeCsv(std::string& out, const SynthPractice& practice,
                       std::string_view network, long list_size);
void AppendPatientCsv(std::string& out, const SynthPatient& patient,
                      const SynthNetwork& network);
void AppendDispensingCsv(std::string& out, std::string_view record_id,
                         const SynthPatient& patient, const SynthNetwork& network,
                         const SynthDispensing& line);
void AppendReviewCsv(std::string& out, std::string_view patient_id, Date reviewed_on);

// One NDJSON line each (a FHIR R4 resource and a line break). `status` is the
// MedicationDispense status: "completed", "entered-in-error" or "cancelled".
void AppendPatientFhir(std::string& out, const SynthPatient& patient,
                       const SynthNetwork& network);
void AppendDispensingFhir(std::string& out, std::string_view record_id,
                          std::string_view status, const SynthPatient& patient,
                          const SynthDispensing& line);

// A file written through a large in-memory buffer. Move-only; closes on destruction.
class SynthOutputFile {
 public:
  // Creates or truncates `path`. Fails with Status::Input naming the path.
  static Result<SynthOutputFile> Create(const std::string& path);
  SynthOutputFile(SynthOutputFile&& other) noexcept;
  SynthOutputFile& operator=(SynthOutputFile&& other) noexcept;
  SynthOutputFile(const SynthOutputFile&) = delete;
  SynthOutputFile& operator=(const SynthOutputFile&) = delete;
  ~SynthOutputFile();

  // The pending text; append to it, then call Spill().
  std::string& text() { return buffer_; }
  // Writes the pending text out once it has grown past the buffer size.
  Status Spill();
  // Writes everything and closes the file. Fails with Status::Input naming the path.
  Status Close();

 private:
  SynthOutputFile(std::FILE* file, std::string path);
  Status WriteAll();

  std::FILE* file_ = nullptr;
  std::string path_;
  std::string buffer_;
};

}  // namespace medload
