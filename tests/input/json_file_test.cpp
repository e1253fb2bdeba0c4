#include "medload/input/json_file.h"

#include <doctest/doctest.h>

#include <string>

#include "store/temp_folder.h"

namespace medload {

TEST_SUITE("input/json_file") {

TEST_CASE("a JSON syntax error is named by line and column, a trailing comma in plain words") {
  struct Case {
    const char* text;
    const char* message;
  };
  const Case cases[] = {
      {"{\n  \"title\": \"T\",\n  \"months\": 13,\n}\n",
       "network.json:4:1: not valid JSON: a comma before '}' (JSON allows no trailing comma)"},
      {"{\"criteria\": [\"items>=10\", ]}",
       "network.json:1:28: not valid JSON: a comma before ']' (JSON allows no trailing comma)"},
      {"{\n  \"title\": 'T'\n}",
       "network.json:2:12: not valid JSON: syntax error while parsing value - invalid literal; last read: "
       "'\"title\": ''"},
      {"  \n", "network.json: is empty"},
      {"{\"months\": 1e999}", "network.json: not valid JSON (a number is out of range)"},  // no exception
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    const auto document = ParseJsonText(c.text, "network.json");
    REQUIRE_FALSE(document.ok());
    CHECK(document.status().code() == StatusCode::kInput);
    CHECK(document.status().message() == c.message);
  }
  const auto good = ParseJsonText("{\"a\": [1, 2]}", "x.json");
  REQUIRE(good.ok());
  CHECK(good->at("a").size() == 2);
}

TEST_CASE("a missing file, a folder and a readable file are told apart") {
  TempFolder folder;
  CHECK(ReadTextFile(folder.File("absent.json")).status().message() == folder.File("absent.json") + ": no such file");
  const std::string path = folder.File("");
  CHECK(ReadTextFile(path).status().message() == path + ": is a folder, not a file");
  const std::string written = folder.Write("x.json", "{\"a\": 1}");
  CHECK(ReadJsonFile(written)->at("a") == 1);
}

}  // TEST_SUITE

}  // namespace medload
