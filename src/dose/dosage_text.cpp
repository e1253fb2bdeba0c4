#include "medload/dose/dosage_text.h"

#include <algorithm>
#include <bit>
#include <cmath>
#include <limits>
#include <vector>

#include "dose/dosage_items.h"
#include "dose/dosage_lexer.h"
#include "medload/core/text.h"
#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

// One dose said once with its timing: "2 tablets in the morning", "one twice a day".
struct Part {
  std::optional<double> amount;
  std::string_view unit;  // canonical; empty when not said
  double factor = 1;      // unit factor ("5ml spoonful" -> 5 ml)
  std::optional<double> count;   // administrations in `period`
  std::optional<double> period;  // days
  std::vector<int> events;       // distinct times of day
  unsigned weekdays = 0;         // bit d set: day d of the week (bit 0 = Monday)
  bool except_days = false;      // the weekdays are the days left out
  bool meals = false;
  double multiplier = 1;         // "each eye": 2
};

// "max 8 in 24 hours", "up to four times a day", "maximum 4 doses a day".
struct Maximum {
  bool present = false;
  std::optional<double> amount;
  std::string_view unit;
  double factor = 1;
  std::optional<double> count;
  std::optional<double> period;
  std::vector<int> events;
};

// Doses taken together; a "then" starts the next group (a changing dose).
struct Group {
  std::vector<Part> parts;
  Maximum max;
};

struct GroupResult {
  std::optional<double> units_per_day;
  std::string_view unit;
};

void AddDistinct(std::vector<int>& values, int value) {
  if (std::find(values.begin(), values.end(), value) == values.end()) values.push_back(value);
}

// The length of the well-formed UTF-8 sequence at word[i] (RFC 3629: no overlong forms,
// no surrogates, nothing above U+10FFFF), or 0 when it is not one.
size_t Utf8Length(std::string_view word, size_t i) {
  const auto at = [&](size_t k) { return static_cast<unsigned char>(word[i + k]); };
  const unsigned char lead = at(0);
  size_t length = 0;
  unsigned char low = 0x80;
  unsigned char high = 0xBF;
  if (lead < 0x80) return 1;
  if (lead >= 0xC2 && lead <= 0xDF) length = 2;
  if (lead >= 0xE0 && lead <= 0xEF) length = 3;
  if (lead >= 0xF0 && lead <= 0xF4) length = 4;
  if (lead == 0xE0) low = 0xA0;
  if (lead == 0xED) high = 0x9F;
  if (lead == 0xF0) low = 0x90;
  if (lead == 0xF4) high = 0x8F;
  if (length == 0 || i + length > word.size()) return 0;
  if (at(1) < low || at(1) > high) return 0;
  for (size_t k = 2; k < length; ++k) {
    if ((at(k) & 0xC0) != 0x80) return 0;
  }
  return length;
}

// Keeps printable ASCII and well-formed UTF-8 of a word, at most 30 bytes, for the note;
// anything else becomes '?'.
std::string SafeWord(std::string_view word) {
  std::string safe;
  for (size_t i = 0; i < word.size() && safe.size() < 30;) {
    const size_t length = Utf8Length(word, i);
    const auto byte = static_cast<unsigned char>(word[i]);
    if (length > 1 || (length == 1 && byte >= 0x20 && byte != 0x7F)) {
      safe.append(word.substr(i, length));
      i += length;
    } else {
      safe.push_back('?');
      ++i;
    }
  }
  return safe;
}

class Assembler {
 public:
  void Add(const Item& item) {
    if (in_max_ && AddToMaximum(item)) return;
    in_max_ = false;
    switch (item.kind) {
      case ItemKind::kAmount:
        if (part_.amount) StartPart();
        part_.amount = item.value;
        break;
      case ItemKind::kUnit:
        if (part_.unit.empty()) {
          part_.unit = item.unit;
          part_.factor = item.value;
        }
        break;
      case ItemKind::kCount:
        // "once or twice daily": a second count before the period is a range's upper value.
        if (!part_.count || !part_.period) {
          part_.count = std::max(part_.count.value_or(0), item.value);
        }
        break;
      case ItemKind::kPeriod:
        if (!part_.period) part_.period = item.value;
        break;
      case ItemKind::kFrequency:
        if (!part_.count && !part_.period) {
          part_.count = item.value;
          part_.period = item.period_days;
        }
        break;
      default:
        AddOther(item);
    }
  }

  DosageReading Finish(bool truncated);

