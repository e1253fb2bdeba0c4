#include "medload/dose/fhir_dosage.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

using nlohmann::json;

// Notes on what could not be used, in the order met; joined with "; ".
class Notes {
 public:
  void Add(std::string note) {
    if (!text_.empty()) text_ += "; ";
    text_ += note;
  }
  const std::string& text() const { return text_; }

 private:
  std::string text_;
};

// A positive number at parent[key]; absent -> nullopt silently, wrong type or <= 0 ->
// nullopt with a note naming the JSON pointer.
std::optional<double> PositiveNumber(const json& parent, const char* key,
                                     const std::string& pointer, Notes& notes) {
  if (!parent.is_object() || !parent.contains(key)) return std::nullopt;
  const json& value = parent.at(key);
  if (value.is_number() && value.get<double>() > 0) return value.get<double>();
  notes.Add(pointer + "/" + key + " is not a positive number");
  return std::nullopt;
}

std::string String(const json& parent, const char* key) {
  if (!parent.is_object() || !parent.contains(key) || !parent.at(key).is_string()) return {};
  return parent.at(key).get<std::string>();
}

// Days in one period unit of Timing.repeat.periodUnit (UCUM subset; HL7 FHIR R4 Timing).
// A month is 30 days and a year 365, as for the text parser.
std::optional<double> DaysPerUnit(std::string_view unit) {
  if (unit == "s") return 1.0 / 86400;
  if (unit == "min") return 1.0 / 1440;
  if (unit == "h" || unit == "hour" || unit == "hours") return 1.0 / 24;
  if (unit == "d" || unit == "day" || unit == "days") return 1.0;
  if (unit == "wk" || unit == "week" || unit == "weeks") return 7.0;
  if (unit == "mo" || unit == "month" || unit == "months") return 30.0;
  if (unit == "a" || unit == "year" || unit == "years") return 365.0;
  return std::nullopt;
}

// Administrations per day named by repeat.when codes (HL7 v3 TimingEvent / FHIR
// EventTiming): a meal code without a named meal (C, AC, PC) means every meal, three.
double WhenTimesPerDay(const json& when) {
  std::set<std::string> codes;
  double meals = 0;
  for (const json& code : when) {
    if (!code.is_string()) continue;
    const std::string value = code.get<std::string>();
    if (value == "C" || value == "AC" || value == "PC") {
      meals = 3;
    } else {
      codes.insert(value);
    }
  }
  return std::max(meals, static_cast<double>(codes.size()));
}

// Per-day rate of a Timing.code (HL7 FHIR R4 TimingAbbreviation value set).
std::optional<double> CodeTimesPerDay(const json& timing) {
  if (!timing.contains("code") || !timing.at("code").is_object()) return std::nullopt;
  const json& code = timing.at("code");
  static const std::map<std::string, double, std::less<>> kRates = {
      {"QD", 1},  {"AM", 1},  {"PM", 1},   {"BED", 1},  {"BID", 2},  {"TID", 3},
      {"QID", 4}, {"QOD", 0.5}, {"Q1H", 24}, {"Q2H", 12}, {"Q3H", 8}, {"Q4H", 6},
      {"Q6H", 4}, {"Q8H", 3}, {"WK", 1.0 / 7}, {"MO", 1.0 / 30}};
  if (code.contains("coding") && code.at("coding").is_array()) {
    for (const json& coding : code.at("coding")) {
      const auto rate = kRates.find(String(coding, "code"));
      if (rate != kRates.end()) return rate->second;
    }
  }
  return std::nullopt;
}

