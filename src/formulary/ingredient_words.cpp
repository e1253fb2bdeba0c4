// A part of a combination that names nothing known must never vanish: it is either read
// as a close spelling or kept as an unknown ingredient (the product is then partial), and
// strengths are paired only where it is certain which is whose.
#include "formulary/ingredient_words.h"

#include <algorithm>
#include <cstdint>
#include <optional>

#include "formulary/description_words.h"
#include "formulary/spelling.h"
#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {
namespace {

// How two neighbouring parts are joined.
enum class Join { kNone, kWeak, kStrong };  // weak: a comma or a hyphen; strong: and, with, /, +, &

bool IsLetterByte(char c) { return (c >= 'a' && c <= 'z') || static_cast<unsigned char>(c) >= 0x80; }

// The join between words a and b, from the characters between them.
Join JoinBetween(std::string_view text, const Word& a, const Word& b) {
  const size_t from = a.offset + a.text.size();
  const std::string_view between = text.substr(from, b.offset - from);
  if (between.find_first_of("+&") != std::string_view::npos) return Join::kStrong;
  const bool letters = IsLetterByte(a.text.back()) && IsLetterByte(b.text.front());
  if (letters && between.find('/') != std::string_view::npos) return Join::kStrong;
  if (between.find(',') != std::string_view::npos) return Join::kWeak;
  if (letters && between.find('-') != std::string_view::npos) return Join::kWeak;
  return Join::kNone;
}

// The parts of a description: each word's part, and the join before each part.
struct Parts {
  std::vector<size_t> of_word;
  std::vector<Join> join_before;  // join_before[p]: between part p-1 and part p
};

Parts SplitParts(std::string_view text, const std::vector<Word>& words) {
  Parts parts;
  parts.join_before.push_back(Join::kNone);
  for (size_t k = 0; k < words.size(); ++k) {
    const Join join = k == 0 ? Join::kNone : JoinBetween(text, words[k - 1], words[k]);
    const bool connector = IsConnectorWord(words[k].text);
    if (join != Join::kNone || connector) parts.join_before.push_back(connector ? Join::kStrong : join);
    parts.of_word.push_back(parts.join_before.size() - 1);
    if (connector) parts.join_before.push_back(Join::kStrong);
  }
  parts.join_before.push_back(Join::kNone);  // after the last part
  return parts;
}

struct Mention {
  size_t ingredient = 0;
  size_t first_word = 0;
  size_t word_count = 0;
};

std::vector<Mention> FindMentions(const Formulary& formulary, const std::vector<Word>& words) {
  std::vector<Mention> mentions;
  const WordTable& table = formulary.name_index().ingredients;
  for (size_t i = 0; i < words.size();) {
    const WordTable::Entry* entry = table.LongestAt(words, i);
    if (entry == nullptr) {
      ++i;
      continue;
    }
    mentions.push_back(Mention{entry->target, i, entry->words.size()});
    i += entry->words.size();
  }
  return mentions;
}

void AddComponent(std::vector<Component>& components, Component component) {
  const bool repeated = component.kind != Component::Kind::kUnknown &&
                        std::any_of(components.begin(), components.end(), [&](const Component& other) {
                          return other.kind != Component::Kind::kUnknown && other.name == component.name;
                        });
  if (!repeated) components.push_back(std::move(component));
}

// The close spellings among `candidates` (word indexes); true if any.
bool AddSpellings(const Formulary& formulary, const std::vector<Word>& words, const std::vector<size_t>& candidates,
                  std::vector<Component>& components) {
  bool any = false;
  for (const size_t k : candidates) {
    const auto ingredient = CloseIngredient(formulary, words[k].text);
    if (!ingredient) continue;
    AddComponent(components, Component{Component::Kind::kSpelled, formulary.ingredients()[*ingredient].name,
                                       std::string(words[k].text), words[k].offset});
    any = true;
  }
  return any;
}

bool HasStrength(const std::vector<Strength>& strengths, size_t from, size_t to) {
  return std::any_of(strengths.begin(), strengths.end(),
                     [&](const Strength& s) { return s.position >= from && s.position < to; });
}

}  // namespace

bool LooksLikeIngredient(std::string_view word) {
  if (word.size() < 5 || IsDescriptiveWord(word)) return false;
  return std::all_of(word.begin(), word.end(), IsLetterByte);
}

