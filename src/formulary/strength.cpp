// Strengths as British product descriptions write them: "10mg", "500micrograms",
// "5mg/5ml", "30mg/500mg", "30/500", "0.1%", "5micrograms/hour", "100units/ml", and as US
// ones do: "5 mg/325 mg", "10-325 mg".
#include <charconv>
#include <cmath>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/formulary/resolver.h"

namespace medload {
namespace {

enum class UnitKind { kNone, kMass, kUnits, kPercent, kVolume, kTime, kCount };

struct UnitWord {
  std::string_view word;
  UnitKind kind;
  double factor;  // mass: to mg; volume: to ml; time: to hours; else 1
};

// Longest spellings first where one is a prefix of another.
constexpr UnitWord kUnitWords[] = {
    {"micrograms", UnitKind::kMass, 0.001}, {"microgram", UnitKind::kMass, 0.001},
    {"milligrams", UnitKind::kMass, 1},     {"milligram", UnitKind::kMass, 1},
    {"nanograms", UnitKind::kMass, 1e-6},   {"nanogram", UnitKind::kMass, 1e-6},
    {"grams", UnitKind::kMass, 1000},       {"gram", UnitKind::kMass, 1000},
    {"mcg", UnitKind::kMass, 0.001},        {"ug", UnitKind::kMass, 0.001},
    {"mg", UnitKind::kMass, 1},             {"g", UnitKind::kMass, 1000},
    {"units", UnitKind::kUnits, 1},         {"unit", UnitKind::kUnits, 1},
    {"iu", UnitKind::kUnits, 1},            {"%", UnitKind::kPercent, 1},
    {"millilitres", UnitKind::kVolume, 1},  {"millilitre", UnitKind::kVolume, 1},
    {"ml", UnitKind::kVolume, 1},           {"litres", UnitKind::kVolume, 1000},
    {"litre", UnitKind::kVolume, 1000},     {"l", UnitKind::kVolume, 1000},
    {"hours", UnitKind::kTime, 1},          {"hour", UnitKind::kTime, 1},
    {"hrs", UnitKind::kTime, 1},            {"hr", UnitKind::kTime, 1},
    {"h", UnitKind::kTime, 1},              {"days", UnitKind::kTime, 24},
    {"day", UnitKind::kTime, 24},           {"doses", UnitKind::kCount, 1},
    {"dose", UnitKind::kCount, 1},          {"actuations", UnitKind::kCount, 1},
    {"actuation", UnitKind::kCount, 1},     {"sprays", UnitKind::kCount, 1},
    {"spray", UnitKind::kCount, 1},         {"puffs", UnitKind::kCount, 1},
    {"puff", UnitKind::kCount, 1},          {"drops", UnitKind::kCount, 1},
    {"drop", UnitKind::kCount, 1},          {"inhalation", UnitKind::kCount, 1},
    {"application", UnitKind::kCount, 1},   {"sachet", UnitKind::kCount, 1},
    {"vial", UnitKind::kCount, 1},          {"ampoule", UnitKind::kCount, 1},
};

bool IsLetter(char c) { return (c >= 'a' && c <= 'z') || static_cast<unsigned char>(c) >= 0x80; }
bool IsDigit(char c) { return c >= '0' && c <= '9'; }

struct Item {
  std::optional<double> number;
  UnitKind kind = UnitKind::kNone;
  double factor = 1;
  std::string_view unit;  // the unit word as listed in kUnitWords
  size_t position = 0;
};

void SkipSpaces(std::string_view text, size_t& i) {
  while (i < text.size() && text[i] == ' ') ++i;
}

// A unit word at text[i], followed by a non-letter; advances i.
std::optional<UnitWord> ReadUnit(std::string_view text, size_t& i) {
  for (const UnitWord& unit : kUnitWords) {
    if (text.substr(i, unit.word.size()) != unit.word) continue;
    const size_t end = i + unit.word.size();
    if (unit.word != "%" && end < text.size() && IsLetter(text[end])) continue;
    i = end;
    return unit;
  }
  return std::nullopt;
}

// [number] [spaces] [unit] at text[i]; at least one of the two. Advances i on success.
std::optional<Item> ReadItem(std::string_view text, size_t& i, bool number_required) {
  size_t j = i;
  Item item;
  item.position = i;
  if (j < text.size() && IsDigit(text[j])) {
    size_t end = j;
    while (end < text.size() && (IsDigit(text[end]) || text[end] == '.')) ++end;
    while (end > j && text[end - 1] == '.') --end;  // a full stop after the number
    double value = 0;
    const auto [ptr, ec] = std::from_chars(text.data() + j, text.data() + end, value);
    if (ec != std::errc() || ptr != text.data() + end) return std::nullopt;
    item.number = value;
    j = end;
  } else if (number_required) {
    return std::nullopt;
  }
  size_t k = j;
  SkipSpaces(text, k);
  if (auto unit = ReadUnit(text, k)) {
    item.kind = unit->kind;
    item.factor = unit->factor;
    item.unit = unit->word;
    j = k;
  }
  if (!item.number && item.kind == UnitKind::kNone) return std::nullopt;
  i = j;
  return item;
}

// A chain of items separated by '/', starting at a number.
std::vector<Item> ReadChain(std::string_view text, size_t& i) {
  std::vector<Item> chain;
  auto first = ReadItem(text, i, true);
  if (!first) return chain;
  chain.push_back(*first);
  while (chain.size() < 6) {
    size_t j = i;
    // "10-325 mg": a dash straight between two numbers separates them as a slash does.
    const bool dash = j + 1 < text.size() && text[j] == '-' && j > 0 && IsDigit(text[j - 1]) && IsDigit(text[j + 1]);
    SkipSpaces(text, j);
    if (j >= text.size() || (text[j] != '/' && !dash)) break;
    ++j;
    SkipSpaces(text, j);
    auto next = ReadItem(text, j, false);
    if (!next) break;
    chain.push_back(*next);
    i = j;
    // A denominator ends the chain: "100micrograms/dose / 6micrograms/dose" is two.
    if (next->kind == UnitKind::kVolume || next->kind == UnitKind::kTime || next->kind == UnitKind::kCount) break;
  }
  return chain;
}

bool IsStrengthKind(UnitKind kind) {
  return kind == UnitKind::kMass || kind == UnitKind::kUnits || kind == UnitKind::kPercent;
}

// Whether the chain's last item is a denominator ("/5ml", "/hour", "/dose", "/g").
bool LastIsDenominator(const std::vector<Item>& chain) {
  if (chain.size() < 2) return false;
  const Item& last = chain.back();
  if (last.kind == UnitKind::kVolume || last.kind == UnitKind::kTime || last.kind == UnitKind::kCount) {
    return true;
  }
  // "20mg/g": grams with no amount (or 1) after a smaller mass unit.
  const Item& before = chain[chain.size() - 2];
  return last.kind == UnitKind::kMass && last.factor == 1000 && (!last.number || *last.number == 1) &&
         before.kind == UnitKind::kMass && before.factor < 1000;
}

std::string DenominatorName(const Item& item) {
  switch (item.kind) {
    case UnitKind::kVolume: return "ml";
    case UnitKind::kTime: return "hour";
    case UnitKind::kMass: return "g";
    default: break;
  }
  std::string name(item.unit);
  if (name.size() > 1 && name.back() == 's') name.pop_back();
  if (name == "actuation" || name == "puff" || name == "inhalation") name = "dose";
  return name;
}

// Turns a chain into strengths; appends to `out`.
void Interpret(const std::vector<Item>& chain, std::vector<Strength>& out) {
  const bool has_denominator = LastIsDenominator(chain);
  const size_t numerators = has_denominator ? chain.size() - 1 : chain.size();
  bool any_unit = false;
  for (size_t k = 0; k < numerators; ++k) {
    if (chain[k].kind != UnitKind::kNone && !IsStrengthKind(chain[k].kind)) return;  // "5ml/..."
    any_unit = any_unit || chain[k].kind != UnitKind::kNone;
  }
  // Bare numbers count only as a combination ("30/500"), never alone ("28").
  if (!any_unit && (numerators != 2 || has_denominator)) return;
  double per_amount = 1;
  std::string per;
  if (has_denominator) {
    const Item& last = chain.back();
    // In the denominator's own unit: ml for volumes, hours for times, g for masses.
    per_amount = last.number.value_or(1) * (last.kind == UnitKind::kMass ? last.factor / 1000 : last.factor);
    per = DenominatorName(last);
  }
  for (size_t k = 0; k < numerators; ++k) {
    const Item* unit_from = &chain[k];
    // A bare number takes the unit of the next (else the previous) number with a unit.
    for (size_t n = k; unit_from->kind == UnitKind::kNone && n + 1 < numerators; ++n) unit_from = &chain[n + 1];
    for (size_t n = k; unit_from->kind == UnitKind::kNone && n > 0; --n) unit_from = &chain[n - 1];
    if (!chain[k].number || !(per_amount > 0)) continue;
    Strength strength;
    strength.position = chain[k].position;
    strength.per_amount = per_amount;
    strength.per = per;
    switch (unit_from->kind) {
      case UnitKind::kUnits: strength.unit = StrengthUnit::kUnits; strength.amount = *chain[k].number; break;
      case UnitKind::kPercent: strength.unit = StrengthUnit::kPercent; strength.amount = *chain[k].number; break;
      case UnitKind::kMass: strength.amount = *chain[k].number * unit_from->factor; break;
      default:  // bare numbers: mg (the resolver rescales them for inhalers)
        strength.amount = *chain[k].number;
        strength.bare = true;
        break;
    }
    out.push_back(strength);
  }
}

}  // namespace

namespace {

// Keeps results free of binary noise (0.6000000000000001 -> 0.6).
double Tidy(double value) { return std::round(value * 1e9) / 1e9; }

// "0mg" (or an amount that rounds to 0) is a misprint, not a dose of nothing: no mg at
// all (the dose is then unknown and counted as such) rather than a burden of zero.
std::optional<double> AboveZero(double mg) {
  return mg > 0 && std::isfinite(mg) ? std::optional<double>(mg) : std::nullopt;
}

}  // namespace

std::optional<double> Strength::MgPerUnit() const {
  if (per == "hour") return std::nullopt;
  if (unit == StrengthUnit::kUnits) return std::nullopt;
  if (unit == StrengthUnit::kPercent) {
    // 1% is 1 g per 100 g (or 100 ml): 10 mg per g or ml.
    if (!per.empty()) return std::nullopt;
    return AboveZero(Tidy(amount * 10));
  }
  return AboveZero(Tidy(amount / per_amount));
}

std::optional<double> Strength::MgPerDay() const {
  if (per != "hour" || unit != StrengthUnit::kMg) return std::nullopt;
  return AboveZero(Tidy(amount * 24 / per_amount));
}

std::vector<Strength> ParseStrengths(std::string_view text) {
  std::vector<Strength> strengths;
  size_t i = 0;
  while (i < text.size()) {
    const bool starts_number =
        IsDigit(text[i]) && (i == 0 || (!IsLetter(text[i - 1]) && !IsDigit(text[i - 1]) && text[i - 1] != '.'));
    if (!starts_number) {
      ++i;
      continue;
    }
    const size_t start = i;
    const std::vector<Item> chain = ReadChain(text, i);
    if (i == start) ++i;
    Interpret(chain, strengths);
  }
  return strengths;
}

}  // namespace medload
