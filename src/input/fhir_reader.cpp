// FHIR R4 NDJSON: bounded line reading, then one resource per line. Element names and
// value sets follow the HL7 FHIR R4 definitions of MedicationDispense and Patient.
#include "medload/input/fhir_reader.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstring>
#include <istream>

#include "input/read_chunk.h"
#include "medload/core/text.h"
#include "medload/dose/dose_unit.h"
#include "medload/dose/fhir_dosage.h"

namespace medload {
namespace {

using nlohmann::json;

constexpr size_t kChunkBytes = 256 * 1024;

// Arrays and objects nested deeper than this are refused before parsing: a FHIR resource
// needs far fewer levels, and the JSON library copies and prints values recursively.
constexpr size_t kMaxJsonNesting = 64;

// True if `text` opens more than `limit` arrays or objects inside one another (brackets
// inside strings do not count).
bool NestedDeeperThan(std::string_view text, size_t limit) {
  size_t depth = 0;
  bool in_string = false;
  bool escaped = false;
  for (char c : text) {
    if (in_string) {
      if (escaped) escaped = false;
      else if (c == '\\') escaped = true;
      else if (c == '"') in_string = false;
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > limit) return true;
    } else if ((c == ']' || c == '}') && depth > 0) {
      --depth;
    }
  }
  return false;
}

// Builds the rejection of one element, named by its JSON pointer.
struct Faults {
  std::string_view file;
  size_t line;
  RowFault operator()(std::string reason, std::string_view pointer, std::string_view fault) const {
    return {std::move(reason), FaultMessage(file, line, pointer, fault)};
  }
};

// A JSON value as shown in a message: strings quoted, anything else as JSON.
std::string Shown(const json& value) {
  return QuoteForMessage(value.is_string() ? value.get<std::string>() : value.dump());
}

const json* Member(const json& parent, const char* key) {
  if (!parent.is_object()) return nullptr;
  const auto found = parent.find(key);
  return found == parent.end() ? nullptr : &*found;
}

std::string StringAt(const json& parent, const char* key) {
  const json* value = Member(parent, key);
  return value != nullptr && value->is_string() ? value->get<std::string>() : std::string();
}

// The id part of a reference to `type` ("Patient/123", "https://x/fhir/Patient/123" ->
// "123"); a bare id is taken as it is; a reference to another type gives "".
std::string ReferencedId(std::string_view reference, std::string_view type) {
  const std::string marker = std::string(type) + "/";
  const size_t at = reference.rfind(marker);
  if (at != std::string_view::npos && (at == 0 || reference[at - 1] == '/')) {
    std::string_view id = reference.substr(at + marker.size());
    if (const size_t history = id.find('/'); history != std::string_view::npos) {
      id = id.substr(0, history);  // ".../_history/2"
    }
    return std::string(id);
  }
  return reference.find('/') == std::string_view::npos ? std::string(reference) : std::string();
}

// Product text and code from a CodeableConcept: its text (else the first coding's
// display) and the first coding that has a code.
void ReadConcept(const json& concept_json, DispensingRecord& out) {
  out.product = StringAt(concept_json, "text");
  const json* codings = Member(concept_json, "coding");
  if (codings == nullptr || !codings->is_array()) return;
  for (const json& coding : *codings) {
    if (out.product.empty()) out.product = StringAt(coding, "display");
    if (out.code.empty() && !StringAt(coding, "code").empty()) {
      out.code = StringAt(coding, "code");
      out.code_system = StringAt(coding, "system");
    }
  }
}

// The medication: medicationCodeableConcept, else medicationReference (its display, or a
// contained Medication's code when the reference is local, "#id").
std::optional<RowFault> ReadMedication(const json& resource, const Faults& fault,
                                       DispensingRecord& out) {
  out.product.clear();
  out.code.clear();
  out.code_system.clear();
  if (const json* concept_json = Member(resource, "medicationCodeableConcept")) {
    ReadConcept(*concept_json, out);
  } else if (const json* reference = Member(resource, "medicationReference")) {
    out.product = StringAt(*reference, "display");
    const std::string local = StringAt(*reference, "reference");
    const json* contained = Member(resource, "contained");
    if (out.product.empty() && local.size() > 1 && local[0] == '#' && contained != nullptr &&
        contained->is_array()) {
      for (const json& item : *contained) {
        if (StringAt(item, "id") == local.substr(1) && Member(item, "code") != nullptr) {
          ReadConcept(item.at("code"), out);
        }
      }
    }
  }
  if (!out.product.empty() || !out.code.empty()) return std::nullopt;
  return fault("missing_product", "/medicationCodeableConcept",
               "has no text, display or code (nor has medicationReference)");
}

std::optional<RowFault> ReadSubject(const json& resource, const Faults& fault,
                                    std::string& patient_id) {
  const json* subject = Member(resource, "subject");
  const std::string reference = subject != nullptr ? StringAt(*subject, "reference") : "";
  patient_id = ReferencedId(reference, "Patient");
  if (patient_id.empty() && subject != nullptr && Member(*subject, "identifier") != nullptr) {
    patient_id = StringAt(subject->at("identifier"), "value");
  }
  if (!patient_id.empty()) return std::nullopt;
  if (!reference.empty()) {
    return fault("missing_patient", "/subject/reference",
                 QuoteForMessage(reference) + " is not a Patient reference");
  }
  return fault("missing_patient", "/subject/reference", "is missing");
}

std::optional<RowFault> ReadHandedOver(const json& resource, const Faults& fault, Date& date) {
  const char* key = Member(resource, "whenHandedOver") != nullptr ? "whenHandedOver" : "whenPrepared";
  const json* value = Member(resource, key);
  const std::string pointer = std::string("/") + key;
  if (value == nullptr) return fault("missing_date", "/whenHandedOver", "is missing (and so is whenPrepared)");
  const std::optional<Date> parsed =
      value->is_string() ? ParseDate(value->get<std::string>()) : std::nullopt;
  if (!parsed) return fault("bad_date", pointer, Shown(*value) + " is not a real date (expected YYYY-MM-DD...)");
  date = *parsed;
  return std::nullopt;
}

std::optional<RowFault> ReadAmounts(const json& resource, const Faults& fault, DispensingRecord& out) {
  const json* quantity = Member(resource, "quantity");
  const json* value = quantity != nullptr ? Member(*quantity, "value") : nullptr;
  if (value == nullptr) return fault("missing_quantity", "/quantity/value", "is missing");
  if (!value->is_number() || !std::isfinite(value->get<double>())) {
    return fault("bad_quantity", "/quantity/value", Shown(*value) + " is not a number");
  }
  if (value->get<double>() <= 0) {
    return fault("bad_quantity", "/quantity/value", Shown(*value) + " is not above zero");
  }
  out.quantity = value->get<double>();
  out.unit = StringAt(*quantity, "unit");
  if (out.unit.empty()) out.unit = StringAt(*quantity, "code");
  out.days_supply.reset();
  const json* days_supply = Member(resource, "daysSupply");
  const json* days = days_supply != nullptr ? Member(*days_supply, "value") : nullptr;
  if (days == nullptr) return std::nullopt;
  if (!days->is_number() || std::floor(days->get<double>()) != days->get<double>() ||
      days->get<double>() >= 1e9) {
    return fault("bad_days_supply", "/daysSupply/value", Shown(*days) + " is not a whole number of days");
  }
  if (days->get<double>() <= 0) {
    return fault("bad_days_supply", "/daysSupply/value", Shown(*days) + " is not above zero");
  }
  out.days_supply = static_cast<int>(days->get<double>());
  return std::nullopt;
}

// Text of the first instruction, and the structured dose when the instructions have a
// timing or a dose and its unit agrees with the dispensed quantity's unit.
void ReadDosage(const json& resource, DispensingRecord& out) {
  out.dosage.clear();
  out.structured_units_per_day.reset();
  out.structured_as_needed = false;
  const json* instructions = Member(resource, "dosageInstruction");
  if (instructions == nullptr || !instructions->is_array() || instructions->empty()) return;
  out.dosage = StringAt(instructions->at(0), "text");
  bool structured = false;
  for (const json& element : *instructions) {
    structured = structured || Member(element, "timing") != nullptr ||
                 Member(element, "doseAndRate") != nullptr ||
                 Member(element, "asNeededBoolean") != nullptr;
  }
  if (!structured) return;
  const DosageReading reading = ReadFhirDosageList(*instructions);
  out.structured_as_needed = reading.as_needed;
  if (!reading.units_per_day) return;
  if (reading.unit.empty() || out.unit.empty()) {
    out.structured_units_per_day = reading.units_per_day;
    return;
  }
  const std::optional<DoseUnit> dose_unit = ReadDoseUnit(reading.unit);
  const std::optional<DoseUnit> quantity_unit = ReadDoseUnit(out.unit);
  if (dose_unit && quantity_unit && SameDoseUnit(dose_unit->name, quantity_unit->name)) {
    out.structured_units_per_day = *reading.units_per_day * dose_unit->factor / quantity_unit->factor;
  }
}

std::optional<RowFault> ReadStatus(const json& resource, const Faults& fault, std::string& status) {
  status.clear();
  const json* value = Member(resource, "status");
  if (value == nullptr) return std::nullopt;
  if (value->is_string()) {
    for (std::string_view code : MedicationDispenseStatuses()) {
      if (code == value->get<std::string>()) {
        status.assign(code);
        return std::nullopt;
      }
    }
  }
  return fault("bad_status", "/status",
               Shown(*value) + " is not a MedicationDispense status (FHIR value set "
                               "medicationdispense-status)");
}

std::optional<RowFault> ReadDispense(const json& resource, const Faults& fault, DispensingRecord& out) {
  if (auto bad = ReadStatus(resource, fault, out.status)) return bad;
  if (auto bad = ReadSubject(resource, fault, out.patient_id)) return bad;
  if (auto bad = ReadHandedOver(resource, fault, out.dispensed_on)) return bad;
  if (auto bad = ReadMedication(resource, fault, out)) return bad;
  if (auto bad = ReadAmounts(resource, fault, out)) return bad;
  ReadDosage(resource, out);
  out.record_id = StringAt(resource, "id");
  out.practice.clear();
  return std::nullopt;
}

std::optional<RowFault> ReadPatient(const json& resource, const Faults& fault, PatientRecord& out) {
  out = PatientRecord();
  out.patient_id = StringAt(resource, "id");
  if (out.patient_id.empty()) return fault("missing_patient", "/id", "is missing");
  if (const json* birth = Member(resource, "birthDate")) {
    if (!birth->is_string()) return fault("bad_date", "/birthDate", Shown(*birth) + " is not a date");
    if (auto bad = ParseBirthDate(birth->get<std::string>(), DateOrder::kIso, fault.file, fault.line,
                                  "/birthDate", out.birth_date, out.birth_year_only)) {
      return bad;
    }
  }
  if (auto bad = ParseSex(StringAt(resource, "gender"), fault.file, fault.line, "/gender", out.sex)) {
    return bad;
  }
  const json* practitioners = Member(resource, "generalPractitioner");
  if (practitioners != nullptr && practitioners->is_array() && !practitioners->empty()) {
    const json& first = practitioners->at(0);
    const json* identifier = Member(first, "identifier");
    out.practice = identifier != nullptr ? StringAt(*identifier, "value") : "";
    if (out.practice.empty()) out.practice = ReferencedId(StringAt(first, "reference"), "Organization");
  }
  return std::nullopt;
}

}  // namespace

