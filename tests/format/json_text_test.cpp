#include "medload/format/json_text.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("format/json_text") {

TEST_CASE("JSON text replaces bytes that are not UTF-8 instead of failing") {
  const nlohmann::json value = {{"file", std::string("ward\xff.csv")}};
  // Source: RFC 8259 section 8.1 requires UTF-8; U+FFFD is the Unicode replacement character.
  CHECK(JsonText(value, -1) == "{\"file\":\"ward\xEF\xBF\xBD.csv\"}");
  CHECK_THROWS(static_cast<void>(value.dump()));  // what a plain dump would have done
}

TEST_CASE("JSON text writes C1 and bidi controls as escapes and keeps other text") {
  // Bidi controls: Unicode Standard Annex #9, table 4; JSON escapes: RFC 8259 section 7.
  const nlohmann::json value = {{"title", "P\xE2\x80\xAE" "1 \xC2\x9B caf\xC3\xA9 \xE2\x82\xAC \xE2\x81\xA6x"}};
  const std::string text = JsonText(value, -1);
  CHECK(text == "{\"title\":\"P\\u202E1 \\u009B caf\xC3\xA9 \xE2\x82\xAC \\u2066x\"}");
  CHECK(nlohmann::json::parse(text) == value);  // the same string once read back
}

TEST_CASE("JSON text indents as asked") {
  const nlohmann::json value = {{"a", 1}};
  CHECK(JsonText(value) == "{\n  \"a\": 1\n}");
  CHECK(JsonText(value, -1) == "{\"a\":1}");
}

}  // TEST_SUITE

}  // namespace medload
