#include "medload/synth/synth.h"

#include <filesystem>
#include <system_error>

#include "medload/synth/care_plan.h"
#include "medload/synth/history.h"
#include "medload/synth/population.h"
#include "medload/synth/record_writer.h"

namespace medload {
namespace {

constexpr uint64_t kMaxPatients = 50'000'000;
constexpr int kMaxMonths = 240;

// The four output files, open together while the patients stream through.
struct SynthFiles {
  SynthOutputFile patients;
  SynthOutputFile dispensing;
  SynthOutputFile reviews;
};

Result<SynthFiles> OpenFiles(const std::filesystem::path& folder, SynthFormat format,
                             SynthSummary& summary) {
  const bool fhir = format == SynthFormat::kFhir;
  const std::string patients_name = fhir ? "patients.ndjson" : "patients.csv";
  const std::string dispensing_name = fhir ? "dispensing.ndjson" : "dispensing.csv";
  Result<SynthOutputFile> patients = SynthOutputFile::Create((folder / patients_name).string());
  if (!patients.ok()) return patients.status();
  Result<SynthOutputFile> dispensing =
      SynthOutputFile::Create((folder / dispensing_name).string());
  if (!dispensing.ok()) return dispensing.status();
  Result<SynthOutputFile> reviews = SynthOutputFile::Create((folder / "reviews.csv").string());
  if (!reviews.ok()) return reviews.status();
  if (!fhir) {
    patients->text() += kSynthPatientsHeader;
    dispensing->text() += kSynthDispensingHeader;
  }
  reviews->text() += kSynthReviewsHeader;
  summary.files = {{"practices.csv", 0}, {patients_name, 0}, {dispensing_name, 0},
                   {"reviews.csv", 0}};
  return SynthFiles{std::move(*patients), std::move(*dispensing), std::move(*reviews)};
}

// Writes one patient's registry row, dispensing lines and review.
void WritePatient(const SynthOptions& options, const SynthNetwork& network,
                  const SynthPatient& patient, const SynthHistory& history, SynthFiles& files,
                  SynthSummary& summary, std::string& record_id) {
  const bool fhir = options.format == SynthFormat::kFhir;
  if (patient.in_registry) {
    if (fhir) {
      AppendPatientFhir(files.patients.text(), patient, network);
    } else {
      AppendPatientCsv(files.patients.text(), patient, network);
    }
    ++summary.registered_patients;
  }
  const std::string prefix = "SYN-" + std::to_string(options.seed) + "-";
  for (const SynthDispensing& line : history.dispensings) {
    if (fhir && line.voided_copy != 0) {
      record_id = prefix + std::to_string(++summary.dispensing_rows);
      AppendDispensingFhir(files.dispensing.text(), record_id,
                           line.voided_copy == 1 ? "entered-in-error" : "cancelled", patient,
                           line);
    }
    record_id = prefix + std::to_string(++summary.dispensing_rows);
    if (fhir) {
      AppendDispensingFhir(files.dispensing.text(), record_id, "completed", patient, line);
    } else {
      AppendDispensingCsv(files.dispensing.text(), record_id, patient, network, line);
    }
  }
  if (history.reviewed_on && patient.in_registry) {
    AppendReviewCsv(files.reviews.text(), patient.patient_id, *history.reviewed_on);
    ++summary.reviews;
  }
}

Status WritePractices(const std::filesystem::path& folder, const SynthNetwork& network,
                      const std::vector<long>& list_sizes) {
  Result<SynthOutputFile> file = SynthOutputFile::Create((folder / "practices.csv").string());
  if (!file.ok()) return file.status();
  file->text() += kSynthPracticesHeader;
  for (size_t i = 0; i < network.practices.size(); ++i) {
    AppendPracticeCsv(file->text(), network.practices[i], network.name, list_sizes[i]);
  }
  return file->Close();
}

Status StreamPatients(const SynthOptions& options, const SynthNetwork& network,
                      const SynthWindow& window, SynthFiles& files, SynthSummary& summary,
                      std::vector<long>& list_sizes) {
  SynthHistory history;
  std::string record_id;
  for (uint64_t index = 0; index < options.patients; ++index) {
    SynthRandom random = SynthRandom::ForStream(options.seed, index);
    const SynthPatient patient =
        MakePatient(index, options.patients, options.seed, network, window, random);
    const CarePlan plan = PlanCare(patient.age_at_end, patient.sex == "female", window.days(),
                                   random);
    BuildHistory(plan, patient, window, random, history);
    WritePatient(options, network, patient, history, files, summary, record_id);
    // The list size is the registered list on the last day covered.
    if (patient.in_registry && !patient.registered_to) ++list_sizes[patient.practice];
    for (SynthOutputFile* file : {&files.patients, &files.dispensing, &files.reviews}) {
      if (Status status = file->Spill(); !status.ok()) return status;
    }
  }
  return Status::Ok();
}

}  // namespace

Date DefaultSynthEnd() { return Date::FromCivil(2026, 10, 31); }

std::string_view SynthFormatName(SynthFormat format) {
  return format == SynthFormat::kFhir ? "fhir" : "csv";
}

Status CheckSynthOptions(const SynthOptions& options) {
  if (options.patients < 1 || options.patients > kMaxPatients) {
    return Status::Usage("patients " + std::to_string(options.patients) +
                         " is out of range: give 1 to 50000000");
  }
  if (options.months < 1 || options.months > kMaxMonths) {
    return Status::Usage("months " + std::to_string(options.months) +
                         " is out of range: give 1 to 240");
  }
  if (options.end.year() < 1950 || options.end.year() > 2150) {
    return Status::Usage("end " + options.end.ToIso() +
                         " is out of range: give a date in 1950-2150");
  }
  return Status::Ok();
}

Result<SynthSummary> WriteSynthData(const SynthOptions& options, const std::string& folder) {
  if (Status status = CheckSynthOptions(options); !status.ok()) return status;
  std::error_code error;
  std::filesystem::create_directories(folder, error);
  if (error || !std::filesystem::is_directory(folder)) {
    return Status::Input(folder + ": cannot create the folder: " + error.message());
  }
  const SynthNetwork network = MakeNetwork(options.patients, options.seed);
  const SynthWindow window = MakeWindow(options.end, options.months);
  SynthSummary summary;
  summary.folder = folder;
  summary.network = network.name;
  summary.seed = options.seed;
  summary.format = options.format;
  summary.from = window.start;
  summary.to = window.end;
  summary.practices = network.practices.size();
  summary.patients = options.patients;
  Result<SynthFiles> files = OpenFiles(folder, options.format, summary);
  if (!files.ok()) return files.status();
  std::vector<long> list_sizes(network.practices.size(), 0);
  if (Status status = StreamPatients(options, network, window, *files, summary, list_sizes);
      !status.ok()) {
    return status;
  }
  for (SynthOutputFile* file : {&files->patients, &files->dispensing, &files->reviews}) {
    if (Status status = file->Close(); !status.ok()) return status;
  }
  if (Status status = WritePractices(folder, network, list_sizes); !status.ok()) return status;
  summary.files[0].rows = summary.practices;
  summary.files[1].rows = summary.registered_patients;
  summary.files[2].rows = summary.dispensing_rows;
  summary.files[3].rows = summary.reviews;
  return summary;
}

}  // namespace medload
