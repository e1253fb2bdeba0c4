#include "medload/report/report_pages.h"

#include <doctest/doctest.h>

#include "report/report_fixture.h"

namespace medload {
namespace {

std::map<std::string, PracticeFiles> Files(const ReportModel& model) {
  std::map<std::string, PracticeFiles> files;
  for (const ReportSeries& s : model.practices) {
    files[s.code] = PracticeFiles{"practice-" + s.code + ".html", "worklist-" + s.code + ".csv", "digests/x.eml"};
  }
  return files;
}

}  // namespace

TEST_SUITE("report/report_pages") {

TEST_CASE("the overview has a table, a trend chart and a funnel plot per criterion and any") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const std::string html = IndexHtml(*model, Files(*model), {"A1"});
  CHECK(html.find("<h2>acb&gt;=3</h2>") != std::string::npos);
  CHECK(html.find("<h2>items&gt;=2</h2>") != std::string::npos);
  CHECK(html.find("<h2>any</h2>") != std::string::npos);
  size_t funnels = 0;
  for (size_t at = html.find("class=\"funnel\""); at != std::string::npos; at = html.find("class=\"funnel\"", at + 1)) {
    ++funnels;
  }
  CHECK(funnels == 3);
  // A1 on 2024-06-30 (after its latest dispensing, 2024-06-01: beyond the data): 6 patients
  // with acb>=3, 750 per 1000, up 6 since the previous month.
  CHECK(html.find("<td>A1</td><td>Alder &lt;script&gt;alert(1)&lt;/script&gt; Surgery</td><td class=\"num\">8</td>"
                  "<td>beyond-data</td><td class=\"num\">6</td><td class=\"num\">750</td><td class=\"num\">+6</td>") !=
        std::string::npos);
  CHECK(html.find("<script") == std::string::npos);
  CHECK(html.find("class=\"caution\"") != std::string::npos);
  CHECK(html.find("href=\"digests/x.eml\"") != std::string::npos);
}

TEST_CASE("a practice page shows its measures, its trend and its worklist with reasons") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const auto files = Files(*model);
  const std::string html = PracticeHtml(*model, 0, files.at("A1"));
  CHECK(html.find("<title>Test Vale report: A1 Alder &lt;script&gt;") != std::string::npos);
  CHECK(html.find("href=\"index.html\"") != std::string::npos);
  CHECK(html.find("8 of 8 registered patients meet acb&gt;=3 or items&gt;=2 on 2024-06-30") != std::string::npos);
  CHECK(html.find("not a clinical priority") != std::string::npos);
  CHECK(html.find("patient-level files") != std::string::npos);
  CHECK(html.find("ZQ7102") != std::string::npos);
  // Furosemide scores 1 on the bundled ACB table, so these patients score 7.
  CHECK(html.find("ACB 7: amitriptyline 3, oxybutynin 3, furosemide 1") != std::string::npos);
  CHECK(html.find("<svg") != std::string::npos);
  CHECK(html.find("ZQ7110") == std::string::npos);  // a patient of the other practice
}

TEST_CASE("a practice page withholds a meeting count below the suppression threshold, with the note") {
  testing::ReportPopulation population;
  auto config = testing::TestConfig();
  config.suppress_below = 10;  // A1: 8 patients meet a criterion
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  const auto files = Files(*model);
  const std::string html = PracticeHtml(*model, 0, files.at("A1"));
  CHECK(html.find("8 of 8") == std::string::npos);
  CHECK(html.find("fewer than 10 of 8 registered patients meet") != std::string::npos);
  CHECK(html.find("(below 10) are withheld") != std::string::npos);
  // Without a threshold the count is shown.
  auto plain = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(plain.ok());
  CHECK(PracticeHtml(*plain, 0, files.at("A1")).find("8 of 8 registered patients meet") != std::string::npos);
}

TEST_CASE("report warnings name each practice's dates in short history and beyond its data") {
  testing::ReportPopulation population;  // dispensings from 2024-01-01 to 2024-06-01
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  // Census dates 2024-01-31 .. 2024-06-30: the first two are in the first 84 days of the
  // data; 2024-06-30 is after the latest dispensing. One note of each per practice.
  const std::vector<std::string> warnings = ReportWarnings(*model);
  REQUIRE(warnings.size() == 4);
  CHECK(warnings[0] == "practice A1: 2024-01-31 to 2024-02-29 (2 dates) within the first 84 days of its data (from "
                       "2024-01-01), marked short-history: supplies dispensed before then are missing, so figures may "
                       "be too low and changes are not computed against them");
  CHECK(warnings[1] == "practice A1: 2024-06-30 after its latest dispensing loaded (2024-06-01), marked beyond-data: "
                       "supplies and tails running then count, refills collected since are not loaded");
  CHECK(warnings[2].rfind("practice B/../<b>: 2024-01-31 to 2024-02-29", 0) == 0);
  const std::string index = IndexHtml(*model, Files(*model), {});
  CHECK(index.find("<strong>Warning:</strong> practice A1: 2024-06-30 after its latest dispensing") != std::string::npos);
  const std::string code = "A1";
  CHECK(ReportWorklist(*model, code).notes == ReportWarnings(*model, &code));
  CHECK(ReportWorklist(*model, code).notes.size() == 2);
  CHECK(model->practices[0].data.front() == DataState::kShortHistory);
  CHECK(model->practices[0].data[2] == DataState::kFull);
  CHECK(model->practices[0].data.back() == DataState::kBeyondData);
}

}

}  // namespace medload
