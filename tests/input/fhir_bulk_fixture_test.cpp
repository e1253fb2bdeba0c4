// The FHIR R4 bulk-data fixture (tests/data/fhir, written by make_fixture.py from the R4
// specification) read end to end: imported into a store, resolved with the bundled
// formulary and turned into supplies, then compared field by field with a pharmacist's
// reading of each line (tests/data/fhir/expected.csv). The share read as expected is the
// figure in docs/input-formats.md.
#include <doctest/doctest.h>
#include <sqlite3.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <iostream>
#include <map>
#include <set>
#include <sstream>

#include "medload/burden/timeline.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"
#include "medload/input/csv_reader.h"
#include "medload/input/fhir_reader.h"
#include "medload/store/importer.h"

namespace medload {
namespace {

const std::string kFolder = std::string(MEDLOAD_TEST_DATA) + "/fhir/";

struct Expected {
  size_t line = 0;
  std::string id, outcome, reason, patient, counts, ingredients, supply_days, units_per_day, section;
};

std::vector<Expected> ReadExpected() {
  std::ifstream in(kFolder + "expected.csv");
  REQUIRE(in);
  CsvReader reader(in);
  CsvRow row;
  REQUIRE(reader.Next(row));  // header
  std::vector<Expected> rows;
  while (reader.Next(row)) {
    REQUIRE(row.fields.size() == 10);
    Expected e;
    e.line = static_cast<size_t>(std::stoul(std::string(row.fields[0])));
    std::string* fields[] = {&e.id, &e.outcome, &e.reason, &e.patient, &e.counts,
                             &e.ingredients, &e.supply_days, &e.units_per_day, &e.section};
    for (size_t i = 0; i < 9; ++i) fields[i]->assign(row.fields[i + 1]);
    rows.push_back(std::move(e));
  }
  return rows;
}

// The bundled formulary with the fixture's invented SNOMED CT and dm+d codes added (they
// name no real concept, so they are not in formulary/codes.csv).
Formulary FixtureFormulary() {
  Result<Formulary> bundled = LoadFormulary(MEDLOAD_SOURCE_FORMULARY);
  REQUIRE(bundled.ok());
  FormularyTables tables = bundled->tables();
  tables.codes.push_back({"SNOMED CT", "19990001", "lisinopril", "test row: invented code", 0});
  tables.codes.push_back({"dm+d", "39990011000001107", "quetiapine", "test row: invented code", 0});
  tables.codes.push_back({"dm+d", "39990021000001102", "donepezil", "test row: invented code", 0});
  return Formulary::FromTables(std::move(tables));
}

Store Loaded(ImportSummary& summary) {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  ImportOptions options;
  options.max_reject_rate = 1;  // the fixture holds malformed lines on purpose
  REQUIRE(ImportFile(*store, InputKind::kPatients, kFolder + "registry.csv", options).ok());
  Result<ImportSummary> read = ImportFile(*store, InputKind::kDispensing, kFolder + "dispensing_r4.ndjson", options);
  REQUIRE(read.ok());
  summary = *read;
  return std::move(store.value());
}

// The patient ids the stored dispensings are filed under.
std::set<std::string> FiledPatients(const Store& store) {
  std::set<std::string> filed;
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), "SELECT DISTINCT patient_id FROM dispensings", -1, &stmt, nullptr) ==
          SQLITE_OK);
  while (sqlite3_step(stmt) == SQLITE_ROW) filed.insert(reinterpret_cast<const char*>(sqlite3_column_text(stmt, 0)));
  sqlite3_finalize(stmt);
  return filed;
}

// How medload read one dispensing, in the fields of expected.csv.
struct Reading {
  std::string patient, counts, ingredients, supply_days;
  std::optional<double> units_per_day;
};

std::map<std::string, Reading> ReadDispensings(const Store& store, const Formulary& formulary) {
  std::map<std::string, Reading> readings;
  ResolutionCache cache(formulary);
  const ResolveFn resolve = [&](const DispensingRecord& r) -> const ResolvedProduct& {
    return cache.Resolve(r.product, r.code, r.code_system);
  };
  for (const std::string& patient : FiledPatients(store)) {
    const std::vector<DispensingRecord> records = store.AllDispensingsOf(patient).value();
    const Timeline timeline = BuildTimeline(records, resolve, MeasureOptions());
    for (const DispensingRecord& r : records) {
      readings[r.record_id] = {r.patient_id, StatusCounts(r.status) ? "yes" : "no", "", "", std::nullopt};
    }
    for (const Medicine& medicine : timeline.medicines) {
      for (const DispensingUse& use : medicine.uses) {
        Reading& reading = readings[records[use.record].record_id];
        std::vector<std::string> names = medicine.ingredients;
        std::sort(names.begin(), names.end());
        for (const std::string& name : names) reading.ingredients += (reading.ingredients.empty() ? "" : "|") + name;
        reading.supply_days = std::to_string(use.supply.days);
        reading.units_per_day = use.supply.units_per_day;
      }
    }
  }
  return readings;
}

