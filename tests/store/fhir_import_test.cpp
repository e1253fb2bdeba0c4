// How the importer settles what a FHIR line names outside itself (src/store/fhir_import.cpp):
// subjects by identifier or urn:uuid, Medication resources by id.
#include <doctest/doctest.h>
#include <sqlite3.h>

#include <set>
#include <sstream>

#include "medload/store/importer.h"

namespace medload {
namespace {

Store Memory() {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  return std::move(store.value());
}

Result<ImportSummary> Import(Store& store, const std::string& text, InputKind kind = InputKind::kDispensing) {
  std::istringstream in(text);
  ImportOptions options;
  options.max_reject_rate = 1;
  return ImportStream(store, kind, in, "d.ndjson", options);
}

void CheckAddsUp(const ImportSummary& summary) {
  CHECK(summary.read == summary.imported + summary.duplicates + summary.rejected);
  long by_reason = 0;
  for (const auto& [reason, count] : summary.reasons) by_reason += count;
  CHECK(by_reason == summary.rejected);
}

// A completed MedicationDispense (HL7 FHIR R4) of `id` with the given subject and medication.
std::string Dispense(const std::string& id, const std::string& subject,
                     const std::string& medication = R"("medicationCodeableConcept":{"text":"Amlodipine 5mg tablets"})") {
  return R"({"resourceType":"MedicationDispense","id":")" + id + R"(","status":"completed","subject":)" + subject +
         "," + medication + R"(,"quantity":{"value":28,"unit":"tablet"},"whenHandedOver":"2024-03-01"})" + "\n";
}

std::string Nhs(const std::string& value) {
  return R"({"identifier":{"system":"https://fhir.nhs.uk/Id/nhs-number","value":")" + value + R"("}})";
}

std::string PatientLine(const std::string& id, const std::string& identifiers = "") {
  return R"({"resourceType":"Patient","id":")" + id + "\"" +
         (identifiers.empty() ? "" : R"(,"identifier":)" + identifiers) + "}\n";
}

// Patient ids of the stored dispensings, by record id.
std::map<std::string, std::string> Filed(const Store& store) {
  std::map<std::string, std::string> filed;
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), "SELECT record_id, patient_id FROM dispensings", -1, &stmt,
                             nullptr) == SQLITE_OK);
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    filed[reinterpret_cast<const char*>(sqlite3_column_text(stmt, 0))] =
        reinterpret_cast<const char*>(sqlite3_column_text(stmt, 1));
  }
  sqlite3_finalize(stmt);
  return filed;
}

}  // namespace

