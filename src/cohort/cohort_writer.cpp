// Text, CSV and HTML writers of a cohort table (JSON in cohort_json.cpp, the chart in
// cohort_chart.cpp).
#include "medload/cohort/cohort_writer.h"

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

// The header lines every format repeats: what was counted and how.
std::vector<std::string> Preamble(const CohortTable& table) {
  std::vector<std::string> lines;
  std::string criteria;
  for (const std::string& key : table.criteria) criteria += (criteria.empty() ? "" : ", ") + key;
  lines.push_back("Cohort counts by " + std::string(GroupByName(table.group_by)) +
                  "; criteria: " + criteria + " (any = at least one)");
  lines.push_back("Measure: " + table.measure);
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

}  // namespace

void WriteCohortText(std::ostream& out, const CohortTable& table) {
  for (const std::string& line : Preamble(table)) out << line << "\n";
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
  for (const std::string& line : Preamble(table)) out << "<p>" << EscapeHtml(line) << "</p>\n";
  for (size_t k = 0; k < table.keys.size(); ++k) {
    out << "<figure>" << CohortTrendSvg(table, k) << "</figure>\n";
  }
  std::vector<std::string> header = {"date", "group", "registered", "data"};
  for (const std::string& key : table.keys) {
    header.push_back(key);
    header.push_back(key + " per 1000");
    header.push_back(key + " ESP2013 per 1000 (95% CI)");
  }
  std::vector<std::vector<std::string>> rows;
  for (const CohortRow& row : table.rows) {
    std::vector<std::string> cells = {row.date.ToIso(), row.group, std::to_string(row.registered), DataText(row)};
    for (const CohortValue& value : row.values) {
      cells.push_back(CountText(row, value, table.suppress_below));
      cells.push_back(RateText(value.rate));
      cells.push_back(StandardisedText(value));
    }
    rows.push_back(std::move(cells));
  }
  WriteHtmlTable(out, header, rows);
  WriteHtmlEnd(out);
}

}  // namespace medload