const std::vector<std::string_view>& MedicationDispenseStatuses() {
  // Source: HL7 FHIR R4 MedicationDispense.status, value set medicationdispense-status.
  static const std::vector<std::string_view> kStatuses = {
      "preparation", "in-progress", "cancelled", "on-hold",  "completed",
      "entered-in-error", "stopped", "declined", "unknown"};
  return kStatuses;
}

bool StatusCounts(std::string_view status) { return status.empty() || status == "completed"; }

FhirReader::FhirReader(std::istream& in, std::string file, size_t max_line_bytes, size_t first_line)
    : in_(in), file_(std::move(file)), max_line_bytes_(max_line_bytes), chunk_(kChunkBytes),
      next_line_(first_line) {}

bool FhirReader::Fill() {
  if (eof_) return false;
  pos_ = 0;
  end_ = ReadChunk(in_, chunk_, eof_, read_failed_);
  return end_ > 0;
}

// Reads one physical line into line_text_ (without its line end), keeping at most
// max_line_bytes_. Returns false at the end of the input.
bool FhirReader::ReadLine() {
  line_text_.clear();
  line_too_long_ = false;
  if (pos_ >= end_ && !Fill()) return false;
  if (!started_) {
    started_ = true;
    if (end_ - pos_ >= 3 && std::memcmp(chunk_.data() + pos_, "\xEF\xBB\xBF", 3) == 0) pos_ += 3;
  }
  while (pos_ < end_ || Fill()) {
    const char* start = chunk_.data() + pos_;
    const void* newline = std::memchr(start, '\n', end_ - pos_);
    const size_t run = newline != nullptr ? static_cast<size_t>(static_cast<const char*>(newline) - start)
                                          : end_ - pos_;
    const size_t room = max_line_bytes_ - line_text_.size();
    if (run > room) line_too_long_ = true;
    line_text_.append(start, std::min(run, room));
    pos_ += run;
    if (newline != nullptr) {
      ++pos_;
      break;
    }
  }
  if (!line_text_.empty() && line_text_.back() == '\r' && !line_too_long_) line_text_.pop_back();
  return true;
}