// Administrations per day from Dosage.timing, or nullopt when it says nothing usable.
std::optional<double> TimesPerDay(const json& dosage, Notes& notes) {
  if (!dosage.contains("timing") || !dosage.at("timing").is_object()) return std::nullopt;
  const json& timing = dosage.at("timing");
  const json empty = json::object();
  const json& repeat = timing.contains("repeat") && timing.at("repeat").is_object()
                           ? timing.at("repeat") : empty;
  const std::string at = "/timing/repeat";
  const auto frequency = PositiveNumber(repeat, "frequency", at, notes);
  const auto frequency_max = PositiveNumber(repeat, "frequencyMax", at, notes);
  const auto period = PositiveNumber(repeat, "period", at, notes);
  if (period) {
    const auto days = DaysPerUnit(String(repeat, "periodUnit"));
    if (!days) {
      notes.Add(at + "/periodUnit \"" + String(repeat, "periodUnit") +
                "\" is not s|min|h|d|wk|mo|a");
      return std::nullopt;
    }
    return frequency_max.value_or(frequency.value_or(1)) / (*period * *days);
  }
  for (const char* key : {"when", "timeOfDay"}) {
    if (repeat.contains(key) && repeat.at(key).is_array() && !repeat.at(key).empty()) {
      return std::string_view(key) == "when" ? WhenTimesPerDay(repeat.at(key))
                                              : static_cast<double>(repeat.at(key).size());
    }
  }
  if (auto rate = CodeTimesPerDay(timing)) return rate;
  if (frequency) notes.Add(at + "/frequency has no period");
  return std::nullopt;
}

struct Amount {
  double value = 0;
  std::string unit;  // canonical, or empty when not stated or not known
};

// A Quantity's value and unit (unit text first, then code), converted to canonical.
std::optional<Amount> ReadQuantity(const json& quantity, const std::string& pointer,
                                   Notes& notes) {
  const auto value = PositiveNumber(quantity, "value", pointer, notes);
  if (!value) return std::nullopt;
  for (const char* key : {"unit", "code"}) {
    const std::string spelled = String(quantity, key);
    if (spelled.empty()) continue;
    if (const auto unit = ReadDoseUnit(spelled)) {
      return Amount{*value * unit->factor, std::string(unit->name)};
    }
  }
  // A unit this table does not know is kept as written, so that nobody takes the amount
  // for one in the quantity's unit.
  std::string unit = String(quantity, "unit");
  if (unit.empty()) unit = String(quantity, "code");
  if (!unit.empty()) notes.Add(pointer + "/unit \"" + unit + "\" is not a known dose unit");
  return Amount{*value, unit};
}

std::optional<Amount> DoseOf(const json& dosage, Notes& notes) {
  if (!dosage.contains("doseAndRate") || !dosage.at("doseAndRate").is_array() ||
      dosage.at("doseAndRate").empty()) {
    return std::nullopt;
  }
  const json& first = dosage.at("doseAndRate").at(0);
  if (first.contains("doseQuantity")) {
    return ReadQuantity(first.at("doseQuantity"), "/doseAndRate/0/doseQuantity", notes);
  }
  if (first.contains("doseRange") && first.at("doseRange").contains("high")) {
    return ReadQuantity(first.at("doseRange").at("high"), "/doseAndRate/0/doseRange/high",
                        notes);
  }
  return std::nullopt;
}

// maxDosePerPeriod as an amount per day (R4: one Ratio; R5: an array of them).
std::optional<Amount> MaxPerDay(const json& dosage, Notes& notes) {
  if (!dosage.contains("maxDosePerPeriod")) return std::nullopt;
  const json* ratio = &dosage.at("maxDosePerPeriod");
  if (ratio->is_array() && !ratio->empty()) ratio = &ratio->at(0);
  if (!ratio->is_object() || !ratio->contains("numerator")) return std::nullopt;
  auto amount = ReadQuantity(ratio->at("numerator"), "/maxDosePerPeriod/numerator", notes);
  if (!amount) return std::nullopt;
  const json empty = json::object();
  const json& denominator = ratio->contains("denominator") ? ratio->at("denominator") : empty;
  const double count =
      PositiveNumber(denominator, "value", "/maxDosePerPeriod/denominator", notes).value_or(1);
  std::string unit = String(denominator, "code");
  if (unit.empty()) unit = String(denominator, "unit");
  const auto days = DaysPerUnit(unit.empty() ? "d" : unit);
  if (!days) {
    notes.Add("/maxDosePerPeriod/denominator unit \"" + unit + "\" is not a time unit");
    return std::nullopt;
  }
  amount->value /= count * *days;
  return amount;
}

bool AsNeeded(const json& dosage) {
  if (dosage.contains("asNeededBoolean") && dosage.at("asNeededBoolean").is_boolean()) {
    return dosage.at("asNeededBoolean").get<bool>();
  }
  return dosage.contains("asNeededCodeableConcept");
}