TEST_SUITE("store/fhir_import") {

TEST_CASE("a subject given by identifier is the Patient declaring it, before or after it in the file") {
  // Source: HL7 FHIR R4 references.html, Reference.identifier (logical reference) matched
  // against Patient.identifier (system and value).
  Store store = Memory();
  const std::string nhs = R"([{"system":"https://fhir.nhs.uk/Id/nhs-number","value":"9990000018"}])";
  Result<ImportSummary> summary =
      Import(store, PatientLine("pt-a", nhs) + Dispense("d1", Nhs("9990000018")) + Dispense("d2", Nhs("9990000026")) +
                        PatientLine("pt-b", R"([{"system":"https://fhir.nhs.uk/Id/nhs-number","value":"9990000026"}])"));
  REQUIRE(summary.ok());
  CheckAddsUp(*summary);
  CHECK(summary->imported == 4);
  CHECK(Filed(store) == std::map<std::string, std::string>{{"d1", "pt-a"}, {"d2", "pt-b"}});
  // A later file finds the identifiers stored by this one.
  Result<ImportSummary> later = Import(store, Dispense("d3", Nhs("9990000018")));
  REQUIRE(later.ok());
  CHECK(later->imported == 1);
  CHECK(Filed(store).at("d3") == "pt-a");
}

TEST_CASE("an identifier nobody declares is rejected, never filed under its value") {
  // Source: HL7 FHIR R4 references.html: an identifier is not a resource id.
  Store store = Memory();
  Result<ImportSummary> summary = Import(store, Dispense("d1", Nhs("9434765919")));
  REQUIRE(summary.ok());
  CHECK(summary->rejected == 1);
  CHECK(summary->reasons == std::map<std::string, long>{{"unknown_subject", 1}});
  CHECK(summary->examples.front() ==
        "d.ndjson:1: /subject/identifier: system \"https://fhir.nhs.uk/Id/nhs-number\" value \"9434765919\" names "
        "no Patient loaded (in this file or before) and no patient_id of the registry");
  CHECK(Filed(store).empty());
  CHECK_FALSE(store.PatientOf("9434765919")->has_value());
}

TEST_CASE("an identifier value that is the registry's own patient id names that patient") {
  // The registry's patient_id may be the identifier a practice uses (an NHS number): the
  // rule written in docs/input-formats.md.
  Store store = Memory();
  std::istringstream registry("patient_id,birth_date\n9990000042,1940\n");
  REQUIRE(ImportStream(store, InputKind::kPatients, registry, "p.csv", ImportOptions()).ok());
  Result<ImportSummary> summary = Import(store, Dispense("d1", Nhs("9990000042")));
  REQUIRE(summary.ok());
  CHECK(summary->imported == 1);
  CHECK(Filed(store).at("d1") == "9990000042");
  CHECK(summary->not_in_registry == 0);
}

TEST_CASE("an identifier two Patients declare is rejected as ambiguous") {
  Store store = Memory();
  const std::string shared = R"([{"system":"https://ehr.example.org/mrn","value":"M-1"}])";
  Result<ImportSummary> summary =
      Import(store, PatientLine("pt-a", shared) + PatientLine("pt-b", shared) +
                        Dispense("d1", R"({"identifier":{"system":"https://ehr.example.org/mrn","value":"M-1"}})"));
  REQUIRE(summary.ok());
  CHECK(summary->reasons == std::map<std::string, long>{{"ambiguous_subject", 1}});
  CHECK(summary->examples.front() ==
        "d.ndjson:3: /subject/identifier: system \"https://ehr.example.org/mrn\" value \"M-1\" is an identifier of "
        "more than one Patient (\"pt-a\" and \"pt-b\")");
}

TEST_CASE("a urn:uuid subject is a Patient's fullUrl, URI identifier or id, else rejected") {
  // Source: HL7 FHIR R4 references.html (urn:uuid references resolve to Bundle.entry.fullUrl);
  // Identifier.system urn:ietf:rfc:3986.
  Store store = Memory();
  const std::string by_url = "urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d";
  const std::string by_identifier = "urn:uuid:c0ffee00-1234-4abc-8def-0123456789ab";
  const std::string by_id = "3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11";
  const std::string unknown = "urn:uuid:00000000-1111-4222-8333-444444444444";
  Result<ImportSummary> summary = Import(
      store, Dispense("d1", R"({"reference":")" + by_url + "\"}") +
                 Dispense("d2", R"({"reference":")" + by_identifier + "\"}") +
                 Dispense("d3", R"({"reference":"urn:uuid:)" + by_id + "\"}") +
                 Dispense("d4", R"({"reference":")" + unknown + "\"}") +
                 R"({"fullUrl":")" + by_url + R"(","resource":{"resourceType":"Patient","id":"pt-d"}})" "\n" +
                 PatientLine("pt-e", R"([{"system":"urn:ietf:rfc:3986","value":")" + by_identifier + "\"}]") +
                 PatientLine(by_id));
  REQUIRE(summary.ok());
  CheckAddsUp(*summary);
  CHECK(Filed(store) == std::map<std::string, std::string>{{"d1", "pt-d"}, {"d2", "pt-e"}, {"d3", by_id}});
  CHECK(summary->examples.front() ==
        "d.ndjson:4: /subject/reference: \"" + unknown +
            "\" names no Patient loaded (in this file or before) and no patient_id of the registry");
}

