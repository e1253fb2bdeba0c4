#include <doctest/doctest.h>

#include "medload/report/report_pages.h"
#include "report/report_fixture.h"

namespace medload {
namespace {

size_t Count(const std::string& text, const std::string& needle) {
  size_t n = 0;
  for (size_t at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) ++n;
  return n;
}

}  // namespace

TEST_SUITE("report/report_charts") {

TEST_CASE("a funnel plot has a title, axis labels, the network line, four limit curves and a point per practice") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const std::string svg = FunnelSvg(*model, 0);
  CHECK(svg.find("<title>acb&gt;=3: rate per 1000 against list size, 2024-06-30</title>") != std::string::npos);
  CHECK(svg.find("Registered patients on the census date") != std::string::npos);
  CHECK(svg.find("Patients per 1000") != std::string::npos);
  CHECK(svg.find("network rate 428.6") != std::string::npos);  // 6 of 14 registered
  CHECK(Count(svg, "<polyline") == 4);
  CHECK(Count(svg, "stroke-dasharray=\"6 4\"") == 3);  // two 95% curves and the legend
  CHECK(Count(svg, "stroke-dasharray=\"2 3\"") == 3);  // two 99.8% curves and the legend
  CHECK(Count(svg, "<circle") == 3);                   // two practices and the legend
  CHECK(svg.find(">A1</text>") != std::string::npos);
  CHECK(svg.find("&lt;b&gt;") != std::string::npos);   // the odd code, escaped
}

TEST_CASE("a practice whose count is withheld is left out of the funnel plot") {
  testing::ReportPopulation population;
  ReportConfig config = testing::TestConfig();
  config.suppress_below = 7;  // A1 has 6 patients with acb>=3: withheld; the odd practice 0: shown
  auto model = BuildReportModel(population.store, population.analysis, config, {}, {});
  REQUIRE(model.ok());
  const std::string svg = FunnelSvg(*model, 0);
  CHECK(Count(svg, "<circle") == 2);
  CHECK(svg.find(">A1</text>") == std::string::npos);
}

TEST_CASE("the report's cohort table holds the practices and the network total") {
  testing::ReportPopulation population;
  auto model = BuildReportModel(population.store, population.analysis, testing::TestConfig(), {}, {});
  REQUIRE(model.ok());
  const CohortTable table = ReportCohortTable(*model);
  CHECK(table.groups == std::vector<std::string>{"A1", testing::kOddPractice, "network total"});
  const CohortRow& last = table.rows.back();
  CHECK(last.group == "network total");
  CHECK(last.registered == 14);
  CHECK(*last.values[0].count == 6);
  const std::string a1 = "A1";
  const CohortTable one = ReportCohortTable(*model, &a1);
  CHECK(one.groups == std::vector<std::string>{"A1", "network total"});
  CHECK(one.rows.back().registered == 14);
}

}

}  // namespace medload
