// Small building blocks every writer uses: CSV cells (quoted, and neutralised against
// spreadsheet formula injection), HTML escaping and the page shell with the caution
// banner, and plain-text tables that fit a terminal. No knowledge of any report's content.
#pragma once

#include <iosfwd>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// One CSV cell: quoted when it holds a comma, quote, CR or LF; a cell starting with
// '=', '+', '-', '@', tab or CR gets a leading apostrophe so spreadsheets show it as text
// (OWASP, "CSV Injection"). Plain numbers (e.g. "-1.5") are left as they are.
std::string CsvCell(std::string_view value);
// Cells joined by commas, ending in "\n".
std::string CsvRow(const std::vector<std::string>& cells);
// A comment line of a CSV file (the caution, notes): "# " + text as one quoted field,
// quotes inside doubled and line breaks made spaces, then "\n" -- so that a spreadsheet
// shows it in one cell and a CSV reader reads one field (docs/report.md, "CSV files").
std::string CsvCommentLine(std::string_view text);
void WriteCsvComment(std::ostream& out, std::string_view text);
// The caution as the first line of a CSV file: WriteCsvComment(out, caution).
void WriteCsvCaution(std::ostream& out);

// Escapes &, <, >, " and ' for HTML text and attribute values.
std::string EscapeHtml(std::string_view value);
// Opens a self-contained HTML page (inline style, no external fetches) with `title` and
// the caution as a visible banner at the top. Close it with WriteHtmlEnd.
void WriteHtmlStart(std::ostream& out, std::string_view title);
void WriteHtmlEnd(std::ostream& out);
// An HTML table: header cells and rows, every value escaped.
void WriteHtmlTable(std::ostream& out, const std::vector<std::string>& header,
                    const std::vector<std::vector<std::string>>& rows);

// A plain-text table with columns padded to the widest cell (by UTF-8 code points);
// numbers-looking columns are right-aligned.
void WriteTextTable(std::ostream& out, const std::vector<std::string>& header,
                    const std::vector<std::vector<std::string>>& rows);
// The caution as a text footer, wrapped at 78 columns, preceded by a blank line.
void WriteTextCaution(std::ostream& out);
// kCautionLine as a one-line footer, preceded by a blank line (outputs without clinical
// figures: import summaries, synth, help).
void WriteTextCautionLine(std::ostream& out);

// A number with at most `decimals` decimals, trailing zeros removed ("1.5", "2", "0.91").
std::string FormatNumber(double value, int decimals = 2);

}  // namespace medload
