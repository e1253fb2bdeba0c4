#include "medload/format/output.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <ostream>

#include "medload/core/caution.h"
#include "medload/format/shown_text.h"

namespace medload {
namespace {

// The banner shows "CAUTION:" in bold, then the rest of the caution once.
constexpr std::string_view kCautionWord = "CAUTION:";
std::string_view CautionWord() { return kCautionWord; }
std::string_view CautionRest() {
  std::string_view rest = kCaution;
  if (rest.substr(0, kCautionWord.size()) == kCautionWord) rest.remove_prefix(kCautionWord.size() + 1);
  return rest;
}

bool LooksNumeric(std::string_view value) {
  if (value.empty()) return false;
  size_t i = value[0] == '-' || value[0] == '+' ? 1 : 0;
  if (i == value.size()) return false;
  bool digit = false;
  for (; i < value.size(); ++i) {
    const char c = value[i];
    if (c >= '0' && c <= '9') digit = true;
    else if (c != '.') return false;
  }
  return digit;
}

size_t DisplayWidth(std::string_view text) {
  size_t width = 0;
  for (char c : text) {
    if ((static_cast<unsigned char>(c) & 0xC0) != 0x80) ++width;  // count UTF-8 lead bytes
  }
  return width;
}

void Pad(std::ostream& out, std::string_view text, size_t width, bool right) {
  const size_t fill = width - std::min(width, DisplayWidth(text));
  if (right) out << std::string(fill, ' ') << text;
  else out << text << std::string(fill, ' ');
}

}  // namespace

std::string CsvCell(std::string_view value) {
  std::string cell;
  const bool risky = !value.empty() && !LooksNumeric(value) &&
                     (value[0] == '=' || value[0] == '+' || value[0] == '-' || value[0] == '@' ||
                      value[0] == '\t' || value[0] == '\r');
  if (risky) cell += '\'';
  cell.append(value);
  if (cell.find_first_of(",\"\r\n") == std::string::npos) return cell;
  std::string quoted = "\"";
  for (char c : cell) {
    if (c == '"') quoted += '"';
    quoted += c;
  }
  quoted += '"';
  return quoted;
}

std::string CsvRow(const std::vector<std::string>& cells) {
  std::string row;
  for (size_t i = 0; i < cells.size(); ++i) {
    if (i > 0) row += ',';
    row += CsvCell(cells[i]);
  }
  row += '\n';
  return row;
}

std::string CsvCommentLine(std::string_view text) {
  std::string line = "\"# ";
  for (const char c : text) {
    if (c == '"') line += "\"\"";
    else if (c == '\r' || c == '\n') line += ' ';
    else line += c;
  }
  line += "\"\n";
  return line;
}

void WriteCsvComment(std::ostream& out, std::string_view text) { out << CsvCommentLine(text); }

void WriteCsvCaution(std::ostream& out) { WriteCsvComment(out, kCaution); }

std::string EscapeHtml(std::string_view value) {
  // Control characters and bidi controls from data (an escape in a title, U+202E in a
  // name) are shown as visible escapes, as on the terminal.
  std::string shown;
  if (NeedsShowing(value)) {
    shown = ShownText(value, true);
    value = shown;
  }
  std::string escaped;
  escaped.reserve(value.size());
  for (char c : value) {
    switch (c) {
      case '&': escaped += "&amp;"; break;
      case '<': escaped += "&lt;"; break;
      case '>': escaped += "&gt;"; break;
      case '"': escaped += "&quot;"; break;
      case '\'': escaped += "&#39;"; break;
      default: escaped += c;
    }
  }
  return escaped;
}

namespace {

// The page style. Screen: a readable column; tables wrap long words rather than push the
// page sideways. Print (A4, 12 mm margins): full width, smaller type, a table's header
// repeated on each page, rows, charts and the caution never split across pages, headings
// kept with what follows, and links and navigation that mean nothing on paper left out.
constexpr std::string_view kPageStyle =
    "body{font-family:system-ui,sans-serif;margin:1.5rem auto;max-width:72rem;padding:0 1rem;"
    "color:#1b1b1b;line-height:1.4}\n"
    ".caution{border:2px solid #7a4b00;background:#fff6e0;padding:.6rem .9rem;margin:0 0 1rem;"
    "font-size:.95rem}\n"
    "table{border-collapse:collapse;margin:.5rem 0 1.2rem;font-size:.9rem;max-width:100%}\n"
    "th,td{border:1px solid #bbb;padding:.25rem .5rem;text-align:left;vertical-align:top;"
    "overflow-wrap:break-word}\n"
    "th{background:#eef0f3}\ntd.num{text-align:right;white-space:nowrap}\n"
    "h1{font-size:1.5rem}h2{font-size:1.2rem;margin-top:1.6rem}\n"
    ".note{color:#444;font-size:.9rem}\nfigure{margin:1rem 0}\nsvg{max-width:100%;height:auto}\n"
    "@page{size:A4;margin:12mm}\n"
    "@media print{body{max-width:none;margin:0;padding:0;font-size:9pt;line-height:1.3}"
    ".caution{border-width:1px;background:none;break-inside:avoid}"
    "h1{font-size:14pt}h2{font-size:11.5pt;break-after:avoid}"
    "table{width:100%;font-size:7.5pt;margin:.3rem 0 .8rem}thead{display:table-header-group}"
    "th,td{padding:.1rem .25rem}th{background:none}tr,figure,.caution{break-inside:avoid}"
    "figure{margin:.4rem 0}.note{font-size:8.5pt}a{color:inherit;text-decoration:none}.screen{display:none}}\n";

}  // namespace

void WriteHtmlStart(std::ostream& out, std::string_view title) {
  out << "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
         "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>"
      << EscapeHtml(title) << "</title>\n<style>\n" << kPageStyle
      << "</style>\n</head>\n<body>\n<div class=\"caution\" role=\"note\"><strong>" << EscapeHtml(CautionWord())
      << "</strong> " << EscapeHtml(CautionRest()) << "</div>\n<h1>" << EscapeHtml(title) << "</h1>\n";
}

void WriteHtmlEnd(std::ostream& out) { out << "</body>\n</html>\n"; }

void WriteHtmlTable(std::ostream& out, const std::vector<std::string>& header,
                    const std::vector<std::vector<std::string>>& rows) {
  out << "<table>\n<thead><tr>";
  for (const auto& cell : header) out << "<th scope=\"col\">" << EscapeHtml(cell) << "</th>";
  out << "</tr></thead>\n<tbody>\n";
  for (const auto& row : rows) {
    out << "<tr>";
    for (const auto& cell : row) {
      out << (LooksNumeric(cell) ? "<td class=\"num\">" : "<td>") << EscapeHtml(cell) << "</td>";
    }
    out << "</tr>\n";
  }
  out << "</tbody>\n</table>\n";
}

void WriteTextTable(std::ostream& out, const std::vector<std::string>& header,
                    const std::vector<std::vector<std::string>>& rows) {
  std::vector<size_t> widths(header.size(), 0);
  std::vector<bool> numeric(header.size(), true);
  for (size_t c = 0; c < header.size(); ++c) widths[c] = DisplayWidth(header[c]);
  for (const auto& row : rows) {
    for (size_t c = 0; c < row.size() && c < widths.size(); ++c) {
      widths[c] = std::max(widths[c], DisplayWidth(row[c]));
      if (!row[c].empty() && !LooksNumeric(row[c])) numeric[c] = false;
    }
  }
  auto write_row = [&](const std::vector<std::string>& row) {
    for (size_t c = 0; c < widths.size(); ++c) {
      if (c > 0) out << "  ";
      const std::string_view cell = c < row.size() ? std::string_view(row[c]) : std::string_view();
      if (c + 1 == widths.size() && !numeric[c]) out << cell;  // no trailing spaces
      else Pad(out, cell, widths[c], numeric[c] && !rows.empty());
    }
    out << "\n";
  };
  write_row(header);
  std::vector<std::string> rule;
  for (size_t w : widths) rule.emplace_back(w, '-');
  write_row(rule);
  for (const auto& row : rows) write_row(row);
}

void WriteTextCaution(std::ostream& out) {
  out << "\n";
  std::string_view text = kCaution;
  while (!text.empty()) {
    if (text.size() <= 78) {
      out << text << "\n";
      break;
    }
    size_t cut = text.rfind(' ', 78);
    if (cut == std::string_view::npos || cut == 0) cut = 78;
    out << text.substr(0, cut) << "\n";
    text.remove_prefix(std::min(text.size(), cut + 1));
  }
}

void WriteTextCautionLine(std::ostream& out) { out << "\n" << kCautionLine << "\n"; }

std::string FormatNumber(double value, int decimals) {
  if (!std::isfinite(value)) return "";
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", decimals, value);
  std::string text = buffer;
  if (text.find('.') != std::string::npos) {
    while (text.back() == '0') text.pop_back();
    if (text.back() == '.') text.pop_back();
  }
  if (text == "-0") text = "0";
  return text;
}

}  // namespace medload
