#include "store/shard_split.h"

#include <doctest/doctest.h>
#include <sqlite3.h>

#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "medload/store/importer.h"
#include "medload/store/store.h"
#include "store/read_patients.h"

namespace medload {
namespace {

Store Memory() {
  Result<Store> store = Store::Open(":memory:");
  REQUIRE(store.ok());
  return std::move(store.value());
}

Result<ImportSummary> Import(Store& store, InputKind kind, const std::string& text, ShardSpec shard,
                             double max_reject_rate = 0.05) {
  ImportOptions options;
  options.shard = shard;
  options.max_reject_rate = max_reject_rate;
  std::istringstream in(text);
  return ImportStream(store, kind, in, std::string(InputKindName(kind)) + ".csv", options);
}

std::set<std::string> Strings(const Store& store, const char* sql) {
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(store.handle(), sql, -1, &stmt, nullptr) == SQLITE_OK);
  std::set<std::string> values;
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    values.emplace(reinterpret_cast<const char*>(sqlite3_column_text(stmt, 0)));
  }
  sqlite3_finalize(stmt);
  return values;
}

std::string Id(int i) { return "N" + std::to_string(100 + i); }

// 24 patients at two practices, monthly for a few months each; practice B2's latest month
// has a single patient, so that most shards hold none of its latest dispensings.
std::string Dispensing() {
  std::string text = "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply\n";
  int record = 0;
  for (int i = 0; i < 24; ++i) {
    const std::string practice = i % 2 == 0 ? "A1" : "B2";
    for (int month = 1 + i % 3; month <= 4 + i % 4; ++month) {
      text += "D" + std::to_string(++record) + "," + Id(i) + "," + practice + ",2024-0" + std::to_string(month) +
              "-1" + std::to_string(i % 9) + ",Amlodipine 5mg tablets,28,28\n";
    }
  }
  text += "D900," + Id(5) + ",B2,2024-09-28,Amlodipine 5mg tablets,28,28\n";
  return text;
}

std::string Patients() {
  std::string text = "patient_id,birth_date,sex,practice\n";
  for (int i = 0; i < 24; ++i) text += Id(i) + ",1940," + (i % 2 == 0 ? "female,A1\n" : "male,B2\n");
  return text;
}

std::string Reviews() {
  std::string text = "patient_id,reviewed_on\n";
  for (int i = 0; i < 24; i += 3) text += Id(i) + ",2024-03-01\n";
  return text;
}

void CheckAddsUp(const ImportSummary& summary) {
  CAPTURE(summary.file);
  CHECK(summary.read == summary.imported + summary.duplicates + summary.rejected + summary.other_shards);
}

}  // namespace

