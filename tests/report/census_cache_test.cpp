#include "medload/report/census_cache.h"

#include <doctest/doctest.h>
#include <sqlite3.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "medload/report/report.h"
#include "medload/report/report_writer.h"
#include "report/report_fixture.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

std::map<std::string, std::string> FilesOf(const std::string& dir) {
  std::map<std::string, std::string> files;
  for (const auto& entry : std::filesystem::recursive_directory_iterator(dir)) {
    if (!entry.is_regular_file()) continue;
    std::ifstream in(entry.path(), std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    files[std::filesystem::relative(entry.path(), dir).string()] = text.str();
  }
  return files;
}

void Exec(Store& store, const char* sql) { REQUIRE(sqlite3_exec(store.handle(), sql, nullptr, nullptr, nullptr) == SQLITE_OK); }

// The report's files (generated_at fixed, so byte for byte).
std::map<std::string, std::string> Report(testing::ReportPopulation& population, const TempFolder& temp,
                                          const std::string& name) {
  ReportRunOptions options;
  options.out_dir = temp.File(name);
  options.generated_at = "2024-07-01T00:00:00Z";
  REQUIRE(RunReport(population.store, population.analysis, testing::TestConfig(), options).ok());
  return FilesOf(temp.File(name));
}

// The census dates the store would serve to the test config's next report.
std::vector<std::string> Served(testing::ReportPopulation& population) {
  ReportConfig config = testing::TestConfig();
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  std::vector<std::string> dates;
  for (const auto& [date, figures] : model->census_cache.served) dates.push_back(date.ToIso());
  return dates;
}

const std::vector<std::string> kOlderDates = {"2024-01-31", "2024-02-29", "2024-03-31", "2024-04-30",
                                              "2024-05-31"};

// Runs a report on `cached` and on `fresh` (the same data, its saved figures cleared), both
// after `change`, and checks that they write the same files.
template <typename Change>
void CheckSameAfter(const Change& change, const std::vector<std::string>& expected_served) {
  testing::ReportPopulation cached;
  testing::ReportPopulation fresh;
  TempFolder temp;
  Report(cached, temp, "a1");
  Report(fresh, temp, "b1");
  change(cached);
  change(fresh);
  REQUIRE(fresh.store.ClearCensusFigures().ok());
  CHECK(Served(cached) == expected_served);
  CHECK(Served(fresh).empty());
  CHECK(Report(cached, temp, "a2") == Report(fresh, temp, "b2"));
}

std::string DemoFile(const std::string& name) {
  std::ifstream in(std::string(MEDLOAD_SOURCE_DEMO) + "/" + name, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// The bundled demo network in a store of its own, with the demo's report config.
struct DemoStore {
  Store store = std::move(Store::Open(":memory:").value());
  RunContext analysis = std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());
  ReportConfig config;

  DemoStore() {
    for (const auto& [kind, file] : {std::pair{InputKind::kPractices, "practices.csv"},
                                     std::pair{InputKind::kPatients, "patients.csv"},
                                     std::pair{InputKind::kReviews, "reviews.csv"},
                                     std::pair{InputKind::kDispensing, "dispensing.csv"}}) {
      std::istringstream in(DemoFile(file));
      REQUIRE(ImportStream(store, kind, in, file, ImportOptions{}).ok());
    }
    auto read = ReadReportConfig(nlohmann::json::parse(DemoFile("network.json")), "network.json");
    REQUIRE(read.ok());
    config = *read;
  }

  std::map<std::string, std::string> Report(const TempFolder& temp, const std::string& name) {
    ReportRunOptions options;
    options.out_dir = temp.File(name);
    options.generated_at = "2026-11-01T00:00:00Z";
    REQUIRE(RunReport(store, analysis, config, options).ok());
    return FilesOf(temp.File(name));
  }
};

}  // namespace

TEST_SUITE("report/census_cache") {

TEST_CASE("on the demo network, a late dispensing in an older month leaves the report as it is without saved figures") {
  DemoStore cached;
  DemoStore fresh;
  TempFolder temp;
  cached.Report(temp, "a1");
  fresh.Report(temp, "b1");
  // An invented late record dated 2026-05-15, in the demo's 13 census months (to 2026-10-31).
  const std::string late = "record_id,patient_id,practice,dispensed_on,product,quantity,days_supply\n"
                           "LATE-1,Q1059322,WV002,2026-05-15,Oxybutynin 5mg tablets,56,28\n";
  for (DemoStore* demo : {&cached, &fresh}) testing::ImportCsv(demo->store, InputKind::kDispensing, late);
  REQUIRE(fresh.store.ClearCensusFigures().ok());
  auto model = BuildReportModel(cached.store, cached.analysis, cached.config, {}, {});
  REQUIRE(model.ok());
  std::vector<std::string> served;
  for (const auto& [date, figures] : model->census_cache.served) served.push_back(date.ToIso());
  CHECK(served == std::vector<std::string>{"2025-10-31", "2025-11-30", "2025-12-31", "2026-01-31", "2026-02-28",
                                           "2026-03-31", "2026-04-30"});
  CHECK(cached.Report(temp, "a2") == fresh.Report(temp, "b2"));
}


TEST_CASE("saved figures read back as they were counted") {
  DateFigures figures;
  CohortCell cell;
  cell.registered = 7;
  cell.registered_by_band[15] = 7;
  cell.counts = {2, 3, 4};
  cell.counts_by_band.assign(3, {});
  cell.counts_by_band[2][15] = 4;
  figures.cells["A1"] = cell;
  figures.practices["A1"] = {"A1"};
  figures.unseen["A1"]["A1"] = UnseenCell{1, {}};
  const Date on = Date::FromCivil(2024, 5, 31);
  const auto back = ParseFigures(FiguresJson(on, figures), on, 3);
  REQUIRE(back.has_value());
  CHECK(FiguresJson(on, *back) == FiguresJson(on, figures));
  CHECK(back->cells.at("A1").counts == std::vector<long>{2, 3, 4});
  CHECK(back->unseen.at("A1").at("A1").registered == 1);
}

TEST_CASE("saved figures that are malformed, of another date or of other criteria are not read back") {
  const Date on = Date::FromCivil(2024, 5, 31);
  const std::string bands = "[0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0]";
  const std::string cell = R"({"registered":1,"registered_by_band":)" + bands + R"(,"counts":[1,1],"counts_by_band":[)" +
                           bands + "," + bands + "]}";
  const std::string good = R"({"layout":1,"on":"2024-05-31","cells":{"A1":)" + cell + R"(},"practices":{},"unseen":{}})";
  REQUIRE(ParseFigures(good, on, 2).has_value());
  const std::vector<std::pair<std::string, size_t>> cases = {
      {"not json", 2},
      {good, 3},  // another number of criteria
      {R"({"layout":2,"on":"2024-05-31","cells":{},"practices":{},"unseen":{}})", 2},
      {R"({"layout":1,"on":"2024-04-30","cells":{},"practices":{},"unseen":{}})", 2},
      {R"({"layout":1,"on":"2024-05-31","cells":{},"practices":{}})", 2},
      {R"({"layout":1,"on":"2024-05-31","cells":{"A1":{"registered":-1}},"practices":{},"unseen":{}})", 2},
      {R"({"layout":1,"on":"2024-05-31","cells":{},"practices":{"A1":[3]},"unseen":{}})", 2},
  };
  for (const auto& [text, keys] : cases) {
    const auto& figures_text = text;  // clang 14 cannot capture a structured binding
    CAPTURE(figures_text);
    CHECK_FALSE(ParseFigures(text, on, keys).has_value());
  }
}

TEST_CASE("a second report serves the older census dates from the store and writes the same files") {
  CheckSameAfter([](testing::ReportPopulation&) {}, kOlderDates);
}

TEST_CASE("a late dispensing dated in an older month has that month and the later ones counted again") {
  CheckSameAfter([](testing::ReportPopulation& population) {
    testing::ImportCsv(population.store, InputKind::kDispensing,
                       "patient_id,practice,dispensed_on,product,quantity,days_supply\n"
                       "ZQ7100,A1,2024-03-10,Oxybutynin 5mg tablets,56,56\n"
                       "ZQ7100,A1,2024-03-10,Amitriptyline 10mg tablets,56,56\n");
  }, {"2024-01-31", "2024-02-29"});
}

TEST_CASE("a dispensing dated after the census date leaves the saved figures served") {
  CheckSameAfter([](testing::ReportPopulation& population) {
    testing::ImportCsv(population.store, InputKind::kDispensing,
                       "patient_id,practice,dispensed_on,product,quantity,days_supply\n"
                       "ZQ7101,A1,2024-06-20,Oxybutynin 5mg tablets,28,28\n");
  }, kOlderDates);
}

TEST_CASE("a changed registry has every census date counted again") {
  CheckSameAfter([](testing::ReportPopulation& population) {
    testing::ImportCsv(population.store, InputKind::kPatients,
                       "patient_id,birth_date,sex,practice,registered_from,registered_to\n"
                       "ZQ7101,1940,female,A1,,2024-03-15\n");
  }, {});
}

TEST_CASE("an updated or deleted dispensing has the dates it touches counted again") {
  CheckSameAfter([](testing::ReportPopulation& population) {
    Exec(population.store, "UPDATE dispensings SET status = 'cancelled' WHERE patient_id = 'ZQ7102'"
                           " AND dispensed_on = '2024-04-01'");
  }, {"2024-01-31", "2024-02-29", "2024-03-31"});
  CheckSameAfter([](testing::ReportPopulation& population) {
    Exec(population.store, "DELETE FROM dispensings WHERE patient_id = 'ZQ7102' AND dispensed_on = '2024-06-01'");
  }, {});
}

TEST_CASE("a damaged saved entry is never served: it is counted again and the report is unchanged") {
  CheckSameAfter([](testing::ReportPopulation& population) {
    Exec(population.store, "UPDATE census_figures SET figures = replace(figures, '\"registered\":8', '\"registered\":9')"
                           " WHERE census_date = '2024-02-29'");
    Exec(population.store, "UPDATE census_figures SET figures = 'x', digest = '2d711642b726b04401627ca9fbac32f5c8530fb1903cc4db02258717921a4881'"
                           " WHERE census_date = '2024-03-31'");
  }, {"2024-01-31", "2024-04-30", "2024-05-31"});
}

TEST_CASE("when a late dispensing pushes a history past the store's bound, no saved figure is served") {
  // Patients ZQ7102 to ZQ7107 hold 14 counting dispensings each: a bound of 14 cuts none
  // until the late one below, which leaves ZQ7102's oldest (2024-01-01) out of every figure.
  TempFolder temp;
  StoreOptions bounded;
  bounded.max_dispensings_per_patient = 14;
  testing::ReportPopulation cached;
  testing::ReportPopulation fresh;
  cached.store = std::move(Store::Open(temp.File("cached.db"), bounded).value());
  fresh.store = std::move(Store::Open(temp.File("fresh.db"), bounded).value());
  for (testing::ReportPopulation* population : {&cached, &fresh}) testing::ImportPopulation(population->store);
  Report(cached, temp, "a1");
  Report(fresh, temp, "b1");
  CHECK(Served(cached) == kOlderDates);
  for (testing::ReportPopulation* population : {&cached, &fresh}) {
    testing::ImportCsv(population->store, InputKind::kDispensing,
                       "patient_id,practice,dispensed_on,product,quantity,days_supply\n"
                       "ZQ7102,A1,2024-06-15,Ramipril 5mg capsules,28,31\n");
  }
  REQUIRE(fresh.store.ClearCensusFigures().ok());
  auto model = BuildReportModel(cached.store, cached.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  CHECK(model->census_cache.served.empty());
  CHECK(model->census_cache.counted.empty());
  CHECK(model->capped_patients.size() == 1);
  CHECK(Report(cached, temp, "a2") == Report(fresh, temp, "b2"));
}

TEST_CASE("other criteria use saved figures of their own") {
  testing::ReportPopulation population;
  TempFolder temp;
  Report(population, temp, "a");
  ReportConfig config = testing::TestConfig();
  config.criteria.pop_back();
  auto cache = OpenCensusCache(population.store, config, population.analysis,
                               {Date::FromCivil(2024, 5, 31), Date::FromCivil(2024, 6, 30)}, Date::FromCivil(2024, 6, 30));
  REQUIRE(cache.ok());
  CHECK(cache->served.empty());
}

}  // TEST_SUITE

}  // namespace medload
