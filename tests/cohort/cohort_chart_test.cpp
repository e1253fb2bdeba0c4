#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "cohort/population_fixture.h"
#include "medload/cohort/cohort_chart.h"
#include "medload/cohort/cohort_writer.h"
#include "format/svg_checks.h"

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

// A table of `groups` practices over 13 month ends with varied rates, every line ending
// near the others (the hardest case for end labels), and a network total.
CohortTable ManyGroups(size_t groups, const std::string& long_name = "") {
  CohortTally tally;
  tally.criteria = {"items>=10"};
  for (int m = 1; m <= 12; ++m) tally.dates.push_back(EndOfMonth(D(2025, m, 1)));
  tally.dates.push_back(D(2026, 1, 31));
  for (size_t g = 0; g < groups; ++g) {
    std::string name = "NW" + std::string(g < 9 ? "0" : "") + std::to_string(g + 1);
    if (g == 0 && !long_name.empty()) name = long_name;
    for (size_t d = 0; d < tally.dates.size(); ++d) {
      CohortCell cell;
      cell.registered = 200;
      const long count = d + 1 == tally.dates.size() ? 20 : static_cast<long>((g * 7 + d * 3) % 40);
      cell.counts = {count, count};
      cell.counts_by_band = {{}, {}};
      tally.groups[name].push_back(cell);
      if (g == 0) tally.groups["network total"].push_back(cell);
    }
  }
  return BuildCohortTable(tally, 0, 84);
}

TEST_CASE("no two texts of a trend chart overlap and none leaves the drawing, for 1 to 50 groups") {
  for (const size_t groups : std::vector<size_t>{1, 2, 3, 5, 6, 13, 50}) {
    CAPTURE(groups);
    const CohortTable table = ManyGroups(groups, "Gorse Square Health Centre & Branch Site at the Old Mill");
    for (const bool with_reference : {false, true}) {
      CAPTURE(with_reference);
      TrendStyle style;
      if (with_reference) style.reference = "network total";
      const std::string svg = CohortTrendSvg(table, 0, style);
      CHECK(testing::Listed(testing::Overlaps(testing::TextBoxes(svg))) == "");
      CHECK(testing::Listed(testing::OutsideDrawing(svg)) == "");
      // Every group is named, in full or cut with an ellipsis.
      CHECK(Occurrences(svg, ">NW") + Occurrences(svg, ">Gorse") == groups);
    }
  }
}

TEST_CASE("up to five groups share one plot with end labels; more get a panel each") {
  TrendStyle style;
  style.reference = "network total";
  const std::string five = CohortTrendSvg(ManyGroups(5), 0, style);
  CHECK(Occurrences(five, "class=\"panel\"") == 0);
  CHECK(five.find(">network total</text>") != std::string::npos);  // labelled like the others
  CHECK(five.find(">census date<") != std::string::npos);
  const std::string six = CohortTrendSvg(ManyGroups(6), 0, style);
  CHECK(Occurrences(six, "class=\"panel\"") == 6);
  CHECK(six.find("Grey line: network total.") != std::string::npos);
  CHECK(Occurrences(six, "stroke=\"#9a9a9a\"") == 6);  // the total behind each panel's line
  CHECK(six.find(">NW06</text>") != std::string::npos);
}

TEST_CASE("a group keeps the colour it is given, the reference is near-black, and names are escaped") {
  CohortTable table = ManyGroups(2);
  table.groups[0] = "<b>&";
  for (CohortRow& row : table.rows) {
    if (row.group == "NW01") row.group = "<b>&";
  }
  TrendStyle style;
  style.reference = "network total";
  style.colours = SeriesColours({"<b>&", "NW00", "NW02"});  // NW00 only shifts the others
  const std::string svg = CohortTrendSvg(table, 0, style);
  CHECK(svg.find("fill=\"" + std::string(style.colours->Of("NW02")) + "\">NW02</text>") != std::string::npos);
  CHECK(svg.find("fill=\"" + std::string(kReferenceColour) + "\">network total</text>") != std::string::npos);
  CHECK(svg.find("&lt;b&gt;&amp;") != std::string::npos);
  CHECK(svg.find("<b>") == std::string::npos);
}

TEST_CASE("date labels under a long series skip dates so that they stand apart") {
  CohortTally tally;
  tally.criteria = {"items>=10"};
  for (int y = 2024; y <= 2026; ++y) {
    for (int m = 1; m <= 12; ++m) tally.dates.push_back(EndOfMonth(D(y, m, 1)));
  }
  CohortCell cell;
  cell.registered = 100;
  cell.counts = {5, 5};
  cell.counts_by_band = {{}, {}};
  tally.groups["A01"].assign(tally.dates.size(), cell);
  const std::string svg = CohortTrendSvg(BuildCohortTable(tally, 0, 84), 0);
  CHECK(testing::Listed(testing::Overlaps(testing::TextBoxes(svg))) == "");
  CHECK(svg.find(">2024-01-31<") != std::string::npos);
  CHECK(svg.find(">2024-02-29<") == std::string::npos);  // skipped: 36 dates do not fit
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
