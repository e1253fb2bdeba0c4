#include <doctest/doctest.h>
#include <sqlite3.h>

#include <algorithm>
#include <sstream>

#include "medload/store/importer.h"
#include "medload/store/store.h"
#include "store/read_patients.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

void Load(Store& store, InputKind kind, const std::string& text) {
  std::istringstream in(text);
  Result<ImportSummary> summary = ImportStream(store, kind, in, "test.csv", ImportOptions());
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

const char* const kDispensing =
    "record_id,patient_id,practice,dispensed_on,product,code,quantity,days_supply\n"
    "d1,P2,A1,2024-03-01,Amlodipine 5mg tablets,,28,28\n"
    "d2,P1,A1,2024-02-01,Sertraline 50mg tablets,,28,28\n"
    "d3,P1,A1,2024-01-01,Sertraline 50mg tablets,,28,28\n"
    "d4,P1,A1,2024-01-01,Amlodipine 5mg tablets,,28,28\n"
    "d5,P4,A2,2024-01-15,,X99,10,\n";

const char* const kPatients =
    "patient_id,birth_date,sex,practice,registered_from,registered_to\n"
    "P1,1940,F,A1,2010-01-01,\n"
    "P3,1950-05-02,M,A2,,2023-12-31\n"
    "P2,1945-01-01,female,A1,,\n";

Store Loaded() {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  Load(*store, InputKind::kDispensing, kDispensing);
  Load(*store, InputKind::kPatients, kPatients);
  return std::move(store.value());
}

// Marks a dispense as entered in error, as a later FHIR feed would.
void SetStatus(Store& store, const char* record_id, const char* status) {
  const std::string sql = std::string("UPDATE dispensings SET status = '") + status +
                          "' WHERE record_id = '" + record_id + "'";
  REQUIRE(sqlite3_exec(store.handle(), sql.c_str(), nullptr, nullptr, nullptr) == SQLITE_OK);
}

// Every patient of one pass: id, registry presence and every field of each dispensing.
std::vector<std::string> Pass(const Store& store, const PatientIdRange& range = {}) {
  Result<PatientCursor> cursor = store.Patients(range);
  REQUIRE(cursor.ok());
  PatientHistory history;
  std::vector<std::string> seen;
  for (;;) {
    Result<bool> more = cursor->Next(history);
    REQUIRE(more.ok());
    if (!*more) break;
    std::string line = history.patient_id + (history.registry ? " registered:" : ":");
    for (const DispensingRecord& r : history.dispensings) {
      line += " [" + r.record_id + "|" + r.patient_id + "|" + r.practice + "|" +
              r.dispensed_on.ToIso() + "|" + r.product + "|" + r.code + "|" + r.code_system +
              "|" + std::to_string(r.quantity) + "|" + r.unit + "|" +
              (r.days_supply ? std::to_string(*r.days_supply) : "-") + "|" + r.dosage + "|" +
              (r.structured_units_per_day ? std::to_string(*r.structured_units_per_day) : "-") +
              "|" + r.structured_unit + "|" + (r.structured_as_needed ? "prn" : "") + "|" + r.status + "]";
    }
    seen.push_back(line);
  }
  return seen;
}

// The same pass read from the packed copy: packed first, then read inside a snapshot.
std::vector<std::string> PackedPass(const Store& store, const PatientIdRange& range = {}) {
  REQUIRE(store.RefreshPackedHistories().ok());
  REQUIRE(store.PackedHistoriesCurrent().value());
  Result<StoreSnapshot> snapshot = store.BeginSnapshot();
  REQUIRE(snapshot.ok());
  return Pass(store, range);
}

// SQLite's plan for `sql`, one step per line.
std::string QueryPlan(const Store& store, const std::string& sql) {
  sqlite3_stmt* stmt = nullptr;
  const std::string explain = "EXPLAIN QUERY PLAN " + sql;
  REQUIRE(sqlite3_prepare_v2(store.handle(), explain.c_str(), -1, &stmt, nullptr) == SQLITE_OK);
  std::string plan;
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    plan += reinterpret_cast<const char*>(sqlite3_column_text(stmt, 3));
    plan += "\n";
  }
  sqlite3_finalize(stmt);
  return plan;
}

void Exec(Store& store, const std::string& sql) {
  REQUIRE(sqlite3_exec(store.handle(), sql.c_str(), nullptr, nullptr, nullptr) == SQLITE_OK);
}

}  // namespace

