#include "medload/input/input_hints.h"

#include <algorithm>

namespace medload {

std::optional<std::string_view> CompressedFormat(std::string_view head) {
  // Magic numbers: RFC 1952 (gzip), PKWARE APPNOTE (zip), bzip2 "BZh", xz and zstd
  // stream headers (each format's own specification).
  static constexpr std::pair<std::string_view, std::string_view> kMagic[] = {
      {"\x1f\x8b", "gzip"},
      {"PK\x03\x04", "zip"},
      {"BZh", "bzip2"},
      {"\xFD" "7zXZ\x00", "xz"},
      {"\x28\xB5\x2F\xFD", "zstd"},
  };
  for (const auto& [magic, name] : kMagic) {
    if (head.substr(0, magic.size()) == magic) return name;
  }
  return std::nullopt;
}

std::string CompressedInputMessage(std::string_view file, std::string_view format, std::string_view kind) {
  const std::string name(file);
  const std::string how = format == "gzip"    ? "gunzip -k " + name + "), or stream it: zcat " + name +
                                                    " | medload import " + std::string(kind) + " -"
                          : format == "zip"   ? "unzip " + name + ")"
                          : format == "bzip2" ? "bunzip2 -k " + name + ")"
                          : format == "xz"    ? "unxz -k " + name + ")"
                                              : "unzstd " + name + ")";
  return name + " is a " + std::string(format) + "-compressed file; medload reads plain CSV or NDJSON: " +
         "decompress it first (" + how;
}

std::string DelimiterHint(const CsvRow& header) {
  if (header.text.find(',') != std::string_view::npos) return "";
  static constexpr std::pair<char, std::string_view> kSeparators[] = {
      {';', "semicolons"}, {'\t', "tabs"}, {'|', "vertical bars"}};
  for (const auto& [separator, name] : kSeparators) {
    const auto count = std::count(header.text.begin(), header.text.end(), separator);
    if (count == 0) continue;
    const std::string shown = separator == '\t' ? "\\t" : std::string(1, separator);
    return "; the header has no commas but " + std::to_string(count) + " " + std::string(name) +
           ": medload reads comma-separated files (export as CSV with commas, or convert with tr '" + shown +
           "' ',' if no field holds a comma)";
  }
  return "";
}

std::string DateOrderHint(std::string_view text, DateOrder order) {
  if (order != DateOrder::kIso && ParseDate(text, DateOrder::kIso)) {
    return "; it reads as YYYY-MM-DD: use --date-format iso (the default)";
  }
  const bool dmy = order != DateOrder::kDmy && ParseDate(text, DateOrder::kDmy).has_value();
  const bool mdy = order != DateOrder::kMdy && ParseDate(text, DateOrder::kMdy).has_value();
  if (dmy && mdy) {
    return "; it reads as a day-first or a month-first date: use --date-format dmy (DD/MM/YYYY) or mdy "
           "(MM/DD/YYYY)";
  }
  if (dmy) return "; it reads as a day-first date: use --date-format dmy";
  if (mdy) return "; it reads as a month-first date: use --date-format mdy";
  return "";
}

}  // namespace medload
