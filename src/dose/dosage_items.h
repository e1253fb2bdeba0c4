// Gives the tokens of a dosage instruction their meaning, one phrase at a time: amounts,
// units, frequencies, times of day, as-needed and maximum markers. Private to src/dose.
// It does not combine them: ReadDosageText assembles items into doses per day.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "dose/dosage_lexer.h"

namespace medload {

enum class ItemKind {
  kAmount,      // value: the amount (upper value of a range)
  kUnit,        // unit: canonical unit name; value: factor to it
  kCount,       // value: administrations in the period ("twice", "3 times", "x3")
  kPeriod,      // value: the period in days ("daily" 1, "weekly" 7, "every 4 hours" 1/6)
  kFrequency,   // value: administrations in period_days days ("bd", "tds", "od")
  kEvent,       // value: a time of day id (morning, night, 08:00, ...)
  kMeals,       // "with meals": three administrations a day unless a frequency is given
  kWeekday,     // value: days of the week as bits, 1 Monday .. 64 Sunday ("weekends" 96)
  kExceptDays,  // "except", "not on": the days of the week named next are left out
  kAsNeeded,    // "prn", "when required", ...
  kMaximum,     // "max", "up to", "no more than"; value 1 when it says "daily" itself
  kAsDirected,  // "as directed", "as per instructions", ...
  kSeparator,   // "and", ",", ";", "."
  kThen,        // "then", "followed by": the next doses replace these (a changing dose)
  kDuration,    // value: how long these doses are taken, in days ("for 7 days", "5/7")
  kOneDay,      // "stat", "immediately", "on the first day", "day 1": a dose on one day
  kStop,        // "then stop", "and stop": nothing is taken after the doses before it
  kVariable,    // "reduce by", "taper", "wean": the dose changes by a rule not written out
  kNegation,    // "not", "do not", "remove": the rest of the clause adds no dose
  kStageMark,   // "week 2", "days 2-5": a stage of value days (daily: its doses are daily)
  kStartAfter,  // "after one week": the stage before lasts value days
  kEachSide,    // "each eye", "both nostrils": value 2 administrations per dose
  kUnitHint,    // a verb that implies a unit ("apply" -> application); unit set
  kFiller,      // understood and without effect ("take", "by mouth", "for 7 days")
  kUnknown,     // not understood; text: the word; unusable_amount: a number too large for a dose
};

struct Item {
  ItemKind kind = ItemKind::kUnknown;
  double value = 0;
  double period_days = 0;      // kFrequency: the days its administrations are spread over
  std::string_view unit = {};  // static storage
  std::string text = {};       // the word, for kUnknown
  bool unusable_amount = false;  // kUnknown: a number too large for a dose (the dose is unusable)
  bool as_needed = false;        // kMaximum: "up to" also makes the dose as needed
  bool daily = false;            // kStageMark: a dose under the label without a timing is daily
  bool ranged = false;           // kAmount, kCount: the upper value of a range ("1-2", "2-3 times")
};

// Amounts above this are not doses (hostile or mistyped numbers): read as unknown.
inline constexpr double kMaxDosageAmount = 100000;

// The items of the tokens, in order. Every token belongs to exactly one item. Pure.
std::vector<Item> RecogniseDosageItems(const std::vector<Token>& tokens);

}  // namespace medload
