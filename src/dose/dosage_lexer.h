// Splits a dosage instruction into lower-case words, numbers and punctuation for the
// dosage-text recogniser. Private to src/dose. It gives words no meaning: "bd" and
// "tablet" are just words here.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

enum class TokenKind { kNumber, kWord, kPunct };

struct Token {
  TokenKind kind = TokenKind::kWord;
  std::string text;    // lower-case ASCII word, the punctuation character, or the digits
  double number = 0;   // the value of a kNumber ("2.5" -> 2.5, "½" -> 0.5, "1½" -> 1.5)
  bool joined = false; // no white space between this token and the previous one
};

struct LexedText {
  std::vector<Token> tokens;
  bool truncated = false;  // the text was longer than the caps below
};

// Caps that bound the work on hostile input.
inline constexpr size_t kMaxDosageTextBytes = 1000;
inline constexpr size_t kMaxDosageTokens = 400;

// Words: ASCII letters folded to lower case, with abbreviation dots removed ("b.d." ->
// "bd", "p.r.n." -> "prn") and a trailing "(s)" dropped ("tablet(s)" -> "tablet"); a
// hyphen between letters separates words ("twice-daily"). Numbers: ASCII digits with an
// optional decimal part, and the vulgar fractions ½ ¼ ¾ (added to a whole number right
// before them). "×" is the word "x"; dashes are "-"; other non-ASCII text is kept in words
// as it is. Pure and locale-independent; reads at most kMaxDosageTextBytes bytes and
// returns at most kMaxDosageTokens tokens.
LexedText LexDosageText(std::string_view text);

}  // namespace medload
