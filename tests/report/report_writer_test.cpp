#include "medload/report/report_writer.h"

#include <doctest/doctest.h>

#include <algorithm>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "medload/report/report_files.h"
#include "report/report_fixture.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

std::string ReadAll(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Every file under `dir` with its bytes, run.json's generated_at line left out.
std::map<std::string, std::string> Snapshot(const std::string& dir) {
  std::map<std::string, std::string> files;
  for (const auto& entry : std::filesystem::recursive_directory_iterator(dir)) {
    if (!entry.is_regular_file()) continue;
    std::string text = ReadAll(entry.path());
    if (entry.path().filename() == "run.json") {
      const size_t at = text.find("\"generated_at\"");
      text.erase(at, text.find('\n', at) - at);
    }
    files[std::filesystem::relative(entry.path(), dir).string()] = text;
  }
  return files;
}

ReportRunOptions Options(const std::string& out, const std::string& generated_at) {
  ReportRunOptions options;
  options.out_dir = out;
  options.generated_at = generated_at;
  return options;
}

}  // namespace

TEST_SUITE("report/report_writer") {

TEST_CASE("the report folder holds the overview, a page, worklist and digest per practice, cohort and run files") {
  testing::ReportPopulation population;
  TempFolder temp;
  auto outcome = RunReport(population.store, population.analysis, testing::TestConfig(),
                           Options(temp.File("out"), "2024-07-01T00:00:00Z"));
  REQUIRE(outcome.ok());
  const std::string stem = SafeFileStem(testing::kOddPractice).value();
  const std::vector<std::string> expected = {
      "cohort.csv", "cohort.json", "digests/A1.eml", "index.html", "practice-" + stem + ".html",
      "practice-A1.html", "run.json", "worklist-" + stem + ".csv", "worklist-A1.csv"};
  std::vector<std::string> sorted = expected;
  std::sort(sorted.begin(), sorted.end());
  CHECK(outcome->files == sorted);
  CHECK(outcome->digests == std::vector<std::string>{"A1"});
  for (const std::string& file : expected) CHECK(std::filesystem::exists(temp.File("out/" + file)));
  const nlohmann::json run = nlohmann::json::parse(ReadAll(temp.File("out/run.json")));
  CHECK(run.at("census_date") == "2024-06-30");
  CHECK(run.at("census_dates").size() == 6);
  CHECK(run.at("generated_at") == "2024-07-01T00:00:00Z");
  CHECK(run.at("data").at("patients") == 14);
  CHECK(run.at("data").at("earliest_dispensed") == "2024-01-01");
  CHECK_FALSE(run.at("formulary_checksum").get<std::string>().empty());
  CHECK(run.at("caution").get<std::string>().rfind("CAUTION", 0) == 0);
  CHECK(ReadAll(temp.File("out/cohort.csv")).rfind("\"# CAUTION", 0) == 0);
  CHECK(nlohmann::json::parse(ReadAll(temp.File("out/cohort.json"))).contains("caution"));
}

TEST_CASE("a census date beyond the data is warned of in run.json, the pages and the worklist CSVs") {
  testing::ReportPopulation population;  // the latest dispensing is 2024-06-01
  TempFolder temp;
  auto outcome = RunReport(population.store, population.analysis, testing::TestConfig(),
                           Options(temp.File("out"), "2024-07-01T00:00:00Z"));
  REQUIRE(outcome.ok());
  const std::string warning = "practice A1: 2024-06-30 after its latest dispensing loaded (2024-06-01), marked beyond-data";
  auto beyond = [&](const std::vector<std::string>& warnings) {
    return std::count_if(warnings.begin(), warnings.end(),
                         [](const std::string& w) { return w.find("marked beyond-data") != std::string::npos; });
  };
  CHECK(beyond(outcome->warnings) == 2);  // both practices
  const nlohmann::json run = nlohmann::json::parse(ReadAll(temp.File("out/run.json")));
  CHECK(run.at("warnings").get<std::vector<std::string>>() == outcome->warnings);
  CHECK(ReadAll(temp.File("out/index.html")).find(warning) != std::string::npos);
  CHECK(ReadAll(temp.File("out/practice-A1.html")).find(warning) != std::string::npos);
  CHECK(ReadAll(temp.File("out/worklist-A1.csv")).find("\"# note: " + warning) != std::string::npos);
  // "latest" takes the last month end on or before the data: nothing beyond the data, and
  // 2023-12-31, before the data begin, has no figures.
  auto config = testing::TestConfig();
  config.on.reset();
  auto latest = RunReport(population.store, population.analysis, config, Options(temp.File("latest"), "x"));
  REQUIRE(latest.ok());
  CHECK(latest->on == Date::FromCivil(2024, 5, 31));
  CHECK(beyond(latest->warnings) == 0);
  CHECK(std::any_of(latest->warnings.begin(), latest->warnings.end(), [](const std::string& w) {
    return w == "practice A1: no figures for 2023-12-31, before its data begin on 2024-01-01";
  }));
}

TEST_CASE("a report worklist CSV gives the census date, what the rank means and what the limit left out") {
  testing::ReportPopulation population;
  TempFolder temp;
  auto config = testing::TestConfig();
  config.worklist_limit = 3;
  auto outcome = RunReport(population.store, population.analysis, config, Options(temp.File("out"), "x"));
  REQUIRE(outcome.ok());
  const std::string csv = ReadAll(temp.File("out/worklist-A1.csv"));
  CHECK(csv.rfind("\"# CAUTION", 0) == 0);
  CHECK(csv.compare(csv.find('\n') + 1, 28, "\"# census date: 2024-06-30\"\n") == 0);
  CHECK(csv.find("not a clinical priority") != std::string::npos);
  // A1 has 8 meeting patients; 3 are listed.
  CHECK(csv.find("\"# note: 5 more patient(s) who meet the criteria are not shown: the list stops at the first 3\"\n") !=
        std::string::npos);
}

TEST_CASE("every value from the data is escaped in the pages") {
  testing::ReportPopulation population;
  TempFolder temp;
  auto outcome = RunReport(population.store, population.analysis, testing::TestConfig(),
                           Options(temp.File("out"), "t"));
  REQUIRE(outcome.ok());
  for (const std::string& file : outcome->files) {
    if (file.size() < 5 || file.substr(file.size() - 5) != ".html") continue;
    CAPTURE(file);
    const std::string html = ReadAll(temp.File("out/" + file));
    CHECK(html.find("<script") == std::string::npos);
    CHECK(html.find("<b>") == std::string::npos);
    CHECK(html.find("class=\"caution\"") != std::string::npos);
    CHECK(html.find("<svg") != std::string::npos);
    CHECK(html.find("http://") == html.find("http://www.w3.org/2000/svg"));  // no external fetch
  }
  const std::string index = ReadAll(temp.File("out/index.html"));
  CHECK(index.find("Alder &lt;script&gt;alert(1)&lt;/script&gt; Surgery") != std::string::npos);
  CHECK(index.find("Odd &amp; Sons") != std::string::npos);
  CHECK(index.find("class=\"funnel\"") != std::string::npos);
}

TEST_CASE("no digest byte carries a patient identifier") {
  testing::ReportPopulation population;
  TempFolder temp;
  auto outcome = RunReport(population.store, population.analysis, testing::TestConfig(),
                           Options(temp.File("out"), "t"));
  REQUIRE(outcome.ok());
  REQUIRE_FALSE(outcome->digests.empty());
  for (const auto& entry : std::filesystem::directory_iterator(temp.File("out/digests"))) {
    const std::string bytes = ReadAll(entry.path());
    for (const std::string& id : testing::PatientIds()) {
      CAPTURE(id);
      CHECK(bytes.find(id) == std::string::npos);
    }
  }
  // The worklist pages do name patients: the test would notice if identifiers vanished.
  CHECK(ReadAll(temp.File("out/practice-A1.html")).find("ZQ710") != std::string::npos);
}

TEST_CASE("the same config on the same data writes the same files, timestamps aside") {
  testing::ReportPopulation population;
  TempFolder temp;
  const ReportConfig config = testing::TestConfig();
  REQUIRE(RunReport(population.store, population.analysis, config, Options(temp.File("a"), "2024-07-01T00:00:00Z")).ok());
  REQUIRE(RunReport(population.store, population.analysis, config, Options(temp.File("b"), "2024-07-02T09:30:00Z")).ok());
  const auto a = Snapshot(temp.File("a"));
  const auto b = Snapshot(temp.File("b"));
  CHECK(a.size() == 9);
  CHECK(a == b);
}

TEST_CASE("a later report compares with the saved earlier report") {
  testing::ReportPopulation population;
  TempFolder temp;
  ReportConfig config = testing::TestConfig();
  config.on = Date::FromCivil(2024, 4, 30);
  REQUIRE(RunReport(population.store, population.analysis, config, Options(temp.File("april"), "t")).ok());
  config.on = Date::FromCivil(2024, 6, 30);
  auto june = RunReport(population.store, population.analysis, config, Options(temp.File("june"), "t"));
  REQUIRE(june.ok());
  const std::string digest = ReadAll(temp.File("june/digests/A1.eml"));
  CHECK(digest.find("Compared with: the report of 2024-04-30") != std::string::npos);
  CHECK(digest.find("- acb>=3: up 6 patients since 2024-04-30") != std::string::npos);
  const nlohmann::json run = nlohmann::json::parse(ReadAll(temp.File("june/run.json")));
  CHECK(run.at("previous_report") == "2024-04-30");
}

TEST_CASE("a stale digest from an earlier run into the same folder is removed") {
  testing::ReportPopulation population;
  TempFolder temp;
  ReportConfig config = testing::TestConfig();
  REQUIRE(RunReport(population.store, population.analysis, config, Options(temp.File("out"), "t")).ok());
  REQUIRE(std::filesystem::exists(temp.File("out/digests/A1.eml")));
  config.digests.triggers.rise_patients = 100;
  REQUIRE(RunReport(population.store, population.analysis, config, Options(temp.File("out"), "t")).ok());
  CHECK_FALSE(std::filesystem::exists(temp.File("out/digests/A1.eml")));
}

}

}  // namespace medload
