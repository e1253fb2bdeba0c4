// The US RxNorm release as its RRF files lay it out (field order as documented for the
// RRF format, from memory: check against the release's documentation): RXNCONSO.RRF
// (18 fields: RXCUI, ..., SAB at 11, TTY at 12, STR at 14, SUPPRESS at 16) and RXNREL.RRF
// (16 fields: RXCUI1 at 0, RXCUI2 at 4, RELA at 7, SAB at 10). Only SAB=RXNORM rows are
// read. Relationships are followed by the term types at their ends (clinical and branded
// drugs and packs down to their ingredients), so their direction in the file does not
// matter.
#include <algorithm>
#include <map>
#include <set>

#include "formulary/dictionary_release.h"

namespace medload::formulary_internal {
namespace {

struct Concept {
  std::string tty, name;
};

// How far down the drug hierarchy a term type sits: relationships are followed from a
// lower rank to a higher one, until an ingredient (IN).
int Rank(std::string_view tty) {
  if (tty == "BPCK" || tty == "GPCK") return 0;
  if (tty == "SBD") return 1;
  if (tty == "SCD" || tty == "BN") return 2;
  if (tty == "SCDC" || tty == "MIN") return 3;
  if (tty == "PIN") return 4;
  if (tty == "IN") return 5;
  return -1;
}

constexpr std::string_view kRelations[] = {
    "consists_of", "constitutes", "has_ingredient", "ingredient_of", "has_precise_ingredient",
    "precise_ingredient_of", "form_of", "has_form", "tradename_of", "has_tradename", "contains",
    "contained_in", "has_part", "part_of", "has_ingredients", "ingredients_of"};

std::vector<std::string_view> SplitFields(std::string_view line) {
  std::vector<std::string_view> fields;
  size_t start = 0;
  while (true) {
    const size_t bar = line.find('|', start);
    if (bar == std::string_view::npos) break;
    fields.push_back(line.substr(start, bar - start));
    start = bar + 1;
  }
  return fields;
}

// Calls `row(fields, line number)` for each line of an RRF file.
template <typename Row>
void ForEachRow(std::string_view content, Row row) {
  size_t start = 0;
  int line = 0;
  while (start < content.size()) {
    size_t end = content.find('\n', start);
    if (end == std::string_view::npos) end = content.size();
    std::string_view text = content.substr(start, end - start);
    if (!text.empty() && text.back() == '\r') text.remove_suffix(1);
    ++line;
    if (!text.empty()) row(SplitFields(text), line);
    start = end + 1;
  }
}

struct Release {
  std::map<std::string, Concept> concepts;                 // RXCUI -> its RXNORM concept
  std::map<std::string, std::set<std::string>> below;      // RXCUI -> concepts one step down
  std::vector<std::string> names;
};

Status ReadConcepts(const ReleaseFile& file, Release& release) {
  Status status = Status::Ok();
  ForEachRow(file.content, [&](const std::vector<std::string_view>& f, int line) {
    if (!status.ok()) return;
    if (f.size() < 17) {
      status = Status::Input(file.path + ":" + std::to_string(line) + ": " + std::to_string(f.size()) +
                             " fields, expected 18 (RXNCONSO.RRF)");
      return;
    }
    if (f[11] != "RXNORM" || f[16] == "Y" || Rank(f[12]) < 0) return;
    release.concepts.emplace(std::string(f[0]), Concept{std::string(f[12]), std::string(f[14])});
  });
  return status;
}

void ReadRelations(const ReleaseFile& file, Release& release) {
  ForEachRow(file.content, [&](const std::vector<std::string_view>& f, int) {
    if (f.size() < 11 || f[10] != "RXNORM") return;
    if (std::find(std::begin(kRelations), std::end(kRelations), f[7]) == std::end(kRelations)) return;
    const auto a = release.concepts.find(std::string(f[0]));
    const auto b = release.concepts.find(std::string(f[4]));
    if (a == release.concepts.end() || b == release.concepts.end()) return;
    const int rank_a = Rank(a->second.tty), rank_b = Rank(b->second.tty);
    if (rank_a < rank_b) release.below[a->first].insert(b->first);
    if (rank_b < rank_a) release.below[b->first].insert(a->first);
  });
}

// The RXCUIs of the ingredients (IN) below `rxcui`, and of its brand name (BN) if any.
void Collect(const Release& release, const std::string& rxcui, std::set<std::string>& ingredients,
             std::string& brand) {
  const auto it = release.below.find(rxcui);
  if (it == release.below.end()) return;
  for (const std::string& next : it->second) {
    const Concept& below = release.concepts.at(next);
    if (below.tty == "IN") {
      ingredients.insert(next);
    } else {
      if (below.tty == "BN" && brand.empty()) brand = below.name;
      Collect(release, next, ingredients, brand);
    }
  }
}

// The ingredients column for a drug named `name` ("acetaminophen 325 MG / hydrocodone
// bitartrate 5 MG Oral Tablet [Norco]"): each ingredient with the strength written after
// its name, in the name's order; "name=" where the name gives none (a combination).
std::vector<std::string> Elements(const Formulary& formulary, const Release& release, const std::string& name,
                                  const std::set<std::string>& ingredients, std::set<std::string>& unknown) {
  const std::string drug = name.substr(0, name.find(" ["));
  std::vector<std::string> parts, keys;  // each part as text, and its NameKey
  for (size_t start = 0; start <= drug.size();) {
    const size_t end = std::min(drug.find(" / ", start), drug.size());
    parts.push_back(NormaliseText(drug.substr(start, end - start)));
    keys.push_back(NameKey(parts.back()));
    start = end + 3;
  }
  std::vector<std::pair<size_t, std::string>> placed;
  for (const std::string& rxcui : ingredients) {
    const std::string& substance = release.concepts.at(rxcui).name;
    const std::string canonical = IngredientOfSubstance(formulary, substance, unknown);
    const std::string key = NameKey(substance);
    size_t at = parts.size();
    for (size_t k = 0; k < parts.size() && at == parts.size(); ++k) {
      if (keys[k].rfind(key, 0) == 0) at = k;
    }
    std::string element = canonical;
    if (ingredients.size() > 1) {
      const auto strengths = at < parts.size() ? ParseStrengths(parts[at]) : std::vector<Strength>{};
      element += "=" + (strengths.empty() ? std::string() : StrengthText(strengths.front()));
    }
    if (std::none_of(placed.begin(), placed.end(), [&](const auto& p) { return p.second.substr(0, p.second.find('=')) == canonical; })) {
      placed.emplace_back(at, std::move(element));
    }
  }
  std::stable_sort(placed.begin(), placed.end(), [](const auto& a, const auto& b) { return a.first < b.first; });
  std::vector<std::string> elements;
  for (auto& [at, element] : placed) elements.push_back(std::move(element));
  return elements;
}

}  // namespace

Result<DictionaryLoad> ReadRxnormRelease(const Formulary& formulary, const std::vector<ReleaseFile>& files) {
  Release release;
  const ReleaseFile* relations = nullptr;
  for (const ReleaseFile& file : files) {
    const std::string_view first = std::string_view(file.content).substr(0, file.content.find('\n'));
    const size_t fields = SplitFields(first).size();
    if (fields == 18) {
      if (Status status = ReadConcepts(file, release); !status.ok()) return status;
    } else if (fields == 16) {
      relations = &file;
    } else {
      return Status::Input(file.path + ":1: " + std::to_string(fields) +
                           " fields, expected 18 (RXNCONSO.RRF) or 16 (RXNREL.RRF)");
    }
    release.names.push_back(FileName(file.path));
  }
  if (release.concepts.empty()) return Status::Input("rxnorm: RXNCONSO.RRF (18 fields a line) is missing or has no RXNORM drug");
  if (relations == nullptr) return Status::Input("rxnorm: RXNREL.RRF (16 fields a line) is missing");
  ReadRelations(*relations, release);
  DictionaryLoad load;
  load.code_system = "rxnorm";
  std::set<std::string> unknown;
  std::string source = "RxNorm release:";
  for (const std::string& name : release.names) source += " " + name;
  for (const auto& [rxcui, drug] : release.concepts) {
    if (Rank(drug.tty) > 2) continue;  // drugs, packs and brand names only
    std::set<std::string> ingredients;
    std::string brand = drug.tty == "BN" ? drug.name : std::string();
    Collect(release, rxcui, ingredients, brand);
    if (ingredients.empty()) {
      ++load.skipped;
      continue;
    }
    if (drug.tty == "SCD" || drug.tty == "GPCK") brand.clear();
    load.entries.push_back(DictionaryEntry{"rxnorm", rxcui, drug.name, brand,
                                           Elements(formulary, release, drug.name, ingredients, unknown),
                                           source + " (" + drug.tty + ")", 0});
  }
  load.unknown_substances.assign(unknown.begin(), unknown.end());
  return load;
}

}  // namespace medload::formulary_internal
