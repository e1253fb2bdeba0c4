#include "medload/store/import_summary.h"

#include <ostream>
#include <utility>

#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/format/json_text.h"
#include "medload/format/output.h"

namespace medload {
namespace {

// "bad_date=3;bad_quantity=1" for one CSV cell.
std::string JoinCounts(const std::map<std::string, long>& counts, std::string_view between,
                       std::string_view separator) {
  std::string text;
  for (const auto& [key, count] : counts) {
    if (!text.empty()) text += separator;
    text += key;
    text += between;
    text += std::to_string(count);
  }
  return text;
}

// "a; b" for one CSV cell.
std::string JoinLines(const std::vector<std::string>& lines) {
  std::string text;
  for (const std::string& line : lines) text += (text.empty() ? "" : "; ") + line;
  return text;
}

// "3 item(s) not recognised (not counted), 1 recognised only in part": the flagged
// products' items by match kind, in that fixed order.
std::string ProductFlagText(const std::map<std::string, long>& flags) {
  static const std::pair<const char*, const char*> kKinds[] = {
      {"unmatched", " not recognised (not counted)"},
      {"partial", " recognised only in part"},
      {"approximate", " read from a close spelling"}};
  std::vector<std::string> parts;
  for (const auto& [kind, said] : kKinds) {
    const auto it = flags.find(kind);
    if (it != flags.end() && it->second > 0) parts.push_back(std::to_string(it->second) + " item(s)" + said);
  }
  return Join(parts, ", ");
}

nlohmann::ordered_json FileJson(const ImportSummary& summary) {
  nlohmann::ordered_json json = {
      {"file", summary.file},
      {"kind", summary.kind},
      {"format", summary.format},
      {"run_id", summary.run_id},
      {"read", summary.read},
      {"imported", summary.imported},
      {"duplicates", summary.duplicates},
      {"rejected", summary.rejected},
      {"updated", summary.updated},
      {"blank_lines", summary.blank_lines},
      {"reasons", summary.reasons},
      {"not_counted", summary.not_counted},
      {"rolled_back", summary.rolled_back},
      {"examples", summary.examples},
  };
  if (summary.kind == "dispensing") {
    json["not_in_registry"] = summary.not_in_registry;
    json["not_in_registry_patients"] = summary.not_in_registry_patients;
    json["not_in_registry_examples"] = summary.not_in_registry_examples;
    json["product_flags"] = summary.product_flags;
  }
  if (summary.kind == "dispensing" && summary.format == "fhir") {
    json["patients"] = summary.patients;
    json["medications"] = summary.medications;
  }
  return json;
}

std::vector<std::string> CountCells(const ImportSummary& summary) {
  return {summary.file,
          summary.kind,
          std::to_string(summary.read),
          std::to_string(summary.imported),
          std::to_string(summary.duplicates),
          std::to_string(summary.rejected),
          summary.rolled_back ? "rolled back" : "committed"};
}

// The lines under the table that explain one file: reasons, statuses, examples.
std::vector<std::string> DetailLines(const ImportSummary& summary) {
  std::vector<std::string> lines;
  if (!summary.reasons.empty()) {
    lines.push_back(summary.file + ": rejected by reason: " + JoinCounts(summary.reasons, " ", ", "));
  }
  if (summary.updated > 0) {
    lines.push_back(summary.file + ": " + std::to_string(summary.updated) +
                    " of the imported rows updated rows already stored");
  }
  if (!summary.not_counted.empty()) {
    lines.push_back(summary.file + ": stored but not counted in measures (status): " +
                    JoinCounts(summary.not_counted, " ", ", "));
  }
  if (!summary.product_flags.empty()) {
    lines.push_back(summary.file + ": products to check (medload formulary unmatched lists them): " +
                    ProductFlagText(summary.product_flags));
  }
  if (summary.patients > 0) {
    lines.push_back(summary.file + ": " + std::to_string(summary.patients) +
                    " of the rows read were Patient resources (registry rows)");
  }
  if (summary.medications > 0) {
    lines.push_back(summary.file + ": " + std::to_string(summary.medications) +
                    " of the rows read were Medication resources (products that dispenses name)");
  }
  if (summary.not_in_registry > 0) {
    std::string line = summary.file + ": warning: " + std::to_string(summary.not_in_registry) +
                       " imported dispensing(s) of " + std::to_string(summary.not_in_registry_patients) +
                       " patient(s) have no row in the patient registry (no age, practice or"
                       " registration for them until it is imported; check the patient ids)";
    lines.push_back(line + (summary.not_in_registry_examples.empty() ? "" : ", for example:"));
    for (const std::string& example : summary.not_in_registry_examples) lines.push_back("  " + example);
  }
  for (const std::string& example : summary.examples) lines.push_back(example);
  if (summary.rejected > static_cast<long>(summary.examples.size())) {
    lines.push_back(summary.file + ": ... and " +
                    std::to_string(summary.rejected - static_cast<long>(summary.examples.size())) +
                    " more rejected rows (write them all with --rejects FILE)");
  }
  if (summary.rolled_back) lines.push_back(RollbackMessage(summary));
  return lines;
}

const std::vector<std::string> kHeader = {"file", "kind", "read", "imported", "duplicates",
                                          "rejected", "outcome"};

}  // namespace

void ImportSummary::Add(const ImportSummary& other) {
  read += other.read;
  imported += other.imported;
  duplicates += other.duplicates;
  rejected += other.rejected;
  updated += other.updated;
  patients += other.patients;
  medications += other.medications;
  blank_lines += other.blank_lines;
  not_in_registry += other.not_in_registry;
  not_in_registry_patients += other.not_in_registry_patients;
  for (const auto& [key, count] : other.reasons) reasons[key] += count;
  for (const auto& [key, count] : other.not_counted) not_counted[key] += count;
  for (const auto& [key, count] : other.product_flags) product_flags[key] += count;
  rolled_back = rolled_back || other.rolled_back;
}

ImportSummary TotalOf(const std::vector<ImportSummary>& files) {
  ImportSummary total;
  total.file = "total";
  for (const ImportSummary& file : files) {
    total.Add(file);
    if (total.kind.empty()) total.kind = file.kind;
    else if (total.kind != file.kind) total.kind = "mixed";
  }
  return total;
}

std::string RollbackMessage(const ImportSummary& summary) {
  const double rate =
      summary.read > 0 ? static_cast<double>(summary.rejected) / static_cast<double>(summary.read) : 0;
  return summary.file + ": " + std::to_string(summary.rejected) + " of " +
         std::to_string(summary.read) + " rows rejected (" + FormatNumber(rate * 100, 1) +
         "%), above --max-reject-rate " + FormatNumber(summary.max_reject_rate, 4) +
         ": the file was rolled back and nothing from it was stored";
}

nlohmann::ordered_json ImportJson(const std::vector<ImportSummary>& files) {
  const ImportSummary total = TotalOf(files);
  nlohmann::ordered_json json = {
      {"read", total.read},
      {"imported", total.imported},
      {"duplicates", total.duplicates},
      {"rejected", total.rejected},
      {"reasons", total.reasons},
      {"updated", total.updated},
      {"not_counted", total.not_counted},
      {"not_in_registry", total.not_in_registry},
      {"product_flags", total.product_flags},
      {"rolled_back", total.rolled_back},
  };
  if (files.size() == 1) json["file"] = files.front().file;
  json["files"] = nlohmann::ordered_json::array();
  for (const ImportSummary& file : files) json["files"].push_back(FileJson(file));
  json["caution"] = std::string(kCaution);
  return json;
}

void WriteImportText(const std::vector<ImportSummary>& files, std::ostream& out) {
  std::vector<std::vector<std::string>> rows;
  for (const ImportSummary& file : files) rows.push_back(CountCells(file));
  if (files.size() > 1) {
    std::vector<std::string> total = CountCells(TotalOf(files));
    total[6].clear();
    rows.push_back(std::move(total));
  }
  WriteTextTable(out, kHeader, rows);
  bool first = true;
  for (const ImportSummary& file : files) {
    for (const std::string& line : DetailLines(file)) {
      if (first) out << "\n";
      first = false;
      out << line << "\n";
    }
  }
  WriteTextCaution(out);
}

void WriteImportCsv(const std::vector<ImportSummary>& files, std::ostream& out) {
  WriteCsvCaution(out);
  out << CsvRow({"file", "kind", "format", "read", "imported", "duplicates", "rejected", "updated",
                 "rolled_back", "reasons", "not_counted", "not_in_registry", "not_in_registry_examples", "product_flags"});
  std::vector<ImportSummary> rows = files;
  if (files.size() > 1) rows.push_back(TotalOf(files));
  for (const ImportSummary& file : rows) {
    out << CsvRow({file.file, file.kind, file.format, std::to_string(file.read),
                   std::to_string(file.imported), std::to_string(file.duplicates),
                   std::to_string(file.rejected), std::to_string(file.updated),
                   file.rolled_back ? "true" : "false", JoinCounts(file.reasons, "=", ";"),
                   JoinCounts(file.not_counted, "=", ";"), std::to_string(file.not_in_registry),
                   JoinLines(file.not_in_registry_examples), JoinCounts(file.product_flags, "=", ";")});
  }
}

void WriteImportJson(const std::vector<ImportSummary>& files, std::ostream& out) {
  out << JsonText(ImportJson(files)) << "\n";
}

void WriteImportHtml(const std::vector<ImportSummary>& files, std::ostream& out) {
  WriteHtmlStart(out, "medload import");
  std::vector<std::vector<std::string>> rows;
  for (const ImportSummary& file : files) rows.push_back(CountCells(file));
  if (files.size() > 1) rows.push_back(CountCells(TotalOf(files)));
  WriteHtmlTable(out, kHeader, rows);
  std::vector<std::string> details;
  for (const ImportSummary& file : files) {
    for (std::string& line : DetailLines(file)) details.push_back(std::move(line));
  }
  if (!details.empty()) {
    out << "<ul>\n";
    for (const std::string& line : details) out << "<li>" << EscapeHtml(line) << "</li>\n";
    out << "</ul>\n";
  }
  WriteHtmlEnd(out);
}

void WriteRejectsHeader(std::ostream& out) {
  WriteCsvCaution(out);
  out << CsvRow({"file", "line", "reason", "message", "original_row"});
}

void WriteRejectRow(std::ostream& out, std::string_view file, size_t line, std::string_view reason,
                    std::string_view message, std::string_view original_row) {
  out << CsvRow({std::string(file), std::to_string(line), std::string(reason), std::string(message),
                 std::string(original_row)});
}

}  // namespace medload