// The structured reading: fills `reading` and returns true when it gave units per day.
// `times` is set to the administrations a day whenever the timing gives them.
bool ReadStructure(const json& dosage, DosageReading& reading, Notes& notes,
                   std::optional<double>& times) {
  reading.as_needed = AsNeeded(dosage);
  const auto dose = DoseOf(dosage, notes);
  times = TimesPerDay(dosage, notes);
  auto max = MaxPerDay(dosage, notes);
  if (dose) reading.unit = dose->unit;
  if (max && dose && !max->unit.empty() && !dose->unit.empty() &&
      !SameDoseUnit(max->unit, dose->unit)) {
    notes.Add("maxDosePerPeriod is in " + max->unit + ", the dose in " + dose->unit);
    max.reset();
  }
  std::optional<double> regular;
  if (dose && times) regular = dose->value * *times;
  if (reading.as_needed && max) {
    reading.units_per_day = max->value;
    if (reading.unit.empty()) reading.unit = max->unit;
  } else if (regular) {
    reading.units_per_day = max ? std::min(*regular, max->value) : *regular;
  }
  if (reading.units_per_day && !std::isfinite(*reading.units_per_day)) {
    reading.units_per_day.reset();  // huge values (1e308 x 1e308): no usable daily amount
    notes.Add("the structured dose and frequency give no finite amount per day");
  }
  return reading.units_per_day.has_value();
}

// When the structure gave no amount a day: the text's reading, else (a frequency without
// a dose) so many administrations a day, for the supply calculation to count one unit
// each only for single-unit forms.
DosageReading ReadWithoutStructure(const json& dosage, DosageReading reading, std::optional<double> times,
                                   Notes& notes) {
  const std::string text = String(dosage, "text");
  DosageReading from_text = text.empty() ? DosageReading() : ReadDosageText(text);
  if (from_text.units_per_day || (!text.empty() && !times)) {
    from_text.as_needed = from_text.as_needed || reading.as_needed;
    if (from_text.unit.empty()) from_text.unit = reading.unit;
    notes.Add("no structured dose and frequency: read from the text");
    if (!from_text.note.empty()) notes.Add(from_text.note);
    from_text.note = notes.text();
    return from_text;
  }
  if (times && reading.unit.empty() && std::isfinite(*times)) {
    reading.units_per_day = *times;
    reading.unit = std::string(kAdministrationUnit);
    reading.understanding = Understanding::kPartial;
    notes.Add("a frequency without a dose: administrations a day");
  } else {
    notes.Add(text.empty() ? "no structured dose and frequency and no text"
                           : "no structured dose and frequency, and the text gave none");
    reading.understanding = Understanding::kUnknown;
  }
  reading.note = notes.text();
  return reading;
}

// Days of Timing.repeat.boundsDuration (HL7 FHIR R4 Timing.repeat.bounds[x]), rounded up
// to whole days; nullopt when absent or unusable.
std::optional<int> BoundsDays(const json& element) {
  if (!element.is_object() || !element.contains("timing")) return std::nullopt;
  const json& timing = element.at("timing");
  if (!timing.is_object() || !timing.contains("repeat") || !timing.at("repeat").is_object()) {
    return std::nullopt;
  }
  const json& repeat = timing.at("repeat");
  if (!repeat.contains("boundsDuration")) return std::nullopt;
  Notes ignored;
  const json& duration = repeat.at("boundsDuration");
  const auto value = PositiveNumber(duration, "value", "", ignored);
  std::string unit = String(duration, "code");
  if (unit.empty()) unit = String(duration, "unit");
  const auto per_unit = DaysPerUnit(unit);
  if (!value || !per_unit) return std::nullopt;
  const double days = std::ceil(*value * *per_unit - 1e-9);
  if (!(days >= 1) || days > 36500) return std::nullopt;
  return static_cast<int>(days);
}

