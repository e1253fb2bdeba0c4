#include "medload/core/text.h"

#include <doctest/doctest.h>

#include <string>
#include <string_view>
#include <vector>

namespace medload {

TEST_SUITE("core/text") {

TEST_CASE("Join puts the separator between parts once the text so far is not empty") {
  struct Case {
    std::vector<std::string> parts;
    std::string joined;
  };
  const std::vector<Case> cases = {
      {{}, ""},
      {{"a"}, "a"},
      {{"a", "b", "c"}, "a, b, c"},
      {{"", "a", "b"}, "a, b"},      // empty leading parts add nothing
      {{"a", "", "b"}, "a, , b"},    // a later empty part keeps its separator
      {{"", ""}, ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.joined);
    CHECK(Join(c.parts, ", ") == c.joined);
  }
}

TEST_CASE("Trim removes only the chosen blank bytes at either end") {
  struct Case {
    std::string_view text;
    std::string_view blanks;
    std::string_view start, end, both;
  };
  const std::vector<Case> cases = {
      {"", kSpaceTab, "", "", ""},
      {" \t ", kSpaceTab, "", "", ""},
      {"  a b\t", kSpaceTab, "a b\t", "  a b", "a b"},
      {"a\r", kSpaceTab, "a\r", "a\r", "a\r"},        // CR is not blank by default
      {" a\r \r", " \t\r", "a\r \r", " a", "a"},       // mixed blanks at the end
      {"\na\n", kSpaceTab, "\na\n", "\na\n", "\na\n"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(TrimStart(c.text, c.blanks) == c.start);
    CHECK(TrimEnd(c.text, c.blanks) == c.end);
    CHECK(Trim(c.text, c.blanks) == c.both);
  }
}

TEST_CASE("IsBlank is true when every byte is one of the chosen blanks") {
  struct Case {
    std::string_view text;
    std::string_view blanks;
    bool blank;
  };
  const std::vector<Case> cases = {
      {"", kSpaceTab, true},
      {" \t", kSpaceTab, true},
      {" \r", kSpaceTab, false},
      {" \r", " \t\r", true},
      {"\f\v\n", " \t\n\r\f\v", true},
      {" x ", " \t\n\r\f\v", false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(IsBlank(c.text, c.blanks) == c.blank);
  }
}

}  // TEST_SUITE

}  // namespace medload
