#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "cohort/population_fixture.h"
#include "medload/cohort/cohort_writer.h"

namespace medload {
namespace {

using testing::D;

CohortTable TwoGroups() {
  CohortTally tally;
  tally.criteria = {"acb>=3"};
  tally.dates = {D(2024, 1, 31), D(2024, 2, 29), D(2024, 3, 31)};
  for (const char* group : {"A01", "B02"}) {
    for (long d = 0; d < 3; ++d) {
      CohortCell cell;
      cell.registered = 100;
      cell.counts = {10 + d * 5, 10 + d * 5};
      cell.counts_by_band = {{}, {}};
      tally.groups[group].push_back(cell);
    }
  }
  tally.groups["B02"][1].counts = {2, 2};  // suppressed below 5: a gap in B02's line
  return BuildCohortTable(tally, 5, 84);
}

size_t Occurrences(const std::string& text, const std::string& needle) {
  size_t n = 0;
  for (size_t at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) ++n;
  return n;
}

TEST_SUITE("cohort/cohort_chart") {

TEST_CASE("the trend chart has a title, axis labels and a text label per group") {
  const std::string svg = CohortTrendSvg(TwoGroups(), 0);
  CHECK(svg.rfind("<svg", 0) == 0);
  CHECK(svg.find("acb&gt;=3: rate per 1000 registered, by practice") != std::string::npos);
  CHECK(svg.find(">census date<") != std::string::npos);
  CHECK(svg.find(">rate per 1000 registered<") != std::string::npos);
  CHECK(svg.find(">A01</text>") != std::string::npos);
  CHECK(svg.find(">B02</text>") != std::string::npos);
  CHECK(svg.find(">2024-02-29<") != std::string::npos);
}

TEST_CASE("a suppressed point leaves a gap in its group's line") {
  const std::string svg = CohortTrendSvg(TwoGroups(), 0);
  // A01: three points on one line; B02: two points with a gap between, so no line.
  CHECK(Occurrences(svg, "<circle") == 5);
  CHECK(Occurrences(svg, "d=\"M") == 1);
  CHECK(Occurrences(svg, " M") == 0);
  CHECK(Occurrences(svg, " L") == 2);
}

TEST_CASE("dates without data leave no point; short-history and beyond-data points are drawn apart") {
  // One practice whose data begin on 2024-02-01 and end on 2024-04-20: January has no
  // figures, February and March fall in the first 84 days (short history), April 30 is
  // beyond the data; May... none. Points: hollow circles, a hollow square, dashed lines.
  CohortTally tally;
  tally.criteria = {"acb>=3"};
  tally.dates = {D(2024, 1, 31), D(2024, 2, 29), D(2024, 3, 31), D(2024, 4, 30)};
  for (size_t d = 0; d < 4; ++d) {
    CohortCell cell;
    cell.registered = 100;
    cell.counts = {10, 10};
    cell.counts_by_band = {{}, {}};
    tally.groups["A01"].push_back(cell);
  }
  tally.practices["A01"] = {"A01"};
  tally.spans["A01"] = DataSpan{D(2024, 2, 1), D(2024, 4, 20)};
  const CohortTable table = BuildCohortTable(tally, 0, 84);
  REQUIRE(table.rows.size() == 4);
  CHECK(table.rows[0].data == DataState::kNoData);
  CHECK_FALSE(table.rows[0].values[0].count.has_value());  // null, never 0
  CHECK(table.rows[1].data == DataState::kShortHistory);
  CHECK(table.rows[2].data == DataState::kShortHistory);
  CHECK(table.rows[3].data == DataState::kBeyondData);
  const std::string svg = CohortTrendSvg(table, 0);
  CHECK(Occurrences(svg, "<title>short history</title>") == 2);
  CHECK(Occurrences(svg, "<title>beyond the data</title>") == 1);
  CHECK(Occurrences(svg, "stroke-dasharray=\"5 4\"") == 1);  // one dashed path, no solid one
  CHECK(Occurrences(svg, "d=\"M") == 1);
}

TEST_CASE("group labels at the line ends stay apart and above the date labels") {
  CohortTally tally;
  tally.criteria = {"items>=10"};
  tally.dates = {D(2024, 1, 31), D(2024, 2, 29)};
  for (const char* group : {"A01", "B02", "C03", "D04"}) {
    CohortCell cell;
    cell.registered = 100;
    cell.counts = {0, 0};  // every line ends on the x axis
    cell.counts_by_band = {{}, {}};
    tally.groups[group] = {cell, cell};
  }
  const std::string svg = CohortTrendSvg(BuildCohortTable(tally, 0, 84), 0);
  // Labels are the texts placed right of the plot (x = 760 - 150 + 8 = 618).
  const std::string marker = "<text x=\"618\" y=\"";
  std::vector<double> ys;
  for (size_t at = svg.find(marker); at != std::string::npos; at = svg.find(marker, at + 1)) {
    ys.push_back(std::stod(svg.substr(at + marker.size())));
  }
  REQUIRE(ys.size() == 4);
  for (size_t i = 0; i < ys.size(); ++i) {
    CAPTURE(i);
    CHECK(ys[i] <= 340 - 56 + 4);             // not below the x axis
    if (i > 0) CHECK(ys[i] - ys[i - 1] >= 12 - 1e-9);  // not overlapping the one above
  }
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
