#include "medload/synth/record_writer.h"

#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "medload/synth/catalogue.h"

namespace medload {

namespace {

SynthNetwork TestNetwork() {
  SynthNetwork network;
  network.name = "Test Vale Care Network";
  network.practices.push_back({"WV001", "Wrenfold Road Surgery", 100});
  return network;
}

SynthPatient TestPatient() {
  SynthPatient patient;
  patient.patient_id = "Q1234567";
  patient.birth_date = Date::FromCivil(1941, 3, 9);
  patient.sex = "female";
  patient.registered_from = Date::FromCivil(1999, 5, 1);
  return patient;
}

SynthDispensing Line(std::string_view key, int text) {
  SynthDispensing line;
  line.dispensed_on = Date::FromCivil(2026, 2, 3);
  line.product = *FindCatalogueProduct(key);
  line.quantity = SynthCatalogue()[line.product].quantity;
  line.dosage_text = text;
  return line;
}

}  // namespace

TEST_SUITE("synth/record_writer") {

TEST_CASE("csv fields are quoted only when they hold a comma, quote or line break") {
  // Source: RFC 4180, section 2 (rules 5-7).
  struct Case {
    const char* field;
    const char* written;
  };
  const Case cases[] = {
      {"plain", "plain"},
      {"", ""},
      {"a,b", "\"a,b\""},
      {"say \"when\"", "\"say \"\"when\"\"\""},
      {"two\nlines", "\"two\nlines\""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.field);
    std::string out;
    AppendCsvField(out, c.field);
    CHECK(out == c.written);
  }
}

TEST_CASE("json strings escape quotes, backslashes and control characters") {
  // Source: RFC 8259, section 7.
  std::string out;
  AppendJsonString(out, "a\"b\\c\n\x01");
  CHECK(out == "\"a\\\"b\\\\c\\u000a\\u0001\"");
}

TEST_CASE("quantities are written in their shortest exact form") {
  std::string out;
  AppendNumber(out, 28);
  out += ' ';
  AppendNumber(out, 2.5);
  out += ' ';
  AppendNumber(out, 0.1);
  CHECK(out == "28 2.5 0.1");
}

TEST_CASE("a dispensing csv row has the spec's columns in header order") {
  const SynthNetwork network = TestNetwork();
  SynthDispensing line = Line("paracetamol-prn", 3);
  line.days_supply = 13;
  std::string out;
  AppendDispensingCsv(out, "SYN-1-9", TestPatient(), network, line);
  CHECK(out ==
        "SYN-1-9,Q1234567,WV001,2026-02-03,Paracetamol 500mg tablets,,,100,tablet,13,"
        "\"one or two tablets every four to six hours when required, maximum eight in 24 "
        "hours\"\n");
  line.days_supply.reset();
  line.dosage_text = -1;
  out.clear();
  AppendDispensingCsv(out, "SYN-1-10", TestPatient(), network, line);
  CHECK(out == "SYN-1-10,Q1234567,WV001,2026-02-03,Paracetamol 500mg tablets,,,100,tablet,,\n");
}

TEST_CASE("patient rows give a year alone when only the year is known") {
  const SynthNetwork network = TestNetwork();
  SynthPatient patient = TestPatient();
  std::string out;
  AppendPatientCsv(out, patient, network);
  CHECK(out == "Q1234567,1941-03-09,female,WV001,1999-05-01,\n");
  patient.birth_year_only = true;
  patient.registered_to = Date::FromCivil(2026, 4, 30);
  out.clear();
  AppendPatientCsv(out, patient, network);
  CHECK(out == "Q1234567,1941,female,WV001,1999-05-01,2026-04-30\n");
}

TEST_CASE("practice and review rows follow their headers") {
  std::string out;
  AppendPracticeCsv(out, TestNetwork().practices[0], "Test Vale Care Network", 812);
  AppendReviewCsv(out, "Q1234567", Date::FromCivil(2026, 7, 1));
  CHECK(out == "WV001,Wrenfold Road Surgery,Test Vale Care Network,812\nQ1234567,2026-07-01\n");
}

TEST_CASE("a MedicationDispense line carries the FHIR R4 required and used elements") {
  SynthDispensing line = Line("paracetamol-prn", 0);
  line.days_supply = 13;
  line.structured_dosage = true;
  std::string out;
  AppendDispensingFhir(out, "SYN-1-9", "completed", TestPatient(), line);
  REQUIRE(out.back() == '\n');
  REQUIRE(out.find('\n') == out.size() - 1);  // NDJSON: one resource per line
  const nlohmann::json resource = nlohmann::json::parse(out);
  // Source: HL7 FHIR R4 MedicationDispense: status 1..1 (medicationdispense-status),
  // medication[x] 1..1, subject Reference(Patient), quantity SimpleQuantity, daysSupply
  // SimpleQuantity, whenHandedOver dateTime, dosageInstruction Dosage.
  CHECK(resource.at("resourceType") == "MedicationDispense");
  CHECK(resource.at("id") == "SYN-1-9");
  CHECK(resource.at("status") == "completed");
  CHECK(resource.at("medicationCodeableConcept").at("text") == "Paracetamol 500mg tablets");
  CHECK(resource.at("subject").at("reference") == "Patient/Q1234567");
  CHECK(resource.at("quantity").at("value") == 100);
  CHECK(resource.at("daysSupply").at("value") == 13);
  CHECK(resource.at("daysSupply").at("code") == "d");
  CHECK(resource.at("whenHandedOver") == "2026-02-03");
  const nlohmann::json& dosage = resource.at("dosageInstruction").at(0);
  CHECK(dosage.at("text") == "1-2 tablets up to four times a day when required");
  // Source: HL7 FHIR R4 Dosage (asNeededBoolean, timing.repeat frequency/period/
  // periodUnit, doseAndRate.doseRange) and Timing.repeat.
  CHECK(dosage.at("asNeededBoolean") == true);
  CHECK(dosage.at("timing").at("repeat").at("frequency") == 4);
  CHECK(dosage.at("timing").at("repeat").at("period") == 1);
  CHECK(dosage.at("timing").at("repeat").at("periodUnit") == "d");
  CHECK(dosage.at("doseAndRate").at(0).at("doseRange").at("high").at("value") == 2);
}

TEST_CASE("a MedicationDispense without days supply or dosage leaves those elements out") {
  SynthDispensing line = Line("amlodipine-5", -1);
  std::string out;
  AppendDispensingFhir(out, "SYN-2-1", "entered-in-error", TestPatient(), line);
  const nlohmann::json resource = nlohmann::json::parse(out);
  CHECK(resource.at("status") == "entered-in-error");
  CHECK_FALSE(resource.contains("daysSupply"));
  CHECK_FALSE(resource.contains("dosageInstruction"));
  line = Line("amlodipine-5", 0);
  line.structured_dosage = true;
  out.clear();
  AppendDispensingFhir(out, "SYN-2-2", "completed", TestPatient(), line);
  const nlohmann::json single = nlohmann::json::parse(out);
  const nlohmann::json& dose = single.at("dosageInstruction").at(0).at("doseAndRate").at(0);
  CHECK(dose.at("doseQuantity").at("value") == 1);
  CHECK(dose.at("doseQuantity").at("unit") == "tablet");
}

TEST_CASE("a Patient line carries id, gender, birth date and the practice code") {
  // Source: HL7 FHIR R4 Patient: gender (administrative-gender), birthDate (date: YYYY,
  // YYYY-MM or YYYY-MM-DD), generalPractitioner Reference with identifier.
  SynthPatient patient = TestPatient();
  patient.birth_year_only = true;
  std::string out;
  AppendPatientFhir(out, patient, TestNetwork());
  const nlohmann::json resource = nlohmann::json::parse(out);
  CHECK(resource.at("resourceType") == "Patient");
  CHECK(resource.at("id") == "Q1234567");
  CHECK(resource.at("gender") == "female");
  CHECK(resource.at("birthDate") == "1941");
  CHECK(resource.at("generalPractitioner").at(0).at("identifier").at("value") == "WV001");
}

TEST_CASE("an output file writes everything appended once closed") {
  const std::filesystem::path folder =
      std::filesystem::temp_directory_path() / "medload_synth_writer_test";
  std::filesystem::create_directories(folder);
  const std::string path = (folder / "out.csv").string();
  Result<SynthOutputFile> file = SynthOutputFile::Create(path);
  REQUIRE(file.ok());
  std::string expected;
  for (int i = 0; i < 200000; ++i) {
    const std::string row = "row " + std::to_string(i) + "\n";
    file->text() += row;
    expected += row;
    REQUIRE(file->Spill().ok());
  }
  REQUIRE(file->Close().ok());
  std::ifstream in(path, std::ios::binary);
  std::stringstream read;
  read << in.rdbuf();
  CHECK(read.str() == expected);
  std::filesystem::remove_all(folder);
}

TEST_CASE("an output file in a missing folder fails naming the path") {
  const std::string path = "/nonexistent-medload-folder/out.csv";
  Result<SynthOutputFile> file = SynthOutputFile::Create(path);
  REQUIRE_FALSE(file.ok());
  CHECK(file.status().code() == StatusCode::kInput);
  CHECK(file.status().message() ==
        "/nonexistent-medload-folder/out.csv: cannot create: No such file or directory");
}

}  // TEST_SUITE

}  // namespace medload
