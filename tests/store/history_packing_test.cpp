// Packing the histories again for only the patients an import touched, against packing
// every history: the same packed rows, byte for byte.
#include "store/history_packing.h"

#include <doctest/doctest.h>
#include <sqlite3.h>

#include <sstream>
#include <string>
#include <vector>

#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload {
namespace {

constexpr const char* kHeader = "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply,dosage\n";

// Twelve dispensings of five patients: the store as last packed.
const std::string kFirst = std::string(kHeader) +
                           "a1,P1,A1,2024-01-05,Sertraline 50mg tablets,28,28,1 od\n"
                           "a2,P1,A1,2024-02-05,Sertraline 50mg tablets,28,28,1 od\n"
                           "a3,P1,A1,2024-03-05,Amlodipine 5mg tablets,28,28,1 od\n"
                           "a4,P2,A1,2024-01-10,Morphine 10mg/5ml oral solution,300,,5ml qds\n"
                           "a5,P2,A1,2024-03-10,Naproxen 250mg tablets,56,,1 bd\n"
                           "a6,P3,A2,2024-02-01,Amitriptyline 10mg tablets,28,28,1 at night\n"
                           "a7,P3,A2,2024-03-01,Amitriptyline 10mg tablets,28,28,1 at night\n"
                           "a8,P4,A2,2024-01-20,Oxybutynin 5mg tablets,56,28,1 bd\n"
                           "a9,P4,A2,2024-02-20,Oxybutynin 5mg tablets,56,28,1 bd\n"
                           "a10,P6,A2,2024-01-02,Furosemide 40mg tablets,28,28,1 om\n"
                           "a11,P6,A2,2024-02-02,Furosemide 40mg tablets,28,28,1 om\n"
                           "a12,P6,A2,2024-03-02,Furosemide 40mg tablets,28,28,1 om\n";

// The next import: a later month for P1, one back-dated to before P2's last and one on
// the date of P3's last, a new patient P5; P4 and P6 untouched.
const std::string kSecond = std::string(kHeader) +
                            "b1,P1,A1,2024-04-05,Sertraline 50mg tablets,28,28,1 od\n"
                            "b2,P2,A1,2024-02-10,Codeine 30mg tablets,28,,1 qds prn\n"
                            "b3,P3,A2,2024-03-01,Oxybutynin 5mg tablets,56,28,1 bd\n"
                            "b4,P5,A1,2024-04-01,Amlodipine 5mg tablets,28,28,1 od\n";

void Load(Store& store, const std::string& text) {
  std::istringstream in(text);
  Result<ImportSummary> summary = ImportStream(store, InputKind::kDispensing, in, "test.csv", ImportOptions());
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

void Exec(Store& store, const std::string& sql) {
  REQUIRE(sqlite3_exec(store.handle(), sql.c_str(), nullptr, nullptr, nullptr) == SQLITE_OK);
}

Store Open(size_t cap = kMaxDispensingsPerPatient) {
  StoreOptions options;
  options.max_dispensings_per_patient = cap;
  Result<Store> store = Store::Open(":memory:", options);
  REQUIRE(store.ok());
  return std::move(store.value());
}

// Every row of the packed copy: patient, the packed bytes in hex, how many left out.
std::vector<std::string> PackedRows(const Store& store) {
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(),
                             "SELECT patient_id, hex(packed), dropped FROM packed_histories ORDER BY patient_id",
                             -1, &stmt, nullptr) == SQLITE_OK);
  std::vector<std::string> rows;
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    std::string row;
    for (int column = 0; column < 3; ++column) {
      row += reinterpret_cast<const char*>(sqlite3_column_text(stmt, column));
      row += "|";
    }
    rows.push_back(row);
  }
  sqlite3_finalize(stmt);
  return rows;
}

// The copy packed whole from the same imports, in a store of its own.
std::vector<std::string> PackedWhole(const std::vector<std::string>& files, size_t cap = kMaxDispensingsPerPatient) {
  Store store = Open(cap);
  for (const std::string& file : files) Load(store, file);
  const PackOutcome outcome = store.PackHistoriesNow().value();
  REQUIRE(outcome.whole);
  return PackedRows(store);
}

}  // namespace

