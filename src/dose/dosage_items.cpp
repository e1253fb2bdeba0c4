#include "dose/dosage_items.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <optional>

#include "dose/dosage_phrases.h"
#include "dose/dosage_words.h"
#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

bool IsWhole(double value) { return value == std::floor(value); }

struct Number {
  double value = 0;
  size_t next = 0;
};

struct Range {
  double low = 0;
  double high = 0;
  size_t next = 0;
};

class Recogniser {
 public:
  explicit Recogniser(const std::vector<Token>& tokens) : t_(tokens) {}

  std::vector<Item> Run() {
    while (i_ < t_.size()) {
      const size_t before = i_;
      Step();
      if (i_ == before) ++i_;  // never stall
    }
    return std::move(items_);
  }

 private:
  std::string_view Text(size_t k) const {
    if (k >= t_.size()) return {};
    return t_[k].text;
  }
  bool IsNumber(size_t k) const { return k < t_.size() && t_[k].kind == TokenKind::kNumber; }
  bool Word(size_t k, std::string_view word) const {
    return k < t_.size() && t_[k].kind != TokenKind::kNumber && t_[k].text == word;
  }

  void Emit(ItemKind kind, size_t next, double value = 0, double period_days = 0,
            std::string_view unit = {}) {
    items_.push_back(Item{kind, value, period_days, unit, {}, false});
    i_ = next;
  }

  // An amount or a count: the upper value of `range`, marked when it is a range.
  void EmitUpper(ItemKind kind, size_t next, const Range& range) {
    Emit(kind, next, range.high);
    items_.back().ranged = range.high > range.low;
  }

  // A single number: digits, fractions ("1/2", "1 1/2"), words ("one", "twenty four",
  // "half a", "a half", "one and a half").
  std::optional<Number> NumberAt(size_t k) const {
    std::optional<Number> number;
    if (IsNumber(k)) {
      number = Number{t_[k].number, k + 1};
      if (auto fraction = FractionAt(k)) return WithHalf(*fraction);
      if (IsWhole(number->value)) {
        if (auto fraction = FractionAt(k + 1)) {
          return Number{number->value + fraction->value, fraction->next};
        }
        if (IsNumber(k + 1) && t_[k + 1].number < 1 && !t_[k + 1].joined) {
          return Number{number->value + t_[k + 1].number, k + 2};
        }
      }
    } else if (Word(k, "a") || Word(k, "an")) {
      const auto value = NumberWordValue(Text(k + 1));
      if (value && *value < 1) number = Number{*value, k + 2};
    } else if (const auto roman = RomanValue(k)) {
      number = Number{*roman, k + 1};
    } else if (const auto value = NumberWordValue(Text(k))) {
      number = Number{*value, k + 1};
      const auto ones = NumberWordValue(Text(k + 1));
      if (*value >= 20 && ones && *ones < 10 && *ones >= 1) number = Number{*value + *ones, k + 2};
    }
    if (!number) return std::nullopt;
    return WithHalf(*number);
  }

  // "i", "ii", "iii" before a unit or "po": a count written in Roman numerals (common
  // practice in US prescriptions: "ii tabs po bid"). "iv" is a route, never a number.
  std::optional<double> RomanValue(size_t k) const {
    if (k >= t_.size() || t_[k].kind != TokenKind::kWord) return std::nullopt;
    const std::string_view word = t_[k].text;
    if (word != "i" && word != "ii" && word != "iii") return std::nullopt;
    if (!UnitAt(k + 1) && !Word(k + 1, "po")) return std::nullopt;
    return static_cast<double>(word.size());
  }

  // "n/d" with d in 2..4 and n < d: a fraction of a dose unit (not "5/7", a duration).
  std::optional<Number> FractionAt(size_t k) const {
    if (!IsNumber(k) || !Word(k + 1, "/") || !IsNumber(k + 2)) return std::nullopt;
    const double numerator = t_[k].number;
    const double denominator = t_[k + 2].number;
    if (denominator < 2 || denominator > 4 || numerator >= denominator ||
        !IsWhole(numerator) || !IsWhole(denominator) || numerator < 1) {
      return std::nullopt;
    }
    return Number{numerator / denominator, k + 3};
  }

