// The word index the resolver matches descriptions against: names (ingredients and their
// synonyms, named products, non-medicine terms, form words) as word sequences, longest
// first. Private to src/formulary/; built once per formulary, read-only afterwards.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <utility>
#include <vector>

namespace medload {
namespace formulary_internal {

// One word of a normalised text and where it starts.
struct Word {
  std::string_view text;
  size_t offset = 0;
};

// The words of `normalised` (NormaliseText output): runs of letters, digits and
// non-ASCII bytes. The views point into `normalised`.
std::vector<Word> SplitWords(std::string_view normalised);

// True if a description's word matches a table word, allowing a plural in the
// description ("tablets", "patches", "suppositories").
bool WordMatches(std::string_view text_word, std::string_view table_word);

// Word sequences mapped to targets (indexes into some table).
class WordTable {
 public:
  struct Entry {
    std::vector<std::string> words;
    size_t target = 0;
    size_t rank = 0;  // extra weight: longer first, then higher rank
  };

  // Adds a name (any text; it is split into normalised words). Empty names are ignored.
  void Add(std::string_view name, size_t target, size_t rank = 0);
  // The longest entry (then highest rank, then first added) whose words start at
  // words[i] and for which `accept(entry)` is true; nullptr if none.
  template <typename Accept>
  const Entry* LongestAt(const std::vector<Word>& words, size_t i, Accept accept) const;
  const Entry* LongestAt(const std::vector<Word>& words, size_t i) const {
    return LongestAt(words, i, [](const Entry&) { return true; });
  }
  // True if the words of `name` occur anywhere in `words`.
  static bool Contains(const std::vector<Word>& words, const std::vector<std::string>& name);
  size_t size() const { return count_; }

 private:
  // Hashes a std::string and a string_view alike, so that lookups build no string.
  struct TextHash {
    using is_transparent = void;
    size_t operator()(std::string_view text) const { return std::hash<std::string_view>{}(text); }
  };
  const std::vector<Entry>* Bucket(std::string_view first_word) const;
  std::unordered_map<std::string, std::vector<Entry>, TextHash, std::equal_to<>> by_first_;
  size_t count_ = 0;
};

// --- template implementation ---

bool SequenceAt(const std::vector<Word>& words, size_t i, const std::vector<std::string>& name);

template <typename Accept>
const WordTable::Entry* WordTable::LongestAt(const std::vector<Word>& words, size_t i,
                                             Accept accept) const {
  if (i >= words.size()) return nullptr;
  const std::vector<Entry>* bucket = Bucket(words[i].text);
  if (bucket == nullptr) return nullptr;
  for (const Entry& entry : *bucket) {  // sorted: longest, then highest rank
    if (SequenceAt(words, i, entry.words) && accept(entry)) return &entry;
  }
  return nullptr;
}

}  // namespace formulary_internal

// The resolver's index over a formulary's tables.
class NameIndex {
 public:
  formulary_internal::WordTable ingredients;    // target: index in FormularyTables::ingredients
  formulary_internal::WordTable products;       // target: see Formulary::NamedProductAt
  formulary_internal::WordTable non_medicines;  // target: index in FormularyTables::non_medicines
  // Single-word ingredient names and synonyms (NameKey) with their ingredient index, sorted:
  // the candidates a close spelling may be read as.
  std::vector<std::pair<std::string, size_t>> spelling_names;
};

}  // namespace medload
