#include "dose/dosage_lexer.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {
namespace {

// The tokens as one string: words as they are, numbers as #value, punctuation in [].
std::string Show(std::string_view text) {
  std::string shown;
  for (const Token& token : LexDosageText(text).tokens) {
    if (!shown.empty()) shown += ' ';
    switch (token.kind) {
      case TokenKind::kWord: shown += token.text; break;
      case TokenKind::kNumber: {
        std::string number = std::to_string(token.number);
        while (number.back() == '0') number.pop_back();
        if (number.back() == '.') number.pop_back();
        shown += "#" + number;
        break;
      }
      case TokenKind::kPunct: shown += "[" + token.text + "]"; break;
    }
  }
  return shown;
}

}  // namespace

TEST_SUITE("dose/dosage_lexer") {

TEST_CASE("words fold to lower case and numbers split from their units") {
  CHECK(Show("Take 2 TABLETS") == "take #2 tablets");
  CHECK(Show("5ml tds") == "#5 ml tds");
  CHECK(Show("2.5mL") == "#2.5 ml");
  CHECK(Show(".5 ml") == "#0.5 ml");
  CHECK(Show("q4h") == "q #4 h");
  CHECK(Show("1-2 every 4-6 hours") == "#1 [-] #2 every #4 [-] #6 hours");
}

TEST_CASE("abbreviation dots are removed and sentence dots kept") {
  CHECK(Show("b.d.") == "bd");
  CHECK(Show("one t.d.s. p.r.n.") == "one tds prn");
  CHECK(Show("a.m.") == "am");
  CHECK(Show("daily. Take") == "daily [.] take");
  CHECK(Show("max. 8") == "max [.] #8");
  CHECK(Show("daily.then") == "daily [.] then");
}

TEST_CASE("a plural in brackets and hyphens between words are dropped") {
  CHECK(Show("tablet(s)") == "tablet");
  CHECK(Show("twice-daily") == "twice daily");
  CHECK(Show("four-hourly") == "four hourly");
  CHECK(Show("(s)") == "[(] s [)]");
}

TEST_CASE("vulgar fractions, the times sign and dashes are read") {
  CHECK(Show("\xC2\xBD tablet") == "#0.5 tablet");
  CHECK(Show("1\xC2\xBD tablets") == "#1.5 tablets");
  CHECK(Show("1 \xC2\xBD") == "#1 #0.5");  // joined later by the recogniser
  CHECK(Show("\xC2\xBC") == "#0.25");
  CHECK(Show("2\xC3\x97" "5ml") == "#2 x #5 ml");
  CHECK(Show("1\xE2\x80\x93" "2") == "#1 [-] #2");
  CHECK(Show("don\xE2\x80\x99t") == "don't");
  CHECK(Show("one\xC2\xA0tablet") == "one tablet");
}

TEST_CASE("tokens record whether white space came before them") {
  const LexedText lexed = LexDosageText("8am and 8 pm");
  REQUIRE(lexed.tokens.size() == 5);
  CHECK_FALSE(lexed.tokens[0].joined);
  CHECK(lexed.tokens[1].joined);
  CHECK_FALSE(lexed.tokens[4].joined);
}

TEST_CASE("other non-ASCII bytes stay inside words") {
  CHECK(Show("caf\xC3\xA9 daily") == "caf\xC3\xA9 daily");
  CHECK(Show("\xFF\xFE bd") == "\xFF\xFE bd");
}

TEST_CASE("input beyond the caps is cut and marked as truncated") {
  CHECK_FALSE(LexDosageText("one daily").truncated);
  const LexedText long_text = LexDosageText(std::string(5000, 'a'));
  CHECK(long_text.truncated);
  REQUIRE(long_text.tokens.size() == 1);
  CHECK(long_text.tokens[0].text.size() == kMaxDosageTextBytes);
  std::string many;
  for (int k = 0; k < 450; ++k) many += "1 ";
  const LexedText many_tokens = LexDosageText(many);
  CHECK(many_tokens.truncated);
  CHECK(many_tokens.tokens.size() == kMaxDosageTokens);
}

}  // TEST_SUITE

}  // namespace medload
