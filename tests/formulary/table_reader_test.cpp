#include "formulary/table_reader.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

namespace medload::formulary_internal {
namespace {

TEST_SUITE("formulary/table_reader") {

TEST_CASE("columns are returned in the asked order whatever the header order") {
  std::vector<std::string> faults;
  const auto table = ParseTable("t.csv", "source,score,ingredient\nBoustani 2008,3,atropine\n",
                                {"ingredient", "score", "source"}, faults);
  REQUIRE(table.has_value());
  CHECK(faults.empty());
  REQUIRE(table->rows.size() == 1);
  CHECK(table->rows[0].fields == std::vector<std::string>{"atropine", "3", "Boustani 2008"});
  CHECK(table->rows[0].line == 2);
}

TEST_CASE("an optional column is read when the header has it and empty when it does not") {
  std::vector<std::string> faults;
  const auto with = ParseTable("t.csv", "routes,ingredient,score,source\noral|eye,atropine,3,B\n",
                               {"ingredient", "score", "source"}, faults, {"routes"});
  REQUIRE(with.has_value());
  CHECK(faults.empty());
  CHECK(with->rows[0].fields == std::vector<std::string>{"atropine", "3", "B"});
  CHECK(with->rows[0].optional == std::vector<std::string>{"oral|eye"});
  const auto without = ParseTable("t.csv", "ingredient,score,source\natropine,3,B\n",
                                  {"ingredient", "score", "source"}, faults, {"routes"});
  REQUIRE(without.has_value());
  CHECK(faults.empty());
  CHECK(without->rows[0].optional == std::vector<std::string>{""});
  // Not offered as optional: still an unknown column.
  CHECK_FALSE(ParseTable("t.csv", "ingredient,score,source,routes\na,3,B,oral\n", {"ingredient", "score", "source"},
                         faults).has_value());
  CHECK(faults == std::vector<std::string>{"t.csv:1: unknown or repeated column \"routes\""});
}

TEST_CASE("quoted fields keep commas, doubled quotes and line breaks; lines are counted") {
  std::vector<std::string> faults;
  const auto table = ParseTable("t.csv",
                                "\xEF\xBB\xBFname,source\r\n\"a, b\",\"say \"\"hi\"\"\"\r\n"
                                "\"two\nlines\",x\r\n# comment\r\n\r\nlast , y \r\n",
                                {"name", "source"}, faults);
  REQUIRE(table.has_value());
  CHECK(faults.empty());
  REQUIRE(table->rows.size() == 3);
  CHECK(table->rows[0].fields == std::vector<std::string>{"a, b", "say \"hi\""});
  CHECK(table->rows[1].fields == std::vector<std::string>{"two\nlines", "x"});
  CHECK(table->rows[1].line == 3);
  CHECK(table->rows[2].fields == std::vector<std::string>{"last", "y"});
  CHECK(table->rows[2].line == 7);
}

TEST_CASE("header faults name the missing and unknown columns") {
  std::vector<std::string> faults;
  const auto table = ParseTable("t.csv", "name,colour\n", {"name", "source"}, faults);
  CHECK_FALSE(table.has_value());
  CHECK(faults == std::vector<std::string>{"t.csv:1: unknown or repeated column \"colour\"",
                                           "t.csv:1: missing column \"source\""});
  faults.clear();
  CHECK_FALSE(ParseTable("t.csv", "# only a comment\n", {"name"}, faults).has_value());
  CHECK(faults == std::vector<std::string>{"t.csv:1: no header row"});
}

TEST_CASE("a row with the wrong field count is left out with a fault") {
  std::vector<std::string> faults;
  const auto table = ParseTable("t.csv", "name,source\na,b,c\nd,e\n", {"name", "source"}, faults);
  REQUIRE(table.has_value());
  CHECK(table->rows.size() == 1);
  CHECK(faults == std::vector<std::string>{"t.csv:2: 3 fields, expected 2"});
}

TEST_CASE("lists split on bars, trimmed, without empty parts") {
  CHECK(SplitList(" a | b||c ") == std::vector<std::string>{"a", "b", "c"});
  CHECK(SplitList("").empty());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload::formulary_internal
