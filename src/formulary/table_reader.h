// Reads one formulary CSV table (RFC 4180 quoting, a header row, `#` comment lines and
// blank lines skipped) into rows of named fields, collecting faults as
// "file:line: fault". Private to src/formulary/; it knows nothing of what the columns mean.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload::formulary_internal {

struct TableRow {
  int line = 0;                     // 1-based line where the row starts
  std::vector<std::string> fields;  // in `columns` order (see Table)
  std::vector<std::string> optional;  // in `optional_columns` order; "" where the header lacks one
};

struct Table {
  std::string name;                 // the file name as shown in faults ("dbi.csv")
  std::vector<TableRow> rows;
};

// Parses `content` of the table `name`. `columns` are the required header names, in the
// order fields are returned; `optional_columns` may be in the header too (their values go
// to TableRow::optional). The header may list them in any order, with no others. A
// header fault makes the result nullopt; a row with the wrong number of fields is left
// out with a fault. Fields are trimmed of surrounding spaces.
std::optional<Table> ParseTable(std::string_view name, std::string_view content,
                                const std::vector<std::string_view>& columns,
                                std::vector<std::string>& faults,
                                const std::vector<std::string_view>& optional_columns = {});

// Splits a `|`-separated list, trimming each part and dropping empty parts.
std::vector<std::string> SplitList(std::string_view text);

// "file:line: fault".
std::string Fault(std::string_view file, int line, std::string_view fault);

}  // namespace medload::formulary_internal