  // "one and a half", "2 & a half"; "half a tablet", "quarter of a tablet".
  Number WithHalf(Number number) const {
    size_t k = number.next;
    if (number.value >= 1 && IsWhole(number.value) && (Word(k, "and") || Word(k, "&"))) {
      size_t at = k + 1;
      if (Word(at, "a")) ++at;
      const auto part = NumberWordValue(Text(at));
      if (part && *part < 1) return Number{number.value + *part, at + 1};
    }
    if (number.value < 1 && (Word(number.next - 1, "half") || Word(number.next - 1, "quarter"))) {
      if (Word(k, "of")) ++k;
      if (Word(k, "a") || Word(k, "an")) number.next = k + 1;
    }
    return number;
  }

  // A number or a range of two ("1-2", "1 to 2", "one or two"), then "x N" before a unit.
  std::optional<Range> RangeAt(size_t k) const {
    const auto first = NumberAt(k);
    if (!first) return std::nullopt;
    Range range{first->value, first->value, first->next};
    // "2.5ml to 5ml": the unit may follow both numbers; the second one is kept.
    const bool unit_between = UnitAt(first->next) && IsLink(first->next + 1);
    const size_t link = unit_between ? first->next + 1 : first->next;
    if (IsLink(link)) {
      const auto second = NumberAt(link + 1);
      if (second && (!unit_between || Text(second->next) == Text(first->next))) {
        range = Range{std::min(first->value, second->value),
                      std::max(first->value, second->value), second->next};
      }
    }
    if (Word(range.next, "x") && IsNumber(range.next + 1) && UnitAt(range.next + 2) &&
        !FormAfterMass(range.next + 2)) {
      const double times = t_[range.next + 1].number;
      range = Range{range.low * times, range.high * times, range.next + 2};
    }
    return range;
  }

  // A mass unit at k followed by a dose-form unit: "500mg tablets" names a strength.
  bool FormAfterMass(size_t k) const {
    if (!IsMass(k)) return false;
    const auto form = UnitOf(k + 1);
    return form && form->name != "mg" && form->name != "ml" && form->name != "unit";
  }

  std::optional<DoseUnit> UnitOf(size_t k) const {
    if (k >= t_.size() || t_[k].kind != TokenKind::kWord) return std::nullopt;
    return ReadDoseUnit(t_[k].text);
  }

  // A mass unit word at k ("mg", "g", "micrograms"): only these can name a strength.
  bool IsMass(size_t k) const {
    // Every mass unit word starts with m, g or u (mg, mcg, microgram, g, gram, ug): a
    // cheap test first, since this runs after every amount.
    if (k >= t_.size() || t_[k].text.empty()) return false;
    const char first = t_[k].text.front();
    if (first != 'm' && first != 'g' && first != 'u') return false;
    const auto unit = UnitOf(k);
    return unit && unit->name == "mg";
  }

  bool IsLink(size_t k) const { return Word(k, "-") || Word(k, "to") || Word(k, "or"); }

  bool UnitAt(size_t k) const {
    return k < t_.size() && t_[k].kind == TokenKind::kWord && ReadDoseUnit(t_[k].text);
  }

  void Step() {
    if (Word(i_, "(")) ++depth_;
    if (Word(i_, ")") && depth_ > 0) --depth_;
    if (MatchClockTime() || MatchSpoon() || MatchEvery() || MatchQHours() || MatchHourly() ||
        MatchCount() || MatchPerTime() || MatchDuration() || MatchDayNumber() ||
        MatchWeekLabel() || MatchAmount() ||
        MatchArticle() ||
        MatchOnAtNight() || MatchPhrase() || MatchUnit()) {
      return;
    }
    if (t_[i_].kind == TokenKind::kWord) {
      items_.push_back(Item{ItemKind::kUnknown, 0, 0, {}, t_[i_].text});
    } else {
      items_.push_back(Item{ItemKind::kFiller});
    }
    ++i_;
  }

