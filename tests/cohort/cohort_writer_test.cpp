#include "medload/cohort/cohort_writer.h"

#include <doctest/doctest.h>

#include <sstream>

#include "cohort/population_fixture.h"
#include "medload/core/caution.h"

namespace medload {
namespace {

using testing::D;

CohortTable SmallTable(long suppress_below) {
  CohortTally tally;
  tally.criteria = {"items>=10"};
  tally.dates = {D(2024, 1, 31)};
  tally.measure = "concurrent";
  CohortCell cell;
  cell.registered = 50;
  cell.registered_by_band[15] = 50;
  cell.counts = {2, 2};
  cell.counts_by_band = {{}, {}};
  cell.counts_by_band[0][15] = 2;
  cell.counts_by_band[1][15] = 2;
  tally.groups["<A&B>"] = {cell};
  return BuildCohortTable(tally, suppress_below, 84);
}

TEST_SUITE("cohort/cohort_writer") {

TEST_CASE("the CSV starts with the caution and has one line per date, group and criterion") {
  std::ostringstream out;
  WriteCohortCsv(out, SmallTable(0));
  const std::string text = out.str();
  CHECK(text.rfind("\"# " + std::string(kCaution) + "\"\n", 0) == 0);
  CHECK(text.find("date,group,registered,data,practices_without_data,criterion,count,rate_per_1000,") !=
        std::string::npos);
  CHECK(text.find("2024-01-31,<A&B>,50,full,0,items>=10,2,40,40,") != std::string::npos);
  CHECK(text.find("2024-01-31,<A&B>,50,full,0,any,2,40,40,") != std::string::npos);
}

TEST_CASE("suppressed CSV cells are empty and flagged") {
  std::ostringstream out;
  WriteCohortCsv(out, SmallTable(5));
  CHECK(out.str().find("2024-01-31,<A&B>,50,full,0,items>=10,,,,,,yes") != std::string::npos);
}

TEST_CASE("the text table shows withheld counts as below the threshold and ends with the caution") {
  std::ostringstream out;
  WriteCohortText(out, SmallTable(5));
  const std::string text = out.str();
  CHECK(text.find("<5") != std::string::npos);
  CHECK(text.find("Secondary disclosure") != std::string::npos);
  CHECK(text.find("CAUTION:") != std::string::npos);
}

TEST_CASE("the HTML page has the banner, an escaped group and a trend chart") {
  std::ostringstream out;
  WriteCohortHtml(out, SmallTable(0));
  const std::string html = out.str();
  CHECK(html.find("CAUTION:") != std::string::npos);
  CHECK(html.find("&lt;A&amp;B&gt;") != std::string::npos);
  CHECK(html.find("<A&B>") == std::string::npos);
  CHECK(html.find("<svg") != std::string::npos);
}

TEST_CASE("a table's warnings appear in the text, CSV, HTML and JSON") {
  CohortTable table = SmallTable(0);
  const std::string warning = "the census date 2024-01-31 is 30 days after the latest dispensing loaded (2024-01-01)";
  std::ostringstream text;
  WriteCohortText(text, table);
  CHECK(text.str().find("Warning:") == std::string::npos);
  CHECK(CohortJson(table, nullptr).at("notes").empty());
  table.notes = {warning};
  std::ostringstream text_with, csv, html;
  WriteCohortText(text_with, table);
  WriteCohortCsv(csv, table);
  WriteCohortHtml(html, table);
  CHECK(text_with.str().find("Warning: " + warning + ".") != std::string::npos);
  CHECK(html.str().find("Warning: " + warning + ".") != std::string::npos);
  // CSV: the caution first, then the warning as a comment line, then the header.
  const std::string lines = csv.str();
  const std::string note = "\"# note: " + warning + "\"\n";
  CHECK(lines.compare(lines.find('\n') + 1, note.size(), note) == 0);
  CHECK(CohortJson(table, nullptr).at("notes") == nlohmann::json::array({warning}));
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
