#include "dose/dosage_phrases.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("dose/dosage_phrases") {

TEST_CASE("the longest listed phrase wins and numbers never start one") {
  const auto tokens = LexDosageText("as and when required").tokens;
  const auto match = MatchDosagePhrase(tokens, 0);
  REQUIRE(match);
  CHECK(match->length == 4);
  CHECK(match->item.kind == ItemKind::kAsNeeded);
  CHECK(MatchDosagePhrase(LexDosageText("max daily dose 8").tokens, 0)->length == 3);
  CHECK(MatchDosagePhrase(LexDosageText("max daily dose 8").tokens, 0)->item.value == 1);
  CHECK_FALSE(MatchDosagePhrase(LexDosageText("8 daily").tokens, 0));
  CHECK_FALSE(MatchDosagePhrase(LexDosageText("zorb").tokens, 0));
  CHECK_FALSE(MatchDosagePhrase(LexDosageText("daily").tokens, 5));
}

TEST_CASE("every listed abbreviation carries its administrations per day") {
  // Common practice: od/qd 1, bd/bid 2, tds/tid 3, qds/qid 4 a day; qod every other day.
  struct Case {
    const char* word;
    double per_day;
  };
  const Case cases[] = {{"od", 1}, {"qd", 1}, {"bd", 2}, {"bid", 2}, {"tds", 3},
                        {"tid", 3}, {"qds", 4}, {"qid", 4}, {"qod", 0.5}, {"qh", 24}};
  for (const Case& c : cases) {
    CAPTURE(c.word);
    const auto match = MatchDosagePhrase(LexDosageText(c.word).tokens, 0);
    REQUIRE(match);
    CHECK(match->item.kind == ItemKind::kFrequency);
    CHECK(match->item.value / match->item.period_days == doctest::Approx(c.per_day));
  }
}

}  // TEST_SUITE

}  // namespace medload