TEST_SUITE("store/history_packing") {

TEST_CASE("packing only the touched patients gives the same packed rows as packing every history") {
  Store store = Open();
  Load(store, kFirst);
  const PackOutcome first = store.PackHistoriesNow().value();
  CHECK(first.whole);
  CHECK(first.patients == 5);
  Load(store, kSecond);
  const PackOutcome second = store.PackHistoriesNow().value();
  CHECK_FALSE(second.was_current);
  CHECK_FALSE(second.whole);
  CHECK(second.patients == 4);
  CHECK(store.PackedHistoriesCurrent().value());
  const std::vector<std::string> rows = PackedRows(store);
  CHECK(rows.size() == 6);
  CHECK(rows == PackedWhole({kFirst, kSecond}));
}

TEST_CASE("the touched set is the patients with counting dispensings newer than the packing, in id order") {
  Store store = Open();
  Load(store, kFirst);
  REQUIRE(store.PackHistoriesNow().ok());
  const long packed_up_to = 12;
  Load(store, kSecond);
  // A dispense of P6 that does not count (as a FHIR feed marks one): P6's history is as packed.
  Exec(store,
       "INSERT INTO dispensings (dedup_key, patient_id, dispensed_on, product, quantity, status,"
       " source_line, run_id) VALUES ('x', 'P6', '2024-04-02', 'Furosemide 40mg tablets', 28,"
       " 'entered-in-error', 9, 1)");
  std::vector<std::string> touched;
  Result<long> written = PackTouchedHistories(store.handle(), packed_up_to, kMaxDispensingsPerPatient, &touched);
  REQUIRE(written.ok());
  CHECK(*written == 4);
  CHECK(touched == std::vector<std::string>{"P1", "P2", "P3", "P5"});
  touched.clear();
  CHECK(PackTouchedHistories(store.handle(), 16, kMaxDispensingsPerPatient, &touched).value() == 0);
  CHECK(touched.empty());
}

TEST_CASE("histories at the bound are cut after the merge as packing every history cuts them") {
  // Bound 2: P1 and P6 (3 each) were packed leaving one out, so they are read again from
  // the table; P2, P3 and P4 reach or pass the bound only with the newer dispensings.
  Store store = Open(2);
  Load(store, kFirst);
  REQUIRE(store.PackHistoriesNow().value().whole);
  Load(store, kSecond);
  const PackOutcome outcome = store.PackHistoriesNow().value();
  CHECK_FALSE(outcome.whole);
  const std::vector<std::string> rows = PackedRows(store);
  CHECK(rows == PackedWhole({kFirst, kSecond}, 2));
  REQUIRE(rows.size() == 6);
  CHECK(rows[0].substr(rows[0].size() - 2) == "2|");  // P1: two of four left out
  CHECK(rows[1].substr(rows[1].size() - 2) == "1|");  // P2: the oldest of three
}

TEST_CASE("a touched patient whose packed row is damaged or missing is packed again from the table") {
  Store store = Open();
  Load(store, kFirst);
  REQUIRE(store.PackHistoriesNow().ok());
  Exec(store, "UPDATE packed_histories SET packed = x'0102' WHERE patient_id = 'P1'");
  Exec(store, "DELETE FROM packed_histories WHERE patient_id = 'P2'");
  Load(store, kSecond);
  CHECK_FALSE(store.PackHistoriesNow().value().whole);
  CHECK(PackedRows(store) == PackedWhole({kFirst, kSecond}));
}

TEST_CASE("deleting the state row, as the damaged-history message says, packs every history again") {
  Store store = Open();
  Load(store, kFirst);
  REQUIRE(store.PackHistoriesNow().ok());
  Exec(store, "UPDATE packed_histories SET packed = x'0102' WHERE patient_id = 'P4'");  // untouched
  Exec(store, "DELETE FROM packed_histories_state");
  CHECK(store.PackHistoriesNow().value().whole);
  CHECK(PackedRows(store) == PackedWhole({kFirst}));
}

TEST_CASE("after an update or a delete of a dispensing, or when most rows are new, every history is packed again") {
  Store store = Open();
  Load(store, kFirst);
  REQUIRE(store.PackHistoriesNow().ok());
  Load(store, kSecond);
  SUBCASE("an update") { Exec(store, "UPDATE dispensings SET quantity = 14 WHERE record_id = 'a2'"); }
  SUBCASE("a delete") { Exec(store, "DELETE FROM dispensings WHERE record_id = 'a9'"); }
  SUBCASE("more rows newer than the packing than older") {
    std::string many = kHeader;
    for (int day = 10; day < 23; ++day) {
      many += "c" + std::to_string(day) + ",P7,A1,2024-05-" + std::to_string(day) + ",Amlodipine 5mg tablets,7,7,\n";
    }
    Load(store, many);
  }
  const PackOutcome outcome = store.PackHistoriesNow().value();
  CHECK_FALSE(outcome.was_current);
  CHECK(outcome.whole);
  CHECK(store.PackedHistoriesCurrent().value());
}

}  // TEST_SUITE

}  // namespace medload
