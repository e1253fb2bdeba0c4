#include "medload/store/import_summary.h"

#include <optional>
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

// Rows stored: none when the file was rolled back.
long Stored(const ImportSummary& summary) { return summary.rolled_back ? 0 : summary.imported; }
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
      {"other_shards", summary.other_shards},
      {"stored", Stored(summary)},
      {"updated", summary.updated},
      {"lines", summary.lines},
      {"header_lines", summary.header_lines},
      {"blank_lines", summary.blank_lines},
      {"row_lines", summary.row_lines},
      {"multiline_rows", summary.multiline_rows},
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
  if (!summary.shard.empty()) {
    json["shard"] = summary.shard;
    json["other_shards_rejected"] = summary.other_shards_rejected;
  }
  if (summary.kind == "dispensing" && summary.format == "fhir") {
    json["patients"] = summary.patients;
    json["medications"] = summary.medications;
  }
  return json;
}

// A rolled-back file stored nothing: its valid rows are shown as not stored, never as
// imported ("0 (50 valid)").
std::string ImportedCell(const ImportSummary& summary) {
  if (!summary.rolled_back || summary.imported == 0) return std::to_string(summary.imported);
  return "0 (" + std::to_string(summary.imported) + " valid, not stored)";
}

// With `shards`, a column of the rows left to other shards after "rejected".
std::vector<std::string> CountCells(const ImportSummary& summary, bool shards) {
  std::vector<std::string> cells = {summary.file,
                                    summary.kind,
                                    std::to_string(summary.lines),
                                    std::to_string(summary.read),
                                    ImportedCell(summary),
                                    std::to_string(summary.duplicates),
                                    std::to_string(summary.rejected),
                                    summary.rolled_back ? "rolled back" : "committed"};
  if (shards) cells.insert(cells.begin() + 7, std::to_string(summary.other_shards));
  return cells;
}

// Whether any file was imported with --shard: the tables then show the other shards' rows.
bool AnyShard(const std::vector<ImportSummary>& files) {
  for (const ImportSummary& file : files) {
    if (!file.shard.empty()) return true;
  }
  return false;
}

std::vector<std::string> HeaderCells(bool shards) {
  std::vector<std::string> header = {"file", "kind", "lines", "read", "imported", "duplicates", "rejected", "outcome"};
  if (shards) header.insert(header.begin() + 7, "other shards");
  return header;
}

// "d.csv: shard 2/4: 75 of the rows read belong to other shards' patients (not stored
// here; their own shard rejects 3 of them)".
std::optional<std::string> ShardLine(const ImportSummary& summary) {
  if (summary.shard.empty()) return std::nullopt;
  std::string line = summary.file + ": shard " + summary.shard + ": " + std::to_string(summary.other_shards) +
                     " of the rows read belong to other shards' patients (not stored here";
  if (summary.other_shards_rejected > 0) {
    line += "; their own shard rejects " + std::to_string(summary.other_shards_rejected) + " of them";
  }
  return line + ")";
}

// "d.csv: 103 lines = 1 header + 2 blank + 100 in the 98 rows read (2 rows span several
// lines)", when the lines are not simply a header and one line per row.
std::optional<std::string> LinesLine(const ImportSummary& summary) {
  if (summary.blank_lines == 0 && summary.multiline_rows == 0 &&
      summary.lines == summary.header_lines + summary.read) {
    return std::nullopt;
  }
  std::string line = summary.file + ": " + std::to_string(summary.lines) + " lines = " +
                     std::to_string(summary.header_lines) + " header + " +
                     std::to_string(summary.blank_lines) + " blank + " +
                     std::to_string(summary.row_lines) + " in the " + std::to_string(summary.read) +
                     " rows read";
  if (summary.multiline_rows > 0) {
    line += " (" + std::to_string(summary.multiline_rows) +
            (summary.multiline_rows == 1 ? " row spans" : " rows span") + " several lines)";
  }
  return line;
}

// The lines under the table that explain one file: reasons, statuses, examples.
std::vector<std::string> DetailLines(const ImportSummary& summary) {
  std::vector<std::string> lines;
  if (std::optional<std::string> counted = LinesLine(summary)) lines.push_back(std::move(*counted));
  if (std::optional<std::string> shard = ShardLine(summary)) lines.push_back(std::move(*shard));
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

}  // namespace

void ImportSummary::Add(const ImportSummary& other) {
  read += other.read;
  imported += other.imported;
  duplicates += other.duplicates;
  rejected += other.rejected;
  other_shards += other.other_shards;
  other_shards_rejected += other.other_shards_rejected;
  updated += other.updated;
  patients += other.patients;
  medications += other.medications;
  blank_lines += other.blank_lines;
  lines += other.lines;
  header_lines += other.header_lines;
  row_lines += other.row_lines;
  multiline_rows += other.multiline_rows;
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
    if (total.shard.empty()) total.shard = file.shard;
    else if (!file.shard.empty() && total.shard != file.shard) total.shard = "mixed";
  }
  return total;
}

