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

TEST_CASE("JSON text indents as asked") {
  const nlohmann::json value = {{"a", 1}};
  CHECK(JsonText(value) == "{\n  \"a\": 1\n}");
  CHECK(JsonText(value, -1) == "{\"a\":1}");
}

}  // TEST_SUITE

}  // namespace medload
