#include "store/control_characters.h"

#include <string>

namespace medload {
namespace {

bool IsControl(unsigned value) {
  return (value < 0x20 && value != '\t' && value != '\n' && value != '\r') || value == 0x7F;
}

int HexDigit(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

// The value of the four hex digits at text[at], or -1.
int HexValue(std::string_view text, size_t at) {
  if (at + 4 > text.size()) return -1;
  int value = 0;
  for (size_t i = at; i < at + 4; ++i) {
    const int digit = HexDigit(text[i]);
    if (digit < 0) return -1;
    value = value * 16 + digit;
  }
  return value;
}

RowFault Fault(std::string_view file, size_t line, unsigned value, size_t at) {
  static constexpr char kHex[] = "0123456789ABCDEF";
  const std::string code = {'0', 'x', kHex[(value >> 4) & 0xF], kHex[value & 0xF]};
  return {"control_character",
          FaultMessage(file, line, "row",
                       "holds the control character " + code + " (at byte " + std::to_string(at + 1) +
                           "); remove it from the file")};
}

// True when the text has no byte that could start a fault: none below 0x20 (tab and line
// ends included, to keep this loop simple), no DEL, and in JSON no backslash. Written
// without an early exit so that the compiler can compare many bytes at once: nearly every
// row takes only this path.
bool PlainText(std::string_view text, bool json) {
  unsigned char suspect = 0;
  const unsigned char escape = json ? '\\' : 0x7F;
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    suspect |= static_cast<unsigned char>((byte < 0x20) | (byte == 0x7F) | (byte == escape));
  }
  return suspect == 0;
}

}  // namespace

std::optional<RowFault> ControlCharacterFault(std::string_view file, size_t line,
                                              std::string_view text, bool json) {
  if (PlainText(text, json)) return std::nullopt;
  for (size_t i = 0; i < text.size(); ++i) {
    const auto byte = static_cast<unsigned char>(text[i]);
    if (IsControl(byte)) return Fault(file, line, byte, i);
    if (!json || text[i] != '\\' || i + 1 >= text.size()) continue;
    if (text[i + 1] == 'u') {
      const int value = HexValue(text, i + 2);
      if (value >= 0 && IsControl(static_cast<unsigned>(value))) return Fault(file, line, static_cast<unsigned>(value), i);
    }
    ++i;  // the escaped character (a backslash escaping a backslash is not an escape)
  }
  return std::nullopt;
}

}  // namespace medload
