#include "medload/core/text.h"

#include <doctest/doctest.h>

#include <optional>
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

TEST_CASE("ParseDecimal reads a number only when it spans the whole text") {
  const struct {
    std::string_view text;
    std::optional<double> value;
  } cases[] = {
      {"0.8", 0.8}, {"1095", 1095.0}, {"-2", -2.0}, {"1e3", 1000.0},
      {"", std::nullopt}, {"0.8x", std::nullopt}, {" 1", std::nullopt}, {"+1", std::nullopt}, {"ten", std::nullopt},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    CHECK(ParseDecimal(c.text) == c.value);
  }
}

TEST_CASE("IsLowerHyphenated accepts class names and refuses other forms") {
  for (const std::string_view name : {"statin", "ras-blocker", "h1-antihistamine", "a"}) {
    CAPTURE(name);
    CHECK(IsLowerHyphenated(name));
  }
  for (const std::string_view name : {"", "-statin", "statin-", "Statin", "ras blocker", "ras_blocker"}) {
    CAPTURE(name);
    CHECK_FALSE(IsLowerHyphenated(name));
  }
}

}  // TEST_SUITE

}  // namespace medload
