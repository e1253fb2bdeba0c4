#include "medload/format/shown_text.h"

#include <doctest/doctest.h>

#include <sstream>

namespace medload {

TEST_SUITE("format/shown_text") {

TEST_CASE("control characters, bidi controls and bad bytes are shown as escapes") {
  // Bidi controls: Unicode Standard Annex #9 (explicit formatting characters and marks).
  struct Case {
    std::string text;
    std::string one_line;
    std::string keep_lines;
  };
  const Case cases[] = {
      {"plain Amlodipine 5mg", "plain Amlodipine 5mg", "plain Amlodipine 5mg"},
      {"\x1b[2Jtitle", "\\x1b[2Jtitle", "\\x1b[2Jtitle"},
      {"a\rb", "a\\x0db", "a\\x0db"},
      {"a\nb\tc", "a\\x0ab\\x09c", "a\nb\tc"},
      {"del\x7f", "del\\x7f", "del\\x7f"},
      {"P\xE2\x80\xAE" "1", "P\\u202E1", "P\\u202E1"},                // right-to-left override
      {"\xE2\x81\xA6x\xE2\x81\xA9", "\\u2066x\\u2069", "\\u2066x\\u2069"},  // isolates
      {"\xE2\x80\x8F\xD8\x9C", "\\u200F\\u061C", "\\u200F\\u061C"},    // RLM, Arabic letter mark
      {"c1 \xC2\x9B", "c1 \\u009B", "c1 \\u009B"},                    // C1 control (CSI)
      {"caf\xC3\xA9 \xE2\x82\xAC", "caf\xC3\xA9 \xE2\x82\xAC", "caf\xC3\xA9 \xE2\x82\xAC"},
      {"bad\xFF", "bad\\xff", "bad\\xff"},
      {"cut\xE2\x80", "cut\\xe2\\x80", "cut\\xe2\\x80"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(ShownText(c.text) == c.one_line);
    CHECK(ShownText(c.text, true) == c.keep_lines);
    CHECK(NeedsShowing(c.text) == (c.text != c.one_line));
  }
}

TEST_CASE("an identifier's first hidden character is named, plain text has none") {
  CHECK(HiddenCharacterIn("P0001") == std::nullopt);
  CHECK(HiddenCharacterIn("Zo\xC3\xAB") == std::nullopt);
  CHECK(HiddenCharacterIn("P1\nP2") == "\\x0a");
  CHECK(HiddenCharacterIn("P1\tx") == "\\x09");
  CHECK(HiddenCharacterIn("\xE2\x80\xAE" "1P") == "\\u202E");
}

TEST_CASE("a stream through the shown-text buffer is escaped, even split across writes") {
  std::ostringstream target;
  {
    ShownTextBuffer buffer(target.rdbuf());
    std::ostream out(&buffer);
    out << "title \x1b[31mred\n";
    out << "P\xE2\x80";  // a bidi control split across two writes
    out.flush();
    out << "\xAE" "1 end";
  }
  CHECK(target.str() == "title \\x1b[31mred\nP\\u202E1 end");
}

}  // TEST_SUITE

}  // namespace medload