TEST_SUITE("store/store_read") {

TEST_CASE("the packed copy gives the same pass as the dispensings, whole and by range") {
  Store store = Loaded();
  Load(store, InputKind::kDispensing,
       "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply,dosage,unit\n"
       "e1,P1,A1,2024-04-01,Morphine 10mg/5ml oral solution,300,,5ml four times a day,ml\n"
       "e2,P5,A2,2024-04-02,Naproxen 250mg tablets,56,,,\n");
  SetStatus(store, "d2", "entered-in-error");  // a dispensing that does not count
  const std::vector<std::string> table = Pass(store);
  REQUIRE(table.size() == 5);
  CHECK(table[0].find("[d2|") == std::string::npos);
  CHECK(PackedPass(store) == table);
  Result<std::vector<PatientIdRange>> ranges = store.PatientRanges(1);
  REQUIRE(ranges.ok());
  REQUIRE(ranges->size() > 2);
  std::vector<std::string> joined;
  for (const PatientIdRange& range : *ranges) {
    const std::vector<std::string> part = PackedPass(store, range);
    CHECK(part == Pass(store, range));
    joined.insert(joined.end(), part.begin(), part.end());
  }
  CHECK(joined == table);
}

TEST_CASE("an import, an update or a delete of a dispensing leaves the packed copy stale until packed again") {
  Store store = Loaded();
  REQUIRE(store.RefreshPackedHistories().ok());
  CHECK(store.PackedHistoriesCurrent().value());
  SUBCASE("import") {
    Load(store, InputKind::kDispensing,
         "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply\n"
         "f1,P3,A2,2024-05-01,Amlodipine 5mg tablets,28,28\n");
  }
  SUBCASE("a status update") { SetStatus(store, "d1", "cancelled"); }
  SUBCASE("a delete") { Exec(store, "DELETE FROM dispensings WHERE record_id = 'd5'"); }
  SUBCASE("a delete of the newest then an insert of the same id") {
    Exec(store, "DELETE FROM dispensings WHERE id = (SELECT MAX(id) FROM dispensings)");
    REQUIRE(store.RefreshPackedHistories().ok());
    Exec(store,
         "INSERT INTO dispensings (dedup_key, patient_id, dispensed_on, product, quantity,"
         " source_line, run_id) VALUES ('x', 'P9', '2024-06-01', 'Sertraline 50mg tablets', 28, 2, 1)");
  }
  CHECK_FALSE(store.PackedHistoriesCurrent().value());
  std::vector<std::string> inside;
  {
    // Stale inside a snapshot: the pass reads the dispensings themselves.
    Result<StoreSnapshot> snapshot = store.BeginSnapshot();
    REQUIRE(snapshot.ok());
    CHECK_FALSE(store.PackedHistoriesCurrent().value());
    inside = Pass(store);
  }
  CHECK(inside == Pass(store));
  CHECK(PackedPass(store) == Pass(store));
}

TEST_CASE("packing does nothing inside a snapshot or while another connection writes") {
  TempFolder folder;
  const std::string path = folder.File("medload.db");
  Result<Store> store = Store::Open(path);
  REQUIRE(store.ok());
  Load(*store, InputKind::kDispensing, kDispensing);
  {
    Result<StoreSnapshot> snapshot = store->BeginSnapshot();
    REQUIRE(snapshot.ok());
    CHECK(store->RefreshPackedHistories().ok());
  }
  CHECK_FALSE(store->PackedHistoriesCurrent().value());
  StoreOptions patient;
  patient.busy_timeout_ms = 3600 * 1000;  // a wait would be noticed: the test would hang
  Result<Store> reader = Store::Open(path, patient);
  REQUIRE(reader.ok());
  Exec(*store, "BEGIN IMMEDIATE");
  CHECK(reader->RefreshPackedHistories().ok());
  Exec(*store, "ROLLBACK");
  CHECK_FALSE(reader->PackedHistoriesCurrent().value());
  CHECK(reader->RefreshPackedHistories().ok());
  CHECK(store->PackedHistoriesCurrent().value());
}

TEST_CASE("a damaged packed history stops the pass with an error naming the patient") {
  Store store = Loaded();
  REQUIRE(store.RefreshPackedHistories().ok());
  Exec(store, "UPDATE packed_histories SET packed = x'0102' WHERE patient_id = 'P2'");
  Result<StoreSnapshot> snapshot = store.BeginSnapshot();
  REQUIRE(snapshot.ok());
  Result<PatientCursor> cursor = store.Patients();
  REQUIRE(cursor.ok());
  PatientHistory history;
  REQUIRE(cursor->Next(history).value());  // P1
  Result<bool> damaged = cursor->Next(history);
  REQUIRE_FALSE(damaged.ok());
  CHECK(damaged.status().message().find("patient \"P2\" is damaged") != std::string::npos);
}

TEST_CASE("the pass over the packed copy reads its key in order without sorting") {
  Store store = Loaded();
  const std::string plan = QueryPlan(store, "SELECT patient_id, packed FROM packed_histories WHERE 1"
                                            " AND patient_id >= ?1 AND patient_id < ?2 ORDER BY patient_id");
  CAPTURE(plan);
  CHECK(plan.find("TEMP B-TREE") == std::string::npos);
}

TEST_CASE("one patient's dispensings come in date order, then import order") {
  Store store = Loaded();
  Result<std::vector<DispensingRecord>> records = store.DispensingsOf("P1");
  REQUIRE(records.ok());
  REQUIRE(records->size() == 3);
  CHECK((*records)[0].record_id == "d3");  // 2024-01-01, imported before d4
  CHECK((*records)[1].record_id == "d4");
  CHECK((*records)[2].record_id == "d2");
  CHECK((*records)[2].dispensed_on.ToIso() == "2024-02-01");
  CHECK((*records)[2].product == "Sertraline 50mg tablets");
  CHECK((*records)[2].quantity == 28);
  CHECK((*records)[2].days_supply == 28);
  CHECK(store.DispensingsOf("nobody")->empty());
}

TEST_CASE("dispenses whose status does not count are kept but not returned for measures") {
  // Source: HL7 FHIR R4 MedicationDispense.status (value set medicationdispense-status):
  // only a completed dispense was handed over.
  Store store = Loaded();
  SetStatus(store, "d4", "entered-in-error");
  SetStatus(store, "d3", "completed");
  Result<std::vector<DispensingRecord>> counting = store.DispensingsOf("P1");
  REQUIRE(counting.ok());
  REQUIRE(counting->size() == 2);
  CHECK((*counting)[0].record_id == "d3");
  CHECK((*counting)[1].record_id == "d2");
  Result<std::vector<DispensingRecord>> all = store.AllDispensingsOf("P1");
  REQUIRE(all.ok());
  CHECK(all->size() == 3);
  Result<StoreSummary> summary = store.Summary();
  REQUIRE(summary.ok());
  CHECK(summary->not_counting_dispensings == 1);
}

TEST_CASE("a patient's registry row reads back with a birth year as 1 July") {
  Store store = Loaded();
  Result<std::optional<PatientRecord>> patient = store.PatientOf("P1");
  REQUIRE(patient.ok());
  REQUIRE(patient->has_value());
  CHECK((*patient)->birth_date->ToIso() == "1940-07-01");  // docs/input-formats.md
  CHECK((*patient)->birth_year_only);
  CHECK((*patient)->sex == "female");
  CHECK((*patient)->registered_from->ToIso() == "2010-01-01");
  CHECK_FALSE((*patient)->registered_to.has_value());
  CHECK_FALSE(store.PatientOf("P4")->has_value());
}

TEST_CASE("every patient is visited once in id order with registry row and dispensings") {
  Store store = Loaded();
  std::vector<std::string> ids;
  std::vector<size_t> counts;
  std::vector<bool> registered;
  for (const PatientHistory& history : testing::ReadPatients(store)) {
    ids.push_back(history.patient_id);
    counts.push_back(history.dispensings.size());
    registered.push_back(history.registry.has_value());
    for (size_t i = 1; i < history.dispensings.size(); ++i) {
      CHECK(history.dispensings[i - 1].dispensed_on <= history.dispensings[i].dispensed_on);
    }
    for (const DispensingRecord& record : history.dispensings) CHECK(record.patient_id == history.patient_id);
  }
  CHECK(ids == std::vector<std::string>{"P1", "P2", "P3", "P4"});
  CHECK(counts == std::vector<size_t>{3, 1, 0, 1});
  CHECK(registered == std::vector<bool>{true, true, true, false});
}

TEST_CASE("a patient whose only dispensings do not count is visited only through the registry") {
  Store store = Loaded();
  SetStatus(store, "d5", "cancelled");  // P4 has no registry row and nothing counting
  SetStatus(store, "d1", "cancelled");  // P2 keeps the registry row
  std::vector<std::string> ids;
  for (const PatientHistory& history : testing::ReadPatients(store)) {
    ids.push_back(history.patient_id);
    if (history.patient_id == "P2") CHECK(history.dispensings.empty());
  }
  CHECK(ids == std::vector<std::string>{"P1", "P2", "P3"});
}

TEST_CASE("a cursor reusing one history gives each patient exactly their own records") {
  Store store = Loaded();
  Result<PatientCursor> cursor = store.Patients();
  REQUIRE(cursor.ok());
  PatientHistory history;
  std::vector<std::pair<std::string, std::vector<std::string>>> seen;
  for (;;) {
    Result<bool> more = cursor->Next(history);
    REQUIRE(more.ok());
    if (!*more) break;
    std::vector<std::string> ids;
    for (const DispensingRecord& record : history.dispensings) ids.push_back(record.record_id);
    seen.emplace_back(history.patient_id, ids);
  }
  // P1 has three dispensings, P2 one (the reused history shrinks), P3 none, P4 one.
  REQUIRE(seen.size() == 4);
  CHECK(seen[0] == std::pair<std::string, std::vector<std::string>>{"P1", {"d3", "d4", "d2"}});
  CHECK(seen[1] == std::pair<std::string, std::vector<std::string>>{"P2", {"d1"}});
  CHECK(seen[2] == std::pair<std::string, std::vector<std::string>>{"P3", {}});
  CHECK(seen[3] == std::pair<std::string, std::vector<std::string>>{"P4", {"d5"}});
  CHECK_FALSE(cursor->Next(history).value());
}

TEST_CASE("ranges share out the pass: their cursors together give every patient once, in order") {
  Store store = Loaded();
  using Seen = std::vector<std::pair<std::string, size_t>>;  // patient, dispensings
  auto read = [&](const PatientIdRange& range, Seen& into) {
    Result<PatientCursor> cursor = store.Patients(range);
    REQUIRE(cursor.ok());
    PatientHistory history;
    for (;;) {
      Result<bool> more = cursor->Next(history);
      REQUIRE(more.ok());
      if (!*more) break;
      into.emplace_back(history.patient_id, history.dispensings.size());
    }
  };
  Seen whole;
  read(PatientIdRange{}, whole);
  REQUIRE(whole == Seen{{"P1", 3}, {"P2", 1}, {"P3", 0}, {"P4", 1}});
  // One registry patient per range: P1 | P2 | P3 and P4 (P4 has no registry row).
  Result<std::vector<PatientIdRange>> by_registry = store.PatientRanges(1);
  REQUIRE(by_registry.ok());
  REQUIRE(by_registry->size() == 3);
  CHECK(by_registry->front().from.empty());
  CHECK(by_registry->back().to.empty());
  // Two per range: three registry rows are too few to share out, so the dispensings'
  // patients (P1, P2, P4) cut it: P1, P2, P3 | P4.
  Result<std::vector<PatientIdRange>> by_dispensings = store.PatientRanges(2);
  REQUIRE(by_dispensings.ok());
  REQUIRE(by_dispensings->size() == 2);
  CHECK((*by_dispensings)[1].from == "P4");
  for (const auto* ranges : {&*by_registry, &*by_dispensings}) {
    Seen joined;
    for (const PatientIdRange& range : *ranges) read(range, joined);
    CHECK(joined == whole);
  }
  Seen middle;
  read(PatientIdRange{"P2", "P4"}, middle);
  CHECK(middle == Seen{{"P2", 1}, {"P3", 0}});
}

TEST_CASE("an empty store is one range with nothing in it") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  Result<std::vector<PatientIdRange>> ranges = store->PatientRanges(128);
  REQUIRE(ranges.ok());
  REQUIRE(ranges->size() == 1);
  PatientHistory history;
  CHECK_FALSE(store->Patients((*ranges)[0])->Next(history).value());
}

