// Hints for input that fails for a reason the user can fix in one step: a compressed file,
// a file separated by semicolons or tabs instead of commas, dates written day first. Each
// helper looks at text already read and returns what to say; none of them changes how the
// input is read (medload does not guess a delimiter or a date order silently).
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "medload/core/date.h"
#include "medload/input/csv_reader.h"

namespace medload {

// The compression or archive format that the first bytes of a file start with ("gzip",
// "zip", "bzip2", "xz", "zstd"), or nullopt for anything else.
std::optional<std::string_view> CompressedFormat(std::string_view head);

// The fault for an input in such a format, with the command that reads it ("dispensing"
// for `kind`): "FILE is a gzip-compressed file; medload reads plain CSV or NDJSON:
// decompress it first (gunzip -k FILE), or stream it: zcat FILE | medload import KIND -".
std::string CompressedInputMessage(std::string_view file, std::string_view format, std::string_view kind);

// For a header that did not name the required columns: when it holds no comma but another
// common separator (';', tab, '|'), "; the header has no commas but 3 semicolons: medload
// reads comma-separated files (export as CSV with commas, or convert: tr ';' ',')";
// otherwise "".
std::string DelimiterHint(const CsvRow& header);

// For a date that did not parse in `order`: when it parses in another order, "; it reads
// as a day-first date: use --date-format dmy" (month-first: mdy; both when either could be
// meant; YYYY-MM-DD: iso); otherwise "".
std::string DateOrderHint(std::string_view text, DateOrder order);

}  // namespace medload
