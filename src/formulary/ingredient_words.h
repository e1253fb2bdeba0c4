// Reading the ingredients of a description from its words: known names and synonyms,
// close spellings, and words that look like an ingredient the tables do not know, each
// part of a combination ("A and B", "A/B", "A + B", "A with B") in text order; and the
// pairing of strengths with them. Private to src/formulary/.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "formulary/name_index.h"
#include "medload/formulary/resolver.h"

namespace medload::formulary_internal {

// One ingredient of a product as read from its description.
struct Component {
  enum class Kind { kKnown, kSpelled, kUnknown };
  Kind kind = Kind::kKnown;
  std::string name;     // canonical (known, spelled), or the words as written (unknown)
  std::string written;  // kSpelled: the word as written
  size_t offset = 0;    // where it starts in the text
};

// The components of `text` (ExpandAbbreviations output) split into `words`, with its
// `strengths` (ParseStrengths of `text`), in text order,
// each ingredient once. A part of a combination with no known name but a word that looks
// like one (letters only, five or more, not a descriptive word; or a mineral standing
// alone: "calcium and vitamin D") is a close spelling when
// CloseIngredient reads it, else unknown. When no part names a known ingredient, the
// close spellings anywhere in the words are read. Empty when nothing looks like one.
std::vector<Component> FindComponents(const Formulary& formulary, std::string_view text,
                                      const std::vector<Word>& words, const std::vector<Strength>& strengths);

// The strength of each of `count` ingredients starting at `offsets` (text order; empty
// offsets when their places are not known): for one ingredient the first strength (the
// first written after its name when its place is known); for several, in order when the
// counts agree; else, when places are known and the first
// ingredient has exactly one strength written before the next name, the one strength
// written between each ingredient and the next; otherwise none. Never a strength that
// may be another ingredient's.
std::vector<const Strength*> PairStrengths(size_t count, const std::vector<size_t>& offsets,
                                           const std::vector<Strength>& strengths);

// Words that may name an ingredient the tables do not know: letters only, at least five,
// not a descriptive word.
bool LooksLikeIngredient(std::string_view word);

}  // namespace medload::formulary_internal
