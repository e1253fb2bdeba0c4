#include "medload/cohort/cohort_wide_writer.h"

#include <doctest/doctest.h>

#include <sstream>

#include "cohort/population_fixture.h"
#include "medload/core/caution.h"
#include "medload/format/output.h"

namespace medload {
namespace {

using testing::D;

CohortCell Cell(long registered, long count) {
  CohortCell cell;
  cell.registered = registered;
  cell.registered_by_band[15] = registered;
  cell.counts = {count, count};
  cell.counts_by_band = {{}, {}};
  cell.counts_by_band[0][15] = count;
  cell.counts_by_band[1][15] = count;
  return cell;
}

// Practice A01 over three month ends, its data beginning on 2024-01-15 (the first two
// dates are short-history with an 84-day window); B02 has 3 patients meeting on the last.
CohortTable ThreeMonths(long suppress_below) {
  CohortTally tally;
  tally.criteria = {"items>=10"};
  tally.dates = {D(2024, 1, 31), D(2024, 2, 29), D(2024, 5, 31)};
  tally.measure = "concurrent";
  tally.groups["A01"] = {Cell(200, 12), Cell(200, 14), Cell(250, 20)};
  tally.groups["B02"] = {Cell(100, 0), Cell(100, 0), Cell(100, 3)};
  tally.spans["A01"] = DataSpan{D(2024, 1, 15), D(2024, 6, 30)};
  tally.spans["B02"] = DataSpan{D(2023, 1, 1), D(2024, 6, 30)};
  tally.practices["A01"] = {"A01"};
  tally.practices["B02"] = {"B02"};
  return BuildCohortTable(tally, suppress_below, 84);
}

}  // namespace

TEST_SUITE("cohort/cohort_wide_writer") {

TEST_CASE("the wide layout has a row per group and a column per census date with count and rate") {
  const CohortTable table = ThreeMonths(0);
  CHECK(WideHeader(table) == std::vector<std::string>{"2024-01-31", "2024-02-29", "2024-05-31"});
  const auto rows = WideRows(table, 0);
  REQUIRE(rows.size() == 2);
  // 12 of 200 = 60 per 1000, short history; 20 of 250 = 80 per 1000.
  CHECK(rows[0] == std::vector<std::string>{"A01", "12 (60) s", "14 (70) s", "20 (80)"});
  CHECK(rows[1] == std::vector<std::string>{"B02", "0 (0)", "0 (0)", "3 (30)"});
}

TEST_CASE("withheld counts read <N in the wide layout and are empty in its CSV") {
  const CohortTable table = ThreeMonths(5);
  CHECK(WideRows(table, 0)[1] == std::vector<std::string>{"B02", "0 (0)", "0 (0)", "<5"});
  std::ostringstream csv;
  WriteCohortWideCsv(csv, table);
  const std::string text = csv.str();
  CHECK(text.rfind(CsvCommentLine(kCaution), 0) == 0);  // one quoted field
  CHECK(text.find("\ngroup,criterion,figure,2024-01-31,2024-02-29,2024-05-31\n") != std::string::npos);
  CHECK(text.find("\nA01,,data,short-history,short-history,full\n") != std::string::npos);
  CHECK(text.find("\nA01,,registered,200,200,250\n") != std::string::npos);
  CHECK(text.find("\nA01,items>=10,count,12,14,20\n") != std::string::npos);
  CHECK(text.find("\nA01,items>=10,rate_per_1000,60,70,80\n") != std::string::npos);
  CHECK(text.find("\nB02,items>=10,count,0,0,\n") != std::string::npos);
  CHECK(text.find("\nB02,items>=10,rate_per_1000,0,0,\n") != std::string::npos);
}

TEST_CASE("the wide text and HTML give a block per criterion, the registered patients, the legend and the caution") {
  const CohortTable table = ThreeMonths(0);
  std::ostringstream text;
  WriteCohortWideText(text, table);
  const std::string t = text.str();
  CHECK(t.find("\nitems>=10: patients (per 1000 registered)\ngroup  2024-01-31") != std::string::npos);
  CHECK(t.find("\nany: patients (per 1000 registered)\n") != std::string::npos);
  CHECK(t.find("\nregistered patients\n") != std::string::npos);
  CHECK(t.find("s = short history") != std::string::npos);
  CHECK(t.find("CAUTION: this output supports clinical judgement") != std::string::npos);
  std::ostringstream html;
  WriteCohortWideHtml(html, table);
  const std::string h = html.str();
  CHECK(h.find("class=\"caution\"") < h.find("<h2>items&gt;=10: patients (per 1000 registered)</h2>"));
  CHECK(h.find("<td>12 (60) s</td>") != std::string::npos);
  CHECK(h.find("<svg") != std::string::npos);
}

}  // TEST_SUITE

}  // namespace medload
