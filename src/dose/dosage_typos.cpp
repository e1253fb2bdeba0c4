#include "dose/dosage_typos.h"

#include <array>
#include <cstdlib>
#include <string_view>

#include "dose/dosage_phrases.h"
#include "dose/dosage_words.h"
#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

// Words a misspelling is read as: those that carry a dose, a unit or a timing. Common
// practice: the misspellings seen on prescriptions are of these everyday words.
// "three" and "nocte" are left out: "there" and "note" are words of their own.
constexpr std::array<std::string_view, 39> kTargets = {
    "twice",     "thrice",      "daily",     "tablets",     "tablet",   "capsules",
    "capsule",   "morning",     "mornings",  "night",       "nightly",  "evening",
    "bedtime",   "times",       "every",     "hours",       "hourly",   "weekly",
    "required",  "needed",      "spoonful",  "spoonfuls",   "sachets",  "sachet",
    "drops",     "puffs",       "sprays",    "inhalations", "application", "lunchtime",
    "breakfast", "alternate",   "nostril",   "nostrils",    "suppository", "pessary",
    "patches",   "maximum",     "units",
};

// Words the recogniser understands outside the phrase and unit tables (numbers, units
// of time, and words its matchers read): never corrected.
bool Known(std::string_view word) {
  if (IsDosagePhraseWord(word) || NumberWordValue(word) || TimeUnitDays(word)) return true;
  if (word == "every" || word == "times" || word == "hourly" || word == "hrly") return true;
  return ReadDoseUnit(word).has_value();
}

// One edit between `typo` and `word`: a swap of neighbouring letters, a letter missing
// or extra, or (when `substitute`) one letter changed.
bool OneEdit(std::string_view typo, std::string_view word, bool substitute) {
  const size_t a = typo.size();
  const size_t b = word.size();
  if ((a > b ? a - b : b - a) > 1 || typo == word) return false;
  size_t i = 0;
  while (i < a && i < b && typo[i] == word[i]) ++i;
  if (a == b) {
    if (i + 1 < a && typo[i] == word[i + 1] && typo[i + 1] == word[i] &&
        typo.substr(i + 2) == word.substr(i + 2)) {
      return true;  // neighbours swapped
    }
    return substitute && typo.substr(i + 1) == word.substr(i + 1);
  }
  if (a > b) return typo.substr(i + 1) == word.substr(i);  // one extra letter
  return typo.substr(i) == word.substr(i + 1);             // one letter missing
}

bool AsciiLetters(std::string_view word) {
  for (char c : word) {
    if (c < 'a' || c > 'z') return false;
  }
  return true;
}

// A listed word itself, or its singular or plural ("tablet", "drop", "puffs").
bool FormOfTarget(std::string_view word) {
  for (std::string_view target : kTargets) {
    if (word == target) return true;
    if (word.size() + 1 == target.size() && target.back() == 's' &&
        target.compare(0, word.size(), word) == 0) {
      return true;
    }
    if (word.size() == target.size() + 1 && word.back() == 's' &&
        word.compare(0, target.size(), target) == 0) {
      return true;
    }
  }
  return false;
}

std::string_view Correction(std::string_view typo) {
  if (typo.size() < 4 || !AsciiLetters(typo) || FormOfTarget(typo)) return {};
  for (std::string_view target : kTargets) {
    if (OneEdit(typo, target, target.size() >= 7)) return target;
  }
  return {};
}

}  // namespace

std::vector<std::string> CorrectDosageTypos(std::vector<Token>& tokens) {
  std::vector<std::string> notes;
  for (Token& token : tokens) {
    if (token.kind != TokenKind::kWord) continue;
    // The near-miss test is cheap and rarely passes; the vocabulary test runs only then.
    const std::string_view target = Correction(token.text);
    if (target.empty() || Known(token.text)) continue;
    notes.push_back("read \"" + token.text + "\" as \"" + std::string(target) + "\"");
    token.text = std::string(target);
  }
  return notes;
}

}  // namespace medload
