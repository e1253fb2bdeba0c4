#include "formulary/table_reader.h"

#include <algorithm>
#include <cstddef>

#include "medload/core/text.h"

namespace medload::formulary_internal {
namespace {

// A field without spaces and tabs around it, nor a CR left at its end.
std::string TrimField(std::string_view text) { return std::string(TrimEnd(TrimStart(text), " \t\r")); }

// One physical record: its fields and the line it starts on. Quoted fields may hold
// commas, doubled quotes and line breaks.
struct RawRecord {
  int line = 0;
  std::vector<std::string> fields;
  bool blank_or_comment = false;
};

// Reads the record starting at `pos`; advances `pos` and `line` past it.
RawRecord ReadRecord(std::string_view content, size_t& pos, int& line) {
  RawRecord record;
  record.line = line;
  size_t first = pos;
  while (first < content.size() && (content[first] == ' ' || content[first] == '\t')) ++first;
  if (first < content.size() && content[first] == '#') {  // a comment line: no quoting inside
    const size_t end = content.find('\n', first);
    pos = end == std::string_view::npos ? content.size() : end + 1;
    ++line;
    record.blank_or_comment = true;
    return record;
  }
  std::string field;
  bool quoted = false;
  bool was_quoted = false;
  while (pos < content.size()) {
    const char c = content[pos++];
    if (quoted) {
      if (c == '"' && pos < content.size() && content[pos] == '"') {
        field += '"';
        ++pos;
      } else if (c == '"') {
        quoted = false;
      } else {
        if (c == '\n') ++line;
        field += c;
      }
    } else if (c == '"' && TrimField(field).empty()) {
      quoted = true;
      was_quoted = true;
      field.clear();
    } else if (c == ',') {
      record.fields.push_back(was_quoted ? field : TrimField(field));
      field.clear();
      was_quoted = false;
    } else if (c == '\n') {
      ++line;
      break;
    } else if (was_quoted && (c == ' ' || c == '\t' || c == '\r')) {
      continue;  // spacing after a closing quote
    } else {
      field += c;
    }
  }
  record.fields.push_back(was_quoted ? field : TrimField(field));
  if (record.fields.size() == 1 && record.fields[0].empty() && !was_quoted) {
    record.blank_or_comment = true;
  }
  return record;
}

}  // namespace

std::string Fault(std::string_view file, int line, std::string_view fault) {
  return std::string(file) + ":" + std::to_string(line) + ": " + std::string(fault);
}

std::vector<std::string> SplitList(std::string_view text) {
  std::vector<std::string> parts;
  size_t start = 0;
  while (start <= text.size()) {
    size_t end = text.find('|', start);
    if (end == std::string_view::npos) end = text.size();
    std::string part = TrimField(text.substr(start, end - start));
    if (!part.empty()) parts.push_back(std::move(part));
    start = end + 1;
  }
  return parts;
}

std::optional<Table> ParseTable(std::string_view name, std::string_view content,
                                const std::vector<std::string_view>& columns,
                                std::vector<std::string>& faults,
                                const std::vector<std::string_view>& optional_columns) {
  if (content.substr(0, 3) == "\xEF\xBB\xBF") content.remove_prefix(3);
  size_t pos = 0;
  int line = 1;
  RawRecord header;
  do {
    header = ReadRecord(content, pos, line);
  } while (header.blank_or_comment && pos < content.size());
  if (header.blank_or_comment) {
    faults.push_back(Fault(name, header.line, "no header row"));
    return std::nullopt;
  }
  // order[i] = index in the header of all_columns[i] (required, then optional).
  std::vector<std::string_view> all_columns = columns;
  all_columns.insert(all_columns.end(), optional_columns.begin(), optional_columns.end());
  std::vector<size_t> order(all_columns.size(), SIZE_MAX);
  bool header_ok = true;
  for (size_t h = 0; h < header.fields.size(); ++h) {
    std::string column = header.fields[h];
    std::transform(column.begin(), column.end(), column.begin(),
                   [](unsigned char c) { return static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c); });
    const auto it = std::find(all_columns.begin(), all_columns.end(), column);
    if (it == all_columns.end() || order[static_cast<size_t>(it - all_columns.begin())] != SIZE_MAX) {
      faults.push_back(Fault(name, header.line, "unknown or repeated column \"" + column + "\""));
      header_ok = false;
      continue;
    }
    order[static_cast<size_t>(it - all_columns.begin())] = h;
  }
  for (size_t i = 0; i < columns.size(); ++i) {
    if (order[i] == SIZE_MAX) {
      faults.push_back(Fault(name, header.line, "missing column \"" + std::string(columns[i]) + "\""));
      header_ok = false;
    }
  }
  if (!header_ok) return std::nullopt;
  Table table;
  table.name = std::string(name);
  while (pos < content.size()) {
    RawRecord record = ReadRecord(content, pos, line);
    if (record.blank_or_comment) continue;
    if (record.fields.size() != header.fields.size()) {
      faults.push_back(Fault(name, record.line,
                             std::to_string(record.fields.size()) + " fields, expected " +
                                 std::to_string(header.fields.size())));
      continue;
    }
    TableRow row;
    row.line = record.line;
    for (size_t i = 0; i < columns.size(); ++i) row.fields.push_back(std::move(record.fields[order[i]]));
    for (size_t i = columns.size(); i < all_columns.size(); ++i) {
      row.optional.push_back(order[i] == SIZE_MAX ? std::string() : std::move(record.fields[order[i]]));
    }
    table.rows.push_back(std::move(row));
  }
  return table;
}

}  // namespace medload::formulary_internal
