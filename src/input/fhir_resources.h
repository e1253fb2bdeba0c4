// The element-by-element reading of one parsed FHIR R4 resource (MedicationDispense,
// Patient, Medication) into a FhirItem, or the fault of its first bad element. Private to
// the FHIR reader, which handles lines, JSON parsing and resource types.
#pragma once

#include <nlohmann/json.hpp>

#include <optional>
#include <string>
#include <string_view>

#include "medload/input/fhir_reader.h"

namespace medload {

// Builds the rejection of one element, named by its JSON pointer.
struct FhirFaults {
  std::string_view file;
  size_t line;
  RowFault operator()(std::string reason, std::string_view pointer, std::string_view fault) const;
};

// Each fills the kind's members of `item` (not kind, line or text) and returns nullopt,
// or returns the fault (see docs/input-formats.md for the rules and the messages).
std::optional<RowFault> ReadDispenseResource(const nlohmann::json& resource, const FhirFaults& fault,
                                             FhirItem& item);
// `full_url` is the Bundle entry's fullUrl when the line was an entry, else empty.
std::optional<RowFault> ReadPatientResource(const nlohmann::json& resource, const FhirFaults& fault,
                                            std::string_view full_url, FhirItem& item);
std::optional<RowFault> ReadMedicationLine(const nlohmann::json& resource, const FhirFaults& fault,
                                           FhirItem& item);

}  // namespace medload
