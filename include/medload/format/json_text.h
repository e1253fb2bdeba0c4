// JSON values as output text. Every JSON output goes through here so that a string that
// is not valid UTF-8 (a file name from the command line, say) cannot make a command fail.
#pragma once

#include <string>

#include <nlohmann/json.hpp>

namespace medload {

// `value` as text, indented by `indent` spaces (-1: one line). Bytes that are not valid
// UTF-8 inside strings are replaced by U+FFFD; C1 controls and bidi controls (U+202E...)
// are written as \u escapes, so that the text shows as stored wherever it is displayed.
std::string JsonText(const nlohmann::json& value, int indent = 2);

}  // namespace medload
