// What a FHIR R4 medication element says about the dispensed product: a CodeableConcept
// (medicationCodeableConcept, Medication.code) or a Medication resource (contained, or
// on a line of its own) with its form and ingredient[] list. Private to the FHIR reader.
// It does not consult the formulary: it picks the coding and writes the text that the
// resolver (formulary/resolver.h) will read.
#pragma once

#include <nlohmann/json.hpp>

#include <string>

namespace medload {

struct MedicationText {
  std::string product;      // readable text; empty only when nothing was readable
  std::string code;         // the chosen coding's code, or empty
  std::string code_system;  // FormularyCodeSystem of its system
  bool named = false;       // the product is a text or display (not "<system> <code>")
};

// A CodeableConcept: the code of the first coding in a system the formulary names
// (RxNorm, SNOMED CT, dm+d, ATC), else of the first coding with a code; the product is
// the concept's text, else the chosen coding's display, else any coding's display, else
// "<system> <code>". Values of the wrong JSON type are ignored.
MedicationText ReadCodeableConcept(const nlohmann::json& concept_json);

// A Medication resource: its code as above; when it lists active ingredients
// (ingredient[].itemCodeableConcept with strength numerator/denominator), the product
// is "<name> (<ingredient> <strength> + ... <form>)", or without the name and brackets
// when the code gives no text, so that the resolver finds the ingredients and strengths
// whatever the brand. An ingredient with isActive false is left out.
MedicationText ReadMedicationResource(const nlohmann::json& medication);

}  // namespace medload