 private:
  void AddOther(const Item& item) {
    switch (item.kind) {
      case ItemKind::kEvent: AddDistinct(part_.events, static_cast<int>(item.value)); break;
      case ItemKind::kMeals: part_.meals = true; break;
      case ItemKind::kWeekday: part_.weekdays |= static_cast<unsigned>(item.value); break;
      case ItemKind::kExceptDays: part_.except_days = true; break;
      case ItemKind::kAsNeeded: as_needed_ = true; break;
      case ItemKind::kAsDirected: as_directed_ = true; break;
      case ItemKind::kEachSide: part_.multiplier = item.value; break;
      case ItemKind::kUnitHint:
        if (unit_hint_.empty()) unit_hint_ = item.unit;
        break;
      case ItemKind::kThen:
        StartPart();
        groups_.emplace_back();
        break;
      case ItemKind::kMaximum:
        in_max_ = true;
        group().max.present = true;
        if (item.value == 1 && !group().max.period) group().max.period = 1;
        break;
      case ItemKind::kUnknown:
        unknown_.push_back(item.text);
        if (item.unusable_amount) {
          if (part_.amount) StartPart();
          part_.amount = std::numeric_limits<double>::quiet_NaN();  // an unusable dose
        }
        break;
      default: break;  // separators and fillers
    }
  }

  // Items after a maximum marker describe the maximum until a separator or a marker.
  bool AddToMaximum(const Item& item) {
    Maximum& max = group().max;
    switch (item.kind) {
      case ItemKind::kAmount:
        if (max.amount) return false;
        max.amount = item.value;
        return true;
      case ItemKind::kUnit:
        if (max.unit.empty()) {
          max.unit = item.unit;
          max.factor = item.value;
        }
        return true;
      case ItemKind::kCount: max.count = item.value; return true;
      case ItemKind::kPeriod: max.period = item.value; return true;
      case ItemKind::kFrequency:
        max.count = item.value;
        max.period = item.period_days;
        return true;
      case ItemKind::kEvent: AddDistinct(max.events, static_cast<int>(item.value)); return true;
      case ItemKind::kMaximum:
      case ItemKind::kFiller: return true;
      default: return false;
    }
  }

  Group& group() {
    if (groups_.empty()) groups_.emplace_back();
    return groups_.back();
  }

  void StartPart() {
    group().parts.push_back(part_);
    part_ = Part{};
  }

  void Note(std::string note) {
    if (std::find(notes_.begin(), notes_.end(), note) == notes_.end()) notes_.push_back(note);
  }

  struct PartsSum {
    double regular = 0;     // units per day of the timed doses
    bool timed = false;     // at least one dose had a timing
    bool left_out = false;  // a dose had no timing
    std::optional<double> first_dose;
  };

  std::optional<double> Rate(const Part& part);
  std::string_view GroupUnit(const Group& group) const;
  PartsSum SumParts(const Group& group, std::string_view unit,
                    std::optional<double> max_administrations);
  GroupResult Evaluate(const Group& group);
  void MaximumPerDay(const Group& group, std::string_view unit, std::optional<double>& units,
                     std::optional<double>& administrations);
  std::string JoinedNotes() const;

  std::vector<Group> groups_;
  Part part_;
  bool in_max_ = false;
  bool as_needed_ = false;
  bool as_directed_ = false;
  bool doubtful_ = false;  // something was assumed or left out: at best kPartial
  bool left_out_ = false;  // a dose without a frequency was not counted
  std::string_view unit_hint_;
  std::vector<std::string> unknown_;
  std::vector<std::string> notes_;
};

// Administrations per day of one part, or nullopt when it gives no timing.
std::optional<double> Assembler::Rate(const Part& part) {
  std::optional<double> rate;
  if (part.count || part.period) {
    if (part.count && !part.period && part.weekdays == 0) {
      Note("a count without a period is read as per day");
      doubtful_ = true;
    }
    rate = part.count.value_or(1) / part.period.value_or(1);
  } else if (!part.events.empty()) {
    rate = static_cast<double>(part.events.size());
  } else if (part.meals) {
    rate = 3;  // with each of three meals
  } else if (part.weekdays != 0) {
    rate = 1;
  }
  if (rate && part.weekdays != 0 && part.period.value_or(1) <= 1) {
    const int days = std::popcount(part.weekdays);
    rate = *rate * (part.except_days ? 7 - days : days) / 7.0;
  }
  return rate;
}

void Assembler::MaximumPerDay(const Group& group, std::string_view unit,
                              std::optional<double>& units,
                              std::optional<double>& administrations) {
  const Maximum& max = group.max;
  if (!max.present || (!max.amount && !max.count && max.events.empty())) return;
  if (!max.period && max.events.empty()) Note("a maximum without a period is read as per day");
  const double count =
      max.count.value_or(max.events.empty() ? 1 : static_cast<double>(max.events.size()));
  const double period = max.period.value_or(1);
  if (!max.amount) {
    administrations = count / period;
    return;
  }
  const bool doses = max.unit == "dose" && unit != "dose" && unit != "puff";
  if (doses) {
    administrations = *max.amount * count / period;
  } else if (max.unit.empty() || unit.empty() || SameDoseUnit(max.unit, unit)) {
    units = *max.amount * max.factor * count / period;
  } else {
    Note("a maximum in " + std::string(max.unit) + " was not compared with doses in " +
         std::string(unit));
  }
}

