#include "medload/store/practice_codes.h"

#include <doctest/doctest.h>

#include <sstream>
#include <string>
#include <vector>

#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload {
namespace {

void Load(Store& store, InputKind kind, const std::string& text) {
  std::istringstream in(text);
  Result<ImportSummary> summary = ImportStream(store, kind, in, "test.csv", ImportOptions());
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

// Practice WV001 is in the practices table, WV002 only in the registry, WV003 only in
// dispensings of a patient without a registry row.
Store ThreeWays() {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  Load(*store, InputKind::kPractices, "practice,name,network,list_size\nWV001,Willow Vale,Test Vale,100\n");
  Load(*store, InputKind::kPatients,
       "patient_id,birth_date,sex,practice,registered_from,registered_to\nP1,1940,female,WV002,,\n");
  Load(*store, InputKind::kDispensing,
       "patient_id,practice,dispensed_on,product,quantity\nP9,WV003,2024-01-02,Amlodipine 5mg tablets,28\n");
  return std::move(*store);
}

}  // namespace

TEST_SUITE("store/practice_codes") {

TEST_CASE("the store knows practice codes from its practices, its registry and its dispensings") {
  const Store store = ThreeWays();
  CHECK(store.PracticeCodes(false).value() == std::vector<std::string>{"WV001", "WV002"});
  CHECK(store.PracticeCodes(true).value() == std::vector<std::string>{"WV001", "WV002", "WV003"});
  CHECK(CheckPracticeCodes(store, {}).ok());
  CHECK(CheckPracticeCodes(store, {"WV001", "WV002", "WV003"}).ok());
}

TEST_CASE("an unknown practice code is an input error naming the known codes") {
  const Store store = ThreeWays();
  const Status status = CheckPracticeCodes(store, {"WV002", "WV999"});
  REQUIRE_FALSE(status.ok());
  CHECK(status.code() == StatusCode::kInput);
  CHECK(status.message() == "practice \"WV999\" is not in the store (known: WV001, WV002, WV003)");
}

TEST_CASE("the message for an unknown code suggests a different case and shortens a long list") {
  std::vector<std::string> many;
  for (int i = 10; i < 35; ++i) many.push_back("WV0" + std::to_string(i));
  struct Case {
    std::string code;
    std::vector<std::string> known;
    std::string message;
  };
  const std::vector<Case> cases = {
      {"wv001", {"WV001", "WV002"},
       "practice \"wv001\" is not in the store; codes are case-sensitive: did you mean \"WV001\"? (known: WV001, "
       "WV002)"},
      {"WV001", {}, "practice \"WV001\" is not in the store (it knows no practice: import practices or patients first)"},
      {"XX", many,
       "practice \"XX\" is not in the store (known: WV010, WV011, WV012, WV013, WV014, WV015, WV016, WV017, WV018, "
       "WV019, WV020, WV021, WV022, WV023, WV024, WV025, WV026, WV027, WV028, WV029 and 5 more)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.code);
    CHECK(UnknownPracticeMessage(c.code, c.known) == c.message);
  }
}

}  // TEST_SUITE

}  // namespace medload
