#include "medload/input/fhir_reader.h"

#include <doctest/doctest.h>

#include <sstream>

namespace medload {
namespace {

std::vector<FhirItem> ReadAll(const std::string& ndjson) {
  std::istringstream in(ndjson);
  FhirReader reader(in, "dispensing.ndjson");
  std::vector<FhirItem> items;
  FhirItem item;
  while (reader.Next(item)) {
    items.push_back(item);
    items.back().text = {};  // the view dies with the next line
  }
  return items;
}

FhirItem ReadOne(const std::string& line) {
  std::vector<FhirItem> items = ReadAll(line + "\n");
  REQUIRE(items.size() == 1);
  return items.front();
}

// A MedicationDispense with the elements medload reads, one line. Element names from
// HL7 FHIR R4, MedicationDispense resource (https://hl7.org/fhir/R4/medicationdispense.html).
const char* const kDispense =
    R"({"resourceType":"MedicationDispense","id":"md-1","status":"completed",)"
    R"("subject":{"reference":"Patient/P001"},)"
    R"("medicationCodeableConcept":{"text":"Lactulose 3.35g/5ml oral solution",)"
    R"("coding":[{"system":"http://snomed.info/sct","code":"322230006","display":"Lactulose"}]},)"
    R"("quantity":{"value":450,"unit":"mL"},"daysSupply":{"value":30},)"
    R"("whenPrepared":"2024-02-28","whenHandedOver":"2024-03-01T10:15:00+00:00",)"
    R"("dosageInstruction":[{"text":"5ml three times a day",)"
    R"("timing":{"repeat":{"frequency":3,"period":1,"periodUnit":"d"}},)"
    R"("doseAndRate":[{"doseQuantity":{"value":5,"unit":"mL"}}]}]})";

}  // namespace

TEST_SUITE("input/fhir_reader") {

TEST_CASE("a MedicationDispense is read element by element") {
  // Source: HL7 FHIR R4 MedicationDispense: subject, medication[x], quantity, daysSupply,
  // whenHandedOver, dosageInstruction, status.
  const FhirItem item = ReadOne(kDispense);
  REQUIRE(item.kind == FhirItemKind::kDispense);
  const DispensingRecord& r = item.dispense;
  CHECK(r.record_id == "md-1");
  CHECK(r.patient_id == "P001");
  CHECK(r.product == "Lactulose 3.35g/5ml oral solution");
  CHECK(r.code == "322230006");
  CHECK(r.code_system == "SNOMED CT");  // the formulary's name for http://snomed.info/sct
  CHECK(r.quantity == 450);
  CHECK(r.unit == "mL");
  CHECK(r.days_supply == 30);
  CHECK(r.dispensed_on.ToIso() == "2024-03-01");  // whenHandedOver, its time of day ignored
  CHECK(r.dosage == "5ml three times a day");
  CHECK(r.status == "completed");
  // Source: HL7 FHIR R4 Dosage and Timing.repeat; the QI-Core style worked example
  // 5 mL three times a day = 15 mL a day (450 mL lasts 30 days).
  REQUIRE(r.structured_units_per_day.has_value());
  CHECK(*r.structured_units_per_day == doctest::Approx(15));
  CHECK(r.structured_unit == "ml");
  CHECK_FALSE(r.structured_as_needed);
}

TEST_CASE("whenPrepared is the date when whenHandedOver is absent") {
  std::string line = kDispense;
  const std::string handed = R"("whenHandedOver":"2024-03-01T10:15:00+00:00",)";
  line.erase(line.find(handed), handed.size());
  const FhirItem item = ReadOne(line);
  REQUIRE(item.kind == FhirItemKind::kDispense);
  CHECK(item.dispense.dispensed_on.ToIso() == "2024-02-28");
}

TEST_CASE("every status of the value set is kept, and only completed counts") {
  // Source: HL7 FHIR R4 MedicationDispense.status, value set medicationdispense-status
  // (http://hl7.org/fhir/R4/valueset-medicationdispense-status.html).
  const std::vector<std::string_view>& statuses = MedicationDispenseStatuses();
  CHECK(statuses.size() == 9);
  for (std::string_view status : statuses) {
    CAPTURE(status);
    std::string line = kDispense;
    line.replace(line.find("\"completed\""), 11, "\"" + std::string(status) + "\"");
    const FhirItem item = ReadOne(line);
    REQUIRE(item.kind == FhirItemKind::kDispense);
    CHECK(item.dispense.status == status);
    CHECK(StatusCounts(status) == (status == "completed"));
  }
  CHECK(StatusCounts(""));
}

TEST_CASE("a status outside the value set is rejected") {
  std::string line = kDispense;
  line.replace(line.find("\"completed\""), 11, "\"done\"");
  const FhirItem item = ReadOne(line);
  REQUIRE(item.kind == FhirItemKind::kRejected);
  CHECK(item.fault.reason == "bad_status");
  CHECK(item.fault.message ==
        "dispensing.ndjson:1: /status: \"done\" is not a MedicationDispense status (FHIR value set "
        "medicationdispense-status)");
}

TEST_CASE("a medicationReference gives the product by display or from a contained Medication") {
  // Source: HL7 FHIR R4 MedicationDispense.medication[x] (Reference(Medication)), and
  // references.html: "#id" names a contained resource.
  const FhirItem display = ReadOne(
      R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Patient/P1"},)"
      R"("medicationReference":{"reference":"Medication/m1","display":"Sertraline 50mg tablets"},)"
      R"("quantity":{"value":28},"whenHandedOver":"2024-01-02"})");
  REQUIRE(display.kind == FhirItemKind::kDispense);
  CHECK(display.dispense.product == "Sertraline 50mg tablets");
  CHECK(display.medication_reference == "m1");  // the importer looks the resource up
  const FhirItem contained = ReadOne(
      R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Patient/P1"},)"
      R"("contained":[{"resourceType":"Medication","id":"med","code":{"text":"Amlodipine 5mg tablets"}}],)"
      R"("medicationReference":{"reference":"#med"},"quantity":{"value":28},"whenHandedOver":"2024-01-02"})");
  REQUIRE(contained.kind == FhirItemKind::kDispense);
  CHECK(contained.dispense.product == "Amlodipine 5mg tablets");
}

TEST_CASE("a subject is a literal Patient reference, an identifier or a urn:uuid, never an id made up") {
  // Source: HL7 FHIR R4 MedicationDispense.subject; references.html: literal references
  // (relative, absolute, with _history), Reference.identifier (a logical reference) and
  // urn:uuid references. Only a literal reference gives the patient id here; the others
  // are left for the importer to resolve.
  struct Case {
    const char* subject;
    SubjectForm form;
    const char* id;
    const char* system;
    const char* value;
  };
  const Case cases[] = {
      {R"({"reference":"Patient/123"})", SubjectForm::kLiteral, "123", "", ""},
      {R"({"reference":"https://example.org/fhir/Patient/123"})", SubjectForm::kLiteral, "123", "", ""},
      {R"({"reference":"Patient/123/_history/4"})", SubjectForm::kLiteral, "123", "", ""},
      {R"({"reference":"Patient/123","identifier":{"value":"9990000018"}})", SubjectForm::kLiteral, "123", "", ""},
      {R"({"identifier":{"system":"https://fhir.nhs.uk/Id/nhs-number","value":"9990000018"}})",
       SubjectForm::kIdentifier, "", "https://fhir.nhs.uk/Id/nhs-number", "9990000018"},
      {R"({"identifier":{"value":"NHS-9"}})", SubjectForm::kIdentifier, "", "", "NHS-9"},
      {R"({"reference":"urn:uuid:c0ffee00-1234-4abc-8def-0123456789ab"})", SubjectForm::kUrn, "", "",
       "urn:uuid:c0ffee00-1234-4abc-8def-0123456789ab"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.subject);
    const FhirItem item = ReadOne(std::string(R"({"resourceType":"MedicationDispense","status":"completed","subject":)") +
                                  c.subject +
                                  R"(,"medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},)"
                                  R"("whenHandedOver":"2024-01-02"})");
    REQUIRE(item.kind == FhirItemKind::kDispense);
    CHECK(item.subject.form == c.form);
    CHECK(item.dispense.patient_id == c.id);
    CHECK(item.subject.system == c.system);
    CHECK(item.subject.value == c.value);
  }
}

TEST_CASE("bad elements are rejected with their JSON pointer") {
  const std::string base =
      R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Patient/P1"},)";
  struct Case {
    std::string line;
    const char* reason;
    const char* message;
  };
  const Case cases[] = {
      {base + R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":"abc"},"whenHandedOver":"2024-01-02"})",
       "bad_quantity", "dispensing.ndjson:1: /quantity/value: \"abc\" is not a number"},
      {base + R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":0},"whenHandedOver":"2024-01-02"})",
       "bad_quantity", "dispensing.ndjson:1: /quantity/value: \"0\" is not above zero"},
      {base + R"("medicationCodeableConcept":{"text":"X"},"whenHandedOver":"2024-01-02"})",
       "missing_quantity", "dispensing.ndjson:1: /quantity/value: is missing"},
      {base + R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"daysSupply":{"value":2.5},"whenHandedOver":"2024-01-02"})",
       "bad_days_supply", "dispensing.ndjson:1: /daysSupply/value: \"2.5\" is not a whole number of days"},
      {base + R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-02-30"})",
       "bad_date", "dispensing.ndjson:1: /whenHandedOver: \"2024-02-30\" is not a real date (expected YYYY-MM-DD...)"},
      {base + R"("medicationCodeableConcept":{"text":"X"},"quantity":{"value":1}})",
       "missing_date", "dispensing.ndjson:1: /whenHandedOver: is missing (and so is whenPrepared)"},
      {base + R"("medicationCodeableConcept":{"coding":[]},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})",
       "missing_product",
       "dispensing.ndjson:1: /medicationCodeableConcept: has no text, display, code or ingredient (nor has "
       "medicationReference)"},
      {R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Group/7"},"medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})",
       "missing_patient", "dispensing.ndjson:1: /subject/reference: \"Group/7\" is not a Patient reference"},
      {R"({"resourceType":"MedicationDispense","status":"completed","medicationCodeableConcept":{"text":"X"},"quantity":{"value":1},"whenHandedOver":"2024-01-02"})",
       "missing_patient", "dispensing.ndjson:1: /subject/reference: is missing"},
      {R"({"resourceType":"Observation","id":"o1"})", "unsupported_resource",
       "dispensing.ndjson:1: /resourceType: \"Observation\" is not MedicationDispense, Patient or Medication"},
      {R"({"id":"o1"})", "unsupported_resource",
       "dispensing.ndjson:1: /resourceType: is missing (expected MedicationDispense, Patient or Medication)"},
      {R"({"resourceType": "Patient", )", "bad_json", "dispensing.ndjson:1: row: is not valid JSON (at byte 29)"},
      {R"([1,2])", "bad_json", "dispensing.ndjson:1: row: is not a JSON object (one FHIR resource per line)"},
      {"{\"resourceType\":\"Patient\",\"id\":\"a\xFF\"}", "invalid_utf8",
       "dispensing.ndjson:1: row: is not valid UTF-8 (save the file as UTF-8)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.line);
    const FhirItem item = ReadOne(c.line);
    REQUIRE(item.kind == FhirItemKind::kRejected);
    CHECK(item.fault.reason == c.reason);
    CHECK(item.fault.message == c.message);
  }
}