namespace {

// A description split for reading: its words' parts and which words and parts name a
// known ingredient.
struct Reading {
  Parts parts;
  std::vector<bool> in_mention, part_known;
  const std::vector<Strength>& strengths;
};

// The unknown ingredient of `part` (its ingredient-like words `candidates`), if the part
// stands as an ingredient of the combination.
std::optional<Component> UnknownPart(std::string_view text, const std::vector<Word>& words, const Reading& reading,
                                     size_t part, const std::vector<size_t>& candidates, size_t ingredients_read) {
  std::string name;
  for (const size_t k : candidates) name += (name.empty() ? "" : " ") + std::string(words[k].text);
  size_t end = text.size();
  for (size_t k = candidates.back(); k < words.size(); ++k) {
    if (reading.parts.of_word[k] != part) {
      end = words[k].offset;
      break;
    }
  }
  // A word set off by a comma or a hyphen counts only with a strength of its own or more
  // strengths than the ingredients read (a pack size or a maker is not an ingredient).
  const auto& joins = reading.parts.join_before;
  const bool strong = joins[part] == Join::kStrong || joins[part + 1] == Join::kStrong;
  const size_t start = words[candidates.front()].offset;
  const bool evidence = HasStrength(reading.strengths, start, end) || reading.strengths.size() > ingredients_read;
  if (!strong && !evidence) return std::nullopt;
  return Component{Component::Kind::kUnknown, name, "", start};
}

}  // namespace

std::vector<Component> FindComponents(const Formulary& formulary, std::string_view text,
                                      const std::vector<Word>& words, const std::vector<Strength>& strengths) {
  Reading reading{SplitParts(text, words), std::vector<bool>(words.size(), false), {}, strengths};
  const size_t part_count = reading.parts.join_before.size() - 1;
  reading.part_known.assign(part_count, false);
  std::vector<Component> components;
  for (const Mention& mention : FindMentions(formulary, words)) {
    for (size_t k = mention.first_word; k < mention.first_word + mention.word_count; ++k) {
      reading.in_mention[k] = true;
      reading.part_known[reading.parts.of_word[k]] = true;
    }
    AddComponent(components, Component{Component::Kind::kKnown, formulary.ingredients()[mention.ingredient].name,
                                       "", words[mention.first_word].offset});
  }
  std::vector<Component> unknown;
  for (size_t part = 0; part < part_count; ++part) {
    if (reading.part_known[part]) continue;
    std::vector<size_t> candidates;
    for (size_t k = 0; k < words.size(); ++k) {
      const bool named = LooksLikeIngredient(words[k].text) || IsMineralWord(words[k].text);
      if (reading.parts.of_word[k] == part && !reading.in_mention[k] && named) {
        candidates.push_back(k);
      }
    }
    if (candidates.empty() || AddSpellings(formulary, words, candidates, components)) continue;
    if (auto part_unknown = UnknownPart(text, words, reading, part, candidates, components.size())) {
      unknown.push_back(std::move(*part_unknown));
    }
  }
  if (components.empty()) return {};  // nothing known: unmatched, whatever looks like a name
  components.insert(components.end(), unknown.begin(), unknown.end());
  std::stable_sort(components.begin(), components.end(),
                   [](const Component& a, const Component& b) { return a.offset < b.offset; });
  return components;
}

std::vector<const Strength*> PairStrengths(size_t count, const std::vector<size_t>& offsets,
                                           const std::vector<Strength>& strengths) {
  std::vector<const Strength*> paired(count, nullptr);
  if (count == 0 || strengths.empty()) return paired;
  if (count > 1 && strengths.size() == count) {
    for (size_t i = 0; i < count; ++i) paired[i] = &strengths[i];
    return paired;
  }
  if (count == 1) {
    // Where its place is known, the first strength written after the name ("Xyz 10mg and
    // paracetamol 500mg": 500); one written before it may be another's.
    const auto after = offsets.empty() ? strengths.begin()
                                       : std::find_if(strengths.begin(), strengths.end(),
                                                      [&](const Strength& s) { return s.position > offsets[0]; });
    if (after != strengths.end()) paired[0] = &*after;
    return paired;
  }
  if (offsets.size() != count) return paired;  // places unknown: no strength rather than a wrong one
  // Only when each strength is written after its own name ("A 10mg and B 500mg"): the
  // first ingredient must have exactly one strength before the second's name, or the
  // strengths written after all the names ("A and B 5mg") could be anyone's.
  for (size_t i = 0; i < count; ++i) {
    const size_t end = i + 1 < count ? offsets[i + 1] : SIZE_MAX;
    const Strength* only = nullptr;
    size_t found = 0;
    for (const Strength& strength : strengths) {
      if (strength.position > offsets[i] && strength.position < end) {
        only = &strength;
        ++found;
      }
    }
    if (i == 0 && found != 1) return paired;
    if (found == 1) paired[i] = only;
  }
  return paired;
}

}  // namespace medload::formulary_internal
