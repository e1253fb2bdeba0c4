// Reads a CSV file that medload wrote the way a spreadsheet or a CSV library would, to check
// its layout: the comment lines before the header (each must be one field starting "# "),
// the header, and whether every data row has as many fields as the header. Test code only.
#pragma once

#include <sstream>
#include <string>
#include <vector>

#include "medload/input/csv_reader.h"

namespace medload::testing {

struct CsvLayout {
  std::vector<std::string> comments;  // the comment fields, in order ("# CAUTION: ...")
  size_t comment_fields = 0;          // fields in all the comment records together
  std::vector<std::string> header;    // the first record that is not a comment
  size_t rows = 0;                    // data records after the header
  size_t ragged_rows = 0;             // data records whose field count is not the header's
};

inline CsvLayout ReadCsvLayout(const std::string& text) {
  std::istringstream in(text);
  CsvReader reader(in);
  CsvLayout layout;
  CsvRow row;
  bool in_header = true;
  while (reader.Next(row)) {
    const bool comment = !row.fields.empty() && row.fields[0].rfind("# ", 0) == 0;
    if (in_header && comment) {
      layout.comments.emplace_back(row.fields[0]);
      layout.comment_fields += row.fields.size();
    } else if (in_header) {
      for (const std::string_view field : row.fields) layout.header.emplace_back(field);
      in_header = false;
    } else {
      ++layout.rows;
      if (row.fields.size() != layout.header.size()) ++layout.ragged_rows;
    }
  }
  return layout;
}

}  // namespace medload::testing
