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

// The header cells of each HTML table of `html`, table by table.
std::vector<std::vector<std::string>> TableHeaders(const std::string& html) {
  std::vector<std::vector<std::string>> tables;
  for (size_t at = html.find("<thead>"); at != std::string::npos; at = html.find("<thead>", at + 1)) {
    const size_t end = html.find("</thead>", at);
    tables.emplace_back();
    for (size_t cell = html.find("<th scope=\"col\">", at); cell < end; cell = html.find("<th scope=\"col\">", cell + 1)) {
      const size_t open = cell + std::string("<th scope=\"col\">").size();
      tables.back().push_back(html.substr(open, html.find("</th>", open) - open));
    }
  }
  return tables;
}

TEST_CASE("the HTML gives each criterion narrow tables: months as columns, at most 12 a table, then the detail") {
  // 14 month ends, one practice whose data begin in the second month and end in the 13th:
  // no figures, short history, full and beyond-data months; one withheld count.
  CohortTally tally;
  tally.criteria = {"items>=10"};
  for (int m = 1; m <= 14; ++m) tally.dates.push_back(EndOfMonth(D(2024 + (m - 1) / 12, (m - 1) % 12 + 1, 1)));
  for (size_t d = 0; d < tally.dates.size(); ++d) {
    CohortCell cell;
    cell.registered = 200;
    cell.counts = {d == 6 ? 2L : 10L, d == 6 ? 2L : 10L};
    cell.counts_by_band = {{}, {}};
    tally.groups["A01"].push_back(cell);
  }
  tally.practices["A01"] = {"A01"};
  tally.spans["A01"] = DataSpan{D(2024, 2, 1), D(2025, 1, 20)};
  std::ostringstream out;
  WriteCohortHtml(out, BuildCohortTable(tally, 5, 84));
  const std::string html = out.str();
  const auto tables = TableHeaders(html);
  REQUIRE(tables.size() == 6);  // per criterion (items>=10, any): two month tables, one detail
  CHECK(tables[0].size() == 13);
  CHECK(tables[0][0] == "group");
  CHECK(tables[0][1] == "2024-01");
  CHECK(tables[0][12] == "2024-12");
  CHECK(tables[1] == std::vector<std::string>{"group", "2025-01", "2025-02"});
  CHECK(tables[2] == std::vector<std::string>{"date", "group", "registered", "data", "patients", "per 1000",
                                              "ESP2013 per 1000 (95% CI)"});
  // January: no figures; February and March (within 84 days of 1 February): short
  // history; July: withheld; February 2025: beyond the data.
  CHECK(html.find("<tr><td>A01</td><td>-</td><td>50 s</td><td>50 s</td><td class=\"num\">50</td>") !=
        std::string::npos);
  CHECK(html.find("<td>&lt;5</td>") != std::string::npos);
  CHECK(html.find("<td>50 b</td></tr>") != std::string::npos);
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