TEST_CASE("a Patient gives id, birth date (year, year-month or date), gender and practice") {
  // Source: HL7 FHIR R4 Patient: birthDate is a FHIR date (YYYY, YYYY-MM or YYYY-MM-DD);
  // gender uses value set administrative-gender; generalPractitioner references an
  // Organization or Practitioner.
  const FhirItem year = ReadOne(
      R"({"resourceType":"Patient","id":"P1","birthDate":"1941","gender":"female",)"
      R"("generalPractitioner":[{"identifier":{"value":"A81001"}}]})");
  REQUIRE(year.kind == FhirItemKind::kPatient);
  CHECK(year.patient.patient_id == "P1");
  CHECK(year.patient.birth_date->ToIso() == "1941-07-01");  // docs/input-formats.md
  CHECK(year.patient.birth_year_only);
  CHECK(year.patient.sex == "female");
  CHECK(year.patient.practice == "A81001");
  const FhirItem month = ReadOne(
      R"({"resourceType":"Patient","id":"P2","birthDate":"1941-11","gender":"male",)"
      R"("generalPractitioner":[{"reference":"Organization/B82002"}]})");
  REQUIRE(month.kind == FhirItemKind::kPatient);
  CHECK(month.patient.birth_date->ToIso() == "1941-11-15");
  CHECK(month.patient.practice == "B82002");
  // A Practitioner is not a practice.
  const FhirItem practitioner = ReadOne(
      R"({"resourceType":"Patient","id":"P4","generalPractitioner":[{"reference":"Practitioner/GP7"}]})");
  REQUIRE(practitioner.kind == FhirItemKind::kPatient);
  CHECK(practitioner.patient.practice.empty());
  const FhirItem bad = ReadOne(R"({"resourceType":"Patient","id":"P3","gender":"f2"})");
  REQUIRE(bad.kind == FhirItemKind::kRejected);
  CHECK(bad.fault.message ==
        "dispensing.ndjson:1: /gender: \"f2\" is not one of female, male, other, unknown (or F, M, O, U)");
}