TEST_CASE("the pass over every patient reads the index in order without sorting") {
  Store store = Loaded();
  const std::string plan = QueryPlan(store, "SELECT * FROM dispensings WHERE status IN ('', 'completed')"
                                            " ORDER BY patient_id, dispensed_on, id");
  CAPTURE(plan);
  CHECK(plan.find("dispensings_by_patient") != std::string::npos);
  CHECK(plan.find("TEMP B-TREE") == std::string::npos);
}

TEST_CASE("practices and reviews read back in key order") {
  Store store = Loaded();
  Load(store, InputKind::kPractices, "practice,name,network,list_size\nB2,Brook Lane,North,\nA1,Ash Row,North,9000\n");
  Load(store, InputKind::kReviews, "patient_id,reviewed_on\nP2,2024-02-01\nP1,2024-03-01\nP1,2023-03-01\n");
  Result<std::vector<PracticeRecord>> practices = store.Practices();
  REQUIRE(practices.ok());
  REQUIRE(practices->size() == 2);
  CHECK((*practices)[0].practice == "A1");
  CHECK((*practices)[0].list_size == 9000);
  CHECK_FALSE((*practices)[1].list_size.has_value());
  Result<std::vector<ReviewRecord>> reviews = store.ReviewsOf("P1");
  REQUIRE(reviews.ok());
  REQUIRE(reviews->size() == 2);
  CHECK((*reviews)[0].reviewed_on.ToIso() == "2023-03-01");
  CHECK((*reviews)[1].reviewed_on.ToIso() == "2024-03-01");
  CHECK(store.Reviews()->size() == 3);
}

