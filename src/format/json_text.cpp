#include "medload/format/json_text.h"

namespace medload {
namespace {

// The code point of the two- or three-byte UTF-8 sequence at text[i] when it is a C1
// control (U+0080 to U+009F) or a bidi control (U+061C, U+200E, U+200F, U+202A to U+202E,
// U+2066 to U+2069; Unicode Standard Annex #9), and its length; else length 0.
unsigned HiddenAt(const std::string& text, size_t i, size_t& length) {
  const auto byte = [&](size_t k) { return k < text.size() ? static_cast<unsigned char>(text[k]) : 0U; };
  length = 0;
  if (byte(i) == 0xC2 && byte(i + 1) >= 0x80 && byte(i + 1) <= 0x9F) {
    length = 2;
    return byte(i + 1);
  }
  if (byte(i) == 0xD8 && byte(i + 1) == 0x9C) {
    length = 2;
    return 0x061C;
  }
  if (byte(i) != 0xE2) return 0;
  const unsigned value = 0x2000 | ((byte(i + 1) & 0x3FU) << 6) | (byte(i + 2) & 0x3FU);
  const bool bidi = (byte(i + 1) == 0x80 || byte(i + 1) == 0x81) && (byte(i + 2) & 0xC0) == 0x80 &&
                    (value == 0x200E || value == 0x200F || (value >= 0x202A && value <= 0x202E) ||
                     (value >= 0x2066 && value <= 0x2069));
  if (bidi) length = 3;
  return bidi ? value : 0;
}

}  // namespace

std::string JsonText(const nlohmann::json& value, int indent) {
  std::string text = value.dump(indent, ' ', false, nlohmann::json::error_handler_t::replace);
  if (text.find_first_of("\xC2\xD8\xE2") == std::string::npos) return text;
  // Outside strings JSON text is ASCII: these sequences are inside strings, where a
  // \u escape stands for the same character and cannot reorder or control a display.
  std::string escaped;
  escaped.reserve(text.size());
  static constexpr char kHex[] = "0123456789ABCDEF";
  for (size_t i = 0; i < text.size();) {
    size_t length = 0;
    const unsigned code_point = HiddenAt(text, i, length);
    if (length == 0) {
      escaped += text[i++];
      continue;
    }
    escaped += "\\u";
    for (int shift = 12; shift >= 0; shift -= 4) escaped += kHex[(code_point >> shift) & 0xF];
    i += length;
  }
  return escaped;
}

}  // namespace medload
