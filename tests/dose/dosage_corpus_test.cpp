// Runs the dosage-text reader over tests/data/dosage_corpus.csv: instructions as UK and
// US prescribers write them, each with the units a day a pharmacist would take (common
// practice), the unit, whether it is as needed, and for staged or course text the days a
// quantity lasts. Every row must read right except the few listed in kKnownMisses.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "medload/dose/dosage_text.h"
#include "medload/dose/dose_unit.h"
#include "medload/dose/supply.h"

namespace medload {
namespace {

struct CorpusRow {
  int line = 0;
  std::string text;
  std::optional<double> units_per_day;  // empty: cannot be known
  std::string unit;                     // empty: not checked
  bool as_needed = false;
  std::optional<double> quantity;
  std::optional<int> days;
};

// Splits one CSV line (RFC 4180 quotes; the corpus has no line breaks inside fields).
std::vector<std::string> SplitCsvLine(const std::string& line) {
  std::vector<std::string> fields(1);
  bool quoted = false;
  for (size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted && c == '"' && i + 1 < line.size() && line[i + 1] == '"') {
      fields.back().push_back('"');
      ++i;
    } else if (c == '"') {
      quoted = !quoted;
    } else if (c == ',' && !quoted) {
      fields.emplace_back();
    } else if (c != '\r') {
      fields.back().push_back(c);
    }
  }
  return fields;
}

std::optional<double> Number(const std::string& field) {
  if (field.empty()) return std::nullopt;
  return std::stod(field);  // the corpus is ASCII digits with a '.' decimal point
}

std::vector<CorpusRow> LoadCorpus() {
  std::ifstream in(std::string(MEDLOAD_TEST_DATA) + "/dosage_corpus.csv");
  REQUIRE(in.good());
  std::vector<CorpusRow> rows;
  std::string line;
  int number = 0;
  while (std::getline(in, line)) {
    ++number;
    if (number == 1 || line.empty()) continue;  // header
    const std::vector<std::string> fields = SplitCsvLine(line);
    CAPTURE(number);
    REQUIRE(fields.size() == 7);
    CorpusRow row{number, fields[0], Number(fields[1]), fields[2], fields[3] == "1",
                  Number(fields[4]), std::nullopt};
    if (const auto days = Number(fields[5])) row.days = static_cast<int>(*days);
    rows.push_back(std::move(row));
  }
  return rows;
}

enum class Verdict { kRight, kOverCount, kGuess, kUnderCount, kMissed, kWrongUnit,
                     kWrongAsNeeded, kWrongDays };

bool Close(double a, double b) { return std::abs(a - b) <= 1e-4 * std::max(1.0, std::abs(b)); }

Verdict Judge(const CorpusRow& row, const DosageReading& reading) {
  if (!row.units_per_day) {
    if (reading.units_per_day) return Verdict::kGuess;
  } else if (!reading.units_per_day) {
    return Verdict::kMissed;
  } else if (!Close(*reading.units_per_day, *row.units_per_day)) {
    return *reading.units_per_day > *row.units_per_day ? Verdict::kOverCount
                                                       : Verdict::kUnderCount;
  }
  if (reading.as_needed != row.as_needed) return Verdict::kWrongAsNeeded;
  if (row.units_per_day && !row.unit.empty() && !SameDoseUnit(reading.unit, row.unit)) {
    return Verdict::kWrongUnit;
  }
  if (row.quantity && row.days) {
    const Supply supply = ComputeSupply(*row.quantity, std::nullopt, reading, std::nullopt,
                                        SupplyOptions{});
    if (supply.rule != SupplyRule::kDosageText || supply.days != *row.days) {
      return Verdict::kWrongDays;
    }
  }
  return Verdict::kRight;
}

const char* VerdictName(Verdict verdict) {
  switch (verdict) {
    case Verdict::kRight: return "right";
    case Verdict::kOverCount: return "over-count";
    case Verdict::kGuess: return "guess where unknown";
    case Verdict::kUnderCount: return "under-count";
    case Verdict::kMissed: return "missed";
    case Verdict::kWrongUnit: return "wrong unit";
    case Verdict::kWrongAsNeeded: return "wrong as-needed";
    case Verdict::kWrongDays: return "wrong days";
  }
  return "?";
}

// Rows the reader still gets wrong, each with the reason it is left: the test fails when
// one of them starts reading right, so that this list stays true.
const std::set<std::string> kKnownMisses = {
    // Written as as-needed in the corpus (the usual label wording for paracetamol), but it
    // has no as-needed word: the reader marks as-needed only when the text says so
    // ("prn", "when required", "up to"), and reads it as regular with a maximum of 8.
    "take one or two every four to six hours, maximum eight in 24 hours",
};

}  // namespace

TEST_SUITE("dose/dosage_corpus") {

TEST_CASE("every corpus instruction reads as a pharmacist would count it, bar the listed misses") {
  const std::vector<CorpusRow> rows = LoadCorpus();
  REQUIRE(rows.size() >= 200);
  int right = 0, over = 0, guess = 0;
  for (const CorpusRow& row : rows) {
    const DosageReading reading = ReadDosageText(row.text);
    const Verdict verdict = Judge(row, reading);
    CAPTURE(row.line);
    CAPTURE(row.text);
    CAPTURE(reading.units_per_day.value_or(-1));
    CAPTURE(reading.unit);
    CAPTURE(reading.note);
    const std::string verdict_name = VerdictName(verdict);
    CAPTURE(verdict_name);
    const bool known_miss = kKnownMisses.count(row.text) > 0;
    CHECK((verdict == Verdict::kRight) != known_miss);
    right += verdict == Verdict::kRight ? 1 : 0;
    over += verdict == Verdict::kOverCount ? 1 : 0;
    guess += verdict == Verdict::kGuess ? 1 : 0;
  }
  const double share = static_cast<double>(right) / static_cast<double>(rows.size());
  MESSAGE("dosage corpus: " << right << " of " << rows.size() << " right (" << share * 100
                            << "%), over-counts " << over << ", guesses where unknown " << guess);
  CHECK(over == 0);
  CHECK(guess == 0);
  CHECK(share >= 0.97);
}

}  // TEST_SUITE

}  // namespace medload
