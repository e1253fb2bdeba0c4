#include <doctest/doctest.h>

#include <algorithm>

#include "format/svg_checks.h"
#include "medload/report/funnel.h"
#include "medload/report/report_pages.h"
#include "report/report_fixture.h"

namespace medload {
namespace {

size_t Count(const std::string& text, const std::string& needle) {
  size_t n = 0;
  for (size_t at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) ++n;
  return n;
}

// A network of `practices` invented practices on one census date: list sizes from 60 to
// about 1000, rates spread around 100 per 1000 so that some practices fall outside the
// limits; `spread` (tenths of a percentage point per step) widens the spread.
ReportModel Network(int practices, long spread = 1) {
  ReportModel model;
  model.config.network = "Test Vale";
  model.on = Date::FromCivil(2026, 10, 31);
  model.dates = {model.on};
  model.keys = {"items>=10", "any"};
  model.network.code = "Test Vale";
  model.network.registered = {0};
  model.network.counts = {{0}, {0}};
  model.network.data = {DataState::kFull};
  for (int i = 1; i <= practices; ++i) {
    ReportSeries s;
    s.code = "NW" + std::string(i < 10 ? "0" : "") + std::to_string(i);
    const long n = 60 + (i * 379) % 950;
    const long count = std::clamp(n / 10 + spread * ((i * 7) % 11 - 5) * n / 1000, 0L, n);
    s.registered = {n};
    s.counts = {{count}, {count}};
    s.data = {DataState::kFull};
    model.network.registered[0] += n;
    model.network.counts[0][0] += count;
    model.network.counts[1][0] += count;
    model.practices.push_back(s);
  }
  return model;
}

size_t Labels(const std::string& svg) { return Count(svg, "stroke=\"#9a9a9a\" stroke-width=\"0.8\""); }

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

TEST_CASE("no two texts of a funnel plot overlap and none leaves the drawing, for 2 to 50 practices") {
  for (const int practices : {2, 3, 13, 24, 25, 50}) {
    for (const long spread : {0L, 3L, 10L, 30L}) {
      CAPTURE(practices);
      CAPTURE(spread);
      const ReportModel model = Network(practices, spread);
      std::vector<std::string> codes;
      for (const ReportSeries& s : model.practices) codes.push_back(s.code);
      const std::string svg = FunnelSvg(model, 0, SeriesColours(codes));
      CHECK(testing::Listed(testing::Overlaps(testing::TextBoxes(svg))) == "");
      CHECK(testing::Listed(testing::OutsideDrawing(svg)) == "");
      CHECK(Count(svg, "<circle") == static_cast<size_t>(practices) + 1);  // and the key's
    }
  }
}

TEST_CASE("every practice is labelled when the labels fit beside the funnel") {
  const std::string svg = FunnelSvg(Network(24, 30), 0);
  CHECK(Labels(svg) == 24);
  CHECK(svg.find("Every practice shown is labelled.") != std::string::npos);
  CHECK(svg.find(">NW24</text>") != std::string::npos);
}

TEST_CASE("with more practices than fit, only those outside the 95% limits are labelled, farthest first") {
  const ReportModel model = Network(50, 6);
  size_t outside = 0;
  const double p0 = static_cast<double>(model.network.counts[0][0]) / static_cast<double>(model.network.registered[0]);
  for (const ReportSeries& s : model.practices) {
    if (PositionOf(s.counts[0][0], s.registered[0], p0, 0.95) != FunnelPosition::kWithin) ++outside;
  }
  REQUIRE(outside > 0);
  REQUIRE(outside < 24);
  const std::string svg = FunnelSvg(model, 0);
  CHECK(Labels(svg) == outside);
  CHECK(svg.find("Labelled: " + std::to_string(outside) + " of 50 practices, those outside the 95% limits; the table "
                 "above gives each position.") != std::string::npos);
  // Far more outside than the column holds: the farthest are labelled and the note says so.
  const std::string crowded = FunnelSvg(Network(50, 60), 0);
  CHECK(Labels(crowded) == 24);
  CHECK(crowded.find("those outside the 95% limits farthest from the network rate") != std::string::npos);
}

TEST_CASE("a practice's point and label take the colour the report gives it") {
  const ReportModel model = Network(3, 30);
  const SeriesColours colours({"NW01", "NW02", "NW03"});
  const std::string svg = FunnelSvg(model, 0, colours);
  for (const char* code : {"NW01", "NW02", "NW03"}) {
    CAPTURE(code);
    const std::string colour(colours.Of(code));
    CHECK(svg.find("fill=\"" + colour + "\" stroke=\"#000\"><title>" + std::string(code) + ":") != std::string::npos);
    CHECK(svg.find("fill=\"" + colour + "\">" + std::string(code) + "</text>") != std::string::npos);
  }
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
