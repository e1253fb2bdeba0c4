// Abbreviations are those pharmacy labelling and dispensing systems commonly print
// (common practice); each expands to the words the form table and the salt logic read.
#include "formulary/description_words.h"

#include <algorithm>
#include <string_view>
#include <unordered_map>
#include <unordered_set>
#include <utility>

namespace medload::formulary_internal {
namespace {

using Pair = std::pair<std::string_view, std::string_view>;

// Whole-word abbreviations (lower case) and what they stand for.
constexpr Pair kWordAbbreviations[] = {
    {"tab", "tablets"},          {"tabs", "tablets"},         {"tabl", "tablets"},
    {"cap", "capsules"},         {"caps", "capsules"},        {"mr", "modified release"},
    {"sr", "modified release"},  {"xl", "modified release"},  {"la", "modified release"},
    {"er", "modified release"},  {"xr", "modified release"},  {"cr", "modified release"},
    {"pr", "prolonged release"}, {"ec", "gastro resistant"},  {"gr", "gastro resistant"},
    {"dr", "gastro resistant"},  {"fc", "film coated"},       {"sf", "sugar free"},
    {"soln", "solution"},        {"sol", "solution"},         {"susp", "suspension"},
    {"liq", "oral liquid"},      {"syr", "syrup"},            {"elix", "elixir"},
    {"inh", "inhaler"},          {"mdi", "inhaler"},          {"hfa", "inhaler"},
    {"dpi", "inhalation powder"}, {"neb", "nebules"},         {"nebs", "nebules"},
    {"supp", "suppositories"},   {"supps", "suppositories"},  {"pess", "pessaries"},
    {"inj", "injection"},        {"injn", "injection"},       {"amp", "ampoules"},
    {"amps", "ampoules"},        {"pfs", "pre filled syringe"}, {"crm", "cream"},
    {"oint", "ointment"},        {"disp", "dispersible"},     {"eff", "effervescent"},
    {"efferv", "effervescent"},  {"chew", "chewable"},        {"orodisp", "orodispersible"},
    {"odt", "orodispersible tablets"}, {"sl", "sublingual"},  {"td", "transdermal"},
    {"vag", "vaginal"},          {"sach", "sachets"},         {"gran", "granules"},
    {"loz", "lozenges"},         {"gtt", "drops"},            {"hcl", "hydrochloride"},
    {"hbr", "hydrobromide"},     {"hydrobrom", "hydrobromide"}, {"butylbrom", "butylbromide"},
    {"sod", "sodium"},           {"chl", "chloride"},         {"sulph", "sulfate"},
    {"sulf", "sulfate"},         {"phos", "phosphate"},       {"bicarb", "bicarbonate"},
    {"dihydrochlor", "dihydrochloride"},
};

// Abbreviations written as two letters around a slash ("m/r"), keyed without the slash.
constexpr Pair kSlashAbbreviations[] = {
    {"mr", "modified release"}, {"sr", "modified release"}, {"cr", "modified release"},
    {"ec", "gastro resistant"}, {"gr", "gastro resistant"}, {"fc", "film coated"},
    {"sf", "sugar free"},       {"ed", "eye drops"},        {"eo", "eye ointment"},
    {"nd", "nasal drops"},      {"ns", "nasal spray"},
};

// Words that describe a product without naming an ingredient (common practice).
constexpr std::string_view kDescriptiveWords[] = {
    // forms and devices
    "tablet", "tablets", "caplet", "caplets", "capsule", "capsules", "solution", "suspension",
    "liquid", "syrup", "elixir", "linctus", "mixture", "drops", "drop", "granules", "powder",
    "sachet", "sachets", "lozenge", "lozenges", "pastille", "pastilles", "mouthwash", "cream",
    "ointment", "gel", "lotion", "shampoo", "paste", "foam", "spray", "sprays", "emollient",
    "plaster", "plasters", "patch", "patches", "inhaler", "inhalers", "inhalation", "nebules",
    "nebuliser", "nebulizer", "injection", "injectable", "infusion", "ampoule", "ampoules",
    "vial", "vials", "syringe", "syringes", "cartridge", "cartridges", "implant", "suppository",
    "suppositories", "enema", "enemas", "pessary", "pessaries", "film", "films", "gum", "system",
    "concentrate", "emulsion", "crystals", "tube", "tubes", "applicator", "device", "devices",
    "accuhaler", "easyhaler", "ellipta", "evohaler", "nexthaler", "respimat", "spiromax",
    "turbohaler", "handihaler", "breezhaler", "genuair", "diskus", "autohaler", "clickhaler",
    "novolizer", "modulite", "aerosphere", "twisthaler", "flexpen", "kwikpen", "solostar",
    "penfill", "pen", "pens", "refill", "refills", "starter", "pack", "packs", "kit", "blister",
    "bottle", "bottles", "unit", "units", "dose", "doses", "actuation", "actuations", "metered",
    "breath", "actuated", "pump", "dry", "soltab", "fastab", "velotab", "melt", "melts",
    // routes, release, coating and other descriptors
    "oral", "topical", "cutaneous", "nasal", "ophthalmic", "otic", "eye", "ear", "rectal",
    "vaginal", "transdermal", "sublingual", "buccal", "oromucosal", "subcutaneous",
    "intramuscular", "intravenous", "parenteral", "scalp", "bath", "dental", "modified",
    "release", "prolonged", "extended", "delayed", "controlled", "sustained", "immediate",
    "gastro", "resistant", "enteric", "coated", "dispersible", "soluble", "effervescent",
    "chewable", "orodispersible", "sugar", "free", "alcohol", "preservative", "lactose",
    "gluten", "filled", "pre", "prefilled", "sterile", "aqueous", "anhydrous", "plain",
    "adult", "adults", "child", "children", "paediatric", "pediatric", "junior", "infant",
    "strength", "forte", "extra", "original", "regular", "mild", "strong", "double", "single",
    "daily", "weekly", "monthly", "once", "twice", "hours", "hour", "day", "days", "week",
    "weeks", "seven", "four", "three", "hourly", "night", "white", "yellow", "blue", "pink",
    "flavour", "flavor", "orange", "lemon", "mint", "peppermint", "cherry", "strawberry",
    "vanilla", "chocolate", "aniseed", "sugarfree", "micrograms", "microgram", "milligrams",
    "milligram", "grams", "gram", "litre", "litres", "millilitres", "millilitre",
    // salts, esters and hydrates
    "hydrochloride", "dihydrochloride", "hydrobromide", "butylbromide", "bromide", "chloride",
    "sodium", "potassium", "calcium", "magnesium", "disodium", "dipotassium", "sulfate",
    "sulphate", "phosphate", "maleate", "fumarate", "tartrate", "bitartrate", "citrate",
    "acetate", "mesilate", "mesylate", "besilate", "besylate", "succinate", "hyclate",
    "monohydrate", "dihydrate", "trihydrate", "hemihydrate", "sesquihydrate", "propionate",
    "dipropionate", "furoate", "valerate", "butyrate", "xinafoate", "embonate", "pamoate",
    "lactate", "gluconate", "hydrogen", "etexilate", "medoxomil", "cilexetil", "axetil",
    "pivoxil", "dimesylate", "tosilate", "tosylate", "napsilate", "napsylate", "stearate",
    "estolate", "ethylsuccinate", "decanoate", "enantate", "palmitate", "teoclate",
    "trometamol", "meglumine", "iodide", "nitrate", "sulfosuccinate", "benzoate",
    "salicylate", "bicarbonate", "carbonate", "oxalate", "malate", "aspartate", "edisilate",
    "isetionate", "hydroxide", "oxide", "base", "free", "salt", "ester", "as",
    // connectors and small words
    "and", "with", "plus", "for", "per", "in", "of", "the", "to", "or", "each", "containing",
    "equivalent", "non", "without",
    // companies
    "ltd", "limited", "plc", "gmbh", "inc", "llc", "pharma", "pharmaceuticals",
    "pharmaceutical", "healthcare", "laboratories", "labs", "uk", "company", "products",
    "international", "generics", "consumer", "trading",
};

const std::unordered_set<std::string_view>& DescriptiveWords() {
  static const std::unordered_set<std::string_view> words(std::begin(kDescriptiveWords),
                                                           std::end(kDescriptiveWords));
  return words;
}

bool IsWordByte(char c) {
  const auto u = static_cast<unsigned char>(c);
  return (u >= 'a' && u <= 'z') || (u >= '0' && u <= '9') || u >= 0x80;
}
bool IsAsciiLetter(char c) { return c >= 'a' && c <= 'z'; }
bool IsDigit(char c) { return c >= '0' && c <= '9'; }

std::string_view Lookup(const auto& table, std::string_view key) {
  for (const auto& [abbreviation, expansion] : table) {
    if (abbreviation == key) return expansion;
  }
  return {};
}

// "m/r" at text[i] (a letter, a slash, a letter, then no word byte): its expansion.
std::string_view SlashAbbreviationAt(std::string_view text, size_t i) {
  if (i + 2 >= text.size() || !IsAsciiLetter(text[i]) || text[i + 1] != '/' || !IsAsciiLetter(text[i + 2])) return {};
  if (i + 3 < text.size() && IsWordByte(text[i + 3])) return {};
  const char key[] = {text[i], text[i + 2]};
  return Lookup(kSlashAbbreviations, std::string_view(key, 2));
}

// The whole-word abbreviations by word (every description word is looked up).
std::string_view WordAbbreviation(std::string_view word) {
  static const std::unordered_map<std::string_view, std::string_view> abbreviations(std::begin(kWordAbbreviations),
                                                                                     std::end(kWordAbbreviations));
  const auto it = abbreviations.find(word);
  return it == abbreviations.end() ? std::string_view() : it->second;
}

// Appends one word, expanded or split where it is an abbreviation or a glued strength.
void AppendWord(std::string_view word, std::string& out) {
  if (const std::string_view expansion = WordAbbreviation(word); !expansion.empty()) {
    out += expansion;
    return;
  }
  size_t letters = 0;
  while (letters < word.size() && IsAsciiLetter(word[letters])) ++letters;
  // "lansoprazole30mg": a name of four letters or more with its strength glued on.
  if (letters >= 4 && letters < word.size() && IsDigit(word[letters])) {
    out.append(word.substr(0, letters)).append(1, ' ').append(word.substr(letters));
    return;
  }
  out += word;
}

}  // namespace

std::string ExpandAbbreviations(std::string_view text) {
  std::string out;
  out.reserve(text.size() + 16);
  size_t i = 0;
  while (i < text.size()) {
    if (!IsWordByte(text[i])) {
      out += text[i++];
      continue;
    }
    const bool word_start = i == 0 || !IsWordByte(text[i - 1]);
    if (word_start) {
      if (const std::string_view expansion = SlashAbbreviationAt(text, i); !expansion.empty()) {
        out += expansion;
        i += 3;
        continue;
      }
    }
    size_t end = i;
    while (end < text.size() && IsWordByte(text[end])) ++end;
    AppendWord(text.substr(i, end - i), out);
    i = end;
  }
  return out;
}

bool IsDescriptiveWord(std::string_view word) { return DescriptiveWords().count(word) != 0; }

bool IsMineralWord(std::string_view word) {
  constexpr std::string_view kMinerals[] = {"calcium", "magnesium", "potassium", "sodium", "iron", "zinc",
                                            "fluoride", "iodine", "selenium", "phosphate", "bicarbonate"};
  return std::find(std::begin(kMinerals), std::end(kMinerals), word) != std::end(kMinerals);
}

bool IsConnectorWord(std::string_view word) { return word == "and" || word == "with" || word == "plus"; }

}  // namespace medload::formulary_internal
