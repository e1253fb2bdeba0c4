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
  // A1 on 2024-06-30: 6 patients with acb>=3, 750 per 1000, up 6 since the previous month.
  CHECK(html.find("<td>A1</td><td>Alder &lt;script&gt;alert(1)&lt;/script&gt; Surgery</td><td class=\"num\">8</td>"
                  "<td class=\"num\">6</td><td class=\"num\">750</td><td class=\"num\">+6</td>") != std::string::npos);
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

TEST_CASE("report warnings name a census date after the latest dispensing loaded") {
  testing::ReportPopulation population;  // the latest dispensing is 2024-06-01
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  REQUIRE(ReportWarnings(*model).size() == 1);
  CHECK(ReportWarnings(*model)[0].rfind("the census date 2024-06-30 is 29 days after", 0) == 0);
  const std::string index = IndexHtml(*model, Files(*model), {});
  CHECK(index.find("<strong>Warning:</strong> the census date 2024-06-30") != std::string::npos);
  CHECK(ReportWorklist(*model, "A1").notes == ReportWarnings(*model));
  model->on = Date::FromCivil(2024, 6, 1);
  CHECK(ReportWarnings(*model).empty());
}

}

}  // namespace medload
