#include "medload/core/text.h"

#include <algorithm>
#include <charconv>

namespace medload {

std::string Join(const std::vector<std::string>& parts, std::string_view separator) {
  std::string joined;
  for (const std::string& part : parts) {
    if (!joined.empty()) joined += separator;
    joined += part;
  }
  return joined;
}

namespace {

// A byte test written out: the blank sets are a few bytes long, and find_first_not_of
// searches the set with memchr once per byte (the import trims every field of every row).
bool IsOneOf(char c, std::string_view blanks) {
  for (const char blank : blanks) {
    if (c == blank) return true;
  }
  return false;
}

}  // namespace

std::string_view TrimStart(std::string_view text, std::string_view blanks) {
  size_t first = 0;
  while (first < text.size() && IsOneOf(text[first], blanks)) ++first;
  return text.substr(first);
}

std::string_view TrimEnd(std::string_view text, std::string_view blanks) {
  size_t end = text.size();
  while (end > 0 && IsOneOf(text[end - 1], blanks)) --end;
  return text.substr(0, end);
}

std::string_view Trim(std::string_view text, std::string_view blanks) {
  return TrimEnd(TrimStart(text, blanks), blanks);
}

bool IsBlank(std::string_view text, std::string_view blanks) {
  return text.find_first_not_of(blanks) == std::string_view::npos;
}

std::optional<double> ParseDecimal(std::string_view text) {
  double value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (text.empty() || error != std::errc() || end != text.data() + text.size()) return std::nullopt;
  return value;
}

bool IsLowerHyphenated(std::string_view name) {
  if (name.empty() || name.front() == '-' || name.back() == '-') return false;
  return std::all_of(name.begin(), name.end(),
                     [](char c) { return (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '-'; });
}

}  // namespace medload