  // "8am", "at 8 pm", "08:00", "22:30".
  bool MatchClockTime() {
    if (!IsNumber(i_) || !IsWhole(t_[i_].number) || t_[i_].number > 24) return false;
    const int hour = static_cast<int>(t_[i_].number);
    if (Word(i_ + 1, ":") && IsNumber(i_ + 2) && t_[i_ + 2].text.size() == 2 &&
        IsWhole(t_[i_ + 2].number) && t_[i_ + 2].number < 60) {
      const int minute = static_cast<int>(t_[i_ + 2].number);
      Emit(ItemKind::kEvent, i_ + 3, kClockEventBase + hour * 100 + minute);
      return true;
    }
    const bool am = Word(i_ + 1, "am");
    const bool pm = Word(i_ + 1, "pm");
    if (!am && !pm) return false;
    const bool clock = t_[i_ + 1].joined || (i_ > 0 && Word(i_ - 1, "at"));
    if (!clock || hour < 1 || hour > 12) return false;
    const int hour24 = (hour % 12) + (pm ? 12 : 0);
    Emit(ItemKind::kEvent, i_ + 2, kClockEventBase + hour24 * 100);
    return true;
  }

  // "5ml spoonful", "2.5 ml spoon": a measuring spoon of that volume.
  bool MatchSpoon() {
    if (!IsNumber(i_) || !(Word(i_ + 1, "ml") || Word(i_ + 1, "mls"))) return false;
    const auto spoon = ReadDoseUnit(Text(i_ + 2));
    if (!spoon || spoon->name != "ml" || spoon->factor != 5) return false;
    const double volume = t_[i_].number;
    if (!(volume > 0) || volume > 100) return false;
    Emit(ItemKind::kUnit, i_ + 3, volume, 0, "ml");
    return true;
  }

  // "every 4 hours", "every 4 to 6 hours" (the shorter interval), "every 3 days".
  bool MatchEvery() {
    if (!Word(i_, "every") && !Word(i_, "each")) return false;
    const auto range = RangeAt(i_ + 1);
    if (!range) return false;
    const auto days = TimeUnitDays(Text(range->next));
    if (!days || !(range->low > 0)) return false;
    Emit(ItemKind::kPeriod, range->next + 1, range->low * *days);
    return true;
  }

  // "q4h", "q 4-6 h", "q6hrs".
  bool MatchQHours() {
    if (!Word(i_, "q")) return false;
    const auto range = RangeAt(i_ + 1);
    if (!range || !(range->low > 0)) return false;
    const auto days = TimeUnitDays(Text(range->next));
    if (!days && !Word(range->next, "hourly")) return false;
    Emit(ItemKind::kPeriod, range->next + 1, range->low * days.value_or(1.0 / 24));
    return true;
  }

  // "4 hourly", "4-6 hourly", "6-hourly".
  bool MatchHourly() {
    const auto range = RangeAt(i_);
    if (!range || !(range->low > 0)) return false;
    const size_t next = Word(range->next, "-") ? range->next + 1 : range->next;  // "6-hourly"
    if (!Word(next, "hourly") && !Word(next, "hrly")) return false;
    Emit(ItemKind::kPeriod, next + 1, range->low / 24);
    return true;
  }

  // "3 times", "2-3 times" (the upper), "3x", "x3" (not "2 x 5ml": a product).
  bool MatchCount() {
    if (Word(i_, "x")) {
      const auto range = RangeAt(i_ + 1);
      if (!range || UnitAt(range->next) || TimeUnitDays(Text(range->next)) ||
          Word(range->next, "/")) {  // "x 28/7" is a duration
        return false;
      }
      EmitUpper(ItemKind::kCount, range->next, *range);
      return true;
    }
    const auto range = RangeAt(i_);
    if (!range) return false;
    const size_t next = range->next;
    if (!Word(next, "times") && !Word(next, "time") && !Word(next, "x")) return false;
    if (Word(next, "x") && (IsNumber(next + 1) || NumberAt(next + 1))) return false;
    // "1 x bd", "2 x tds": the number is the dose and "x" joins it to the frequency.
    if (Word(next, "x")) {
      const auto phrase = MatchDosagePhrase(t_, next + 1);
      if (phrase && phrase->item.kind == ItemKind::kFrequency) return false;
    }
    EmitUpper(ItemKind::kCount, next + 1, *range);
    return true;
  }

