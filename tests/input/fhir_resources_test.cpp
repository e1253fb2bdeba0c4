// The element rules of the FHIR reader (src/input/fhir_resources.cpp), one resource a line.
#include <doctest/doctest.h>

#include <sstream>
#include <string>

#include "medload/input/fhir_reader.h"

namespace medload {
namespace {

FhirItem ReadOne(const std::string& line) {
  std::istringstream in(line + "\n");
  FhirReader reader(in, "d.ndjson");
  FhirItem item;
  REQUIRE(reader.Next(item));
  item.text = {};
  return item;
}

// A valid MedicationDispense (HL7 FHIR R4) with `extra` elements spliced in before the end
// and `drop` removed.
std::string Dispense(const std::string& extra = "", const std::string& drop = "") {
  std::string line =
      R"({"resourceType":"MedicationDispense","id":"md-1","status":"completed",)"
      R"("subject":{"reference":"Patient/P1"},"medicationCodeableConcept":{"text":"Amlodipine 5mg tablets"},)"
      R"("quantity":{"value":28,"unit":"tablet"},"whenHandedOver":"2024-03-01")";
  if (!drop.empty()) line.erase(line.find(drop), drop.size());
  return line + extra + "}";
}

}  // namespace

TEST_SUITE("input/fhir_resources") {

TEST_CASE("a MedicationDispense without a status is rejected with a reason of its own") {
  // Source: HL7 FHIR R4 MedicationDispense.status, cardinality 1..1.
  const FhirItem item = ReadOne(Dispense("", R"("status":"completed",)"));
  REQUIRE(item.kind == FhirItemKind::kRejected);
  CHECK(item.fault.reason == "missing_status");
  CHECK(item.fault.message ==
        "d.ndjson:1: /status: is missing (required in FHIR R4; \"completed\" for an item handed over)");
}

TEST_CASE("a resource id that is a JSON number or breaks the id pattern is rejected, not dropped") {
  // Source: HL7 FHIR R4 Resource.id (type id: a string, [A-Za-z0-9\-\.]{1,64}); JSON
  // representation: ids are strings.
  struct Case {
    std::string line;
    std::string message;
  };
  const Case cases[] = {
      {R"({"resourceType":"MedicationDispense","id":123,"status":"completed"})",
       "d.ndjson:1: /id: \"123\" is not a FHIR id (a JSON string of 1 to 64 of A-Z a-z 0-9 - .)"},
      {R"({"resourceType":"Patient","id":42})",
       "d.ndjson:1: /id: \"42\" is not a FHIR id (a JSON string of 1 to 64 of A-Z a-z 0-9 - .)"},
      {R"({"resourceType":"Patient","id":"a/b"})",
       "d.ndjson:1: /id: \"a/b\" is not a FHIR id (a JSON string of 1 to 64 of A-Z a-z 0-9 - .)"},
      {R"({"resourceType":"Medication","code":{"text":"X"}})",
       "d.ndjson:1: /id: is missing (a Medication is read to be referenced by its id)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.line);
    const FhirItem item = ReadOne(c.line);
    REQUIRE(item.kind == FhirItemKind::kRejected);
    CHECK(item.fault.reason == "bad_id");
    CHECK(item.fault.message == c.message);
  }
}

TEST_CASE("a subject or medication reference of a shape R4 does not allow is rejected with the reason") {
  // Source: HL7 FHIR R4 references.html (literal references); a path such as
  // Patient/../../X/_history/1 must never give a patient "..".
  struct Case {
    std::string subject;
    std::string reason;
    std::string message;
  };
  const Case cases[] = {
      {R"({"reference":"Patient/../../X/_history/1"})", "bad_reference",
       "d.ndjson:1: /subject/reference: \"Patient/../../X/_history/1\" is not a reference of the form Type/id "
       "(optionally /_history/version), relative or after an http(s) base URL"},
      {R"({"reference":"P1"})", "bad_reference",
       "d.ndjson:1: /subject/reference: \"P1\" is not a reference of the form Type/id (optionally "
       "/_history/version), relative or after an http(s) base URL"},
      {R"({"reference":"#p"})", "bad_reference",
       "d.ndjson:1: /subject/reference: \"#p\" is a local reference to a contained resource"},
      {R"({"reference":"urn:uuid:123"})", "bad_reference",
       "d.ndjson:1: /subject/reference: \"urn:uuid:123\" is a urn, not a literal reference"},
      {R"({"reference":7})", "bad_reference", "d.ndjson:1: /subject/reference: \"7\" is not a string"},
      {R"({"identifier":{"system":"https://fhir.nhs.uk/Id/nhs-number"}})", "missing_patient",
       "d.ndjson:1: /subject/identifier/value: is missing"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.subject);
    std::string line = Dispense();
    const std::string subject = R"({"reference":"Patient/P1"})";
    line.replace(line.find(subject), subject.size(), c.subject);
    const FhirItem item = ReadOne(line);
    REQUIRE(item.kind == FhirItemKind::kRejected);
    CHECK(item.fault.reason == c.reason);
    CHECK(item.fault.message == c.message);
  }
  std::string medication = Dispense("", R"("medicationCodeableConcept":{"text":"Amlodipine 5mg tablets"},)");
  medication.insert(medication.size() - 1, R"(,"medicationReference":{"reference":"Medication/../x"})");
  const FhirItem bad = ReadOne(medication);
  REQUIRE(bad.kind == FhirItemKind::kRejected);
  CHECK(bad.fault.message ==
        "d.ndjson:1: /medicationReference/reference: \"Medication/../x\" is not a reference of the form "
        "Type/id (optionally /_history/version), relative or after an http(s) base URL");
}

TEST_CASE("daysSupply is read in UCUM days, weeks, months of 30 days, years and hours rounded up") {
  // Source: HL7 FHIR R4 MedicationDispense.daysSupply (SimpleQuantity); UCUM codes d, wk,
  // mo, a, h. A month of 30 days is medload's convention (docs/input-formats.md).
  struct Case {
    std::string days_supply;
    int days;
  };
  const Case cases[] = {
      {R"({"value":28})", 28},
      {R"({"value":28,"unit":"days"})", 28},
      {R"({"value":28,"system":"http://unitsofmeasure.org","code":"d"})", 28},
      {R"({"value":4,"system":"http://unitsofmeasure.org","code":"wk","unit":"week"})", 28},
      {R"({"value":1.5,"unit":"wk"})", 11},
      {R"({"value":3,"system":"http://unitsofmeasure.org","code":"mo"})", 90},
      {R"({"value":1,"unit":"a"})", 365},
      {R"({"value":36,"system":"http://unitsofmeasure.org","code":"h"})", 2},
      {R"({"value":1,"unit":"h"})", 1},
      {R"({"value":48,"unit":"hours"})", 2},
      {R"({"value":30,"unit":"Day"})", 30},
  };
  for (const Case& c : cases) {
    CAPTURE(c.days_supply);
    const FhirItem item = ReadOne(Dispense(R"(,"daysSupply":)" + c.days_supply));
    REQUIRE(item.kind == FhirItemKind::kDispense);
    CHECK(item.dispense.days_supply == c.days);
  }
  const FhirItem bad = ReadOne(Dispense(R"(,"daysSupply":{"value":2,"unit":"kg"})"));
  REQUIRE(bad.kind == FhirItemKind::kRejected);
  CHECK(bad.fault.message == "d.ndjson:1: /daysSupply/unit: \"kg\" is not a unit of time (d, wk, mo, a or h)");
  const FhirItem fraction = ReadOne(Dispense(R"(,"daysSupply":{"value":2.5,"code":"d"})"));
  REQUIRE(fraction.kind == FhirItemKind::kRejected);
  CHECK(fraction.fault.message == "d.ndjson:1: /daysSupply/value: \"2.5\" is not a whole number of days");
}

TEST_CASE("the dispensed quantity keeps its unit, counts in UCUM unity and converts litres to ml") {
  // Source: HL7 FHIR R4 MedicationDispense.quantity (SimpleQuantity); UCUM "1" (unity),
  // "L", annotations such as {tbl}.
  struct Case {
    std::string quantity;
    double value;
    std::string unit;
  };
  const Case cases[] = {
      {R"({"value":28,"unit":"tablet"})", 28, "tablet"},
      {R"({"value":28,"system":"http://unitsofmeasure.org","code":"{tbl}"})", 28, "{tbl}"},
      {R"({"value":28,"system":"http://unitsofmeasure.org","code":"1"})", 28, ""},
      {R"({"value":0.3,"unit":"L","system":"http://unitsofmeasure.org","code":"L"})", 300, "ml"},
      {R"({"value":150,"unit":"mL"})", 150, "mL"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.quantity);
    std::string line = Dispense();
    const std::string quantity = R"({"value":28,"unit":"tablet"})";
    line.replace(line.find(quantity), quantity.size(), c.quantity);
    const FhirItem item = ReadOne(line);
    REQUIRE(item.kind == FhirItemKind::kDispense);
    CHECK(item.dispense.quantity == doctest::Approx(c.value));
    CHECK(item.dispense.unit == c.unit);
  }
}

TEST_CASE("a timing without a dose is kept as administrations a day") {
  // Source: HL7 FHIR R4 Dosage.timing (Timing.code BID from the TimingAbbreviation value
  // set), Dosage.doseAndRate absent.
  const FhirItem item = ReadOne(Dispense(
      R"(,"dosageInstruction":[{"timing":{"code":{"coding":[{"system":)"
      R"("http://terminology.hl7.org/CodeSystem/v3-GTSAbbreviation","code":"BID"}]}}}])"));
  REQUIRE(item.kind == FhirItemKind::kDispense);
  REQUIRE(item.dispense.structured_units_per_day.has_value());
  CHECK(*item.dispense.structured_units_per_day == doctest::Approx(2));
  CHECK(item.dispense.structured_unit == "administration");
}

TEST_CASE("a Patient keeps its identifiers, and an entry's fullUrl as a URI identifier") {
  // Source: HL7 FHIR R4 Patient.identifier; Bundle.entry.fullUrl; Identifier.system
  // urn:ietf:rfc:3986 for a URI.
  const FhirItem item = ReadOne(
      R"({"fullUrl":"urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d","resource":{"resourceType":"Patient",)"
      R"("id":"pt-1","identifier":[{"system":"https://fhir.nhs.uk/Id/nhs-number","value":"9990000018"},)"
      R"({"system":"https://ehr.example.org/mrn"},{"value":"L-7"}]}})");
  REQUIRE(item.kind == FhirItemKind::kPatient);
  CHECK(item.patient.patient_id == "pt-1");
  REQUIRE(item.identifiers.size() == 3);
  CHECK(item.identifiers[0].system == "https://fhir.nhs.uk/Id/nhs-number");
  CHECK(item.identifiers[0].value == "9990000018");
  CHECK(item.identifiers[1].system.empty());
  CHECK(item.identifiers[1].value == "L-7");
  CHECK(item.identifiers[2].system == "urn:ietf:rfc:3986");
  CHECK(item.identifiers[2].value == "urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d");
}

TEST_CASE("a Medication line is read for the dispenses that reference it") {
  // Source: HL7 FHIR R4 Medication: code, form, ingredient[].itemCodeableConcept, strength.
  const FhirItem item = ReadOne(
      R"({"resourceType":"Medication","id":"med-1","code":{"text":"Oxyvance"},"form":{"text":"tablet"},)"
      R"("ingredient":[{"itemCodeableConcept":{"text":"oxybutynin hydrochloride"},)"
      R"("strength":{"numerator":{"value":5,"unit":"mg"},"denominator":{"value":1,"unit":"tablet"}}}]})");
  REQUIRE(item.kind == FhirItemKind::kMedication);
  CHECK(item.medication.id == "med-1");
  CHECK(item.medication.product == "Oxyvance (oxybutynin hydrochloride 5mg tablet)");
  CHECK(item.medication.code.empty());
}

TEST_CASE("a contained Medication with ingredients and no code gives a product text, not a rejection") {
  // Source: HL7 FHIR R4 MedicationDispense.contained and Medication.ingredient.
  const FhirItem item = ReadOne(Dispense(
      R"(,"contained":[{"resourceType":"Medication","id":"m1","ingredient":[)"
      R"({"itemCodeableConcept":{"coding":[{"system":"http://snomed.info/sct","code":"1","display":"Codeine phosphate"}]},)"
      R"("strength":{"numerator":{"value":30,"unit":"mg"},"denominator":{"value":1,"unit":"tablet"}}},)"
      R"({"itemCodeableConcept":{"text":"Paracetamol"},"strength":{"numerator":{"value":500,"unit":"mg"}}},)"
      R"({"itemCodeableConcept":{"text":"Maize starch"},"isActive":false}]}],)"
      R"("medicationReference":{"reference":"#m1"})",
      R"("medicationCodeableConcept":{"text":"Amlodipine 5mg tablets"},)"));
  REQUIRE(item.kind == FhirItemKind::kDispense);
  CHECK(item.dispense.product == "Codeine phosphate 30mg + Paracetamol 500mg");
  const FhirItem missing = ReadOne(Dispense(R"(,"medicationReference":{"reference":"#m9"})",
                                            R"("medicationCodeableConcept":{"text":"Amlodipine 5mg tablets"},)"));
  REQUIRE(missing.kind == FhirItemKind::kRejected);
  CHECK(missing.fault.message == "d.ndjson:1: /medicationReference/reference: \"#m9\" names no contained Medication");
}

}  // TEST_SUITE

}  // namespace medload