TEST_CASE("line numbers count blank lines, CRLF ends are accepted and a BOM is dropped") {
  const std::string input = std::string("\xEF\xBB\xBF") + kDispense + "\r\n\r\n   \n" + kDispense + "\n";
  std::istringstream in(input);
  FhirReader reader(in, "d.ndjson");
  FhirItem item;
  REQUIRE(reader.Next(item));
  CHECK(item.kind == FhirItemKind::kDispense);
  CHECK(item.line == 1);
  REQUIRE(reader.Next(item));
  CHECK(item.kind == FhirItemKind::kDispense);
  CHECK(item.line == 4);
  CHECK_FALSE(reader.Next(item));
  CHECK(reader.blank_lines() == 2);
}

TEST_CASE("an over-long line is rejected without holding it all") {
  const std::string input = "{\"x\":\"" + std::string(5000, 'a') + "\"}\n" + kDispense + "\n";
  std::istringstream in(input);
  FhirReader reader(in, "d.ndjson", 1024);
  FhirItem item;
  REQUIRE(reader.Next(item));
  CHECK(item.kind == FhirItemKind::kRejected);
  CHECK(item.fault.reason == "too_long");
  CHECK(item.text.size() == 1024);
  REQUIRE(reader.Next(item));
  CHECK(item.kind == FhirItemKind::kDispense);
  CHECK(item.line == 2);
}