  // "in 24 hours", "in any 24 hour period", "per 24 hours", "/24h": a period.
  bool MatchPerTime() {
    if (!Word(i_, "in") && !Word(i_, "per") && !Word(i_, "/") && !Word(i_, "within")) {
      return false;
    }
    size_t k = i_ + 1;
    if (Word(k, "any") || Word(k, "a") || Word(k, "each")) ++k;
    if (!IsNumber(k) && !NumberWordValue(Text(k))) return false;
    const auto range = RangeAt(k);
    if (!range || !(range->high > 0)) return false;
    const auto days = TimeUnitDays(Text(range->next));
    if (!days) return false;
    size_t next = range->next + 1;
    if (Word(next, "period")) ++next;
    Emit(ItemKind::kPeriod, next, range->high * *days);
    return true;
  }

  // "for 7 days", "for a week", "x 5 days", "14 days", "5/7", "for 2/52": how long the
  // doses are taken (kDuration, in days, the upper value of a range). Runs after the
  // "every", "q", "hourly", count and "in 24 hours" matchers.
  bool MatchDuration() {
    size_t k = i_;
    const bool after = Word(k, "after");
    if (Word(k, "for") || Word(k, "x") || after) ++k;
    if (IsNumber(k) && Word(k + 1, "/") && IsNumber(k + 2)) {
      const double unit = t_[k + 2].number;
      const double days = unit == 7 ? 1 : unit == 52 ? 7 : unit == 12 ? 30 : 0;
      if (days > 0) {
        EmitDuration(t_[k].number * days, k + 3);
        return true;
      }
    }
    size_t next = k;
    double amount = 1;
    if (k > i_ && (Word(k, "a") || Word(k, "an"))) {
      next = k + 1;
    } else if (const auto range = RangeAt(k)) {
      next = range->next;
      amount = range->high;
    } else {
      return false;
    }
    const auto days = TimeUnitDays(Text(next));
    if (!days) return false;
    // "2 hours before bed", "30 minutes before food" are offsets, not doses: fillers.
    const bool offset = Word(next + 1, "before") || Word(next + 1, "after") ||
                        Word(next + 1, "apart");
    if (*days < 1 || (k == i_ && offset)) {
      Emit(ItemKind::kFiller, next + 1);
    } else if (after) {
      Emit(ItemKind::kStartAfter, next + 1, amount * *days);  // "increase after one week"
    } else {
      EmitDuration(amount * *days, next + 1);
    }
    return true;
  }

  // A labelled stage of `days`: a dose under the label without a timing is daily.
  void EmitStage(double days, size_t next) {
    Item item{ItemKind::kStageMark, days, 0, {}, {}, false};
    item.daily = true;
    items_.push_back(std::move(item));
    i_ = next;
  }

  void EmitDuration(double days, size_t next) {
    if (days >= 1 && days <= kMaxDosageAmount) {
      Emit(ItemKind::kDuration, next, days);
    } else {
      Emit(ItemKind::kFiller, next);
    }
  }

  // "on day 1", "day one": a dose on the first day (kOneDay); "days 2-5": for 4 days;
  // another day number only says which day of a course.
  bool MatchDayNumber() {
    if (!Word(i_, "day") && !Word(i_, "days")) return false;
    const auto range = RangeAt(i_ + 1);
    if (!range) return false;
    if (range->low == 1 && range->high == 1) {
      Emit(ItemKind::kOneDay, range->next);
    } else if (range->high >= range->low && IsWhole(range->low) && IsWhole(range->high) &&
               range->high - range->low < kMaxDosageAmount) {
      EmitStage(range->high - range->low + 1, range->next);
    } else {
      Emit(ItemKind::kFiller, range->next);
    }
    return true;
  }

  // "week 1", "week 2:", "weeks 3-4": a stage of a titration written week by week.
  bool MatchWeekLabel() {
    if (!Word(i_, "week") && !Word(i_, "weeks")) return false;
    const auto range = RangeAt(i_ + 1);
    if (!range || !IsWhole(range->low) || !IsWhole(range->high) || range->low < 1 ||
        range->high - range->low >= 520) {
      return false;
    }
    EmitStage((range->high - range->low + 1) * 7, range->next);
    return true;
  }

