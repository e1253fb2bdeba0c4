#include "medload/synth/record_writer.h"

#include <cerrno>
#include <charconv>
#include <cstring>

#include "medload/synth/catalogue.h"

namespace medload {
namespace {

constexpr size_t kBufferBytes = size_t{1} << 20;

// YYYY-MM-DD without going through printf: dates are the most frequent field.
void AppendDate(std::string& out, Date date) {
  const auto [year, month, day] = ToCivil(date);
  if (year < 0 || year > 9999) {
    out += date.ToIso();
    return;
  }
  char text[10] = {static_cast<char>('0' + year / 1000), static_cast<char>('0' + year / 100 % 10),
                   static_cast<char>('0' + year / 10 % 10), static_cast<char>('0' + year % 10),
                   '-', static_cast<char>('0' + month / 10), static_cast<char>('0' + month % 10),
                   '-', static_cast<char>('0' + day / 10), static_cast<char>('0' + day % 10)};
  out.append(text, sizeof text);
}

std::string_view DosageText(const SynthDispensing& line) {
  if (line.dosage_text < 0) return {};
  const auto& texts = SynthCatalogue()[line.product].dosage->texts;
  return texts[static_cast<size_t>(line.dosage_text)];
}

std::string_view PeriodUnitCode(PeriodUnit unit) {
  switch (unit) {
    case PeriodUnit::kHour:
      return "h";
    case PeriodUnit::kWeek:
      return "wk";
    case PeriodUnit::kDay:
      break;
  }
  return "d";
}

void AppendQuantity(std::string& out, double value, std::string_view unit) {
  out += "{\"value\":";
  AppendNumber(out, value);
  out += ",\"unit\":";
  AppendJsonString(out, unit);
  out += '}';
}

// The FHIR R4 Dosage element: text, and for some lines timing.repeat and doseAndRate.
void AppendDosageFhir(std::string& out, const SynthDispensing& line) {
  const CatalogueDosage& dosage = *SynthCatalogue()[line.product].dosage;
  out += ",\"dosageInstruction\":[{\"text\":";
  AppendJsonString(out, DosageText(line));
  if (line.structured_dosage) {
    out += ",\"asNeededBoolean\":";
    out += dosage.as_needed ? "true" : "false";
    out += ",\"timing\":{\"repeat\":{\"frequency\":";
    out += std::to_string(dosage.frequency);
    out += ",\"period\":";
    out += std::to_string(dosage.period);
    out += ",\"periodUnit\":\"";
    out += PeriodUnitCode(dosage.period_unit);
    out += "\"}},\"doseAndRate\":[{";
    if (dosage.dose_low == dosage.dose_high) {
      out += "\"doseQuantity\":";
      AppendQuantity(out, dosage.dose_high, dosage.dose_unit);
    } else {
      out += "\"doseRange\":{\"low\":";
      AppendQuantity(out, dosage.dose_low, dosage.dose_unit);
      out += ",\"high\":";
      AppendQuantity(out, dosage.dose_high, dosage.dose_unit);
      out += '}';
    }
    out += "}]";
  }
  out += "}]";
}

}  // namespace

void AppendCsvField(std::string& out, std::string_view field) {
  bool plain = true;
  for (const char c : field) {
    if (c == ',' || c == '"' || c == '\r' || c == '\n') {
      plain = false;
      break;
    }
  }
  if (plain) {
    out += field;
    return;
  }
  out += '"';
  for (const char c : field) {
    if (c == '"') out += '"';
    out += c;
  }
  out += '"';
}

void AppendJsonString(std::string& out, std::string_view text) {
  static constexpr char kHex[] = "0123456789abcdef";
  out += '"';
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    if (c == '"' || c == '\\') {
      out += '\\';
      out += c;
    } else if (byte < 0x20) {
      out += "\\u00";
      out += kHex[byte >> 4];
      out += kHex[byte & 0xF];
    } else {
      out += c;
    }
  }
  out += '"';
}

void AppendNumber(std::string& out, double value) {
  char digits[32];
  const auto result = std::to_chars(digits, digits + sizeof digits, value);
  out.append(digits, result.ptr);
}

void AppendPracticeCsv(std::string& out, const SynthPractice& practice,
                       std::string_view network, long list_size) {
  AppendCsvField(out, practice.code);
  out += ',';
  AppendCsvField(out, practice.name);
  out += ',';
  AppendCsvField(out, network);
  out += ',';
  out += std::to_string(list_size);
  out += '\n';
}

void AppendPatientCsv(std::string& out, const SynthPatient& patient,
                      const SynthNetwork& network) {
  out += patient.patient_id;
  out += ',';
  if (patient.birth_year_only) {
    out += std::to_string(patient.birth_date.year());
  } else {
    AppendDate(out, patient.birth_date);
  }
  out += ',';
  out += patient.sex;
  out += ',';
  AppendCsvField(out, network.practices[patient.practice].code);
  out += ',';
  if (patient.registered_from) AppendDate(out, *patient.registered_from);
  out += ',';
  if (patient.registered_to) AppendDate(out, *patient.registered_to);
  out += '\n';
}

