#include "input/fhir_medication.h"

#include <doctest/doctest.h>

#include "medload/input/fhir_reader.h"

namespace medload {

TEST_SUITE("input/fhir_medication") {

TEST_CASE("FHIR system URIs map onto the formulary's code system names") {
  // Sources: HL7 FHIR R4 terminologies-systems.html (RxNorm, SNOMED CT, ATC URIs); NHS
  // Digital dm+d FHIR usage (https://dmd.nhs.uk, and dm+d concepts as SNOMED CT codes of
  // the UK drug extension, namespace 1000001), from memory.
  struct Case {
    const char* system;
    const char* code;
    const char* name;
  };
  const Case cases[] = {
      {"http://www.nlm.nih.gov/research/umls/rxnorm", "6809", "RxNorm"},
      {"http://snomed.info/sct", "322236009", "SNOMED CT"},
      {"http://snomed.info/sct", "39990011000001107", "dm+d"},  // namespace 1000001, partition 10
      {"http://snomed.info/sct", "39990011000001127", "SNOMED CT"},  // partition 12: not a concept
      {"http://snomed.info/sct", "39990011000002107", "SNOMED CT"},  // another namespace
      {"http://snomed.info/sct", "1000001103", "SNOMED CT"},        // too short for a namespace
      {"https://dmd.nhs.uk", "39990021000001102", "dm+d"},
      {"https://dmd.nhs.uk/", "39990021000001102", "dm+d"},
      {"http://www.whocc.no/atc", "N06AB06", "ATC"},
      {"https://ehr.example.org/local", "LF-88", "https://ehr.example.org/local"},
      {"", "X1", ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.system);
    CAPTURE(c.code);
    CHECK(FormularyCodeSystem(c.system, c.code) == c.name);
  }
}

TEST_CASE("the code comes from the first coding of a known system, the product from text or display") {
  // Source: HL7 FHIR R4 CodeableConcept (text, coding[]: system, code, display).
  using nlohmann::json;
  const json both = json::parse(
      R"({"coding":[{"system":"https://ehr.example.org/local","code":"LF-88","display":"Local item 88"},)"
      R"({"system":"http://www.nlm.nih.gov/research/umls/rxnorm","code":"6809","display":"metformin"}]})");
  MedicationText read = ReadCodeableConcept(both);
  CHECK(read.code == "6809");
  CHECK(read.code_system == "RxNorm");
  CHECK(read.product == "metformin");  // the chosen coding's display
  const json local = json::parse(R"({"text":"Metformin 500mg tablets","coding":[{"system":"urn:x","code":"9"}]})");
  read = ReadCodeableConcept(local);
  CHECK(read.code == "9");
  CHECK(read.code_system == "urn:x");
  CHECK(read.product == "Metformin 500mg tablets");
  const json bare = json::parse(R"({"coding":[{"system":"http://www.whocc.no/atc","code":"N06AB06"}]})");
  read = ReadCodeableConcept(bare);
  CHECK(read.product == "ATC N06AB06");  // never empty while a code is there
  CHECK_FALSE(read.named);
  CHECK(ReadCodeableConcept(json::parse(R"({"coding":[]})")).product.empty());
  CHECK(ReadCodeableConcept(json::parse(R"({"text":7})")).product.empty());
}

TEST_CASE("a Medication's ingredients and strengths are written as the resolver reads them") {
  // Source: HL7 FHIR R4 Medication.ingredient.strength (Ratio numerator/denominator).
  using nlohmann::json;
  struct Case {
    const char* medication;
    const char* product;
  };
  const Case cases[] = {
      {R"({"code":{"text":"Oxyvance"},"form":{"text":"tablet"},"ingredient":[{"itemCodeableConcept":)"
       R"({"text":"oxybutynin hydrochloride"},"strength":{"numerator":{"value":5,"unit":"mg"},)"
       R"("denominator":{"value":1,"unit":"tablet"}}}]})",
       "Oxyvance (oxybutynin hydrochloride 5mg tablet)"},
      {R"({"ingredient":[{"itemCodeableConcept":{"text":"lactulose"},"strength":{"numerator":)"
       R"({"value":3.35,"unit":"g"},"denominator":{"value":5,"unit":"mL"}}}],"form":{"text":"oral solution"}})",
       "lactulose 3.35g/5ml oral solution"},
      {R"({"ingredient":[{"itemCodeableConcept":{"text":"levothyroxine"},"strength":{"numerator":)"
       R"({"value":75,"code":"ug"},"denominator":{"value":1,"code":"{tbl}"}}}]})",
       "levothyroxine 75microgram"},
      {R"({"ingredient":[{"itemCodeableConcept":{"text":"morphine"},"strength":{"numerator":)"
       R"({"value":10,"unit":"mg"},"denominator":{"value":1,"unit":"mL"}}}]})",
       "morphine 10mg/ml"},
      {R"({"code":{"coding":[{"system":"http://www.nlm.nih.gov/research/umls/rxnorm","code":"6809"}]},)"
       R"("ingredient":[{"itemReference":{"display":"metformin"}}]})",
       "metformin"},
      {R"({"code":{"text":"Blend"},"ingredient":[{"itemCodeableConcept":{"text":"starch"},"isActive":false}]})",
       "Blend"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.medication);
    CHECK(ReadMedicationResource(json::parse(c.medication)).product == c.product);
  }
}

}  // TEST_SUITE

}  // namespace medload
