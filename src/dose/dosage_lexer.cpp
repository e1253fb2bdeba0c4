#include "dose/dosage_lexer.h"

#include <charconv>
#include <cmath>

namespace medload {
namespace {

bool IsDigit(char c) { return c >= '0' && c <= '9'; }
bool IsLetter(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); }
bool IsSpace(char c) {
  return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v';
}
unsigned char Byte(char c) { return static_cast<unsigned char>(c); }
char Lower(char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c; }

// Non-ASCII sequences the lexer gives a meaning to; everything else is word text.
enum class Special { kNone, kSpace, kHalf, kQuarter, kThreeQuarters, kTimes, kDash, kQuote };

Special SpecialAt(std::string_view text, size_t i, size_t& length) {
  const auto at = [&](size_t k) { return i + k < text.size() ? Byte(text[i + k]) : 0u; };
  length = 2;
  if (at(0) == 0xC2) {
    if (at(1) == 0xA0) return Special::kSpace;          // no-break space
    if (at(1) == 0xBD) return Special::kHalf;           // ½
    if (at(1) == 0xBC) return Special::kQuarter;        // ¼
    if (at(1) == 0xBE) return Special::kThreeQuarters;  // ¾
  }
  if (at(0) == 0xC3 && at(1) == 0x97) return Special::kTimes;  // ×
  length = 3;
  if (at(0) == 0xE2 && at(1) == 0x80) {
    if (at(2) == 0x93 || at(2) == 0x94 || at(2) == 0x90 || at(2) == 0x91) return Special::kDash;
    if (at(2) == 0x98 || at(2) == 0x99) return Special::kQuote;
  }
  if (at(0) == 0xE2 && at(1) == 0x88 && at(2) == 0x92) return Special::kDash;  // minus sign
  length = 0;
  return Special::kNone;
}

// Emits the words of one run of letters and dots: "b.d." -> "bd"; "daily." -> "daily",
// "."; "max.8" is not reached here (digits end a run).
void EmitWordRun(std::string_view run, bool joined, std::vector<Token>& out) {
  std::vector<std::string_view> segments;
  size_t start = 0;
  for (size_t i = 0; i <= run.size(); ++i) {
    if (i == run.size() || run[i] == '.') {
      segments.push_back(run.substr(start, i - start));
      start = i + 1;
    }
  }
  while (segments.size() > 1 && segments.back().empty()) segments.pop_back();
  bool abbreviation = segments.size() > 1;
  for (std::string_view segment : segments) {
    abbreviation = abbreviation && !segment.empty() && segment.size() <= 2;
  }
  auto push_word = [&](std::string_view word, bool is_joined) {
    Token token{TokenKind::kWord, {}, 0, is_joined};
    for (char c : word) token.text.push_back(Lower(c));
    out.push_back(std::move(token));
  };
  if (abbreviation) {
    std::string word;
    for (std::string_view segment : segments) word += segment;
    push_word(word, joined);
    return;
  }
  for (size_t k = 0; k < segments.size(); ++k) {
    if (k > 0) out.push_back(Token{TokenKind::kPunct, ".", 0, true});
    if (!segments[k].empty()) push_word(segments[k], k == 0 ? joined : true);
  }
  if (!run.empty() && run.back() == '.') out.push_back(Token{TokenKind::kPunct, ".", 0, true});
}

// Adds a vulgar fraction: to a whole number just before it, or as a number of its own.
void EmitFraction(double value, bool joined, std::vector<Token>& out) {
  if (joined && !out.empty() && out.back().kind == TokenKind::kNumber &&
      out.back().number == std::floor(out.back().number)) {
    out.back().number += value;
    return;
  }
  out.push_back(Token{TokenKind::kNumber, "", value, joined});
}

class Lexer {
 public:
  explicit Lexer(std::string_view text) : text_(text) {}

  LexedText Run() {
    while (i_ < text_.size() && result_.tokens.size() < kMaxDosageTokens) Step();
    if (i_ < text_.size()) result_.truncated = true;
    return std::move(result_);
  }

