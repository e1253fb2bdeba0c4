#include "formulary/name_index.h"

#include <algorithm>

#include "formulary/description_words.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"

namespace medload::formulary_internal {
namespace {

bool IsWordByte(unsigned char c) {
  return (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c >= 0x80;
}

}  // namespace

std::vector<Word> SplitWords(std::string_view normalised) {
  std::vector<Word> words;
  size_t i = 0;
  while (i < normalised.size()) {
    while (i < normalised.size() && !IsWordByte(static_cast<unsigned char>(normalised[i]))) ++i;
    const size_t start = i;
    while (i < normalised.size() && IsWordByte(static_cast<unsigned char>(normalised[i]))) ++i;
    if (i > start) words.push_back(Word{normalised.substr(start, i - start), start});
  }
  return words;
}

bool WordMatches(std::string_view text_word, std::string_view table_word) {
  if (text_word == table_word) return true;
  if (text_word.size() <= table_word.size() || table_word.size() < 3) return false;
  if (text_word.substr(0, table_word.size()) == table_word) {
    const std::string_view tail = text_word.substr(table_word.size());
    return tail == "s" || tail == "es";
  }
  // "suppository" -> "suppositories"
  if (table_word.back() == 'y' && text_word.size() == table_word.size() + 2 &&
      text_word.substr(0, table_word.size() - 1) == table_word.substr(0, table_word.size() - 1)) {
    return text_word.substr(table_word.size() - 1) == "ies";
  }
  return false;
}

bool SequenceAt(const std::vector<Word>& words, size_t i, const std::vector<std::string>& name) {
  if (name.empty() || i + name.size() > words.size()) return false;
  for (size_t k = 0; k < name.size(); ++k) {
    if (!WordMatches(words[i + k].text, name[k])) return false;
  }
  return true;
}

bool WordTable::Contains(const std::vector<Word>& words, const std::vector<std::string>& name) {
  for (size_t i = 0; i < words.size(); ++i) {
    if (SequenceAt(words, i, name)) return true;
  }
  return false;
}

void WordTable::Add(std::string_view name, size_t target, size_t rank) {
  // Written out as descriptions are ("Seroquel XL" matches "seroquel modified release").
  const std::string key = NameKey(ExpandAbbreviations(NormaliseText(name)));
  if (key.empty()) return;
  Entry entry;
  for (const Word& word : SplitWords(key)) entry.words.emplace_back(word.text);
  entry.target = target;
  entry.rank = rank;
  std::vector<Entry>& bucket = by_first_[entry.words.front()];
  // Keep the bucket sorted: more words first, then higher rank, then insertion order.
  const auto at = std::find_if(bucket.begin(), bucket.end(), [&](const Entry& other) {
    return other.words.size() < entry.words.size() ||
           (other.words.size() == entry.words.size() && other.rank < entry.rank);
  });
  bucket.insert(at, std::move(entry));
  ++count_;
}

const std::vector<WordTable::Entry>* WordTable::Bucket(std::string_view word) const {
  // The word, then the singular forms a plural may stand for ("tablets", "patches",
  // "suppositories"), without building a string except for "-ies".
  const auto find = [&](std::string_view form) -> const std::vector<Entry>* {
    const auto it = by_first_.find(form);
    return it == by_first_.end() ? nullptr : &it->second;
  };
  if (const auto* bucket = find(word)) return bucket;
  if (word.size() > 3 && word.back() == 's') {
    if (const auto* bucket = find(word.substr(0, word.size() - 1))) return bucket;
  }
  if (word.size() > 4 && word.substr(word.size() - 2) == "es") {
    if (const auto* bucket = find(word.substr(0, word.size() - 2))) return bucket;
  }
  if (word.size() > 4 && word.substr(word.size() - 3) == "ies") {
    return find(std::string(word.substr(0, word.size() - 3)) + "y");
  }
  return nullptr;
}

}  // namespace medload::formulary_internal
