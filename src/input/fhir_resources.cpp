// Element names and value sets follow the HL7 FHIR R4 definitions of MedicationDispense,
// Patient, Medication, Reference, Identifier and SimpleQuantity. Where R4 leaves a choice
// to the reader (units of daysSupply, a subject given by identifier), the rule is written
// in docs/input-formats.md.
#include "input/fhir_resources.h"

#include <cmath>

#include "input/fhir_medication.h"
#include "input/fhir_reference.h"
#include "medload/dose/dose_unit.h"
#include "medload/dose/fhir_dosage.h"

namespace medload {
namespace {

using nlohmann::json;

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

// Resource.id: absent is allowed (`id` stays empty); a value must be a JSON string
// holding a FHIR id. A number ("id": 123) is refused rather than read as text: R4 JSON
// writes ids as strings, and a number may have lost digits on the way.
std::optional<RowFault> ReadId(const json& resource, const FhirFaults& fault, std::string& id) {
  id.clear();
  const json* value = Member(resource, "id");
  if (value == nullptr) return std::nullopt;
  if (!value->is_string() || !IsFhirId(value->get<std::string>())) {
    return fault("bad_id", "/id",
                 Shown(*value) + " is not a FHIR id (a JSON string of 1 to 64 of A-Z a-z 0-9 - .)");
  }
  id = value->get<std::string>();
  return std::nullopt;
}

std::optional<RowFault> ReadStatus(const json& resource, const FhirFaults& fault, std::string& status) {
  status.clear();
  const json* value = Member(resource, "status");
  if (value == nullptr) {
    return fault("missing_status", "/status",
                 "is missing (required in FHIR R4; \"completed\" for an item handed over)");
  }
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

// subject.reference (a literal Patient reference, or urn:uuid:), else subject.identifier.
std::optional<RowFault> ReadSubject(const json& resource, const FhirFaults& fault, FhirItem& item) {
  item.subject = FhirSubject();
  item.dispense.patient_id.clear();
  const json* subject = Member(resource, "subject");
  const json* reference = subject != nullptr ? Member(*subject, "reference") : nullptr;
  if (reference != nullptr) {
    if (!reference->is_string()) return fault("bad_reference", "/subject/reference", Shown(*reference) + " is not a string");
    const std::string text = reference->get<std::string>();
    if (UrnUuid(text)) {
      item.subject.form = SubjectForm::kUrn;
      item.subject.value = text;
      return std::nullopt;
    }
    std::string why;
    const std::optional<FhirReference> parsed = ParseFhirReference(text, &why);
    if (!parsed) return fault("bad_reference", "/subject/reference", QuoteForMessage(text) + " " + why);
    if (parsed->type != "Patient") {
      return fault("missing_patient", "/subject/reference", QuoteForMessage(text) + " is not a Patient reference");
    }
    item.dispense.patient_id = parsed->id;
    return std::nullopt;
  }
  const json* identifier = subject != nullptr ? Member(*subject, "identifier") : nullptr;
  if (identifier == nullptr) return fault("missing_patient", "/subject/reference", "is missing");
  item.subject.form = SubjectForm::kIdentifier;
  item.subject.system = StringAt(*identifier, "system");
  item.subject.value = StringAt(*identifier, "value");
  if (item.subject.value.empty()) return fault("missing_patient", "/subject/identifier/value", "is missing");
  return std::nullopt;
}

std::optional<RowFault> ReadHandedOver(const json& resource, const FhirFaults& fault, Date& date) {
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

// medicationReference: a contained Medication ("#id"), a Medication resource elsewhere
// ("Medication/ID", looked up by the importer), and the display as a fallback.
std::optional<RowFault> ReadMedicationReference(const json& resource, const json& reference,
                                                const FhirFaults& fault, FhirItem& item,
                                                MedicationText& text) {
  const std::string display = StringAt(reference, "display");
  const std::string target = StringAt(reference, "reference");
  if (!target.empty() && target[0] == '#') {
    const json* contained = Member(resource, "contained");
    const json* found = nullptr;
    for (size_t i = 0; contained != nullptr && contained->is_array() && i < contained->size(); ++i) {
      const json& candidate = contained->at(i);
      if (StringAt(candidate, "resourceType") == "Medication" && StringAt(candidate, "id") == target.substr(1)) {
        found = &candidate;
      }
    }
    if (found == nullptr) {
      return fault("bad_reference", "/medicationReference/reference",
                   QuoteForMessage(target) + " names no contained Medication");
    }
    text = ReadMedicationResource(*found);
  } else if (!target.empty()) {
    std::string why;
    const std::optional<FhirReference> parsed = ParseFhirReference(target, &why);
    if (!parsed || parsed->type != "Medication") {
      return fault("bad_reference", "/medicationReference/reference",
                   QuoteForMessage(target) + " " + (parsed ? "is not a Medication reference" : why));
    }
    item.medication_reference = parsed->id;
  }
  if (text.product.empty()) text.product = display;
  return std::nullopt;
}

std::optional<RowFault> ReadMedication(const json& resource, const FhirFaults& fault, FhirItem& item) {
  item.medication_reference.clear();
  MedicationText text;
  if (const json* concept_json = Member(resource, "medicationCodeableConcept")) {
    text = ReadCodeableConcept(*concept_json);
  } else if (const json* reference = Member(resource, "medicationReference")) {
    if (auto bad = ReadMedicationReference(resource, *reference, fault, item, text)) return bad;
  }
  DispensingRecord& out = item.dispense;
  out.product = std::move(text.product);
  out.code = std::move(text.code);
  out.code_system = std::move(text.code_system);
  if (!out.product.empty() || !item.medication_reference.empty()) return std::nullopt;
  return fault("missing_product", "/medicationCodeableConcept",
               "has no text, display, code or ingredient (nor has medicationReference)");
}

// A positive, finite JSON number at parent/value, or the fault.
std::optional<RowFault> PositiveValue(const json* value, const FhirFaults& fault, const char* reason,
                                      const std::string& pointer, double& out) {
  if (!value->is_number() || !std::isfinite(value->get<double>())) {
    return fault(reason, pointer, Shown(*value) + " is not a number");
  }
  if (value->get<double>() <= 0) return fault(reason, pointer, Shown(*value) + " is not above zero");
  out = value->get<double>();
  return std::nullopt;
}

// quantity.value in quantity.unit (else its code). UCUM unity "1" counts the product's
// own dose units and is stored without a unit; litres are stored as ml.
std::optional<RowFault> ReadQuantity(const json& resource, const FhirFaults& fault, DispensingRecord& out) {
  const json* quantity = Member(resource, "quantity");
  const json* value = quantity != nullptr ? Member(*quantity, "value") : nullptr;
  if (value == nullptr) return fault("missing_quantity", "/quantity/value", "is missing");
  if (auto bad = PositiveValue(value, fault, "bad_quantity", "/quantity/value", out.quantity)) return bad;
  out.unit = StringAt(*quantity, "unit");
  if (out.unit.empty()) out.unit = StringAt(*quantity, "code");
  if (out.unit == "1") out.unit.clear();
  const std::optional<DoseUnit> unit = ReadDoseUnit(out.unit);
  if (unit && unit->name == "ml" && unit->factor == 1000) {
    out.quantity *= 1000;
    out.unit = "ml";
  }
  return std::nullopt;
}

// Days in one unit of daysSupply: UCUM d, wk, mo (30 days by convention), a (365) and h,
// or the same words spelled out; nullopt for anything else.
std::optional<double> DaysIn(std::string unit) {
  for (char& c : unit) c = c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c;
  if (unit.empty() || unit == "d" || unit == "day" || unit == "days") return 1.0;
  if (unit == "wk" || unit == "week" || unit == "weeks") return 7.0;
  if (unit == "mo" || unit == "month" || unit == "months") return 30.0;
  if (unit == "a" || unit == "year" || unit == "years") return 365.0;
  if (unit == "h" || unit == "hour" || unit == "hours") return 1.0 / 24;
  return std::nullopt;
}

// daysSupply.value in its code (UCUM), else its unit, else days. Days must be whole;
// other units are converted and rounded up to whole days.
std::optional<RowFault> ReadDaysSupply(const json& resource, const FhirFaults& fault, DispensingRecord& out) {
  out.days_supply.reset();
  const json* days_supply = Member(resource, "daysSupply");
  const json* value = days_supply != nullptr ? Member(*days_supply, "value") : nullptr;
  if (value == nullptr) return std::nullopt;
  double amount = 0;
  if (auto bad = PositiveValue(value, fault, "bad_days_supply", "/daysSupply/value", amount)) return bad;
  const bool by_code = !StringAt(*days_supply, "code").empty();
  const std::string unit = StringAt(*days_supply, by_code ? "code" : "unit");
  const std::optional<double> factor = DaysIn(unit);
  if (!factor) {
    return fault("bad_days_supply", by_code ? "/daysSupply/code" : "/daysSupply/unit",
                 QuoteForMessage(unit) + " is not a unit of time (d, wk, mo, a or h)");
  }
  if (*factor == 1 && std::floor(amount) != amount) {
    return fault("bad_days_supply", "/daysSupply/value", Shown(*value) + " is not a whole number of days");
  }
  const double days = std::ceil(amount * *factor - 1e-9);
  if (days >= 1e9) return fault("bad_days_supply", "/daysSupply/value", Shown(*value) + " is too many days");
  out.days_supply = std::max(1, static_cast<int>(days));
  return std::nullopt;
}

// Text of the first instruction, and the structured amount a day with its unit when the
// instructions have a timing, a dose or an as-needed flag.
void ReadDosage(const json& resource, DispensingRecord& out) {
  out.dosage.clear();
  out.structured_units_per_day.reset();
  out.structured_unit.clear();
  out.structured_as_needed = false;
  const json* instructions = Member(resource, "dosageInstruction");
  if (instructions == nullptr || !instructions->is_array() || instructions->empty()) return;
  out.dosage = StringAt(instructions->at(0), "text");
  bool structured = false;
  for (const json& element : *instructions) {
    structured = structured || Member(element, "timing") != nullptr ||
                 Member(element, "doseAndRate") != nullptr ||
                 Member(element, "asNeededBoolean") != nullptr ||
                 Member(element, "asNeededCodeableConcept") != nullptr;
  }
  if (!structured) return;
  const DosageReading reading = ReadFhirDosageList(*instructions);
  out.structured_as_needed = reading.as_needed;
  if (!reading.units_per_day) return;
  out.structured_units_per_day = reading.units_per_day;
  out.structured_unit = reading.unit;
}

}  // namespace

RowFault FhirFaults::operator()(std::string reason, std::string_view pointer, std::string_view fault) const {
  return {std::move(reason), FaultMessage(file, line, pointer, fault)};
}

std::optional<RowFault> ReadDispenseResource(const json& resource, const FhirFaults& fault, FhirItem& item) {
  DispensingRecord& out = item.dispense;
  if (auto bad = ReadId(resource, fault, out.record_id)) return bad;
  if (auto bad = ReadStatus(resource, fault, out.status)) return bad;
  if (auto bad = ReadSubject(resource, fault, item)) return bad;
  if (auto bad = ReadHandedOver(resource, fault, out.dispensed_on)) return bad;
  if (auto bad = ReadMedication(resource, fault, item)) return bad;
  if (auto bad = ReadQuantity(resource, fault, out)) return bad;
  if (auto bad = ReadDaysSupply(resource, fault, out)) return bad;
  ReadDosage(resource, out);
  out.practice.clear();
  return std::nullopt;
}

std::optional<RowFault> ReadPatientResource(const json& resource, const FhirFaults& fault,
                                            std::string_view full_url, FhirItem& item) {
  PatientRecord& out = item.patient;
  out = PatientRecord();
  if (auto bad = ReadId(resource, fault, out.patient_id)) return bad;
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
    const std::optional<FhirReference> organisation = ParseFhirReference(StringAt(first, "reference"), nullptr);
    if (out.practice.empty() && organisation && organisation->type == "Organization") {
      out.practice = organisation->id;
    }
  }
  item.identifiers.clear();
  if (const json* identifiers = Member(resource, "identifier"); identifiers != nullptr && identifiers->is_array()) {
    for (const json& identifier : *identifiers) {
      FhirIdentifier read{StringAt(identifier, "system"), StringAt(identifier, "value")};
      if (!read.value.empty()) item.identifiers.push_back(std::move(read));
    }
  }
  // FHIR R4 Identifier: a URI as identifier takes system "urn:ietf:rfc:3986".
  if (!full_url.empty()) item.identifiers.push_back({"urn:ietf:rfc:3986", std::string(full_url)});
  return std::nullopt;
}

std::optional<RowFault> ReadMedicationLine(const json& resource, const FhirFaults& fault, FhirItem& item) {
  FhirMedicationRecord& out = item.medication;
  if (auto bad = ReadId(resource, fault, out.id)) return bad;
  if (out.id.empty()) return fault("bad_id", "/id", "is missing (a Medication is read to be referenced by its id)");
  MedicationText text = ReadMedicationResource(resource);
  if (text.product.empty()) return fault("missing_product", "/code", "has no text, display or code, and no ingredient is named");
  out.product = std::move(text.product);
  out.code = std::move(text.code);
  out.code_system = std::move(text.code_system);
  return std::nullopt;
}

}  // namespace medload