// Sequences in order as the stages of a changing dose (the text reader's convention):
// each lasts its boundsDuration; one without a duration continues and ends the stages.
// The reading's units per day are the first stage's; unknown when a stage has none.
DosageReading Staged(const std::map<long long, DosageReading>& by_sequence,
                     const std::map<long long, int>& bounds, Notes& notes) {
  DosageReading result = by_sequence.begin()->second;
  std::vector<DoseStage> stages;
  for (const auto& [sequence, group] : by_sequence) {
    result.as_needed = result.as_needed || group.as_needed;
    if (!group.units_per_day || (!group.unit.empty() && !result.unit.empty() &&
                                 !SameDoseUnit(group.unit, result.unit))) {
      notes.Add("a sequence gives no units per day in the first one's unit");
      result.units_per_day.reset();
      result.understanding = Understanding::kUnknown;
      return result;
    }
    if (result.unit.empty()) result.unit = group.unit;
    if (group.understanding == Understanding::kPartial) result.understanding = group.understanding;
    const auto days = bounds.find(sequence);
    stages.push_back(DoseStage{*group.units_per_day, std::nullopt});
    if (days == bounds.end()) break;
    stages.back().days = days->second;
  }
  stages.back().days.reset();
  if (stages.size() < by_sequence.size()) {
    notes.Add("a sequence has no boundsDuration: its dose is taken to continue");
  }
  if (stages.size() >= 2) {
    notes.Add("the dose changes: read in " + std::to_string(stages.size()) +
              " stages, the first one's units per day shown");
    result.stages = std::move(stages);
  }
  result.units_per_day = result.stages.empty() ? by_sequence.begin()->second.units_per_day
                                               : result.stages.front().units_per_day;
  return result;
}

}  // namespace

DosageReading ReadFhirDosage(const json& dosage) {
  DosageReading reading;
  Notes notes;
  try {
    if (!dosage.is_object()) {
      reading.understanding = Understanding::kUnknown;
      reading.note = "the Dosage is not a JSON object";
      return reading;
    }
    if (dosage.empty()) return reading;
    std::optional<double> times;
    if (ReadStructure(dosage, reading, notes, times)) {
      reading.understanding = Understanding::kFull;
      reading.note = notes.text();
      return reading;
    }
    return ReadWithoutStructure(dosage, reading, times, notes);
  } catch (const json::exception& error) {
    reading.units_per_day.reset();
    reading.understanding = Understanding::kUnknown;
    notes.Add(std::string("unreadable Dosage: ") + error.what());
  }
  reading.note = notes.text();
  return reading;
}

DosageReading ReadFhirDosageList(const json& dosage_instructions) {
  DosageReading result;
  if (!dosage_instructions.is_array() || dosage_instructions.empty()) return result;
  if (dosage_instructions.size() == 1) return ReadFhirDosage(dosage_instructions.at(0));
  std::map<long long, DosageReading> by_sequence;
  std::map<long long, int> bounds;  // days of each sequence's boundsDuration
  Notes notes;
  for (const json& element : dosage_instructions) {
    long long sequence = 0;
    if (element.is_object() && element.contains("sequence") &&
        element.at("sequence").is_number_integer()) {
      sequence = element.at("sequence").get<long long>();
    }
    const DosageReading part = ReadFhirDosage(element);
    if (!part.note.empty()) notes.Add(part.note);
    if (const auto days = BoundsDays(element)) bounds.try_emplace(sequence, *days);
    auto [slot, inserted] = by_sequence.try_emplace(sequence, part);
    if (inserted) continue;
    DosageReading& group = slot->second;
    group.as_needed = group.as_needed || part.as_needed;
    if (group.unit.empty()) group.unit = part.unit;
    const std::string_view part_unit = part.unit.empty() ? group.unit : part.unit;
    if (part.units_per_day && group.units_per_day && SameDoseUnit(group.unit, part_unit)) {
      *group.units_per_day += *part.units_per_day;
      if (part.understanding == Understanding::kPartial) group.understanding = part.understanding;
      if (!std::isfinite(*group.units_per_day)) {
        group.units_per_day.reset();
        group.understanding = Understanding::kUnknown;
        notes.Add("the concurrent parts add up to no finite amount per day");
      }
    } else if (part.units_per_day || group.units_per_day) {
      group.units_per_day.reset();  // one concurrent part unusable: the sum is unknown
      group.understanding = Understanding::kUnknown;
      notes.Add("a concurrent part has no usable units per day in the same unit");
    }
  }
  if (by_sequence.size() == 1) {
    result = by_sequence.begin()->second;
  } else {
    result = Staged(by_sequence, bounds, notes);
  }
  result.note = notes.text();
  return result;
}

}  // namespace medload
