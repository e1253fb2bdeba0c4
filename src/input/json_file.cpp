#include "medload/input/json_file.h"

#include <algorithm>
#include <cerrno>
#include <fstream>
#include <sstream>
#include <sys/stat.h>

namespace medload {
namespace {

// The parser's reason without its "[json.exception...] parse error at line L, column C: "
// prefix (the position is given separately).
std::string Reason(const std::string& what) {
  const std::string marker = ": ";
  const size_t at = what.find("column ");
  const size_t start = at == std::string::npos ? std::string::npos : what.find(marker, at);
  return start == std::string::npos ? what : what.substr(start + marker.size());
}

// The reason in plain words where the mistake is a common one.
std::string PlainReason(std::string_view text, size_t offset, const std::string& reason) {
  if (offset < text.size() && (text[offset] == '}' || text[offset] == ']')) {
    size_t before = offset;
    while (before > 0 && (text[before - 1] == ' ' || text[before - 1] == '\t' || text[before - 1] == '\n' ||
                          text[before - 1] == '\r')) {
      --before;
    }
    if (before > 0 && text[before - 1] == ',') {
      return std::string("a comma before '") + text[offset] + "' (JSON allows no trailing comma)";
    }
  }
  return reason;
}

}  // namespace

Result<std::string> ReadTextFile(const std::string& path) {
  struct stat info {};
  if (::stat(path.c_str(), &info) != 0) {
    return Status::Input(path + (errno == ENOENT ? ": no such file" : ": cannot be read (check its permissions)"));
  }
  if (S_ISDIR(info.st_mode)) return Status::Input(path + ": is a folder, not a file");
  std::ifstream in(path, std::ios::binary);
  if (!in) return Status::Input(path + ": cannot be read (check its permissions)");
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) return Status::Input(path + ": reading failed");
  return text.str();
}

Result<nlohmann::json> ParseJsonText(std::string_view text, const std::string& name) {
  if (text.find_first_not_of(" \t\r\n") == std::string_view::npos) return Status::Input(name + ": is empty");
  try {
    return nlohmann::json::parse(text.begin(), text.end());
  } catch (const nlohmann::json::parse_error& error) {
    // error.byte is the 1-based position of the character the parser stopped at.
    const size_t offset = error.byte > 0 ? std::min<size_t>(error.byte - 1, text.size()) : 0;
    size_t line = 1;
    size_t line_start = 0;
    for (size_t i = 0; i < offset; ++i) {
      if (text[i] == '\n') {
        ++line;
        line_start = i + 1;
      }
    }
    const size_t column = offset - line_start + 1;
    return Status::Input(name + ":" + std::to_string(line) + ":" + std::to_string(column) +
                         ": not valid JSON: " + PlainReason(text, offset, Reason(error.what())));
  } catch (const nlohmann::json::out_of_range&) {
    // A number beyond a double ("1e999"): the parser gives no position.
    return Status::Input(name + ": not valid JSON (a number is out of range)");
  }
}

Result<nlohmann::json> ReadJsonFile(const std::string& path) {
  auto text = ReadTextFile(path);
  if (!text.ok()) return text.status();
  return ParseJsonText(*text, path);
}

}  // namespace medload
