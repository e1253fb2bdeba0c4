// A small invented network for the report tests: two practices (one with a code that
// needs sanitising and a name that needs escaping), patients with monthly supplies, in an
// in-memory store, and a config that asks for digests.
#pragma once

#include <doctest/doctest.h>

#include <sstream>
#include <string>
#include <vector>

#include "medload/burden/run_context.h"
#include "medload/report/report_config.h"
#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload::testing {

inline void ImportCsv(Store& store, InputKind kind, const std::string& csv) {
  std::istringstream in(csv);
  auto summary = ImportStream(store, kind, in, "test.csv", ImportOptions{});
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

// Patient identifiers of the population, to prove that digests never carry one.
inline std::vector<std::string> PatientIds() {
  std::vector<std::string> ids;
  for (int i = 0; i < 14; ++i) ids.push_back("ZQ" + std::to_string(7100 + i));
  return ids;
}

inline constexpr const char* kOddPractice = "B/../<b>";

// Practice "A1" has 8 patients, the odd practice 6. In practice A1 the patients from
// index 2 on start amitriptyline + oxybutynin in 2024-06 (a rise in acb>=3); everybody
// has ramipril and furosemide from 2024-01 to 2024-06.
// Imports the population below into `store`.
inline void ImportPopulation(Store& store) {
  ImportCsv(store, InputKind::kPractices,
            "practice,name,network,list_size\nA1,Alder <script>alert(1)</script> Surgery,Test Vale,8\n"
            "\"" + std::string(kOddPractice) + "\",Odd & Sons,Test Vale,6\n");
  std::string patients = "patient_id,birth_date,sex,practice,registered_from,registered_to\n";
  std::string rows = "patient_id,practice,dispensed_on,product,quantity,days_supply\n";
  const std::vector<std::string> ids = PatientIds();
  for (size_t i = 0; i < ids.size(); ++i) {
    const std::string practice = i < 8 ? "A1" : std::string("\"") + kOddPractice + "\"";
    patients += ids[i] + ",1940,female," + practice + ",,\n";
    for (int month = 1; month <= 6; ++month) {
      const std::string date = "2024-0" + std::to_string(month) + "-01";
      rows += ids[i] + "," + practice + "," + date + ",Ramipril 5mg capsules,28,31\n";
      rows += ids[i] + "," + practice + "," + date + ",Furosemide 40mg tablets,28,31\n";
      if (i >= 2 && i < 8 && month >= 6) {
        rows += ids[i] + "," + practice + "," + date + ",Amitriptyline 10mg tablets,28,31\n";
        rows += ids[i] + "," + practice + "," + date + ",Oxybutynin 5mg tablets,28,31\n";
      }
    }
  }
  ImportCsv(store, InputKind::kPatients, patients);
  ImportCsv(store, InputKind::kDispensing, rows);
}

struct ReportPopulation {
  Store store = std::move(Store::Open(":memory:").value());
  RunContext analysis = std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());

  ReportPopulation() { ImportPopulation(store); }
};

inline ReportConfig TestConfig() {
  const auto doc = nlohmann::json::parse(R"({
    "title": "Test Vale report",
    "network": "Test Vale",
    "on": "2024-06-30",
    "months": 6,
    "criteria": ["acb>=3", "items>=2"],
    "digests": {"to": ["team@example.invalid"], "triggers": {"rise_patients": 2}}
  })");
  auto config = ReadReportConfig(doc, "test.json");
  REQUIRE(config.ok());
  return *config;
}

}  // namespace medload::testing