bool FhirReader::Next(FhirItem& item) {
  for (;;) {
    const size_t line = next_line_;
    if (!ReadLine()) return false;
    ++next_line_;
    if (!line_too_long_ && IsBlank(line_text_, " \t\r")) {
      ++blank_lines_;
      continue;
    }
    item.line = line;
    item.text = line_text_;
    Interpret(item);
    return true;
  }
}

void FhirReader::Interpret(FhirItem& item) {
  const Faults fault{file_, item.line};
  item.kind = FhirItemKind::kRejected;
  if (line_too_long_) {
    item.fault = fault("too_long", "row", "the line is longer than 1 MiB");
    return;
  }
  if (!IsValidUtf8(line_text_)) {
    item.fault = fault("invalid_utf8", "row", "is not valid UTF-8 (save the file as UTF-8)");
    return;
  }
  if (NestedDeeperThan(line_text_, kMaxJsonNesting)) {
    item.fault = fault("bad_json", "row", "nests arrays and objects more than " +
                                              std::to_string(kMaxJsonNesting) + " levels deep");
    return;
  }
  json resource;
  try {
    resource = json::parse(line_text_);
  } catch (const json::parse_error& error) {
    item.fault = fault("bad_json", "row", "is not valid JSON (at byte " + std::to_string(error.byte) + ")");
    return;
  } catch (const json::exception&) {
    item.fault = fault("bad_json", "row", "is not valid JSON (a number is out of range)");
    return;
  }
  if (!resource.is_object()) {
    item.fault = fault("bad_json", "row", "is not a JSON object (one FHIR resource per line)");
    return;
  }
  const std::string type = StringAt(resource, "resourceType");
  std::optional<RowFault> bad;
  if (type == "MedicationDispense") {
    bad = ReadDispense(resource, fault, item.dispense);
    item.kind = FhirItemKind::kDispense;
  } else if (type == "Patient") {
    bad = ReadPatient(resource, fault, item.patient);
    item.kind = FhirItemKind::kPatient;
  } else {
    bad = fault("unsupported_resource", "/resourceType",
                type.empty() ? std::string("is missing (expected MedicationDispense or Patient)")
                             : QuoteForMessage(type) + " is not MedicationDispense or Patient");
  }
  if (bad) {
    item.kind = FhirItemKind::kRejected;
    item.fault = std::move(*bad);
  }
}

}  // namespace medload
