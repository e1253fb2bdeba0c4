#include "medload/cohort/cohort_wide_writer.h"

#include <map>
#include <ostream>

#include "medload/cohort/cohort_chart.h"
#include "medload/cohort/cohort_writer.h"
#include "medload/format/output.h"

namespace medload {
namespace {

constexpr const char* kLegend =
    "s = short history (figures may be too low); b = beyond the data; <N = fewer than N, withheld";

// Each group's rows by date index (a group has no row on a date it did not exist).
std::map<std::string, std::vector<const CohortRow*>> RowsByGroup(const CohortTable& table) {
  std::map<std::string, std::vector<const CohortRow*>> by_group;
  for (const std::string& group : table.groups) by_group[group].assign(table.dates.size(), nullptr);
  for (const CohortRow& row : table.rows) {
    for (size_t d = 0; d < table.dates.size(); ++d) {
      if (table.dates[d] == row.date) by_group[row.group][d] = &row;
    }
  }
  return by_group;
}

std::string Mark(DataState state) {
  if (state == DataState::kShortHistory) return " s";
  if (state == DataState::kBeyondData) return " b";
  return "";
}

// "Registered" figures of each group per date.
std::vector<std::vector<std::string>> RegisteredRows(const CohortTable& table) {
  std::vector<std::vector<std::string>> rows;
  for (const auto& [group, cells] : RowsByGroup(table)) {
    std::vector<std::string> row = {group};
    for (const CohortRow* cell : cells) row.push_back(cell == nullptr ? "-" : std::to_string(cell->registered));
    rows.push_back(std::move(row));
  }
  return rows;
}

std::string OptionalNumber(const std::optional<double>& value) { return value ? FormatNumber(*value, 4) : ""; }

}  // namespace

std::string WideCell(const CohortTable& table, const CohortRow& row, size_t key) {
  if (!HasFigures(row.data)) return "no data";
  const CohortValue& value = row.values[key];
  std::string text = value.count ? std::to_string(*value.count) : "<" + std::to_string(table.suppress_below);
  if (value.rate) text += " (" + FormatNumber(*value.rate, 1) + ")";
  return text + Mark(row.data);
}

std::vector<std::string> WideHeader(const CohortTable& table) {
  std::vector<std::string> header;
  for (const Date date : table.dates) header.push_back(date.ToIso());
  return header;
}

std::vector<std::vector<std::string>> WideRows(const CohortTable& table, size_t key) {
  std::vector<std::vector<std::string>> rows;
  for (const auto& [group, cells] : RowsByGroup(table)) {
    std::vector<std::string> row = {group};
    for (const CohortRow* cell : cells) row.push_back(cell == nullptr ? "-" : WideCell(table, *cell, key));
    rows.push_back(std::move(row));
  }
  return rows;
}

void WriteCohortWideText(std::ostream& out, const CohortTable& table) {
  for (const std::string& line : CohortPreamble(table)) out << line << "\n";
  std::vector<std::string> header = {"group"};
  for (const std::string& date : WideHeader(table)) header.push_back(date);
  for (size_t k = 0; k < table.keys.size(); ++k) {
    out << "\n" << table.keys[k] << ": patients (per 1000 registered)\n";
    WriteTextTable(out, header, WideRows(table, k));
  }
  out << "\nregistered patients\n";
  WriteTextTable(out, header, RegisteredRows(table));
  out << "\n" << kLegend << "\n";
  WriteTextCaution(out);
}

void WriteCohortWideCsv(std::ostream& out, const CohortTable& table) {
  WriteCsvCaution(out);
  if (!table.population.empty()) WriteCsvComment(out, "patients: " + table.population);
  for (const std::string& note : table.notes) WriteCsvComment(out, "note: " + note);
  std::vector<std::string> header = {"group", "criterion", "figure"};
  for (const std::string& date : WideHeader(table)) header.push_back(date);
  out << CsvRow(header);
  for (const auto& [group, cells] : RowsByGroup(table)) {
    std::vector<std::string> data = {group, "", "data"};
    std::vector<std::string> registered = {group, "", "registered"};
    for (const CohortRow* cell : cells) {
      data.push_back(cell == nullptr ? "" : std::string(DataStateName(cell->data)));
      registered.push_back(cell == nullptr ? "" : std::to_string(cell->registered));
    }
    out << CsvRow(data) << CsvRow(registered);
    for (size_t k = 0; k < table.keys.size(); ++k) {
      std::vector<std::string> count = {group, table.keys[k], "count"};
      std::vector<std::string> rate = {group, table.keys[k], "rate_per_1000"};
      for (const CohortRow* cell : cells) {
        const bool shown = cell != nullptr && HasFigures(cell->data);
        count.push_back(shown && cell->values[k].count ? std::to_string(*cell->values[k].count) : "");
        rate.push_back(shown ? OptionalNumber(cell->values[k].rate) : "");
      }
      out << CsvRow(count) << CsvRow(rate);
    }
  }
}

void WriteCohortWideHtml(std::ostream& out, const CohortTable& table) {
  WriteHtmlStart(out, "Cohort counts by " + std::string(GroupByName(table.group_by)));
  for (const std::string& line : CohortPreamble(table)) out << "<p>" << EscapeHtml(line) << "</p>\n";
  std::vector<std::string> header = {"group"};
  for (const std::string& date : WideHeader(table)) header.push_back(date);
  for (size_t k = 0; k < table.keys.size(); ++k) {
    out << "<h2>" << EscapeHtml(table.keys[k]) << ": patients (per 1000 registered)</h2>\n";
    out << "<figure>" << CohortTrendSvg(table, k) << "</figure>\n";
    WriteHtmlTable(out, header, WideRows(table, k));
  }
  out << "<h2>Registered patients</h2>\n";
  WriteHtmlTable(out, header, RegisteredRows(table));
  out << "<p class=\"note\">" << EscapeHtml(kLegend) << "</p>\n";
  WriteHtmlEnd(out);
}

}  // namespace medload