// The unit of a group: its first dose's, else its maximum's, else the verb's.
std::string_view Assembler::GroupUnit(const Group& group) const {
  for (const Part& part : group.parts) {
    if (!part.unit.empty()) return part.unit;
  }
  if (group.max.amount && !group.max.unit.empty() && group.max.unit != "dose") {
    return group.max.unit;
  }
  return unit_hint_;
}

// The regular daily amount of a group's doses in `unit`; a dose without its own timing
// takes the maximum's administrations ("1-2 tablets up to four times a day").
Assembler::PartsSum Assembler::SumParts(const Group& group, std::string_view unit,
                                        std::optional<double> max_administrations) {
  PartsSum sum;
  for (const Part& part : group.parts) {
    const double dose = part.amount.value_or(1) * part.factor * part.multiplier;
    if (!part.unit.empty() && !SameDoseUnit(part.unit, unit)) {
      Note("doses in more than one unit: only " + std::string(unit) + " counted");
      doubtful_ = true;
      continue;
    }
    if (part.amount && std::isnan(*part.amount)) {
      Note("an amount too large to be a dose");
      continue;
    }
    if (part.amount && !sum.first_dose) sum.first_dose = dose;
    auto rate = Rate(part);
    if (!rate) rate = max_administrations;
    if (!rate) {
      sum.left_out = sum.left_out || part.amount.has_value();
      continue;
    }
    sum.regular += dose * *rate;
    sum.timed = true;
  }
  return sum;
}

GroupResult Assembler::Evaluate(const Group& group) {
  GroupResult result;
  result.unit = GroupUnit(group);
  std::optional<double> max_units;
  std::optional<double> max_administrations;
  MaximumPerDay(group, result.unit, max_units, max_administrations);
  const PartsSum sum = SumParts(group, result.unit, max_administrations);
  if (max_administrations && !max_units) {
    max_units = sum.first_dose.value_or(1) * *max_administrations;
  }
  // A dose left without a frequency matters unless an as-needed maximum sets the amount.
  left_out_ = left_out_ || (sum.left_out && !(as_needed_ && max_units));
  if (as_needed_) {
    result.units_per_day = max_units ? max_units : sum.timed ? std::optional(sum.regular)
                                                             : std::nullopt;
  } else if (sum.timed) {
    result.units_per_day = max_units ? std::min(sum.regular, *max_units) : sum.regular;
  } else {
    result.units_per_day = max_units;
  }
  return result;
}

std::string Assembler::JoinedNotes() const {
  std::string joined;
  if (!unknown_.empty()) {
    joined = "did not understand";
    for (size_t k = 0; k < unknown_.size() && k < 5; ++k) {
      joined += (k == 0 ? " \"" : ", \"") + SafeWord(unknown_[k]) + "\"";
    }
    if (unknown_.size() > 5) joined += ", ...";
  }
  for (const std::string& note : notes_) {
    if (!joined.empty()) joined += "; ";
    joined += note;
  }
  return joined;
}

DosageReading Assembler::Finish(bool truncated) {
  StartPart();
  DosageReading reading;
  reading.as_needed = as_needed_;
  size_t with_units = 0;
  for (const Group& group : groups_) {
    const GroupResult result = Evaluate(group);
    if (!result.units_per_day) {
      if (reading.unit.empty()) reading.unit = std::string(result.unit);
      continue;
    }
    ++with_units;
    if (!reading.units_per_day || *result.units_per_day > *reading.units_per_day) {
      reading.units_per_day = result.units_per_day;
      reading.unit = std::string(result.unit);
    }
  }
  if (left_out_ && reading.units_per_day) Note("a dose without a frequency was left out");
  if (with_units > 1) Note("the dose changes: the highest daily amount is used");
  if (truncated) {
    Note("the text is longer than the parser reads: the rest was ignored");
    doubtful_ = true;
  }
  if (reading.units_per_day && !(*reading.units_per_day > 0)) {
    reading.units_per_day.reset();
    Note("a dose of zero");
  }
  if (!reading.units_per_day) {
    Note(as_directed_ ? "as directed: no amount per day is given"
         : as_needed_ ? "as needed with no frequency or maximum"
                      : "no usable dose and frequency found");
    reading.understanding = Understanding::kUnknown;
  } else {
    reading.understanding = unknown_.empty() && !doubtful_ ? Understanding::kFull
                                                           : Understanding::kPartial;
  }
  reading.note = JoinedNotes();
  return reading;
}

}  // namespace

std::string_view UnderstandingName(Understanding understanding) {
  switch (understanding) {
    case Understanding::kEmpty: return "empty";
    case Understanding::kFull: return "full";
    case Understanding::kPartial: return "partial";
    case Understanding::kUnknown: return "unknown";
  }
  return "unknown";
}

DosageReading ReadDosageText(std::string_view text) {
  if (IsBlank(text, " \t\n\r\f\v")) return DosageReading{};
  const LexedText lexed = LexDosageText(text);
  if (lexed.tokens.empty()) return DosageReading{};
  Assembler assembler;
  for (const Item& item : RecogniseDosageItems(lexed.tokens)) assembler.Add(item);
  return assembler.Finish(lexed.truncated);
}

}  // namespace medload