void AppendDispensingCsv(std::string& out, std::string_view record_id,
                         const SynthPatient& patient, const SynthNetwork& network,
                         const SynthDispensing& line) {
  const CatalogueProduct& product = SynthCatalogue()[line.product];
  out += record_id;
  out += ',';
  out += patient.patient_id;
  out += ',';
  AppendCsvField(out, network.practices[patient.practice].code);
  out += ',';
  AppendDate(out, line.dispensed_on);
  out += ',';
  AppendCsvField(out, product.description);
  out += ",,,";  // no product code: descriptions only
  AppendNumber(out, line.quantity);
  out += ',';
  out += product.unit;
  out += ',';
  if (line.days_supply) out += std::to_string(*line.days_supply);
  out += ',';
  AppendCsvField(out, DosageText(line));
  out += '\n';
}

void AppendReviewCsv(std::string& out, std::string_view patient_id, Date reviewed_on) {
  out += patient_id;
  out += ',';
  AppendDate(out, reviewed_on);
  out += '\n';
}

void AppendPatientFhir(std::string& out, const SynthPatient& patient,
                       const SynthNetwork& network) {
  const SynthPractice& practice = network.practices[patient.practice];
  out += "{\"resourceType\":\"Patient\",\"id\":";
  AppendJsonString(out, patient.patient_id);
  out += ",\"gender\":";
  AppendJsonString(out, patient.sex);
  out += ",\"birthDate\":\"";
  if (patient.birth_year_only) {
    out += std::to_string(patient.birth_date.year());
  } else {
    AppendDate(out, patient.birth_date);
  }
  out += "\",\"generalPractitioner\":[{\"identifier\":{\"value\":";
  AppendJsonString(out, practice.code);
  out += "},\"display\":";
  AppendJsonString(out, practice.name);
  out += "}]}\n";
}

void AppendDispensingFhir(std::string& out, std::string_view record_id,
                          std::string_view status, const SynthPatient& patient,
                          const SynthDispensing& line) {
  const CatalogueProduct& product = SynthCatalogue()[line.product];
  out += "{\"resourceType\":\"MedicationDispense\",\"id\":";
  AppendJsonString(out, record_id);
  out += ",\"status\":";
  AppendJsonString(out, status);
  out += ",\"medicationCodeableConcept\":{\"text\":";
  AppendJsonString(out, product.description);
  out += "},\"subject\":{\"reference\":";
  AppendJsonString(out, "Patient/" + patient.patient_id);
  out += "},\"quantity\":";
  AppendQuantity(out, line.quantity, product.unit);
  if (line.days_supply) {
    out += ",\"daysSupply\":{\"value\":";
    out += std::to_string(*line.days_supply);
    out += ",\"unit\":\"day\",\"system\":\"http://unitsofmeasure.org\",\"code\":\"d\"}";
  }
  out += ",\"whenHandedOver\":\"";
  AppendDate(out, line.dispensed_on);
  out += '"';
  if (line.dosage_text >= 0) AppendDosageFhir(out, line);
  out += "}\n";
}

Result<SynthOutputFile> SynthOutputFile::Create(const std::string& path) {
  std::FILE* file = std::fopen(path.c_str(), "wb");
  if (file == nullptr) {
    return Status::Input(path + ": cannot create: " + std::strerror(errno));
  }
  return SynthOutputFile(file, path);
}

SynthOutputFile::SynthOutputFile(std::FILE* file, std::string path)
    : file_(file), path_(std::move(path)) {
  buffer_.reserve(kBufferBytes + kBufferBytes / 4);
}

SynthOutputFile::SynthOutputFile(SynthOutputFile&& other) noexcept
    : file_(other.file_), path_(std::move(other.path_)), buffer_(std::move(other.buffer_)) {
  other.file_ = nullptr;
}

SynthOutputFile& SynthOutputFile::operator=(SynthOutputFile&& other) noexcept {
  if (this != &other) {
    if (file_ != nullptr) std::fclose(file_);
    file_ = other.file_;
    path_ = std::move(other.path_);
    buffer_ = std::move(other.buffer_);
    other.file_ = nullptr;
  }
  return *this;
}

SynthOutputFile::~SynthOutputFile() {
  if (file_ != nullptr) std::fclose(file_);
}

Status SynthOutputFile::WriteAll() {
  if (file_ == nullptr) return Status::Input(path_ + ": already closed");
  if (!buffer_.empty() && std::fwrite(buffer_.data(), 1, buffer_.size(), file_) != buffer_.size()) {
    return Status::Input(path_ + ": write failed: " + std::strerror(errno));
  }
  buffer_.clear();
  return Status::Ok();
}

Status SynthOutputFile::Spill() {
  if (buffer_.size() < kBufferBytes) return Status::Ok();
  return WriteAll();
}

Status SynthOutputFile::Close() {
  Status status = WriteAll();
  if (file_ != nullptr) {
    if (std::fclose(file_) != 0 && status.ok()) {
      status = Status::Input(path_ + ": close failed: " + std::strerror(errno));
    }
    file_ = nullptr;
  }
  return status;
}

}  // namespace medload
