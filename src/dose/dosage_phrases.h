// The fixed phrases of British dosage instructions and their meaning, for the dosage
// item recogniser. Private to src/dose. Phrases with numbers in them ("every 4 hours")
// are recognised by code in dosage_items.cpp, not listed here.
#pragma once

#include <cstddef>
#include <optional>
#include <string_view>
#include <vector>

#include "dose/dosage_items.h"

namespace medload {

struct PhraseMatch {
  Item item;
  size_t length = 0;  // tokens consumed
};

// The longest listed phrase starting at tokens[start], if any. Pure.
std::optional<PhraseMatch> MatchDosagePhrase(const std::vector<Token>& tokens, size_t start);

// True when the lower-case `word` is one of the words of a listed phrase or filler. Pure.
bool IsDosagePhraseWord(std::string_view word);

// Events of the time-of-day kind: the values of ItemKind::kEvent for named times of day.
// Clock times use kClockEventBase + hours * 100 + minutes.
enum DayEvent : int { kMorning = 1, kMidday = 2, kAfternoon = 3, kEvening = 4, kNight = 5 };
inline constexpr int kClockEventBase = 1000;

}  // namespace medload
