#include "store/control_characters.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("store/control_characters") {

TEST_CASE("control characters in a record are found as bytes, and in JSON also as escapes") {
  struct Case {
    std::string text;
    bool json;
    const char* message;  // nullptr: no fault
  };
  const Case cases[] = {
      {"P1,2024-01-01,Amlodipine 5mg tablets,28", false, nullptr},
      {"P1,\"two\r\nlines\",x\ty", false, nullptr},  // tab, CR and LF are data
      {std::string("P\0" "1,x", 5), false, "d.csv:7: row: holds the control character 0x00 (at byte 2); remove it from the file"},
      {"x,\x1B[31mred", false, "d.csv:7: row: holds the control character 0x1B (at byte 3); remove it from the file"},
      {"x\x7F", false, "d.csv:7: row: holds the control character 0x7F (at byte 2); remove it from the file"},
      {"caf\xC3\xA9", false, nullptr},                  // UTF-8 bytes are not controls
      {"{\"a\":\"\\u001b[31m\"}", false, nullptr},      // CSV: an escape is just text
      {"{\"a\":\"\\u001b[31m\"}", true, "d.csv:7: row: holds the control character 0x1B (at byte 7); remove it from the file"},
      {"{\"a\":\"\\u0000\"}", true, "d.csv:7: row: holds the control character 0x00 (at byte 7); remove it from the file"},
      {"{\"a\":\"\\u007F\"}", true, "d.csv:7: row: holds the control character 0x7F (at byte 7); remove it from the file"},
      {"{\"a\":\"tab\\u0009 and \\u000a\\u000D\"}", true, nullptr},
      {"{\"a\":\"\\\\u001b is text\"}", true, nullptr},  // an escaped backslash, then text
      {"{\"a\":\"\\u00e9\\u001\"}", true, nullptr},      // not a control; a short escape
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const std::optional<RowFault> fault = ControlCharacterFault("d.csv", 7, c.text, c.json);
    if (c.message == nullptr) {
      CHECK_FALSE(fault.has_value());
      continue;
    }
    REQUIRE(fault.has_value());
    CHECK(fault->reason == "control_character");
    CHECK(fault->message == c.message);
  }
}

TEST_CASE("every byte value is judged the same inside long text as on its own, at any position") {
  // The check's quick pass over plain text must never hide a fault: each of the 256 byte
  // values, alone and inside 40 bytes of plain text at each position, in CSV and JSON.
  for (const bool json : {false, true}) {
    for (int value = 0; value < 256; ++value) {
      const char byte = static_cast<char>(value);
      const bool control = (value < 0x20 && value != '\t' && value != '\n' && value != '\r') || value == 0x7F;
      CAPTURE(json);
      CAPTURE(value);
      CHECK(ControlCharacterFault("d.csv", 1, std::string(1, byte), json).has_value() == control);
      for (size_t at = 0; at < 40; at += 7) {
        std::string text(40, 'a');
        text[at] = byte;
        const std::optional<RowFault> fault = ControlCharacterFault("d.csv", 1, text, json);
        REQUIRE(fault.has_value() == control);
        if (fault) CHECK(fault->message.find("(at byte " + std::to_string(at + 1) + ")") != std::string::npos);
      }
    }
  }
}

}  // TEST_SUITE

}  // namespace medload
