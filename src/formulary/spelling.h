// Close spellings: reads a misspelt word as the one known ingredient it closely resembles
// ("amitriptilline" -> amitriptyline), and finds the nearest names for a word nothing
// knows. Private to src/formulary/; it never guesses between two similar names.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

class Formulary;

namespace formulary_internal {

// The optimal-string-alignment distance between `a` and `b` (insertions, deletions,
// substitutions and swaps of two neighbouring letters), or `limit + 1` when it is more
// than `limit`.
size_t EditDistance(std::string_view a, std::string_view b, size_t limit);

// The most edits a word of `length` letters may be from a name to be read as it: none
// below 6 letters, 1 up to 8, 2 up to 12, 3 beyond.
size_t AllowedEdits(size_t length);

// The index (in formulary.ingredients()) of the one ingredient whose single-word name or
// synonym `word` closely spells: within AllowedEdits, same first letter, and no other
// ingredient within one edit more. nullopt otherwise.
std::optional<size_t> CloseIngredient(const Formulary& formulary, std::string_view word);

// Up to `limit` names (ingredients, their synonyms, brands) nearest to `word`, nearest
// first, each at most about a third of the word's letters away; empty for short words.
std::vector<std::string> NearestNames(const Formulary& formulary, std::string_view word, size_t limit);

}  // namespace formulary_internal
}  // namespace medload
