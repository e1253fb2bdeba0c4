#include "dose/dosage_groups.h"

#include <algorithm>
#include <bit>
#include <cmath>
#include <limits>

#include "dose/dosage_phrases.h"
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
  bool ranged_amount = false;    // the amount is a range's upper value ("1-2 tablets")
  bool ranged_count = false;     // the count is ("2-3 times", "once or twice daily")
};

// "max 8 in 24 hours", "up to four times a day", "maximum 4 doses a day".
struct Maximum {
  std::optional<double> amount;
  std::string_view unit;
  double factor = 1;
  std::optional<double> count;
  std::optional<double> period;
  std::vector<int> events;

  bool empty() const { return !amount && !count && !period && events.empty(); }
};

// Doses taken together; a "then" starts the next group (a changing dose).
struct Group {
  std::vector<Part> parts;
  std::vector<Maximum> maxima;  // each limits the group on its own: the lowest wins
  std::optional<double> days;
  bool one_day = false;
  bool daily = false;  // "days 2-5: 1 tablet": a dose without a timing is once a day
  bool stop = false;
};

void AddDistinct(std::vector<int>& values, int value) {
  if (std::find(values.begin(), values.end(), value) == values.end()) values.push_back(value);
}

bool HasTiming(const Part& part) {
  return part.count || part.period || !part.events.empty() || part.meals || part.weekdays != 0;
}

class Assembler {
 public:
  void Add(const Item& item);
  AssembledDosage Finish();

 private:
  void AddOther(const Item& item);
  bool AddToMaximum(const Item& item);
  Group& group() {
    if (groups_.empty()) groups_.emplace_back();
    return groups_.back();
  }
  void StartPart() {
    group().parts.push_back(part_);
    part_ = Part{};
  }
  void StartGroup() {
    StartPart();
    groups_.emplace_back();
  }
  bool CurrentHasDose() {
    const auto dose = [](const Part& part) { return part.amount || HasTiming(part); };
    return dose(part_) || std::any_of(group().parts.begin(), group().parts.end(), dose);
  }
  void MarkStage(const Item& item);
  void StartAfter(double days);
  void Note(std::string note) {
    auto& notes = out_.notes;
    if (std::find(notes.begin(), notes.end(), note) == notes.end()) notes.push_back(note);
  }

  struct PartsSum {
    double regular = 0;     // units per day of the timed doses
    bool timed = false;     // at least one dose had a timing
    bool left_out = false;  // a dose had no timing
    bool ranged = false;    // a timed dose counted a range's upper value
    std::optional<double> first_dose;
    bool first_ranged = false;  // first_dose is a range's upper value
  };
  struct Limits {
    std::optional<double> units;           // at most this many units a day
    std::optional<double> administrations; // at most this many doses a day
  };

  std::optional<double> Rate(const Part& part);
  std::string_view GroupUnit(const Group& group) const;
  PartsSum SumParts(const Group& group, std::string_view unit, std::optional<double> max_rate);
  Limits MaximumPerDay(const Group& group, std::string_view unit);
  GroupReading Evaluate(const Group& group);

  std::vector<Group> groups_;
  Part part_;
  bool in_max_ = false;
  bool negated_ = false;
  std::string_view unit_hint_;
  AssembledDosage out_;
};