TEST_CASE("a medicationReference is the Medication resource of that id, read before or after") {
  // Source: HL7 FHIR R4 MedicationDispense.medication[x] Reference(Medication).
  Store store = Memory();
  const std::string medication =
      R"({"resourceType":"Medication","id":"med-1","code":{"text":"Oxyvance"},"ingredient":[{"itemCodeableConcept":)"
      R"({"text":"oxybutynin"},"strength":{"numerator":{"value":5,"unit":"mg"}}}]})" "\n";
  Result<ImportSummary> summary = Import(
      store, Dispense("d1", R"({"reference":"Patient/P1"})", R"("medicationReference":{"reference":"Medication/med-1"})") +
                 medication +
                 Dispense("d2", R"({"reference":"Patient/P1"})",
                          R"("medicationReference":{"reference":"Medication/med-9","display":"Sertraline 50mg tablets"})") +
                 Dispense("d3", R"({"reference":"Patient/P1"})", R"("medicationReference":{"reference":"Medication/med-8"})"));
  REQUIRE(summary.ok());
  CheckAddsUp(*summary);
  CHECK(summary->medications == 1);
  CHECK(summary->reasons == std::map<std::string, long>{{"unknown_medication", 1}});
  CHECK(summary->examples.front() ==
        "d.ndjson:4: /medicationReference/reference: \"Medication/med-8\" names no Medication loaded (in this file "
        "or before), and there is no display");
  const std::vector<DispensingRecord> records = store.AllDispensingsOf("P1").value();
  REQUIRE(records.size() == 2);
  std::set<std::string> products;
  for (const DispensingRecord& record : records) products.insert(record.product);
  CHECK(products == std::set<std::string>{"Oxyvance (oxybutynin 5mg)", "Sertraline 50mg tablets"});
  // Importing the file again finds everything stored.
  Result<ImportSummary> again = Import(store, medication);
  REQUIRE(again.ok());
  CHECK(again->duplicates == 1);
}

TEST_CASE("dispensings of patients with no registry row are counted and named in the summary") {
  Store store = Memory();
  Result<ImportSummary> fhir =
      Import(store, Dispense("d1", R"({"reference":"Patient/pt-x"})") + Dispense("d2", R"({"reference":"Patient/pt-x"})") +
                        Dispense("d3", R"({"reference":"Patient/pt-y"})") + Dispense("d4", R"({"reference":"Patient/pt-z"})") +
                        PatientLine("pt-y"));
  REQUIRE(fhir.ok());
  CHECK(fhir->not_in_registry == 3);  // pt-y comes later in the file: registered
  CHECK(fhir->not_in_registry_patients == 2);
  CHECK(fhir->not_in_registry_examples ==
        std::vector<std::string>{"d.ndjson:1: patient \"pt-x\"", "d.ndjson:4: patient \"pt-z\""});
  std::istringstream csv("patient_id,dispensed_on,product,quantity\nP1,2024-01-02,X,1\nP2,2024-01-02,X,1\n");
  Result<ImportSummary> rows = ImportStream(store, InputKind::kDispensing, csv, "d.csv", ImportOptions());
  REQUIRE(rows.ok());
  CHECK(rows->not_in_registry == 2);
  CHECK(rows->not_in_registry_examples ==
        std::vector<std::string>{"d.csv:2: patient \"P1\"", "d.csv:3: patient \"P2\""});
  // Nothing new imported, nothing to warn about.
  std::istringstream same("patient_id,dispensed_on,product,quantity\nP1,2024-01-02,X,1\n");
  CHECK(ImportStream(store, InputKind::kDispensing, same, "d.csv", ImportOptions())->not_in_registry == 0);
}

TEST_CASE("Medication lines are refused in a patients import, and Patient identifiers are stored there too") {
  Store store = Memory();
  Result<ImportSummary> patients = Import(
      store, PatientLine("pt-a", R"([{"system":"s","value":"v"}])") + R"({"resourceType":"Medication","id":"m"})" "\n",
      InputKind::kPatients);
  REQUIRE(patients.ok());
  CHECK(patients->imported == 1);
  CHECK(patients->rejected == 1);
  Result<ImportSummary> dispense = Import(store, Dispense("d1", R"({"identifier":{"system":"s","value":"v"}})"));
  REQUIRE(dispense.ok());
  CHECK(Filed(store).at("d1") == "pt-a");
  // The same Patient with a new identifier is an update.
  Result<ImportSummary> more = Import(store, PatientLine("pt-a", R"([{"system":"s","value":"v"},{"value":"w"}])"),
                                      InputKind::kPatients);
  REQUIRE(more.ok());
  CHECK(more->updated == 1);
}

}  // TEST_SUITE

}  // namespace medload
