#include "formulary/name_index.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

namespace medload::formulary_internal {
namespace {

TEST_SUITE("formulary/name_index") {

TEST_CASE("words are runs of letters and digits with their offsets") {
  const std::string text = "co-codamol 30mg/500mg";
  const std::vector<Word> words = SplitWords(text);
  REQUIRE(words.size() == 4);
  CHECK(words[0].text == "co");
  CHECK(words[1].text == "codamol");
  CHECK(words[1].offset == 3);
  CHECK(words[3].text == "500mg");
}

TEST_CASE("description words match table words in the plural") {
  CHECK(WordMatches("tablets", "tablet"));
  CHECK(WordMatches("patches", "patch"));
  CHECK(WordMatches("suppositories", "suppository"));
  CHECK_FALSE(WordMatches("tablet", "tablets"));
  CHECK_FALSE(WordMatches("stomatitis", "stoma"));
  CHECK_FALSE(WordMatches("is", "i"));
}

TEST_CASE("the longest name starting at a word wins") {
  WordTable table;
  table.Add("hyoscine hydrobromide", 1);
  table.Add("hyoscine butylbromide", 2);
  table.Add("hyoscine", 3);
  const std::string text = "hyoscine butylbromide 10mg";
  const std::vector<Word> words = SplitWords(text);
  const WordTable::Entry* entry = table.LongestAt(words, 0);
  REQUIRE(entry != nullptr);
  CHECK(entry->target == 2);
  const std::string bare = "hyoscine 10mg";
  const std::vector<Word> bare_words = SplitWords(bare);
  REQUIRE(table.LongestAt(bare_words, 0) != nullptr);
  CHECK(table.LongestAt(bare_words, 0)->target == 3);
  CHECK(table.LongestAt(bare_words, 1) == nullptr);
  CHECK(table.size() == 3);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload::formulary_internal
