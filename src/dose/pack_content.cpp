#include "medload/dose/pack_content.h"

#include <array>
#include <cmath>
#include <string>

#include "dose/dosage_lexer.h"

namespace medload {
namespace {

bool IsWord(const std::vector<Token>& t, size_t k, std::string_view word) {
  return k < t.size() && t[k].kind != TokenKind::kNumber && t[k].text == word;
}

bool AnyWord(const std::vector<Token>& t, size_t k, std::initializer_list<std::string_view> words) {
  for (std::string_view word : words) {
    if (IsWord(t, k, word)) return true;
  }
  return false;
}

bool IsNumber(const std::vector<Token>& t, size_t k) {
  return k < t.size() && t[k].kind == TokenKind::kNumber;
}

// "200 dose", "120 actuations", "200-dose", "120 metered doses".
void ReadDoses(const std::vector<Token>& t, size_t k, PackContent& content) {
  size_t next = k + 1;
  if (IsWord(t, next, "-")) ++next;
  if (IsWord(t, next, "metered")) ++next;
  if (!AnyWord(t, next, {"dose", "doses", "actuation", "actuations", "spray", "sprays", "puff",
                         "puffs", "inhalation", "inhalations"})) {
    return;
  }
  if (IsWord(t, next + 1, "/")) return;  // "2 puffs/dose" is not a count in a pack
  if (!content.doses && t[k].number >= 1) content.doses = t[k].number;
}

// "10ml", "3ml cartridge", "2.5 ml"; not "5mg/5ml" nor "100units/ml".
void ReadVolume(const std::vector<Token>& t, size_t k, PackContent& content) {
  if (!AnyWord(t, k + 1, {"ml", "mls", "millilitre", "millilitres"})) return;
  if (k > 0 && IsWord(t, k - 1, "/")) return;
  if (IsWord(t, k + 2, "/")) return;
  if (!content.ml && t[k].number > 0) content.ml = t[k].number;
}

// "100units/ml", "100 units/1ml", "100 iu per ml", "U-100", "U100".
void ReadUnitsPerMl(const std::vector<Token>& t, size_t k, PackContent& content) {
  if (content.units_per_ml || !(t[k].number > 0)) return;
  if (k > 0 && (IsWord(t, k - 1, "u") || (k > 1 && IsWord(t, k - 1, "-") && IsWord(t, k - 2, "u")))) {
    content.units_per_ml = t[k].number;
    return;
  }
  if (!AnyWord(t, k + 1, {"unit", "units", "iu", "unt"})) return;
  size_t next = k + 2;
  if (!AnyWord(t, next, {"/", "per"})) return;
  ++next;
  double per = 1;
  if (IsNumber(t, next)) per = t[next++].number;
  if (AnyWord(t, next, {"ml", "millilitre"}) && per > 0) content.units_per_ml = t[k].number / per;
}

struct Device {
  std::string_view word;
  double doses;
};

// From memory: the doses in one device as commonly dispensed in the UK.
constexpr std::array<Device, 6> kDevices = {{
    {"ellipta", 30},  {"accuhaler", 60},  {"genuair", 60},
    {"respimat", 60}, {"spiromax", 120}, {"nexthaler", 120},
}};

std::string Lower(std::string_view text) {
  std::string lower(text);
  for (char& c : lower) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
    if (c == '-' || c == '_') c = ' ';
  }
  return lower;
}

}  // namespace

PackContent ReadPackContent(std::string_view description) {
  PackContent content;
  const std::vector<Token> tokens = LexDosageText(description).tokens;
  for (size_t k = 0; k < tokens.size(); ++k) {
    if (tokens[k].kind != TokenKind::kNumber || !std::isfinite(tokens[k].number)) continue;
    if (k > 0 && IsWord(tokens, k - 1, "/")) continue;  // a strength's denominator
    ReadDoses(tokens, k, content);
    ReadVolume(tokens, k, content);
    ReadUnitsPerMl(tokens, k, content);
  }
  return content;
}

std::optional<double> UsualDosesPerDevice(std::string_view form, std::string_view description,
                                          size_t ingredient_count) {
  const std::string lower = Lower(description);
  for (const Device& device : kDevices) {
    if (lower.find(device.word) != std::string::npos) return device.doses;
  }
  if (form == "inhaler") return ingredient_count >= 2 ? 120.0 : 200.0;
  if (form == "inhalation powder") return 60.0;
  if (form == "nasal spray") return 120.0;
  return std::nullopt;
}

bool IsContainerUnit(std::string_view unit) {
  static constexpr std::array<std::string_view, 13> kContainers = {
      "inhaler",   "pen",       "cartridge", "bottle", "pack",
      "device",    "canister",  "container", "vial",   "pre filled pen",
      "prefilled pen", "pre filled disposable injection", "injection"};
  std::string word = Lower(unit);
  while (!word.empty() && word.back() == ' ') word.pop_back();
  while (!word.empty() && word.front() == ' ') word.erase(word.begin());
  if (word.size() > 3 && word.compare(word.size() - 3, 3, "(s)") == 0) word.resize(word.size() - 3);
  for (std::string_view container : kContainers) {
    if (word == container) return true;
    if (word.size() == container.size() + 1 && word.back() == 's' &&
        word.compare(0, container.size(), container) == 0) {
      return true;
    }
  }
  return false;
}

bool LooksLikeContainers(double quantity, double content) {
  if (!(content >= 1) || !std::isfinite(content)) return false;
  if (!(quantity >= 1) || quantity > 10 || quantity != std::floor(quantity)) return false;
  const double ratio = quantity / content;
  return ratio != std::floor(ratio);
}

PackContent SupplyPackContent(std::string_view description, std::string_view form, size_t ingredient_count) {
  PackContent pack = ReadPackContent(description);
  if (!pack.doses) pack.doses = UsualDosesPerDevice(form, description, ingredient_count);
  return pack;
}

}  // namespace medload
