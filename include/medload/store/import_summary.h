// The outcome of importing files (how many rows were read, imported, recognised as
// duplicates and rejected, and why) and its writers in every output format, plus the
// --rejects file. The writers print a finished summary; they do not import anything.
#pragma once

#include <iosfwd>
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include <nlohmann/json.hpp>

namespace medload {

// One file's import. Invariants (the "nothing lost" contract): read == imported +
// duplicates + rejected + other_shards, and every physical line is counted once:
// lines == header_lines + blank_lines + row_lines.
struct ImportSummary {
  std::string file;          // as named on the command line ("<stdin>" for "-")
  std::string kind;          // "dispensing", "patients", "practices" or "reviews"
  std::string format;        // "csv" or "fhir"
  long run_id = 0;           // the import_runs row (0 if none was written)
  long read = 0;             // rows (records, or resources) read, blank lines excluded
  long imported = 0;         // stored: new rows, and changed registry rows or statuses
  long duplicates = 0;       // already in the store (or earlier in the same file)
  long rejected = 0;         // not stored; each with a reason
  long other_shards = 0;     // rows of another shard's patients (import --shard): not here
  long other_shards_rejected = 0;  // part of other_shards: rows their own shard rejects
  std::string shard;         // "K/N" for an import with --shard K/N, else ""
  long updated = 0;          // part of `imported`: existing rows that this file changed
  long patients = 0;         // part of `read`: FHIR Patient resources in a dispensing file
  long medications = 0;      // part of `read`: FHIR Medication resources (dispensing file)
  long blank_lines = 0;      // skipped, not rows
  long lines = 0;            // physical lines of the file (LF, CRLF or CR alone end one)
  long header_lines = 0;     // lines of the CSV header (1, unless a quoted name spans lines)
  long row_lines = 0;        // lines of the rows read (a quoted line break adds one)
  long multiline_rows = 0;   // part of `read`: rows spanning more than one line
  // Imported dispensings whose patient has no row in the registry when the file ends (a
  // warning: they are stored), the distinct such patients, and the first few as
  // `FILE:LINE: patient "ID"`.
  long not_in_registry = 0;
  long not_in_registry_patients = 0;
  std::vector<std::string> not_in_registry_examples;
  std::map<std::string, long> reasons;      // reason key -> rejected rows
  std::map<std::string, long> not_counted;  // status -> stored dispenses that do not count
  // Match kind ("unmatched", "partial", "approximate") -> stored counting dispensings whose
  // product the formulary recognised so; empty when no formulary was consulted. Filled by
  // the caller (import dispensing), which resolves the products.
  std::map<std::string, long> product_flags;
  std::vector<std::string> examples;        // the messages of the first rejected rows
  bool rolled_back = false;  // rejected/read was above the rate: nothing was stored
  double max_reject_rate = 0.05;

  // Adds another file's counts (not its name, kind or examples) to this one.
  void Add(const ImportSummary& other);
};

// The sum over several files, named "total".
ImportSummary TotalOf(const std::vector<ImportSummary>& files);

// The message printed when a file was rolled back: how many rows were rejected, the
// rate and the limit.
std::string RollbackMessage(const ImportSummary& summary);

// The import JSON: the totals at the top level ({"read","imported","duplicates",
// "rejected","reasons",...,"caution"}) and one object per file under "files".
nlohmann::ordered_json ImportJson(const std::vector<ImportSummary>& files);

// Writers for --format text|csv|json|html. Each carries the caution (text: footer; CSV:
// a first line starting with '#'; JSON: "caution"; HTML: a banner) and, with several
// files, a total.
void WriteImportText(const std::vector<ImportSummary>& files, std::ostream& out);
void WriteImportCsv(const std::vector<ImportSummary>& files, std::ostream& out);
void WriteImportJson(const std::vector<ImportSummary>& files, std::ostream& out);
void WriteImportHtml(const std::vector<ImportSummary>& files, std::ostream& out);

// The --rejects file: a '#' caution line and the header `file,line,reason,message,
// original_row`, then one row per rejected input row.
void WriteRejectsHeader(std::ostream& out);
void WriteRejectRow(std::ostream& out, std::string_view file, size_t line, std::string_view reason,
                    std::string_view message, std::string_view original_row);

}  // namespace medload
