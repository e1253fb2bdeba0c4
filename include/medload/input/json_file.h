// Reads the small JSON documents that people write by hand or keep between runs (report
// configs, column maps, cohort shard outputs) with faults that say where and what to do:
// "no such file", the line and column of a syntax error, a trailing comma named as such.
// It does not check what the document means; each reader does that with JSON pointers.
#pragma once

#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "medload/core/status.h"

namespace medload {

// The whole file as bytes. Input faults: "PATH: no such file", "PATH: is a folder, not a
// file", "PATH: cannot be read (check its permissions)".
Result<std::string> ReadTextFile(const std::string& path);

// Parses `text`; `name` names it in faults: "NAME:3:1: not valid JSON: a comma before '}'
// (JSON allows no trailing comma)" or "NAME:2:10: not valid JSON: <the parser's reason>"
// (line and column 1-based, the column in bytes). An empty text is "NAME: is empty".
Result<nlohmann::json> ParseJsonText(std::string_view text, const std::string& name);

// ReadTextFile then ParseJsonText, the path naming the file.
Result<nlohmann::json> ReadJsonFile(const std::string& path);

}  // namespace medload
