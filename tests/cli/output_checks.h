// Checks on what the commands write, shared by the command-level tests. Test code only.
#pragma once

#include <cctype>
#include <string>

namespace medload {

// True when `text` (CSV) holds a cell that a spreadsheet would run as a formula: one
// starting (after its opening quote, if any) with =, +, @, tab or CR, or with - and not a
// number. Source: OWASP, "CSV Injection" (the characters that start a formula).
inline bool HasFormulaCell(const std::string& text) {
  bool quoted = false;
  bool cell_start = true;
  for (size_t i = 0; i < text.size(); ++i) {
    if (cell_start) {
      size_t j = i;
      if (text[j] == '"') ++j;
      if (j < text.size()) {
        const char first = text[j];
        if (first == '=' || first == '+' || first == '@' || first == '\t' || first == '\r') return true;
        const bool number_follows =
            j + 1 < text.size() && (std::isdigit(static_cast<unsigned char>(text[j + 1])) != 0 || text[j + 1] == '.');
        if (first == '-' && !number_follows) return true;
      }
      cell_start = false;
    }
    if (text[i] == '"') quoted = !quoted;
    if (!quoted && (text[i] == ',' || text[i] == '\n')) cell_start = true;
  }
  return false;
}

}  // namespace medload
