#include "medload/dose/dosage_text.h"

#include <algorithm>
#include <cmath>
#include <vector>

#include "dose/dosage_groups.h"
#include "dose/dosage_items.h"
#include "dose/dosage_lexer.h"
#include "dose/dosage_typos.h"
#include "medload/core/text.h"
#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

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

std::string JoinedNotes(const std::vector<std::string>& unknown,
                        const std::vector<std::string>& notes) {
  std::string joined;
  if (!unknown.empty()) {
    joined = "did not understand";
    for (size_t k = 0; k < unknown.size() && k < 5; ++k) {
      joined += (k == 0 ? " \"" : ", \"") + SafeWord(unknown[k]) + "\"";
    }
    if (unknown.size() > 5) joined += ", ...";
  }
  for (const std::string& note : notes) {
    if (!joined.empty()) joined += "; ";
    joined += note;
  }
  return joined;
}

void AddNote(std::vector<std::string>& notes, std::string note) {
  if (std::find(notes.begin(), notes.end(), note) == notes.end()) notes.push_back(note);
}

// The groups that carry a dose, and a stop after them; groups before the first dose
// ("shake well then ...") and after a stop are dropped.
std::vector<GroupReading> DoseGroups(const std::vector<GroupReading>& groups) {
  std::vector<GroupReading> kept;
  for (const GroupReading& group : groups) {
    if (!kept.empty() && kept.back().stop) break;
    if (group.stop ? !kept.empty() : group.has_dose) kept.push_back(group);
  }
  return kept;
}

// The stages of two or more dose groups, with the reading's unit; nullopt (and a note)
// when a stage gives no amount or the stages are in units that do not relate. A stage
// without a length continues: the stages after it are not reached.
std::optional<std::vector<DoseStage>> Stages(const std::vector<GroupReading>& kept,
                                             std::string_view& unit,
                                             std::vector<std::string>& notes, bool& doubtful) {
  std::vector<DoseStage> stages;
  for (size_t k = 0; k < kept.size(); ++k) {
    const GroupReading& group = kept[k];
    if (group.stop) {
      stages.push_back(DoseStage{0, std::nullopt});
      break;
    }
    if (!group.units_per_day || !(*group.units_per_day > 0)) {
      AddNote(notes, "a stage of the changing dose gives no amount per day");
      return std::nullopt;
    }
    if (!group.unit.empty() && !unit.empty() && !SameDoseUnit(group.unit, unit)) {
      AddNote(notes, "the stages of the changing dose are in different units");
      return std::nullopt;
    }
    if (unit.empty()) unit = group.unit;
    std::optional<int> days;
    if (group.one_off) days = 1;
    if (!days && group.days) days = static_cast<int>(std::ceil(*group.days - 1e-9));
    stages.push_back(DoseStage{*group.units_per_day, days});
    if (!days) {
      if (k + 1 < kept.size()) {
        AddNote(notes, "a stage has no length: its dose is taken to continue");
        doubtful = true;
      }
      break;
    }
  }
  stages.back().days.reset();
  return stages;
}

// Units per day, unit and stages from the assembled groups (`reading.note` not set).
void ReadGroups(AssembledDosage& assembled, DosageReading& reading) {
  const std::vector<GroupReading> kept = DoseGroups(assembled.groups);
  const GroupReading& first = kept.empty() ? assembled.groups.front() : kept.front();
  const GroupReading& last = assembled.groups.back();
  if (!kept.empty() && assembled.groups.size() > 1 && !last.has_dose && !last.stop &&
      !assembled.variable) {
    // "2 daily for 5 days then see your doctor": nothing says what follows.
    AddNote(assembled.notes, "a later stage gives no dose: the dose before it is taken to continue");
    assembled.doubtful = true;
  }
  reading.unit = std::string(first.unit);
  if (kept.size() >= 2) {
    std::string_view unit;
    auto stages = Stages(kept, unit, assembled.notes, assembled.doubtful);
    if (!stages) return;
    reading.unit = std::string(unit);
    if (stages->size() >= 2) {
      reading.units_per_day = stages->front().units_per_day;
      reading.range_upper = std::any_of(kept.begin(), kept.end(), [](const GroupReading& g) { return g.range_upper; });
      reading.stages = std::move(*stages);
      AddNote(assembled.notes, "the dose changes: read in " + std::to_string(reading.stages.size()) +
                                   " stages, the first one's units per day shown");
      return;
    }
  }
  if (first.one_off) {
    AddNote(assembled.notes, "a dose on one day only: no amount per day");
    return;
  }
  reading.units_per_day = first.units_per_day;
  reading.range_upper = first.range_upper;
}

DosageReading Finish(AssembledDosage assembled, bool truncated) {
  DosageReading reading;
  reading.as_needed = assembled.as_needed;
  ReadGroups(assembled, reading);
  auto& notes = assembled.notes;
  if (assembled.variable && reading.units_per_day) {
    reading.units_per_day.reset();
    reading.stages.clear();
    AddNote(notes, "the dose changes by a rule that is not written out");
  }
  if (assembled.left_out && reading.units_per_day) AddNote(notes, "a dose without a frequency was left out");
  if (truncated) {
    AddNote(notes, "the text is longer than the parser reads: the rest was ignored");
    assembled.doubtful = true;
  }
  if (reading.units_per_day && !(*reading.units_per_day > 0)) {
    reading.units_per_day.reset();
    reading.stages.clear();
    AddNote(notes, "a dose of zero");
  }
  if (!reading.units_per_day) {
    reading.range_upper = false;
    AddNote(notes, assembled.as_directed ? "as directed: no amount per day is given"
                   : assembled.as_needed ? "as needed with no frequency or maximum"
                                         : "no usable dose and frequency found");
    reading.understanding = Understanding::kUnknown;
  } else {
    reading.understanding = assembled.unknown.empty() && !assembled.doubtful
                                ? Understanding::kFull
                                : Understanding::kPartial;
  }
  reading.note = JoinedNotes(assembled.unknown, notes);
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
  LexedText lexed = LexDosageText(text);
  if (lexed.tokens.empty()) return DosageReading{};
  std::vector<Item> items = RecogniseDosageItems(lexed.tokens);
  std::vector<std::string> corrections;
  // Misspellings are looked for only when some word was not understood (rarely).
  if (std::any_of(items.begin(), items.end(),
                  [](const Item& item) { return item.kind == ItemKind::kUnknown; })) {
    corrections = CorrectDosageTypos(lexed.tokens);
    if (!corrections.empty()) items = RecogniseDosageItems(lexed.tokens);
  }
  AssembledDosage assembled = AssembleDosageItems(items);
  if (!corrections.empty()) {
    assembled.doubtful = true;
    assembled.notes.insert(assembled.notes.begin(), corrections.begin(), corrections.end());
  }
  return Finish(std::move(assembled), lexed.truncated);
}

std::optional<double> UnitsPerDayOnDay(const std::vector<DoseStage>& stages, int day) {
  if (stages.empty() || day < 0) return std::nullopt;
  long long start = 0;
  for (const DoseStage& stage : stages) {
    if (!stage.days || day < start + *stage.days) return stage.units_per_day;
    start += *stage.days;
  }
  return stages.back().units_per_day;
}

std::optional<double> UnitsPerDayOnDay(const DosageReading& reading, int day) {
  if (!reading.units_per_day || day < 0) return std::nullopt;
  if (reading.stages.empty()) return reading.units_per_day;
  return UnitsPerDayOnDay(reading.stages, day);
}

}  // namespace medload
