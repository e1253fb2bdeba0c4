// Text, CSV and HTML writers of a cohort table (JSON in cohort_json.cpp, the chart in
// cohort_chart.cpp).
#include "medload/cohort/cohort_writer.h"

#include <algorithm>
#include <map>
#include <ostream>

#include "medload/cohort/cohort_chart.h"
#include "medload/format/output.h"
#include "medload/format/suppression.h"

namespace medload {
namespace {

std::string CountText(const CohortRow& row, const CohortValue& value, long suppress_below) {
  if (!HasFigures(row.data)) return "no data";
  if (value.count) return std::to_string(*value.count);
  return "<" + std::to_string(suppress_below);
}

// The row's coverage, blank when full; with the practices left out of a group.
std::string DataText(const CohortRow& row) {
  std::string text = row.data == DataState::kFull ? "" : std::string(DataStateName(row.data));
  if (row.practices_without_data > 0) {
    text += (text.empty() ? "" : "; ") + std::to_string(row.practices_without_data) + " practice(s) without data left out";
  }
  return text;
}

std::string RateText(const std::optional<double>& rate) {
  return rate ? FormatNumber(*rate, 1) : "-";
}

std::string StandardisedText(const CohortValue& value) {
  if (!value.standardised) return "-";
  const StandardisedRate& rate = *value.standardised;
  std::string text = FormatNumber(rate.rate, 1);
  if (rate.lower && rate.upper) {
    text += " (" + FormatNumber(*rate.lower, 1) + "-" + FormatNumber(*rate.upper, 1) + ")";
  }
  return text;
}

std::string OptionalText(const std::optional<double>& value, int decimals) {
  return value ? FormatNumber(*value, decimals) : "";
}

// A census date as a column heading: "2026-10" when every date is a month end, else in full.
std::string DateHeading(const CohortTable& table, Date date) {
  for (const Date d : table.dates) {
    if (EndOfMonth(d) != d) return date.ToIso();
  }
  return date.ToIso().substr(0, 7);
}

// A cell of the month-by-month table: the rate, "<N" when withheld, "-" without figures or
// without anyone registered; marked "s" (short history) or "b" (beyond the data).
std::string MonthCell(const CohortRow& row, const CohortValue& value, long suppress_below) {
  if (!HasFigures(row.data)) return "-";
  std::string text = value.count ? RateText(value.rate) : "<" + std::to_string(suppress_below);
  if (row.data == DataState::kShortHistory) text += " s";
  if (row.data == DataState::kBeyondData) text += " b";
  return text;
}

// Criterion `key`'s rate per 1000, one row per group and one column per census date, in
// tables of at most 12 dates (so that each fits an A4 page across).
void WriteMonthColumns(std::ostream& out, const CohortTable& table, size_t key) {
  constexpr size_t kDatesPerTable = 12;
  std::map<std::pair<std::string, Date>, const CohortRow*> cells;
  for (const CohortRow& row : table.rows) cells[{row.group, row.date}] = &row;
  out << "<p class=\"note\">Rate per 1000 registered by census date (s: short history; b: beyond the data; "
         "-: no figures).</p>\n";
  for (size_t first = 0; first < table.dates.size(); first += kDatesPerTable) {
    const size_t last = std::min(table.dates.size(), first + kDatesPerTable);
    std::vector<std::string> header = {"group"};
    for (size_t d = first; d < last; ++d) header.push_back(DateHeading(table, table.dates[d]));
    std::vector<std::vector<std::string>> rows;
    for (const std::string& group : table.groups) {
      rows.push_back({group});
      for (size_t d = first; d < last; ++d) {
        const auto it = cells.find({group, table.dates[d]});
        rows.back().push_back(it == cells.end() ? "-" : MonthCell(*it->second, it->second->values[key], table.suppress_below));
      }
    }
    WriteHtmlTable(out, header, rows);
  }
}

}  // namespace

std::vector<std::string> CohortPreamble(const CohortTable& table) {
  std::vector<std::string> lines;
  std::string criteria;
  for (const std::string& key : table.criteria) criteria += (criteria.empty() ? "" : ", ") + key;
  lines.push_back("Cohort counts by " + std::string(GroupByName(table.group_by)) +
                  "; criteria: " + criteria + " (any = at least one)");
  lines.push_back("Measure: " + table.measure);
  if (!table.population.empty()) lines.push_back("Patients: " + table.population);
  lines.push_back("Rates per 1000 registered; standardised: European Standard Population 2013 "
                  "(patients of known age), 95% limits by Dobson et al. 1991.");
  if (!table.complete) {
    lines.push_back("INCOMPLETE: only " + table.shards + " were merged; counts are partial.");
  }
  lines.push_back(SuppressionNote(table.suppress_below));
  for (const std::string& note : table.notes) lines.push_back("Warning: " + note + ".");
  lines.push_back("Data coverage: no-data = before a practice's dispensing data begin (no figures); "
                  "short-history = within the first " + std::to_string(table.history_days) +
                  " days of its data (figures may be too low); beyond-data = after its latest dispensing "
                  "loaded.");
  return lines;
}

void WriteCohortText(std::ostream& out, const CohortTable& table) {
  for (const std::string& line : CohortPreamble(table)) out << line << "\n";
  out << "\n";
  std::vector<std::string> header = {"date", "group", "registered", "data"};
  for (const std::string& key : table.keys) {
    header.push_back(key);
    header.push_back("per 1000");
  }
  header.push_back("any ESP2013 per 1000 (95% CI)");
  std::vector<std::vector<std::string>> rows;
  for (const CohortRow& row : table.rows) {
    std::vector<std::string> cells = {row.date.ToIso(), row.group, std::to_string(row.registered), DataText(row)};
    for (const CohortValue& value : row.values) {
      cells.push_back(CountText(row, value, table.suppress_below));
      cells.push_back(RateText(value.rate));
    }
    cells.push_back(StandardisedText(row.values.back()));
    rows.push_back(std::move(cells));
  }
  WriteTextTable(out, header, rows);
  WriteTextCaution(out);
}

void WriteCohortCsv(std::ostream& out, const CohortTable& table) {
  WriteCsvCaution(out);
  if (!table.population.empty()) WriteCsvComment(out, "patients: " + table.population);
  for (const std::string& note : table.notes) WriteCsvComment(out, "note: " + note);
  out << CsvRow({"date", "group", "registered", "data", "practices_without_data", "criterion", "count",
                 "rate_per_1000", "standardised_per_1000", "standardised_lower", "standardised_upper",
                 "suppressed"});
  for (const CohortRow& row : table.rows) {
    for (size_t k = 0; k < table.keys.size(); ++k) {
      const CohortValue& value = row.values[k];
      const bool suppressed = !value.count && HasFigures(row.data);
      std::optional<double> standardised;
      std::optional<double> lower;
      std::optional<double> upper;
      if (value.standardised) {
        standardised = value.standardised->rate;
        lower = value.standardised->lower;
        upper = value.standardised->upper;
      }
      out << CsvRow({row.date.ToIso(), row.group, std::to_string(row.registered),
                     std::string(DataStateName(row.data)), std::to_string(row.practices_without_data), table.keys[k],
                     value.count ? std::to_string(*value.count) : "",
                     OptionalText(value.rate, 4), OptionalText(standardised, 4),
                     OptionalText(lower, 4), OptionalText(upper, 4),
                     suppressed ? "yes" : "no"});
    }
  }
}

void WriteCohortHtml(std::ostream& out, const CohortTable& table) {
  WriteHtmlStart(out, "Cohort counts by " + std::string(GroupByName(table.group_by)));
  for (const std::string& line : CohortPreamble(table)) out << "<p>" << EscapeHtml(line) << "</p>\n";
  // One section per criterion, so that every table fits the page: the chart, the rates
  // with the months as columns, then the detail of each date and group.
  for (size_t k = 0; k < table.keys.size(); ++k) {
    out << "<section class=\"criterion\">\n<h2>" << EscapeHtml(table.keys[k]) << "</h2>\n<figure>"
        << CohortTrendSvg(table, k) << "</figure>\n";
    WriteMonthColumns(out, table, k);
    out << "<h3>" << EscapeHtml(table.keys[k]) << ": each date and group</h3>\n";
    std::vector<std::vector<std::string>> rows;
    for (const CohortRow& row : table.rows) {
      const CohortValue& value = row.values[k];
      rows.push_back({row.date.ToIso(), row.group, std::to_string(row.registered), DataText(row),
                      CountText(row, value, table.suppress_below), RateText(value.rate), StandardisedText(value)});
    }
    WriteHtmlTable(out, {"date", "group", "registered", "data", "patients", "per 1000", "ESP2013 per 1000 (95% CI)"},
                   rows);
    out << "</section>\n";
  }
  WriteHtmlEnd(out);
}

}  // namespace medload
