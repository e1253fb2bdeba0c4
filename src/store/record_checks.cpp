#include "store/record_checks.h"

#include <algorithm>
#include <string>

#include "medload/format/shown_text.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

std::string AsciiLower(std::string_view text) {
  std::string lower(text);
  for (char& c : lower) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  }
  return lower;
}

std::string Number(double value) {
  std::string text = std::to_string(value);
  text.erase(text.find_last_not_of('0') + 1);
  if (!text.empty() && text.back() == '.') text.pop_back();
  return text;
}

std::optional<RowFault> FirstIdentifierFault(
    std::string_view file, size_t line, std::initializer_list<std::pair<std::string_view, std::string_view>> ids) {
  for (const auto& [field, value] : ids) {
    if (auto fault = IdentifierFault(file, line, field, value)) return fault;
  }
  return std::nullopt;
}

}  // namespace

std::optional<RowFault> IdentifierFault(std::string_view file, size_t line, std::string_view field,
                                        std::string_view value) {
  const std::optional<std::string> hidden = HiddenCharacterIn(value);
  if (!hidden) return std::nullopt;
  return RowFault{"bad_identifier",
                  FaultMessage(file, line, field,
                               "holds the character " + *hidden +
                                   "; identifiers must be plain text (it would reorder or break the lines of every "
                                   "output naming it)")};
}

std::optional<RowFault> StrengthFault(std::string_view file, size_t line, std::string_view product,
                                      PlausibleProducts* plausible) {
  // Cheap when there is no digit (a byte test: find_first_of would search the ten digits
  // with memchr once per byte): most descriptions are read once per row here.
  if (std::none_of(product.begin(), product.end(), [](char c) { return c >= '0' && c <= '9'; })) {
    return std::nullopt;
  }
  if (plausible != nullptr && plausible->Contains(product)) return std::nullopt;
  for (const Strength& strength : ParseStrengths(AsciiLower(product))) {
    double limit = kMaxStrengthMg;
    std::string unit = "mg";
    if (strength.unit == StrengthUnit::kUnits) limit = kMaxStrengthUnits, unit = "units";
    if (strength.unit == StrengthUnit::kPercent) limit = kMaxStrengthPercent, unit = "%";
    if (strength.amount <= limit) continue;
    return RowFault{"implausible_strength",
                    FaultMessage(file, line, "product",
                                 QuoteForMessage(product) + ": a strength of " + Number(strength.amount) + " " + unit +
                                     " is above the plausible " + Number(limit) + " " + unit +
                                     "; check the description")};
  }
  if (plausible != nullptr) plausible->Add(product);
  return std::nullopt;
}

std::optional<RowFault> RecordFault(const DispensingRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts* plausible) {
  const bool csv = names == FieldNames::kCsv;
  if (auto fault = FirstIdentifierFault(file, line,
                                        {{csv ? "record_id" : "/id", record.record_id},
                                         {csv ? "patient_id" : "/subject/reference", record.patient_id},
                                         {"practice", record.practice}})) {
    return fault;
  }
  return StrengthFault(file, line, record.product, plausible);
}

std::optional<RowFault> RecordFault(const PatientRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts*) {
  const bool csv = names == FieldNames::kCsv;
  return FirstIdentifierFault(file, line,
                              {{csv ? "patient_id" : "/id", record.patient_id},
                               {csv ? "practice" : "/generalPractitioner/0", record.practice}});
}

std::optional<RowFault> RecordFault(const PracticeRecord& record, std::string_view file, size_t line, FieldNames,
                                    PlausibleProducts*) {
  return IdentifierFault(file, line, "practice", record.practice);
}

std::optional<RowFault> RecordFault(const ReviewRecord& record, std::string_view file, size_t line, FieldNames,
                                    PlausibleProducts*) {
  return IdentifierFault(file, line, "patient_id", record.patient_id);
}

}  // namespace medload
