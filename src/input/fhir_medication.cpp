// The product text and code of a FHIR R4 medication. Element names follow HL7 FHIR R4
// Medication (code, form, ingredient[].item[x], ingredient[].isActive,
// ingredient[].strength) and CodeableConcept (text, coding[].system/code/display).
#include "input/fhir_medication.h"

#include <array>
#include <charconv>
#include <cmath>
#include <string_view>

#include "medload/input/fhir_reader.h"

namespace medload {
namespace {

using nlohmann::json;

const json* Member(const json& parent, const char* key) {
  if (!parent.is_object()) return nullptr;
  const auto found = parent.find(key);
  return found == parent.end() ? nullptr : &*found;
}

std::string StringAt(const json& parent, const char* key) {
  const json* value = Member(parent, key);
  return value != nullptr && value->is_string() ? value->get<std::string>() : std::string();
}

const json* ArrayAt(const json& parent, const char* key) {
  const json* value = Member(parent, key);
  return value != nullptr && value->is_array() ? value : nullptr;
}

bool IsKnownSystemName(std::string_view name) {
  return name == "RxNorm" || name == "SNOMED CT" || name == "dm+d" || name == "ATC";
}

// True for a SNOMED CT identifier of the UK drug extension (namespace 1000001,
// partition 10: a concept), the extension dm+d codes are issued from. SNOMED CT
// identifiers: namespace (7 digits), partition (2 digits), check digit, at the end
// (SNOMED CT Technical Implementation Guide, from memory).
bool IsUkDrugExtensionId(std::string_view code) {
  if (code.size() < 11 || code.size() > 18) return false;
  for (char c : code) {
    if (c < '0' || c > '9') return false;
  }
  const size_t n = code.size();
  return code.substr(n - 3, 2) == "10" && code.substr(n - 10, 7) == "1000001";
}

// A number as short as it reads back exactly ("500", "3.35", "0.5").
std::string NumberText(double value) {
  std::array<char, 32> buffer{};
  const auto [end, error] = std::to_chars(buffer.data(), buffer.data() + buffer.size(), value);
  return error == std::errc() ? std::string(buffer.data(), end) : std::string();
}

// A strength unit as the resolver's strength reader spells it.
std::string StrengthUnit(const json& quantity) {
  std::string unit = StringAt(quantity, "unit");
  if (unit.empty()) unit = StringAt(quantity, "code");
  if (unit == "ug" || unit == "mcg") return "microgram";
  if (unit == "mL") return "ml";
  if (unit == "[iU]" || unit == "[IU]" || unit == "IU" || unit == "U") return "units";
  return unit;
}

// True when a denominator of one of this unit means "per dose unit" (per tablet, per
// capsule, UCUM unity "1" or a curly-brace annotation such as {tbl}).
bool IsPerDoseUnit(std::string_view unit) {
  return unit.empty() || unit == "1" || (unit.size() > 2 && unit.front() == '{') ||
         unit == "tablet" || unit == "tablets" || unit == "capsule" || unit == "capsules" ||
         unit == "TAB" || unit == "CAP" || unit == "patch" || unit == "suppository" ||
         unit == "each" || unit == "dose" || unit == "actuation";
}

// "5mg", "250mg/5ml", "5mg/ml" from a Ratio; "" when it has no usable numerator.
std::string StrengthText(const json& ratio) {
  const json* numerator = Member(ratio, "numerator");
  const json* value = numerator != nullptr ? Member(*numerator, "value") : nullptr;
  if (value == nullptr || !value->is_number() || !std::isfinite(value->get<double>())) return "";
  std::string text = NumberText(value->get<double>()) + StrengthUnit(*numerator);
  const json* denominator = Member(ratio, "denominator");
  if (denominator == nullptr) return text;
  const std::string per = StrengthUnit(*denominator);
  const json* amount = Member(*denominator, "value");
  const double count = amount != nullptr && amount->is_number() ? amount->get<double>() : 1;
  if (count == 1 && IsPerDoseUnit(per)) return text;
  return text + "/" + (count == 1 ? std::string() : NumberText(count)) + per;
}

// The text of a concept: its text, else the first display.
std::string ConceptText(const json& concept_json) {
  std::string text = StringAt(concept_json, "text");
  if (const json* codings = ArrayAt(concept_json, "coding"); codings != nullptr && text.empty()) {
    for (const json& coding : *codings) {
      text = StringAt(coding, "display");
      if (!text.empty()) break;
    }
  }
  return text;
}

// "oxybutynin hydrochloride 5mg + ..." for the active ingredients; "" when none reads.
std::string IngredientsText(const json& medication) {
  const json* ingredients = ArrayAt(medication, "ingredient");
  if (ingredients == nullptr) return "";
  std::string text;
  for (const json& ingredient : *ingredients) {
    const json* active = Member(ingredient, "isActive");
    if (active != nullptr && active->is_boolean() && !active->get<bool>()) continue;
    std::string name;
    if (const json* item = Member(ingredient, "itemCodeableConcept")) name = ConceptText(*item);
    if (const json* item = Member(ingredient, "itemReference"); name.empty() && item != nullptr) {
      name = StringAt(*item, "display");
    }
    if (name.empty()) continue;
    if (const json* strength = Member(ingredient, "strength")) {
      const std::string amount = StrengthText(*strength);
      if (!amount.empty()) name += " " + amount;
    }
    if (!text.empty()) text += " + ";
    text += name;
  }
  return text;
}

}  // namespace

std::string FormularyCodeSystem(std::string_view system_uri, std::string_view code) {
  std::string_view uri = system_uri;
  while (!uri.empty() && uri.back() == '/') uri.remove_suffix(1);
  if (uri == "http://www.nlm.nih.gov/research/umls/rxnorm") return "RxNorm";
  if (uri == "https://dmd.nhs.uk" || uri == "http://dmd.nhs.uk") return "dm+d";
  if (uri == "http://snomed.info/sct") return IsUkDrugExtensionId(code) ? "dm+d" : "SNOMED CT";
  if (uri == "http://www.whocc.no/atc") return "ATC";
  return std::string(system_uri);
}

MedicationText ReadCodeableConcept(const json& concept_json) {
  MedicationText out;
  std::string chosen_display;
  std::string any_display;
  bool chosen_known = false;
  if (const json* codings = ArrayAt(concept_json, "coding")) {
    for (const json& coding : *codings) {
      const std::string display = StringAt(coding, "display");
      if (any_display.empty()) any_display = display;
      const std::string code = StringAt(coding, "code");
      if (code.empty() || chosen_known) continue;
      const std::string system = FormularyCodeSystem(StringAt(coding, "system"), code);
      const bool known = IsKnownSystemName(system);
      if (!out.code.empty() && !known) continue;
      out.code = code;
      out.code_system = system;
      chosen_display = display;
      chosen_known = known;
    }
  }
  out.product = StringAt(concept_json, "text");
  if (out.product.empty()) out.product = chosen_display;
  if (out.product.empty()) out.product = any_display;
  out.named = !out.product.empty();
  if (out.product.empty() && !out.code.empty()) {
    out.product = (out.code_system.empty() ? std::string("code") : out.code_system) + " " + out.code;
  }
  return out;
}

MedicationText ReadMedicationResource(const json& medication) {
  MedicationText out;
  if (const json* code = Member(medication, "code")) out = ReadCodeableConcept(*code);
  const std::string ingredients = IngredientsText(medication);
  if (ingredients.empty()) return out;
  std::string form;
  if (const json* form_json = Member(medication, "form")) form = ConceptText(*form_json);
  std::string listed = ingredients + (form.empty() ? "" : " " + form);
  // A name made up from the code alone ("RxNorm 123") says less than the ingredients.
  out.product = out.named ? out.product + " (" + listed + ")" : listed;
  out.named = true;
  return out;
}

}  // namespace medload
