#include <doctest/doctest.h>
#include <sqlite3.h>

#include <sstream>

#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload {
namespace {

void Import(Store& store, InputKind kind, const std::string& csv) {
  std::istringstream in(csv);
  auto summary = ImportStream(store, kind, in, "test.csv", ImportOptions{});
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

const char* kHeader = "patient_id,practice,dispensed_on,product,quantity,days_supply\n";

}  // namespace

TEST_SUITE("store/census_figures") {

TEST_CASE("the earliest change since the marks covers added, updated and deleted dispensings") {
  Store store = std::move(Store::Open(":memory:").value());
  Import(store, InputKind::kDispensing, std::string(kHeader) + "P1,A1,2024-05-01,Ramipril 5mg capsules,28,28\n");
  const DataMarks marks = store.CurrentDataMarks().value();
  CHECK(marks.newest_dispensing == 1);
  CHECK_FALSE(store.EarliestChangeSince(marks).value().has_value());
  Import(store, InputKind::kDispensing, std::string(kHeader) + "P1,A1,2024-06-01,Ramipril 5mg capsules,28,28\n"
                                        "P2,A1,2024-03-09,Ramipril 5mg capsules,28,28\n");
  CHECK(store.EarliestChangeSince(marks).value() == std::optional<std::string>("2024-03-09"));
  const DataMarks later = store.CurrentDataMarks().value();
  CHECK_FALSE(store.EarliestChangeSince(later).value().has_value());
  REQUIRE(sqlite3_exec(store.handle(), "UPDATE dispensings SET dispensed_on = '2024-05-20' WHERE id = 2", nullptr,
                       nullptr, nullptr) == SQLITE_OK);
  CHECK(store.EarliestChangeSince(later).value() == std::optional<std::string>("2024-05-20"));
  const DataMarks edited = store.CurrentDataMarks().value();
  CHECK(edited.newest_edit == later.newest_edit + 1);
  REQUIRE(sqlite3_exec(store.handle(), "DELETE FROM dispensings WHERE id = 3", nullptr, nullptr, nullptr) == SQLITE_OK);
  CHECK(store.EarliestChangeSince(edited).value() == std::optional<std::string>(""));
}

TEST_CASE("a saved entry reads back intact, and not intact once its figures change") {
  Store store = std::move(Store::Open(":memory:").value());
  REQUIRE(store.SaveCensusFigures("k", "2024-05-31", DataMarks{4, 1}, "{\"a\":1}").ok());
  REQUIRE(store.SaveCensusFigures("other", "2024-05-31", DataMarks{4, 1}, "{}").ok());
  auto saved = store.SavedCensusFigures("k").value();
  REQUIRE(saved.size() == 1);
  CHECK(saved[0].census_date == "2024-05-31");
  CHECK(saved[0].marks.newest_dispensing == 4);
  CHECK(saved[0].marks.newest_edit == 1);
  CHECK(saved[0].figures == "{\"a\":1}");
  CHECK(saved[0].intact);
  REQUIRE(sqlite3_exec(store.handle(), "UPDATE census_figures SET figures = '{\"a\":2}'", nullptr, nullptr, nullptr) ==
          SQLITE_OK);
  CHECK_FALSE(store.SavedCensusFigures("k").value()[0].intact);
  CHECK(store.ClearCensusFigures().value() == 2);
  CHECK(store.SavedCensusFigures("k").value().empty());
}

TEST_CASE("the registry digest changes with a patient's or a practice's row") {
  Store store = std::move(Store::Open(":memory:").value());
  const std::string empty = store.RegistryDigest().value();
  Import(store, InputKind::kPatients, "patient_id,birth_date,sex,practice,registered_from,registered_to\n"
                                      "P1,1940,female,A1,,\n");
  const std::string one = store.RegistryDigest().value();
  CHECK(one != empty);
  CHECK(store.RegistryDigest().value() == one);
  Import(store, InputKind::kPatients, "patient_id,birth_date,sex,practice,registered_from,registered_to\n"
                                      "P1,1940,female,A1,,2024-03-01\n");
  CHECK(store.RegistryDigest().value() != one);
  const std::string moved = store.RegistryDigest().value();
  Import(store, InputKind::kPractices, "practice,name,network,list_size\nA1,Alder,Test Vale,8\n");
  CHECK(store.RegistryDigest().value() != moved);
}

TEST_CASE("the registry digest changes with a shard store's coverage of other shards' rows") {
  Store store = std::move(Store::Open(":memory:").value());
  const std::string before = store.RegistryDigest().value();
  REQUIRE(sqlite3_exec(store.handle(),
                       "INSERT INTO other_shard_coverage (practice, first_dispensed, latest_dispensed)"
                       " VALUES ('A1', '2024-01-05', '2024-06-28')",
                       nullptr, nullptr, nullptr) == SQLITE_OK);
  const std::string seen = store.RegistryDigest().value();
  CHECK(seen != before);
  // A late row of another shard moves the practice's first dispensing earlier.
  REQUIRE(sqlite3_exec(store.handle(), "UPDATE other_shard_coverage SET first_dispensed = '2023-12-01'", nullptr,
                       nullptr, nullptr) == SQLITE_OK);
  CHECK(store.RegistryDigest().value() != seen);
}

}  // TEST_SUITE

}  // namespace medload