 private:
  void Step() {
    const char c = text_[i_];
    size_t length = 0;
    const Special special = SpecialAt(text_, i_, length);
    if (IsSpace(c) || special == Special::kSpace || Byte(c) < 0x20 || c == 0x7F) {
      i_ += special == Special::kSpace ? length : 1;
      space_ = true;
      return;
    }
    const bool joined = !space_ && !result_.tokens.empty();
    space_ = false;
    if (special != Special::kNone && special != Special::kQuote) {
      EmitSpecial(special, joined);
      i_ += length;
    } else if (IsDigit(c) || (c == '.' && i_ + 1 < text_.size() && IsDigit(text_[i_ + 1]))) {
      LexNumber(joined);
    } else if (c == '(' && i_ + 2 < text_.size() && Lower(text_[i_ + 1]) == 's' &&
               text_[i_ + 2] == ')' && joined && i_ > 0 && IsLetter(text_[i_ - 1])) {
      i_ += 3;  // "tablet(s)"
    } else if (c == '-' && i_ > 0 && i_ + 1 < text_.size() && IsLetter(text_[i_ - 1]) &&
               IsLetter(text_[i_ + 1])) {
      ++i_;  // "twice-daily": the hyphen separates two words
      space_ = true;
    } else if (IsWordByte(i_)) {
      LexWord(joined);
    } else {
      result_.tokens.push_back(Token{TokenKind::kPunct, std::string(1, c), 0, joined});
      ++i_;
    }
  }

  void EmitSpecial(Special special, bool joined) {
    auto& out = result_.tokens;
    switch (special) {
      case Special::kHalf: EmitFraction(0.5, joined, out); break;
      case Special::kQuarter: EmitFraction(0.25, joined, out); break;
      case Special::kThreeQuarters: EmitFraction(0.75, joined, out); break;
      case Special::kTimes: out.push_back(Token{TokenKind::kWord, "x", 0, joined}); break;
      case Special::kDash: out.push_back(Token{TokenKind::kPunct, "-", 0, joined}); break;
      default: break;
    }
  }

  // Letters, apostrophes, abbreviation dots and non-ASCII bytes without a meaning.
  bool IsWordByte(size_t k) const {
    const char c = text_[k];
    if (IsLetter(c) || Byte(c) >= 0x80) {
      size_t length = 0;
      const Special special = SpecialAt(text_, k, length);
      return special == Special::kNone || special == Special::kQuote;
    }
    return false;
  }

  void LexWord(bool joined) {
    std::string run;
    while (i_ < text_.size()) {
      size_t length = 0;
      if (SpecialAt(text_, i_, length) == Special::kQuote) {
        run.push_back('\'');
        i_ += length;
      } else if (IsWordByte(i_)) {
        run.push_back(text_[i_++]);
      } else if ((text_[i_] == '.' || text_[i_] == '\'') && !run.empty()) {
        run.push_back(text_[i_++]);
      } else {
        break;
      }
    }
    while (!run.empty() && run.back() == '\'') run.pop_back();
    EmitWordRun(run, joined, result_.tokens);
  }

  void LexNumber(bool joined) {
    const size_t start = i_;
    while (i_ < text_.size() && IsDigit(text_[i_])) ++i_;
    if (i_ + 1 < text_.size() && text_[i_] == '.' && IsDigit(text_[i_ + 1])) {
      ++i_;
      while (i_ < text_.size() && IsDigit(text_[i_])) ++i_;
    }
    Token token{TokenKind::kNumber, std::string(text_.substr(start, i_ - start)), 0, joined};
    std::string digits = token.text.front() == '.' ? "0" + token.text : token.text;
    std::from_chars(digits.data(), digits.data() + digits.size(), token.number);
    result_.tokens.push_back(std::move(token));
  }

  std::string_view text_;
  size_t i_ = 0;
  bool space_ = false;
  LexedText result_;
};

// The longest prefix of at most kMaxDosageTextBytes that does not cut a UTF-8 sequence.
std::string_view Capped(std::string_view text) {
  if (text.size() <= kMaxDosageTextBytes) return text;
  size_t end = kMaxDosageTextBytes;
  while (end > 0 && (Byte(text[end]) & 0xC0) == 0x80) --end;
  return text.substr(0, end);
}

}  // namespace

LexedText LexDosageText(std::string_view text) {
  LexedText lexed = Lexer(Capped(text)).Run();
  if (text.size() > kMaxDosageTextBytes) lexed.truncated = true;
  return lexed;
}

}  // namespace medload