void Assembler::Add(const Item& item) {
  if (negated_) {
    // A negative runs to the end of its clause ("not at night", "do not take with milk").
    const bool ends = item.kind == ItemKind::kSeparator || item.kind == ItemKind::kThen ||
                      item.kind == ItemKind::kStop;
    if (!ends) {
      if (item.kind == ItemKind::kUnknown) out_.unknown.push_back(item.text);
      return;
    }
    negated_ = false;
  }
  if (in_max_ && AddToMaximum(item)) return;
  in_max_ = false;
  switch (item.kind) {
    case ItemKind::kAmount:
      if (part_.amount) StartPart();
      part_.amount = item.value;
      part_.ranged_amount = item.ranged;
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
        part_.ranged_count = part_.ranged_count || item.ranged || (part_.count && *part_.count != item.value);
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

void Assembler::AddOther(const Item& item) {
  switch (item.kind) {
    case ItemKind::kEvent: AddDistinct(part_.events, static_cast<int>(item.value)); break;
    case ItemKind::kMeals: part_.meals = true; break;
    case ItemKind::kWeekday: part_.weekdays |= static_cast<unsigned>(item.value); break;
    case ItemKind::kExceptDays: part_.except_days = true; break;
    case ItemKind::kAsNeeded: out_.as_needed = true; break;
    case ItemKind::kAsDirected: out_.as_directed = true; break;
    case ItemKind::kEachSide: part_.multiplier = item.value; break;
    case ItemKind::kVariable: out_.variable = true; break;
    case ItemKind::kNegation: negated_ = true; break;
    case ItemKind::kOneDay: group().one_day = true; break;
    case ItemKind::kDuration:
      if (!group().days) group().days = item.value;
      break;
    case ItemKind::kUnitHint:
      if (unit_hint_.empty()) unit_hint_ = item.unit;
      break;
    case ItemKind::kThen: StartGroup(); break;
    case ItemKind::kStageMark: MarkStage(item); break;
    case ItemKind::kStartAfter: StartAfter(item.value); break;
    case ItemKind::kStop:
      StartGroup();
      group().stop = true;
      break;
    case ItemKind::kMaximum:
      in_max_ = true;
      group().maxima.emplace_back();
      if (item.value == 1) group().maxima.back().period = 1;
      if (item.as_needed) out_.as_needed = true;
      break;
    case ItemKind::kUnknown:
      out_.unknown.push_back(item.text);
      if (item.unusable_amount) {
        if (part_.amount) StartPart();
        part_.amount = std::numeric_limits<double>::quiet_NaN();  // an unusable dose
      }
      break;
    default: break;  // separators and fillers
  }
}

// "Week 2: two daily", "days 2-5: 1 tablet": a label starts a new stage when the current
// one already has a dose and a length of its own.
void Assembler::MarkStage(const Item& item) {
  if (CurrentHasDose() && (group().days || group().one_day)) StartGroup();
  if (!group().days) group().days = item.value;
  if (item.daily) group().daily = true;
}

// "increase to two daily after one week": the stage before lasts that long; written in
// the first stage ("one daily, after 2 weeks increase to two"), that stage does.
void Assembler::StartAfter(double days) {
  Group* target = groups_.size() >= 2 ? &groups_[groups_.size() - 2] : &group();
  if (!target->days) target->days = days;
}

// Items after a maximum marker describe the maximum until a separator or a marker.
bool Assembler::AddToMaximum(const Item& item) {
  Maximum& max = group().maxima.back();
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
      // "up to a maximum of" is one maximum; "up to four times a day, max 8" is two.
      if (!max.empty()) return false;
      if (item.as_needed) out_.as_needed = true;
      return true;
    case ItemKind::kFiller: return true;
    default: return false;
  }
}

// Administrations per day of one part, or nullopt when it gives no timing.
std::optional<double> Assembler::Rate(const Part& part) {
  std::optional<double> rate;
  if (part.count || part.period) {
    if (part.count && !part.period && part.weekdays == 0) {
      Note("a count without a period is read as per day");
      out_.doubtful = true;
    }
    rate = part.count.value_or(1) / part.period.value_or(1);
  } else if (part.meals) {
    // Three meals a day; a bedtime dose named with them comes on top ("ac & hs").
    rate = 3.0 + static_cast<double>(std::count(part.events.begin(), part.events.end(), kNight));
  } else if (!part.events.empty()) {
    rate = static_cast<double>(part.events.size());
  } else if (part.weekdays != 0) {
    rate = 1;
  }
  if (rate && part.weekdays != 0 && part.period.value_or(1) <= 1) {
    const int days = std::popcount(part.weekdays);
    rate = *rate * (part.except_days ? 7 - days : days) / 7.0;
  }
  return rate;
}

Assembler::Limits Assembler::MaximumPerDay(const Group& group, std::string_view unit) {
  Limits limits;
  const auto lower = [](std::optional<double>& slot, double value) {
    slot = slot ? std::min(*slot, value) : value;
  };
  for (const Maximum& max : group.maxima) {
    if (!max.amount && !max.count && max.events.empty()) continue;
    if (!max.period && max.events.empty()) Note("a maximum without a period is read as per day");
    const double count =
        max.count.value_or(max.events.empty() ? 1 : static_cast<double>(max.events.size()));
    const double period = max.period.value_or(1);
    if (!max.amount) {
      lower(limits.administrations, count / period);
    } else if (max.unit == "dose" && unit != "dose" && unit != "puff") {
      lower(limits.administrations, *max.amount * count / period);
    } else if (max.unit.empty() || unit.empty() || SameDoseUnit(max.unit, unit)) {
      lower(limits.units, *max.amount * max.factor * count / period);
    } else {
      Note("a maximum in " + std::string(max.unit) + " was not compared with doses in " +
           std::string(unit));
    }
  }
  return limits;
}

// The unit of a group: its first dose's, else its maximum's, else the verb's.
std::string_view Assembler::GroupUnit(const Group& group) const {
  for (const Part& part : group.parts) {
    if (!part.unit.empty()) return part.unit;
  }
  for (const Maximum& max : group.maxima) {
    if (max.amount && !max.unit.empty() && max.unit != "dose") return max.unit;
  }
  return unit_hint_;
}

// The regular daily amount of a group's doses in `unit`; a dose without its own timing
// takes the maximum's administrations ("1-2 tablets up to four times a day"), or one
// administration in a one-day group ("2 stat").
Assembler::PartsSum Assembler::SumParts(const Group& group, std::string_view unit,
                                        std::optional<double> max_rate) {
  PartsSum sum;
  for (const Part& part : group.parts) {
    const double dose = part.amount.value_or(1) * part.factor * part.multiplier;
    if (!part.unit.empty() && !SameDoseUnit(part.unit, unit)) {
      Note("doses in more than one unit: only " + std::string(unit) + " counted");
      out_.doubtful = true;
      continue;
    }
    if (part.amount && std::isnan(*part.amount)) {
      Note("an amount too large to be a dose");
      continue;
    }
    if (part.amount && !sum.first_dose) {
      sum.first_dose = dose;
      sum.first_ranged = part.ranged_amount;
    }
    const std::optional<double> own_rate = Rate(part);
    std::optional<double> rate = own_rate;
    if (!rate) rate = max_rate;
    if (!rate && (group.one_day || group.daily) && part.amount) rate = 1;
    if (!rate) {
      sum.left_out = sum.left_out || part.amount.has_value();
      continue;
    }
    sum.regular += dose * *rate;
    sum.timed = true;
    sum.ranged = sum.ranged || part.ranged_amount || (part.ranged_count && own_rate);
  }
  return sum;
}

GroupReading Assembler::Evaluate(const Group& group) {
  GroupReading result;
  result.unit = GroupUnit(group);
  result.days = group.days;
  result.stop = group.stop;
  result.has_dose = !group.maxima.empty() ||
                    std::any_of(group.parts.begin(), group.parts.end(), [](const Part& part) {
                      return part.amount || HasTiming(part);
                    });
  result.one_off = group.one_day && std::none_of(group.parts.begin(), group.parts.end(), HasTiming);
  Limits limits = MaximumPerDay(group, result.unit);
  const PartsSum sum = SumParts(group, result.unit, limits.administrations);
  // Whether the limit on units comes from the first dose x the most administrations.
  bool units_by_count = false;
  if (limits.administrations) {
    const double by_count = sum.first_dose.value_or(1) * *limits.administrations;
    units_by_count = !limits.units || by_count <= *limits.units;
    limits.units = limits.units ? std::min(*limits.units, by_count) : by_count;
  }
  const bool limit_ranged = units_by_count && sum.first_ranged;
  // A dose left without a frequency matters unless an as-needed maximum sets the amount.
  out_.left_out = out_.left_out || (sum.left_out && !(out_.as_needed && limits.units));
  if (out_.as_needed) {
    result.units_per_day = limits.units ? limits.units
                           : sum.timed  ? std::optional(sum.regular)
                                        : std::nullopt;
    result.range_upper = limits.units ? limit_ranged : sum.ranged;
  } else if (sum.timed) {
    const bool limited = limits.units && *limits.units < sum.regular;
    result.units_per_day = limited ? *limits.units : sum.regular;
    result.range_upper = limited ? limit_ranged : sum.ranged;
  } else {
    result.units_per_day = limits.units;
    result.range_upper = limit_ranged;
  }
  return result;
}

AssembledDosage Assembler::Finish() {
  StartPart();
  for (const Group& group : groups_) out_.groups.push_back(Evaluate(group));
  return std::move(out_);
}

}  // namespace

AssembledDosage AssembleDosageItems(const std::vector<Item>& items) {
  Assembler assembler;
  for (const Item& item : items) assembler.Add(item);
  return assembler.Finish();
}

}  // namespace medload