TEST_CASE("product counts list distinct products by items, with distinct patients") {
  Store store = Loaded();
  Result<std::vector<ProductCount>> counts = store.ProductCounts();
  REQUIRE(counts.ok());
  REQUIRE(counts->size() == 3);
  CHECK((*counts)[0].product == "Amlodipine 5mg tablets");
  CHECK((*counts)[0].items == 2);
  CHECK((*counts)[0].patients == 2);
  CHECK((*counts)[1].product == "Sertraline 50mg tablets");
  CHECK((*counts)[1].items == 2);
  CHECK((*counts)[1].patients == 1);
  CHECK((*counts)[2].code == "X99");
}

TEST_CASE("the summary gives the date span of counting dispensings and every table's size") {
  Store store = Loaded();
  SetStatus(store, "d1", "stopped");
  Result<StoreSummary> summary = store.Summary();
  REQUIRE(summary.ok());
  CHECK(summary->earliest_dispensed->ToIso() == "2024-01-01");
  CHECK(summary->latest_dispensed->ToIso() == "2024-02-01");  // d1 (March) no longer counts
  // Data coverage per practice: the same span, under the practice the records name.
  const PracticeSpans spans = store.PracticeDataSpans().value();
  REQUIRE_FALSE(spans.empty());
  Date latest = spans.begin()->second.latest;
  for (const auto& [practice, span] : spans) latest = std::max(latest, span.latest);
  CHECK(latest == summary->latest_dispensed);
  CHECK(summary->dispensings == 5);
  CHECK(summary->counting_dispensings == 4);
  CHECK(summary->patients == 3);
  CHECK(summary->import_runs == 2);
  Result<std::vector<ImportRunRecord>> runs = store.ImportRuns();
  REQUIRE(runs.ok());
  REQUIRE(runs->size() == 2);
  CHECK((*runs)[0].kind == "dispensing");
  CHECK((*runs)[0].outcome == "committed");
  CHECK((*runs)[0].imported == 5);
}

TEST_CASE("an empty store has no date span") {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  Result<StoreSummary> summary = store->Summary();
  REQUIRE(summary.ok());
  CHECK_FALSE(summary->earliest_dispensed.has_value());
  CHECK(summary->dispensings == 0);
  CHECK(store->PracticeDataSpans().value().empty());
  CHECK(testing::ReadPatients(*store).empty());
}

TEST_CASE("a patient's dispensings that do not count are counted by status up to a date") {
  Store store = Loaded();
  SetStatus(store, "d2", "stopped");        // 2024-02-01
  SetStatus(store, "d3", "entered-in-error");  // 2024-01-01
  CHECK(store.NotCountingOf("P1", *ParseDate("2024-03-01")).value() ==
        std::map<std::string, long>{{"entered-in-error", 1}, {"stopped", 1}});
  CHECK(store.NotCountingOf("P1", *ParseDate("2024-01-15")).value() ==
        std::map<std::string, long>{{"entered-in-error", 1}});
  CHECK(store.NotCountingOf("P2", *ParseDate("2024-03-01")).value().empty());
  CHECK(store.NotCountingOf("nobody", *ParseDate("2024-03-01")).value().empty());
}

}  // TEST_SUITE

}  // namespace medload