TEST_SUITE("store/shard_split") {

TEST_CASE("a split import counts the rows of other shards apart, and the counts add up") {
  // Row 2 names a patient of shard 2 of 2 with a bad date; row 3 names no patient.
  const std::string text =
      "patient_id,dispensed_on,product,quantity\n"
      "N100,2024-01-05,Amlodipine 5mg tablets,28\n"
      "N101,2024-13-05,Amlodipine 5mg tablets,28\n"
      ",2024-01-05,Amlodipine 5mg tablets,28\n";
  REQUIRE(InShard("N100", ShardSpec{1, 2}));
  REQUIRE(InShard("N101", ShardSpec{2, 2}));
  const std::vector<std::pair<ShardSpec, std::vector<long>>> cases = {
      // shard: imported, rejected, other shards, other shards' rejected
      {ShardSpec{1, 2}, {1, 1, 1, 1}},
      {ShardSpec{2, 2}, {0, 2, 1, 0}},
  };
  for (const auto& [shard, want] : cases) {
    const std::string shard_name = ShardName(shard);  // clang 14 cannot capture a structured binding
    CAPTURE(shard_name);
    Store store = Memory();
    Result<ImportSummary> summary = Import(store, InputKind::kDispensing, text, shard, 1.0);
    REQUIRE(summary.ok());
    CHECK(summary->read == 3);
    CHECK(summary->imported == want[0]);
    CHECK(summary->rejected == want[1]);
    CHECK(summary->other_shards == want[2]);
    CHECK(summary->other_shards_rejected == want[3]);
    CHECK(summary->shard == ShardName(shard));
    CheckAddsUp(*summary);
  }
}

TEST_CASE("a row of another shard's patient is not in the store") {
  Store store = Memory();
  REQUIRE(Import(store, InputKind::kPatients, Patients(), ShardSpec{2, 3}).ok());
  REQUIRE(Import(store, InputKind::kDispensing, Dispensing(), ShardSpec{2, 3}).ok());
  REQUIRE(Import(store, InputKind::kReviews, Reviews(), ShardSpec{2, 3}).ok());
  const std::set<std::string> stored = Strings(
      store, "SELECT patient_id FROM patients UNION SELECT patient_id FROM dispensings"
             " UNION SELECT patient_id FROM reviews");
  REQUIRE_FALSE(stored.empty());
  for (const std::string& patient : stored) {
    CAPTURE(patient);
    CHECK(InShard(patient, ShardSpec{2, 3}));
  }
}

TEST_CASE("N shard stores hold every patient exactly once, with every row of each") {
  Store whole = Memory();
  REQUIRE(Import(whole, InputKind::kPatients, Patients(), ShardSpec{}).ok());
  REQUIRE(Import(whole, InputKind::kDispensing, Dispensing(), ShardSpec{}).ok());
  REQUIRE(Import(whole, InputKind::kReviews, Reviews(), ShardSpec{}).ok());
  std::map<std::string, int> seen;  // patient -> stores holding them
  long dispensings = 0;
  long reviews = 0;
  for (uint32_t k = 1; k <= 4; ++k) {
    Store shard = Memory();
    for (const auto& [kind, text] : {std::pair{InputKind::kPatients, Patients()},
                                     std::pair{InputKind::kDispensing, Dispensing()},
                                     std::pair{InputKind::kReviews, Reviews()}}) {
      Result<ImportSummary> summary = Import(shard, kind, text, ShardSpec{k, 4});
      REQUIRE(summary.ok());
      CheckAddsUp(*summary);
    }
    for (const std::string& patient : Strings(shard, "SELECT patient_id FROM patients")) ++seen[patient];
    for (const PatientHistory& history : testing::ReadPatients(shard)) {
      dispensings += static_cast<long>(history.dispensings.size());
    }
    reviews += static_cast<long>(shard.Reviews()->size());
  }
  CHECK(seen.size() == 24);
  for (const auto& [patient, stores] : seen) {
    const auto& patient_id = patient;  // clang 14 cannot capture a structured binding
    CAPTURE(patient_id);
    CHECK(stores == 1);
  }
  long whole_dispensings = 0;
  for (const PatientHistory& history : testing::ReadPatients(whole)) {
    whole_dispensings += static_cast<long>(history.dispensings.size());
  }
  CHECK(dispensings == whole_dispensings);
  CHECK(reviews == static_cast<long>(whole.Reviews()->size()));
}

TEST_CASE("every shard store gives the network's data coverage and latest dispensing") {
  Store whole = Memory();
  REQUIRE(Import(whole, InputKind::kPatients, Patients(), ShardSpec{}).ok());
  REQUIRE(Import(whole, InputKind::kDispensing, Dispensing(), ShardSpec{}).ok());
  const PracticeSpans spans = whole.PracticeDataSpans().value();
  REQUIRE(spans.at("B2").latest == Date::FromCivil(2024, 9, 28));
  for (uint32_t k = 1; k <= 4; ++k) {
    CAPTURE(k);
    Store shard = Memory();
    REQUIRE(Import(shard, InputKind::kPatients, Patients(), ShardSpec{k, 4}).ok());
    REQUIRE(Import(shard, InputKind::kDispensing, Dispensing(), ShardSpec{k, 4}).ok());
    // Three of the four stores hold none of B2's latest dispensings themselves.
    if (!InShard(Id(5), ShardSpec{k, 4})) {
      const std::set<std::string> own = Strings(shard, "SELECT MAX(dispensed_on) FROM dispensings WHERE practice = 'B2'");
      REQUIRE(own.size() == 1);
      CHECK(*own.begin() < "2024-09-28");
    }
    CHECK(shard.PracticeDataSpans().value() == spans);
    CHECK(shard.Summary()->latest_dispensed == whole.Summary()->latest_dispensed);
    CHECK(shard.Summary()->earliest_dispensed == whole.Summary()->earliest_dispensed);
  }
}

TEST_CASE("a shard store knows the practices named by the rows it left to other shards") {
  const std::string text =
      "patient_id,practice,dispensed_on,product,quantity\n"
      "N100,A1,2024-01-05,Amlodipine 5mg tablets,28\n"
      "N101,Q7,2024-01-05,Amlodipine 5mg tablets,28\n";
  REQUIRE(InShard("N100", ShardSpec{1, 2}));
  Store store = Memory();
  REQUIRE(Import(store, InputKind::kDispensing, text, ShardSpec{1, 2}).ok());
  CHECK(store.PracticeCodes(false).value() == std::vector<std::string>{"Q7"});
  CHECK(store.PracticeCodes(true).value() == std::vector<std::string>{"A1", "Q7"});
}

TEST_CASE("the reject rate is the whole file's, so every shard rolls back alike") {
  // 2 of 4 rows are faulty (50%, over 0.25): one in each shard of 2.
  const std::string text =
      "patient_id,dispensed_on,product,quantity\n"
      "N100,2024-01-05,Amlodipine 5mg tablets,28\n"
      "N100,2024-01-05,Amlodipine 5mg tablets,none\n"
      "N101,2024-01-05,Amlodipine 5mg tablets,28\n"
      "N101,2024-01-05,Amlodipine 5mg tablets,-1\n";
  for (uint32_t k = 1; k <= 2; ++k) {
    CAPTURE(k);
    Store store = Memory();
    Result<ImportSummary> summary = Import(store, InputKind::kDispensing, text, ShardSpec{k, 2}, 0.25);
    REQUIRE(summary.ok());
    CHECK(summary->rolled_back);
    CHECK(RollbackMessage(*summary) ==
          "dispensing.csv: 2 of 4 rows rejected in the whole file (1 here, 1 in other shards) (50%), above "
          "--max-reject-rate 0.25: the file was rolled back and nothing from it was stored");
    CHECK(Strings(store, "SELECT patient_id FROM dispensings").empty());
    CHECK(store.OtherShardCoverage()->empty());
  }
}

TEST_CASE("a store holds one shard, or the whole network, never both") {
  const std::string practices = "practice,name,network\nA1,Alder Lane,West Mere\n";
  struct Step {
    ShardSpec shard;
    InputKind kind;
    const char* fault;  // "" when the import goes in
  };
  const std::vector<std::pair<const char*, std::vector<Step>>> cases = {
      {"another shard", {{{1, 2}, InputKind::kPatients, ""},
                         {{2, 2}, InputKind::kReviews,
                          "reviews.csv: the store holds shard 1/2, not 2/2: each shard goes into a store of its own"}}},
      {"no shard into a shard's store", {{{1, 2}, InputKind::kPatients, ""},
                                         {{1, 1}, InputKind::kDispensing,
                                          "dispensing.csv: the store holds shard 1/2 of the network's patients: import "
                                          "with --shard 1/2 (or into a store of the whole network)"}}},
      {"a shard into the whole network's store", {{{1, 1}, InputKind::kPatients, ""},
                                                  {{1, 2}, InputKind::kPatients,
                                                   "patients.csv: the store already holds rows imported without "
                                                   "--shard; shard 1/2 goes into a store of its own"}}},
      {"practices go to every shard", {{{2, 4}, InputKind::kPractices, ""},
                                       {{1, 1}, InputKind::kPractices, ""},
                                       {{2, 4}, InputKind::kPatients, ""}}},
  };
  for (const auto& [name, steps] : cases) {
    const auto& case_name = name;  // clang 14 cannot capture a structured binding
    CAPTURE(case_name);
    Store store = Memory();
    for (const Step& step : steps) {
      const std::string text = step.kind == InputKind::kPractices ? practices
                               : step.kind == InputKind::kReviews ? Reviews()
                               : step.kind == InputKind::kPatients ? Patients()
                                                                   : Dispensing();
      Result<ImportSummary> summary = Import(store, step.kind, text, step.shard);
      if (std::string(step.fault).empty()) {
        CHECK(summary.ok());
      } else {
        REQUIRE_FALSE(summary.ok());
        CHECK(summary.status().message() == step.fault);
      }
    }
  }
}

TEST_CASE("the store says which shard it holds") {
  Store store = Memory();
  CHECK_FALSE(store.HeldShard()->has_value());
  REQUIRE(Import(store, InputKind::kPatients, Patients(), ShardSpec{3, 5}).ok());
  CHECK(store.HeldShard().value() == std::optional<ShardSpec>(ShardSpec{3, 5}));
  // An import of the whole network (1/1) records nothing.
  Store whole = Memory();
  REQUIRE(Import(whole, InputKind::kPatients, Patients(), ShardSpec{1, 1}).ok());
  CHECK_FALSE(whole.HeldShard()->has_value());
}

TEST_CASE("a split import refuses FHIR NDJSON") {
  Store store = Memory();
  Result<ImportSummary> summary =
      Import(store, InputKind::kDispensing, "{\"resourceType\":\"MedicationDispense\"}\n", ShardSpec{1, 2});
  REQUIRE_FALSE(summary.ok());
  CHECK(summary.status().message() ==
        "dispensing.csv: --shard splits CSV files only; import FHIR NDJSON into a store of the whole network");
}

TEST_CASE("a row whose patient cannot be read belongs to every shard") {
  const ShardSplit split(ShardSpec{1, 2}, InputKind::kDispensing);
  CsvRow header;
  header.fields = {"patient_id", "dispensed_on", "product", "quantity"};
  const HeaderLayout layout = HeaderLayout::Find(InputKind::kDispensing, header, {}, "d.csv").value();
  struct Case {
    std::vector<std::string_view> fields;
    CsvFault fault;
    bool elsewhere;
  };
  REQUIRE(!InShard("N101", ShardSpec{1, 2}));
  const std::vector<Case> cases = {
      {{"N101", "2024-01-01", "x", "1"}, CsvFault::kNone, true},
      {{"N100", "2024-01-01", "x", "1"}, CsvFault::kNone, false},
      {{"", "2024-01-01", "x", "1"}, CsvFault::kNone, false},
      {{"N101", "2024-01-01", "x"}, CsvFault::kNone, false},
      {{}, CsvFault::kInvalidUtf8, false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.fields.size());
    CsvRow row;
    row.fields = c.fields;
    row.fault = c.fault;
    CHECK(split.Elsewhere(row, layout) == c.elsewhere);
  }
}

}  // TEST_SUITE

}  // namespace medload
