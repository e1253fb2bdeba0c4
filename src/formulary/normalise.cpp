// Text normalisation for names and descriptions. The only file that uses ICU in the
// formulary: compatibility decomposition (NFKD), combining marks dropped, case folding.
#include <unicode/normalizer2.h>
#include <unicode/uchar.h>
#include <unicode/unistr.h>

#include <string>
#include <string_view>

#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

bool IsAscii(std::string_view text) {
  for (const char c : text) {
    if (static_cast<unsigned char>(c) >= 0x80) return false;
  }
  return true;
}

std::string AsciiLower(std::string_view text) {
  std::string out(text);
  for (char& c : out) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c + ('a' - 'A'));
  }
  return out;
}

// The slow path for text with non-ASCII characters.
std::string IcuNormalise(std::string_view text) {
  UErrorCode error = U_ZERO_ERROR;
  const icu::Normalizer2* nfkd = icu::Normalizer2::getNFKDInstance(error);
  if (U_FAILURE(error)) return AsciiLower(text);
  const icu::UnicodeString input =
      icu::UnicodeString::fromUTF8(icu::StringPiece(text.data(), static_cast<int32_t>(text.size())));
  icu::UnicodeString folded = input;
  folded.foldCase();
  const icu::UnicodeString decomposed = nfkd->normalize(folded, error);
  if (U_FAILURE(error)) return AsciiLower(text);
  icu::UnicodeString kept;
  for (int32_t i = 0; i < decomposed.length();) {
    const UChar32 c = decomposed.char32At(i);
    i += U16_LENGTH(c);
    if (u_charType(c) == U_NON_SPACING_MARK) continue;  // accents: e -> e
    if (c == 0xFFFD) {                                  // invalid UTF-8 in the input
      kept.append(static_cast<UChar>(' '));
    } else if (c == 0x03BC) {                           // micro sign / mu: "ug" -> "mcg"
      kept.append(icu::UnicodeString("mc"));
    } else if (c == 0x2044 || c == 0x2215) {            // fraction and division slashes
      kept.append(static_cast<UChar>('/'));
    } else {
      kept.append(c);
    }
  }
  std::string out;
  kept.toUTF8String(out);
  return out;
}

}  // namespace

std::string NormaliseText(std::string_view text) {
  return IsAscii(text) ? AsciiLower(text) : IcuNormalise(text);
}

std::string NameKey(std::string_view name) {
  const std::string text = NormaliseText(name);
  std::string key;
  key.reserve(text.size());
  bool pending_space = false;
  for (const char c : text) {
    const auto u = static_cast<unsigned char>(c);
    const bool word = (u >= 'a' && u <= 'z') || (u >= '0' && u <= '9') || u >= 0x80;
    if (!word) {
      pending_space = !key.empty();
      continue;
    }
    if (pending_space) key += ' ';
    pending_space = false;
    key += c;
  }
  return key;
}

}  // namespace medload