  bool MatchAmount() {
    const auto range = RangeAt(i_);
    if (!range) return false;
    if (const auto end = StrengthEnd(range->next)) {
      Emit(ItemKind::kFiller, *end);  // a strength: read and left out of the dose
      return true;
    }
    if (depth_ > 0 && i_ >= 2 && Word(i_ - 1, "(") && UnitAt(i_ - 2)) {
      // "10mg (1 tablet) daily": the same dose said again in brackets.
      Emit(ItemKind::kFiller, UnitAt(range->next) ? range->next + 1 : range->next);
      return true;
    }
    if (range->high > kMaxDosageAmount) {
      // An amount that cannot be a dose, so the dose it belongs to is unusable.
      items_.push_back(Item{ItemKind::kUnknown, 0, 0, {}, std::string(Text(i_)), true});
      i_ = range->next;
      return true;
    }
    EmitUpper(ItemKind::kAmount, range->next, *range);
    return true;
  }

  // When the amount ending before `unit` is a strength, not a dose: a mass in brackets
  // ("1 tablet (500mg)"), before a dose form ("2 x 500mg tablets"), per a volume or dose
  // ("10mg/5ml"), or before the dose itself ("Paracetamol 500mg - 2 tabs", "amlodipine
  // 5mg one daily"). Returns where the strength ends; nullopt when it is a dose.
  std::optional<size_t> StrengthEnd(size_t unit) const {
    if (!IsMass(unit)) return std::nullopt;
    if (depth_ > 0 || FormAfterMass(unit)) return unit + 1;
    if (Word(unit + 1, "/")) {
      size_t end = unit + 2;
      if (IsNumber(end)) ++end;
      return UnitAt(end) ? end + 1 : unit + 2;
    }
    size_t k = unit + 1;
    if (Word(k, "-") || Word(k, ":") || Word(k, ",")) ++k;
    const auto dose = RangeAt(k);
    if (!dose) return std::nullopt;
    static constexpr std::array<std::string_view, 8> kCountWords = {
        "times", "time", "x", "hourly", "hrly", "-", "/", "to"};
    const std::string_view after = Text(dose->next);
    if (std::find(kCountWords.begin(), kCountWords.end(), after) != kCountWords.end() ||
        TimeUnitDays(after) || IsMass(dose->next)) {
      return std::nullopt;
    }
    return unit + 1;
  }

  // "a tablet", "an application": one.
  bool MatchArticle() {
    if (!Word(i_, "a") && !Word(i_, "an")) return false;
    if (!UnitAt(i_ + 1) && !(IsNumber(i_ + 1) && Word(i_ + 2, "ml"))) return false;
    Emit(ItemKind::kAmount, i_ + 1, 1);
    return true;
  }

  // "on" is "at night" only when nothing follows that makes it a preposition.
  bool MatchOnAtNight() {
    if (!Word(i_, "on")) return false;
    const size_t k = i_ + 1;
    static constexpr std::array<std::string_view, 12> kAfter = {
        "and", "prn", "when", "if", "as", "max", "maximum", "up", "for", "then", "with", "only"};
    const bool at_night = k >= t_.size() || t_[k].kind == TokenKind::kPunct ||
                          std::find(kAfter.begin(), kAfter.end(), Text(k)) != kAfter.end();
    if (!at_night) return false;
    Emit(ItemKind::kEvent, k, kNight);
    return true;
  }

  bool MatchPhrase() {
    const auto match = MatchDosagePhrase(t_, i_);
    if (!match) return false;
    items_.push_back(match->item);
    i_ += match->length;
    return true;
  }

  bool MatchUnit() {
    if (!UnitAt(i_)) return false;
    const auto unit = ReadDoseUnit(t_[i_].text);
    Emit(ItemKind::kUnit, i_ + 1, unit->factor, 0, unit->name);
    return true;
  }

  const std::vector<Token>& t_;
  size_t i_ = 0;
  int depth_ = 0;  // open brackets before i_
  std::vector<Item> items_;
};

}  // namespace

std::vector<Item> RecogniseDosageItems(const std::vector<Token>& tokens) {
  return Recogniser(tokens).Run();
}

}  // namespace medload