std::string RollbackMessage(const ImportSummary& summary) {
  // With --shard, the whole file's rejected rows: this shard's and the other shards'.
  const long rejected = summary.rejected + summary.other_shards_rejected;
  const double rate = summary.read > 0 ? static_cast<double>(rejected) / static_cast<double>(summary.read) : 0;
  const std::string in_shards =
      summary.other_shards_rejected > 0
          ? " in the whole file (" + std::to_string(summary.rejected) + " here, " +
                std::to_string(summary.other_shards_rejected) + " in other shards)"
          : "";
  return summary.file + ": " + std::to_string(rejected) + " of " + std::to_string(summary.read) + " rows rejected" +
         in_shards + " (" + FormatNumber(rate * 100, 1) +
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
      {"other_shards", total.other_shards},
      {"reasons", total.reasons},
      {"stored", Stored(total)},
      {"lines", total.lines},
      {"header_lines", total.header_lines},
      {"blank_lines", total.blank_lines},
      {"row_lines", total.row_lines},
      {"multiline_rows", total.multiline_rows},
      {"updated", total.updated},
      {"not_counted", total.not_counted},
      {"not_in_registry", total.not_in_registry},
      {"product_flags", total.product_flags},
      {"rolled_back", total.rolled_back},
  };
  if (!total.shard.empty()) json["shard"] = total.shard;
  if (files.size() == 1) json["file"] = files.front().file;
  json["files"] = nlohmann::ordered_json::array();
  for (const ImportSummary& file : files) json["files"].push_back(FileJson(file));
  json["caution"] = std::string(kCaution);
  return json;
}

void WriteImportText(const std::vector<ImportSummary>& files, std::ostream& out) {
  const bool shards = AnyShard(files);
  std::vector<std::vector<std::string>> rows;
  for (const ImportSummary& file : files) rows.push_back(CountCells(file, shards));
  if (files.size() > 1) {
    std::vector<std::string> total = CountCells(TotalOf(files), shards);
    total.back().clear();
    rows.push_back(std::move(total));
  }
  WriteTextTable(out, HeaderCells(shards), rows);
  bool first = true;
  for (const ImportSummary& file : files) {
    for (const std::string& line : DetailLines(file)) {
      if (first) out << "\n";
      first = false;
      out << line << "\n";
    }
  }
  WriteTextCautionLine(out);  // a summary of counts: the one-line caution (docs/clinical-safety.md)
}

void WriteImportCsv(const std::vector<ImportSummary>& files, std::ostream& out) {
  WriteCsvCaution(out);
  out << CsvRow({"file", "kind", "format", "lines", "blank_lines", "row_lines", "read", "imported",
                 "duplicates", "rejected", "stored", "updated", "rolled_back", "reasons", "not_counted",
                 "not_in_registry", "not_in_registry_examples", "product_flags", "shard", "other_shards"});
  std::vector<ImportSummary> rows = files;
  if (files.size() > 1) rows.push_back(TotalOf(files));
  for (const ImportSummary& file : rows) {
    out << CsvRow({file.file, file.kind, file.format, std::to_string(file.lines),
                   std::to_string(file.blank_lines), std::to_string(file.row_lines),
                   std::to_string(file.read), std::to_string(file.imported),
                   std::to_string(file.duplicates), std::to_string(file.rejected),
                   std::to_string(Stored(file)), std::to_string(file.updated),
                   file.rolled_back ? "true" : "false", JoinCounts(file.reasons, "=", ";"),
                   JoinCounts(file.not_counted, "=", ";"), std::to_string(file.not_in_registry),
                   JoinLines(file.not_in_registry_examples), JoinCounts(file.product_flags, "=", ";"), file.shard,
                   std::to_string(file.other_shards)});
  }
}

void WriteImportJson(const std::vector<ImportSummary>& files, std::ostream& out) {
  out << JsonText(ImportJson(files)) << "\n";
}

void WriteImportHtml(const std::vector<ImportSummary>& files, std::ostream& out) {
  WriteHtmlStart(out, "medload import");
  const bool shards = AnyShard(files);
  std::vector<std::vector<std::string>> rows;
  for (const ImportSummary& file : files) rows.push_back(CountCells(file, shards));
  if (files.size() > 1) rows.push_back(CountCells(TotalOf(files), shards));
  WriteHtmlTable(out, HeaderCells(shards), rows);
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