TEST_CASE("a structured dose in mg is kept in mg, for the supply calculation to divide by the strength") {
  // Source: HL7 FHIR R4 Dosage.doseAndRate.doseQuantity (a SimpleQuantity, any unit).
  std::string line = kDispense;
  line.replace(line.find(R"("value":5,"unit":"mL")"), 21, R"("value":10,"unit":"mg")");
  const FhirItem item = ReadOne(line);
  REQUIRE(item.kind == FhirItemKind::kDispense);
  REQUIRE(item.dispense.structured_units_per_day.has_value());
  CHECK(*item.dispense.structured_units_per_day == doctest::Approx(30));  // 10 mg three times a day
  CHECK(item.dispense.structured_unit == "mg");
}

TEST_CASE("an as-needed structured instruction is marked as needed") {
  // Source: HL7 FHIR R4 Dosage.asNeeded[x] (asNeededBoolean).
  const FhirItem item = ReadOne(
      R"({"resourceType":"MedicationDispense","status":"completed","subject":{"reference":"Patient/P1"},)"
      R"("medicationCodeableConcept":{"text":"Paracetamol 500mg tablets"},"quantity":{"value":100,"unit":"tablet"},)"
      R"("whenHandedOver":"2024-01-02","dosageInstruction":[{"text":"1-2 when required","asNeededBoolean":true,)"
      R"("timing":{"repeat":{"frequency":4,"period":1,"periodUnit":"d"}},)"
      R"("doseAndRate":[{"doseRange":{"low":{"value":1},"high":{"value":2,"unit":"tablet"}}}]}]})");
  REQUIRE(item.kind == FhirItemKind::kDispense);
  CHECK(item.dispense.structured_as_needed);
  REQUIRE(item.dispense.structured_units_per_day.has_value());
  CHECK(*item.dispense.structured_units_per_day == doctest::Approx(8));  // high value x 4 a day
}

TEST_CASE("a line nesting arrays or objects more than 64 levels deep is rejected unparsed") {
  // Found by fuzzing: copying or printing a deeply nested value recursed once per level
  // until the stack overflowed.
  const std::string deep = std::string(200000, '[') + std::string(200000, ']');
  const FhirItem item = ReadOne(R"({"resourceType":"MedicationDispense","status":)" + deep + "}");
  CHECK(item.kind == FhirItemKind::kRejected);
  CHECK(item.fault.reason == "bad_json");
  CHECK(item.fault.message ==
        "dispensing.ndjson:1: row: nests arrays and objects more than 64 levels deep");
  // 64 levels are read; brackets inside strings do not count.
  const std::string levels = std::string(63, '[') + std::string(63, ']');
  const FhirItem shallow = ReadOne(R"({"resourceType":"Patient","id":"P1","gender":"f","y":"[{[{\"[","x":)" +
                                   levels + "}");
  CHECK(shallow.kind == FhirItemKind::kPatient);
  CHECK(shallow.patient.sex == "female");
}

}  // TEST_SUITE

}  // namespace medload
