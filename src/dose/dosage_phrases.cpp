#include "dose/dosage_phrases.h"

#include <map>
#include <set>
#include <string>

namespace medload {
namespace {

struct Phrase {
  std::string_view words;  // space-separated tokens (punctuation is a token too)
  ItemKind kind;
  double value = 0;
  double period_days = 0;  // kFrequency: the days its administrations are spread over
  std::string_view unit = {};
  bool as_needed = false;  // kMaximum: also makes the dose as needed
};

using K = ItemKind;

// Common practice: the abbreviations and phrases of British primary-care prescriptions
// (od, bd, tds, qds, mane, nocte, prn, ...), as listed in docs/dosage-text.md.
constexpr Phrase kPhrases[] = {
    // As needed.
    {"prn", K::kAsNeeded}, {"sos", K::kAsNeeded},
    {"when required", K::kAsNeeded}, {"when needed", K::kAsNeeded},
    {"when necessary", K::kAsNeeded}, {"when req", K::kAsNeeded},
    {"when reqd", K::kAsNeeded}, {"as needed", K::kAsNeeded},
    {"as required", K::kAsNeeded}, {"as necessary", K::kAsNeeded},
    {"as req", K::kAsNeeded}, {"as reqd", K::kAsNeeded},
    {"if needed", K::kAsNeeded}, {"if required", K::kAsNeeded},
    {"if necessary", K::kAsNeeded}, {"as and when required", K::kAsNeeded},
    {"as and when needed", K::kAsNeeded}, {"as and when", K::kAsNeeded},
    {"if and when required", K::kAsNeeded}, {"when and if required", K::kAsNeeded},
    {"after each loose stool", K::kAsNeeded}, {"after each loose motion", K::kAsNeeded},
    {"at onset", K::kAsNeeded}, {"at the onset", K::kAsNeeded}, {"on onset", K::kAsNeeded},
    // Maxima.
    {"max", K::kMaximum}, {"max .", K::kMaximum}, {"maximum", K::kMaximum},
    {"max dose", K::kMaximum}, {"maximum dose", K::kMaximum},
    {"max daily dose", K::kMaximum, 1}, {"maximum daily dose", K::kMaximum, 1},
    {"max daily", K::kMaximum, 1}, {"maximum daily", K::kMaximum, 1},
    {"mdd", K::kMaximum, 1}, {"no more than", K::kMaximum},
    // "up to" leaves the number of doses to the patient: as needed (common practice).
    {"up to", K::kMaximum, 0, 0, {}, true},
    {"not more than", K::kMaximum}, {"not to exceed", K::kMaximum},
    {"do not exceed", K::kMaximum}, {"not exceeding", K::kMaximum},
    {"at most", K::kMaximum}, {"do not take more than", K::kMaximum},
    {"don't take more than", K::kMaximum}, {"dont take more than", K::kMaximum},
    // As directed.
    {"as directed", K::kAsDirected}, {"as instructed", K::kAsDirected},
    {"as advised", K::kAsDirected}, {"as prescribed", K::kAsDirected},
    {"as per", K::kAsDirected}, {"per instructions", K::kAsDirected},
    {"sliding scale", K::kAsDirected}, {"mdu", K::kAsDirected}, {"ut dict", K::kAsDirected},
    {"ut dictum", K::kAsDirected},
    {"according to instructions", K::kAsDirected},
    {"according to the instructions", K::kAsDirected},
    // Abbreviated frequencies: administrations per period_days days.
    {"od", K::kFrequency, 1, 1}, {"qd", K::kFrequency, 1, 1},
    {"bd", K::kFrequency, 2, 1}, {"bid", K::kFrequency, 2, 1},
    {"tds", K::kFrequency, 3, 1}, {"tid", K::kFrequency, 3, 1},
    {"qds", K::kFrequency, 4, 1}, {"qid", K::kFrequency, 4, 1},
    {"qod", K::kFrequency, 1, 2}, {"eod", K::kFrequency, 1, 2}, {"qh", K::kFrequency, 1, 1.0 / 24},
    {"qqh", K::kFrequency, 1, 4.0 / 24},
    // Counts.
    {"once", K::kCount, 1}, {"twice", K::kCount, 2}, {"thrice", K::kCount, 3},
    // Periods, in days.
    {"daily", K::kPeriod, 1}, {"a day", K::kPeriod, 1}, {"per day", K::kPeriod, 1},
    {"each day", K::kPeriod, 1}, {"every day", K::kPeriod, 1}, {"/ day", K::kPeriod, 1},
    {"/ d", K::kPeriod, 1}, {"in a day", K::kPeriod, 1}, {"a / day", K::kPeriod, 1},
    {"per diem", K::kPeriod, 1}, {"in any one day", K::kPeriod, 1},
    {"in one day", K::kPeriod, 1}, {"hourly", K::kPeriod, 1.0 / 24},
    {"every hour", K::kPeriod, 1.0 / 24}, {"an hour", K::kPeriod, 1.0 / 24},
    {"per hour", K::kPeriod, 1.0 / 24}, {"every other day", K::kPeriod, 2},
    {"every second day", K::kPeriod, 2}, {"every third day", K::kPeriod, 3},
    {"alternate days", K::kPeriod, 2}, {"alternate day", K::kPeriod, 2},
    {"every alternate day", K::kPeriod, 2}, {"alternate", K::kPeriod, 2},
    {"every other", K::kPeriod, 2}, {"alt die", K::kPeriod, 2}, {"alt dieb", K::kPeriod, 2},
    {"alternis diebus", K::kPeriod, 2}, {"alt days", K::kPeriod, 2},
    {"q day", K::kPeriod, 1}, {"q d", K::kPeriod, 1}, {"q week", K::kPeriod, 7},
    {"q wk", K::kPeriod, 7}, {"weekly", K::kPeriod, 7},
    {"a week", K::kPeriod, 7}, {"per week", K::kPeriod, 7}, {"each week", K::kPeriod, 7},
    {"every week", K::kPeriod, 7}, {"/ week", K::kPeriod, 7},
    {"every other week", K::kPeriod, 14}, {"alternate weeks", K::kPeriod, 14},
    {"fortnightly", K::kPeriod, 14}, {"every fortnight", K::kPeriod, 14},
    {"a fortnight", K::kPeriod, 14}, {"monthly", K::kPeriod, 30},
    {"a month", K::kPeriod, 30}, {"per month", K::kPeriod, 30},
    {"each month", K::kPeriod, 30}, {"every month", K::kPeriod, 30},
    {"every other month", K::kPeriod, 60}, {"yearly", K::kPeriod, 365},
    {"annually", K::kPeriod, 365}, {"a year", K::kPeriod, 365},
    {"every year", K::kPeriod, 365},
    // Times of day.
    {"mane", K::kEvent, kMorning}, {"om", K::kEvent, kMorning}, {"am", K::kEvent, kMorning},
    {"qam", K::kEvent, kMorning}, {"morning", K::kEvent, kMorning},
    {"mornings", K::kEvent, kMorning}, {"breakfast", K::kEvent, kMorning},
    {"breakfast time", K::kEvent, kMorning}, {"waking", K::kEvent, kMorning},
    {"midday", K::kEvent, kMidday}, {"mid day", K::kEvent, kMidday},
    {"noon", K::kEvent, kMidday}, {"lunchtime", K::kEvent, kMidday},
    {"lunch time", K::kEvent, kMidday}, {"lunch", K::kEvent, kMidday},
    {"afternoon", K::kEvent, kAfternoon}, {"afternoons", K::kEvent, kAfternoon},
    {"evening", K::kEvent, kEvening}, {"evenings", K::kEvent, kEvening},
    {"pm", K::kEvent, kEvening}, {"qpm", K::kEvent, kEvening},
    {"teatime", K::kEvent, kEvening}, {"tea time", K::kEvent, kEvening},
    {"evening meal", K::kEvent, kEvening}, {"supper", K::kEvent, kEvening},
    {"dinner", K::kEvent, kEvening}, {"nocte", K::kEvent, kNight},
    {"night", K::kEvent, kNight}, {"nights", K::kEvent, kNight},
    {"nightly", K::kEvent, kNight}, {"bedtime", K::kEvent, kNight},
    {"bed time", K::kEvent, kNight}, {"bed", K::kEvent, kNight},
    {"hs", K::kEvent, kNight}, {"qhs", K::kEvent, kNight},
    {"retiring", K::kEvent, kNight}, {"q am", K::kEvent, kMorning},
    {"q pm", K::kEvent, kEvening}, {"q hs", K::kEvent, kNight},
    // Meals.
    {"with meals", K::kMeals}, {"with each meal", K::kMeals},
    {"with every meal", K::kMeals}, {"with main meals", K::kMeals},
    {"with each main meal", K::kMeals}, {"before meals", K::kMeals},
    {"before each meal", K::kMeals}, {"after meals", K::kMeals},
    {"after each meal", K::kMeals}, {"at mealtimes", K::kMeals},
    {"at meal times", K::kMeals}, {"ac", K::kMeals}, {"pc", K::kMeals},
    // Days of the week.
    {"monday", K::kWeekday, 1}, {"mondays", K::kWeekday, 1}, {"mon", K::kWeekday, 1},
    {"tuesday", K::kWeekday, 2}, {"tuesdays", K::kWeekday, 2}, {"tue", K::kWeekday, 2},
    {"tues", K::kWeekday, 2}, {"wednesday", K::kWeekday, 4},
    {"wednesdays", K::kWeekday, 4}, {"wed", K::kWeekday, 4}, {"weds", K::kWeekday, 4},
    {"thursday", K::kWeekday, 8}, {"thursdays", K::kWeekday, 8},
    {"thu", K::kWeekday, 8}, {"thur", K::kWeekday, 8}, {"thurs", K::kWeekday, 8},
    {"friday", K::kWeekday, 16}, {"fridays", K::kWeekday, 16}, {"fri", K::kWeekday, 16},
    {"saturday", K::kWeekday, 32}, {"saturdays", K::kWeekday, 32},
    {"sat", K::kWeekday, 32}, {"sunday", K::kWeekday, 64}, {"sundays", K::kWeekday, 64},
    {"sun", K::kWeekday, 64}, {"weekdays", K::kWeekday, 31},
    {"weekends", K::kWeekday, 96}, {"weekend", K::kWeekday, 96},
    {"except", K::kExceptDays}, {"except on", K::kExceptDays},
    {"excluding", K::kExceptDays}, {"not on", K::kExceptDays}, {"apart from", K::kExceptDays},
    {"same day", K::kFiller}, {"second day", K::kFiller},
    // A dose given on one day only: a loading dose, a single dose.
    {"stat", K::kOneDay}, {"immediately", K::kOneDay}, {"at once", K::kOneDay},
    {"now", K::kOneDay},
    {"first day", K::kOneDay}, {"once only", K::kOneDay}, {"single dose", K::kOneDay},
    // Both sides.
    {"each eye", K::kEachSide, 2}, {"both eyes", K::kEachSide, 2},
    {"each nostril", K::kEachSide, 2}, {"both nostrils", K::kEachSide, 2},
    {"each ear", K::kEachSide, 2}, {"both ears", K::kEachSide, 2},
    {"ou", K::kEachSide, 2}, {"au", K::kEachSide, 2},  // oculus / auris uterque
    // Separators and changes of dose.
    {"and", K::kSeparator}, {",", K::kSeparator}, {";", K::kSeparator},
    {"(", K::kSeparator}, {")", K::kSeparator},
    {".", K::kSeparator}, {":", K::kSeparator}, {"&", K::kSeparator},
    {"+", K::kSeparator}, {"-", K::kSeparator}, {"plus", K::kSeparator},
    {"also", K::kSeparator}, {"then", K::kThen}, {"followed by", K::kThen},
    {"thereafter", K::kThen}, {"after that", K::kThen}, {"reducing to", K::kThen},
    {"reduce to", K::kThen}, {"increasing to", K::kThen}, {"increase to", K::kThen},
    {"then stop", K::kStop}, {"and stop", K::kStop}, {"then review", K::kFiller},
    {"and review", K::kFiller},
    // A dose that changes by a rule the text does not write out.
    {"reduce", K::kVariable}, {"reducing", K::kVariable}, {"decrease", K::kVariable},
    {"decreasing", K::kVariable}, {"increase by", K::kVariable},
    {"increasing by", K::kVariable}, {"taper", K::kVariable}, {"tapering", K::kVariable},
    {"wean", K::kVariable}, {"weaning", K::kVariable},
    // Negatives: the rest of the clause says when NOT to take a dose.
    {"not", K::kNegation}, {"do not", K::kNegation}, {"don't", K::kNegation},
    {"dont", K::kNegation}, {"never", K::kNegation}, {"avoid", K::kNegation},
    {"must not", K::kNegation}, {"should not", K::kNegation}, {"remove", K::kNegation},
    {"take off", K::kNegation}, {"wash off", K::kNegation},
    // Verbs that imply a unit.
    {"apply", K::kUnitHint, 0, 0, "application"}, {"inhale", K::kUnitHint, 0, 0, "puff"},
    {"instil", K::kUnitHint, 0, 0, "drop"}, {"instill", K::kUnitHint, 0, 0, "drop"},
};

// Words understood as carrying no amount or frequency: verbs, routes, sites, reasons.
constexpr std::string_view kFillers[] = {
    "take", "taken", "to", "be", "give", "given", "use", "used", "using", "swallow",
    "swallowed", "whole", "chew", "chewed", "suck", "sucked", "dissolve", "dissolved",
    "disperse", "dispersed", "in", "into", "at", "the", "of", "by", "mouth", "orally", "oral",
    "with", "water", "glass", "food", "after", "before", "during", "milk", "empty", "stomach",
    "under", "tongue", "sublingually", "subcutaneously", "subcut", "sc", "intramuscularly",
    "im", "inject", "injected", "injection", "each", "every", "per", "for", "area", "areas",
    "affected", "skin", "scalp", "face", "hands", "body", "eye", "eyes", "ear", "ears",
    "nostril", "nostrils", "nose", "left", "right", "thinly", "sparingly", "liberally",
    "gently", "well", "small", "amount", "layer", "thin", "film", "place", "put", "rinse",
    "gargle", "spit", "out", "shake", "inhaler", "spacer", "device", "via", "please", "only",
    "regularly", "regular", "usual", "same", "as", "if", "when", "required", "needed",
    "necessary", "directed", "doctor", "gp", "nurse", "specialist", "consultant", "hospital",
    "clinic", "pharmacist", "your", "you", "it", "them", "this", "these", "stop", "review",
    "continue", "course", "complete", "until", "finished", "going", "onset", "relief",
    "pain", "nausea", "vomiting", "sickness", "sleep", "insomnia", "anxiety", "agitation",
    "constipation", "itch", "itching", "itchy", "wheeze", "wheezing", "breathlessness",
    "breathless", "shortness", "breath", "angina", "chest", "heartburn", "indigestion",
    "reflux", "hayfever", "hay", "fever", "allergy", "allergies", "cough", "migraine",
    "headache", "diarrhoea", "spasm", "spasms", "cramps", "dry", "symptoms", "flare",
    "flares", "attack", "attacks", "dizziness", "inflammation", "swelling", "inhaled",
    "sprayed", "instilled", "inserted", "insert", "applied", "massage", "rub", "sprinkle",
    "mix", "mixed", "dilute", "diluted", "apart", "all", "change", "changed", "replace", "contents", "sl",
    "po", "pr", "sig", "os", "x", "initially", "titrate", "titrated", "adjust", "lungs", "rectally",
    "vaginally", "topically", "new", "together",
    "may", "repeat",
    "repeated",
    "time", "a", "an", "\"",
    "'", "/", "!", "?", "*", "=", "[", "]", "#", "%", "<", ">", "_", "~", "@", "{", "}", "|",
    "\\", "^", "`", "$", "with food", "on", "up", "or", "plenty", "first", "meal",
};

struct SplitPhrase {
  std::vector<std::string_view> words;
  Item item;
};

using PhraseIndex = std::map<std::string_view, std::vector<SplitPhrase>, std::less<>>;

std::vector<std::string_view> SplitWords(std::string_view words) {
  std::vector<std::string_view> split;
  size_t start = 0;
  for (size_t i = 0; i <= words.size(); ++i) {
    if (i == words.size() || words[i] == ' ') {
      split.push_back(words.substr(start, i - start));
      start = i + 1;
    }
  }
  return split;
}

PhraseIndex BuildIndex() {
  PhraseIndex index;
  for (const Phrase& phrase : kPhrases) {
    Item item{phrase.kind, phrase.value, phrase.period_days, phrase.unit, {}, false};
    item.as_needed = phrase.as_needed;
    auto words = SplitWords(phrase.words);
    index[words.front()].push_back(SplitPhrase{std::move(words), item});
  }
  for (std::string_view filler : kFillers) {
    auto words = SplitWords(filler);
    index[words.front()].push_back(SplitPhrase{std::move(words), Item{K::kFiller}});
  }
  return index;
}

std::set<std::string_view, std::less<>> BuildWordSet() {
  std::set<std::string_view, std::less<>> words;
  for (const Phrase& phrase : kPhrases) {
    for (std::string_view word : SplitWords(phrase.words)) words.insert(word);
  }
  for (std::string_view filler : kFillers) {
    for (std::string_view word : SplitWords(filler)) words.insert(word);
  }
  return words;
}

}  // namespace

bool IsDosagePhraseWord(std::string_view word) {
  static const std::set<std::string_view, std::less<>> kWords = BuildWordSet();
  return kWords.count(word) > 0;
}

std::optional<PhraseMatch> MatchDosagePhrase(const std::vector<Token>& tokens, size_t start) {
  static const PhraseIndex kIndex = BuildIndex();
  if (start >= tokens.size() || tokens[start].kind == TokenKind::kNumber) return std::nullopt;
  const auto candidates = kIndex.find(tokens[start].text);
  if (candidates == kIndex.end()) return std::nullopt;
  std::optional<PhraseMatch> best;
  for (const SplitPhrase& phrase : candidates->second) {
    const size_t length = phrase.words.size();
    if (start + length > tokens.size() || (best && best->length >= length)) continue;
    bool equal = true;
    for (size_t k = 1; k < length && equal; ++k) {
      const Token& token = tokens[start + k];
      equal = token.kind != TokenKind::kNumber && token.text == phrase.words[k];
    }
    if (equal) best = PhraseMatch{phrase.item, length};
  }
  return best;
}

}  // namespace medload