// The fields of one dispensing that differ from the expected reading, or "".
std::string Differences(const Expected& e, const Reading& r) {
  std::string differ;
  const auto note = [&](const char* field, const std::string& want, const std::string& got) {
    differ += std::string(field) + " expected \"" + want + "\" read \"" + got + "\"; ";
  };
  if (r.patient != e.patient) note("patient", e.patient, r.patient);
  if (r.counts != e.counts) note("counts", e.counts, r.counts);
  if (e.counts != "yes") return differ;
  if (r.ingredients != e.ingredients) note("ingredients", e.ingredients, r.ingredients);
  if (r.supply_days != e.supply_days) note("supply_days", e.supply_days, r.supply_days);
  const std::string per_day = r.units_per_day ? std::to_string(*r.units_per_day) : "";
  const bool per_day_same = e.units_per_day.empty()
                                ? !r.units_per_day
                                : r.units_per_day && std::abs(*r.units_per_day - std::stod(e.units_per_day)) < 0.001;
  if (!per_day_same) note("units_per_day", e.units_per_day, per_day);
  return differ;
}

std::map<size_t, std::string> RejectedLines(const Store& store) {
  std::map<size_t, std::string> rejected;
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), "SELECT line, reason FROM rejected_rows", -1, &stmt, nullptr) ==
          SQLITE_OK);
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    rejected[static_cast<size_t>(sqlite3_column_int64(stmt, 0))] =
        reinterpret_cast<const char*>(sqlite3_column_text(stmt, 1));
  }
  sqlite3_finalize(stmt);
  return rejected;
}

}  // namespace

TEST_SUITE("input/fhir_bulk_fixture") {

TEST_CASE("every line of the R4 fixture is imported, a duplicate or rejected with its own reason") {
  ImportSummary summary;
  const Store store = Loaded(summary);
  const std::vector<Expected> expected = ReadExpected();
  CHECK(summary.read == static_cast<long>(expected.size()));
  CHECK(summary.read == summary.imported + summary.duplicates + summary.rejected);
  const std::map<size_t, std::string> rejected = RejectedLines(store);
  long want_rejected = 0;
  for (const Expected& e : expected) {
    CAPTURE(e.line);
    CAPTURE(e.section);
    if (e.outcome != "rejected") {
      CHECK(rejected.count(e.line) == 0);
      continue;
    }
    ++want_rejected;
    REQUIRE(rejected.count(e.line) == 1);
    CHECK(rejected.at(e.line) == e.reason);
  }
  CHECK(summary.rejected == want_rejected);
  CHECK(summary.patients == 7);
  CHECK(summary.medications == 2);
  // Only pt-harri has no registry row (the fixture's one literal reference to nobody).
  const auto harri = std::find_if(expected.begin(), expected.end(), [](const Expected& e) { return e.patient == "pt-harri"; });
  REQUIRE(harri != expected.end());
  CHECK(summary.not_in_registry == 1);
  CHECK(summary.not_in_registry_examples ==
        std::vector<std::string>{kFolder + "dispensing_r4.ndjson:" + std::to_string(harri->line) + ": patient \"pt-harri\""});
}

TEST_CASE("no dispensing of the R4 fixture is filed under an identifier value or urn taken as a patient id") {
  ImportSummary summary;
  const Store store = Loaded(summary);
  const std::set<std::string> filed = FiledPatients(store);
  // Every identifier value and urn the fixture's subjects use; 9990000042 is also the
  // registry's own id, the one case where the value is the patient.
  for (const char* value : {"9990000018", "9990000026", "9990000034", "9990000050", "M-2204",
                            "urn:uuid:7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d", "7b1e4d2c-5a6f-4b3e-8c9d-0e1f2a3b4c5d",
                            "urn:uuid:c0ffee00-1234-4abc-8def-0123456789ab", "c0ffee00-1234-4abc-8def-0123456789ab",
                            "urn:uuid:00000000-1111-4222-8333-444444444444", "..", "X"}) {
    CAPTURE(value);
    CHECK(filed.count(value) == 0);
  }
  CHECK(filed == std::set<std::string>{"3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11", "9990000042", "pt-anwen", "pt-bryn",
                                       "pt-dafydd", "pt-elin", "pt-ffion", "pt-gwyn", "pt-harri"});
}

TEST_CASE("the R4 fixture's dispensings are read as a pharmacist reads them in at least 95 of 100") {
  // The expected readings (patient, counting, ingredients, days of supply, units a day)
  // are a pharmacist's, written beside each resource in make_fixture.py.
  ImportSummary summary;
  const Store store = Loaded(summary);
  const std::map<std::string, Reading> readings = ReadDispensings(store, FixtureFormulary());
  int dispensings = 0;
  int as_expected = 0;
  for (const Expected& e : ReadExpected()) {
    if (e.outcome != "imported") continue;
    ++dispensings;
    CAPTURE(e.id);
    CAPTURE(e.section);
    const auto found = readings.find(e.id);
    const std::string differ = found == readings.end() ? "not stored" : Differences(e, found->second);
    CHECK_MESSAGE(differ.empty(), differ);
    as_expected += differ.empty() ? 1 : 0;
  }
  CHECK(dispensings == 45);
  const double share = static_cast<double>(as_expected) / dispensings;
  MESSAGE("FHIR R4 fixture: " << as_expected << " of " << dispensings << " dispensings read as expected");
  CHECK(share >= 0.95);
}

}  // TEST_SUITE

}  // namespace medload
