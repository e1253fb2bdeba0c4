#include "medload/dose/dose_unit.h"

#include <array>
#include <charconv>
#include <string>

#include "medload/core/text.h"

namespace medload {
namespace {

struct UnitWord {
  std::string_view word;
  std::string_view name;
  double factor;
};

// Lower-case spellings; plurals listed explicitly so that nothing is guessed.
constexpr std::array kUnitWords = {
    UnitWord{"tablet", "tablet", 1},        UnitWord{"tablets", "tablet", 1},
    UnitWord{"tab", "tablet", 1},           UnitWord{"tabs", "tablet", 1},
    UnitWord{"tbl", "tablet", 1},           UnitWord{"caplet", "tablet", 1},
    UnitWord{"caplets", "tablet", 1},       UnitWord{"capsule", "capsule", 1},
    UnitWord{"capsules", "capsule", 1},     UnitWord{"cap", "capsule", 1},
    UnitWord{"caps", "capsule", 1},         UnitWord{"ml", "ml", 1},
    UnitWord{"mls", "ml", 1},               UnitWord{"millilitre", "ml", 1},
    UnitWord{"millilitres", "ml", 1},       UnitWord{"milliliter", "ml", 1},
    UnitWord{"milliliters", "ml", 1},       UnitWord{"l", "ml", 1000},
    UnitWord{"litre", "ml", 1000},          UnitWord{"litres", "ml", 1000},
    UnitWord{"spoonful", "ml", 5},          UnitWord{"spoonfuls", "ml", 5},
    UnitWord{"spoon", "ml", 5},             UnitWord{"spoons", "ml", 5},
    UnitWord{"spoonsful", "ml", 5},         UnitWord{"teaspoon", "ml", 5},
    UnitWord{"teaspoons", "ml", 5},         UnitWord{"teaspoonful", "ml", 5},
    UnitWord{"teaspoonfuls", "ml", 5},      UnitWord{"tsp", "ml", 5},
    UnitWord{"puff", "puff", 1},            UnitWord{"puffs", "puff", 1},
    UnitWord{"inhalation", "puff", 1},      UnitWord{"inhalations", "puff", 1},
    UnitWord{"actuation", "puff", 1},       UnitWord{"actuations", "puff", 1},
    UnitWord{"dose", "dose", 1},            UnitWord{"doses", "dose", 1},
    UnitWord{"drop", "drop", 1},            UnitWord{"drops", "drop", 1},
    UnitWord{"gtt", "drop", 1},             UnitWord{"gtts", "drop", 1},             UnitWord{"sachet", "sachet", 1},
    UnitWord{"sachets", "sachet", 1},       UnitWord{"patch", "patch", 1},
    UnitWord{"patches", "patch", 1},        UnitWord{"application", "application", 1},
    UnitWord{"applications", "application", 1},
    UnitWord{"suppository", "suppository", 1},
    UnitWord{"suppositories", "suppository", 1},
    UnitWord{"supp", "suppository", 1},     UnitWord{"supps", "suppository", 1},
    UnitWord{"pessary", "pessary", 1},      UnitWord{"pessaries", "pessary", 1},
    UnitWord{"lozenge", "lozenge", 1},      UnitWord{"lozenges", "lozenge", 1},
    UnitWord{"pastille", "pastille", 1},    UnitWord{"pastilles", "pastille", 1},
    UnitWord{"spray", "spray", 1},          UnitWord{"sprays", "spray", 1},
    UnitWord{"unit", "unit", 1},            UnitWord{"units", "unit", 1},
    UnitWord{"iu", "unit", 1},              UnitWord{"[iu]", "unit", 1},
    UnitWord{"mg", "mg", 1},                UnitWord{"mgs", "mg", 1},
    UnitWord{"milligram", "mg", 1},         UnitWord{"milligrams", "mg", 1},
    UnitWord{"milligramme", "mg", 1},       UnitWord{"milligrammes", "mg", 1},
    UnitWord{"g", "mg", 1000},              UnitWord{"gram", "mg", 1000},
    UnitWord{"grams", "mg", 1000},          UnitWord{"gramme", "mg", 1000},
    UnitWord{"grammes", "mg", 1000},        UnitWord{"mcg", "mg", 0.001},
    UnitWord{"ug", "mg", 0.001},            UnitWord{"microgram", "mg", 0.001},
    UnitWord{"micrograms", "mg", 0.001},    UnitWord{"microgramme", "mg", 0.001},
    UnitWord{"microgrammes", "mg", 0.001},  UnitWord{"ampoule", "ampoule", 1},
    UnitWord{"ampoules", "ampoule", 1},     UnitWord{"amp", "ampoule", 1},
    UnitWord{"amps", "ampoule", 1},         UnitWord{"vial", "vial", 1},
    UnitWord{"vials", "vial", 1},           UnitWord{"enema", "enema", 1},
    UnitWord{"enemas", "enema", 1},
};

std::string LowerAscii(std::string_view text) {
  std::string lower(text);
  for (char& c : lower) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  }
  return lower;
}

std::optional<DoseUnit> LookUpWord(std::string_view word) {
  for (const UnitWord& entry : kUnitWords) {
    if (entry.word == word) return DoseUnit{entry.name, entry.factor};
  }
  return std::nullopt;
}

// "5ml spoonful", "2.5 ml spoon": a measuring spoon of the stated volume.
std::optional<DoseUnit> ReadSpoon(std::string_view text) {
  double volume = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), volume);
  if (error != std::errc() || !(volume > 0) || volume > 100) return std::nullopt;
  std::string_view rest = Trim(text.substr(static_cast<size_t>(end - text.data())));
  if (rest.substr(0, 2) != "ml") return std::nullopt;
  rest = Trim(rest.substr(2));
  const auto spoon = LookUpWord(rest);
  if (!spoon || spoon->name != "ml" || spoon->factor != 5) return std::nullopt;
  return DoseUnit{"ml", volume};
}

}  // namespace

std::optional<DoseUnit> ReadDoseUnit(std::string_view text) {
  std::string lower = LowerAscii(Trim(text));
  std::string_view word = lower;
  if (word.size() > 3 && word.substr(word.size() - 3) == "(s)") word.remove_suffix(3);
  if (word.size() > 2 && word.front() == '{' && word.back() == '}') {
    word = word.substr(1, word.size() - 2);
  }
  if (word.empty()) return std::nullopt;
  if (word.front() >= '0' && word.front() <= '9') return ReadSpoon(word);
  return LookUpWord(word);
}

bool IsSingleUnitForm(std::string_view canonical) {
  for (std::string_view form : {"tablet", "capsule", "patch", "suppository", "pessary", "sachet",
                                "lozenge", "pastille", "enema"}) {
    if (canonical == form) return true;
  }
  return false;
}

bool SameDoseUnit(std::string_view canonical_a, std::string_view canonical_b) {
  if (canonical_a == canonical_b) return true;
  auto either = [&](std::string_view x, std::string_view y) {
    return (canonical_a == x && canonical_b == y) || (canonical_a == y && canonical_b == x);
  };
  return either("tablet", "capsule") || either("puff", "dose") || either("spray", "dose");
}

}  // namespace medload
