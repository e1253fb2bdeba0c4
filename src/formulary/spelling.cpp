// Close spellings are a convenience with a cost: a wrong reading changes a patient's
// scores. Hence the narrow rules: long words only, the first letter kept, few edits for
// the length, and a refusal whenever a second ingredient is nearly as close.
#include "formulary/spelling.h"

#include <algorithm>
#include <vector>

#include "formulary/name_index.h"
#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {

size_t EditDistance(std::string_view a, std::string_view b, size_t limit) {
  const size_t gap = a.size() > b.size() ? a.size() - b.size() : b.size() - a.size();
  if (gap > limit) return limit + 1;
  // Three rows of the dynamic programme: two back (for swaps), one back, current. On the
  // stack for names of ordinary length (this runs for every candidate name).
  constexpr size_t kStackRow = 64;
  size_t stack[3][kStackRow];
  std::vector<size_t> heap;
  size_t* rows[3] = {stack[0], stack[1], stack[2]};
  if (b.size() + 1 > kStackRow) {
    heap.resize(3 * (b.size() + 1));
    for (size_t r = 0; r < 3; ++r) rows[r] = heap.data() + r * (b.size() + 1);
  }
  size_t* before = rows[0];
  size_t* previous = rows[1];
  size_t* current = rows[2];
  for (size_t j = 0; j <= b.size(); ++j) previous[j] = j;
  for (size_t i = 1; i <= a.size(); ++i) {
    current[0] = i;
    size_t row_best = current[0];
    for (size_t j = 1; j <= b.size(); ++j) {
      const size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      size_t value = std::min({previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) value = std::min(value, before[j - 2] + 1);
      current[j] = value;
      row_best = std::min(row_best, value);
    }
    if (row_best > limit) return limit + 1;
    size_t* oldest = before;
    before = previous;
    previous = current;
    current = oldest;
  }
  return std::min(previous[b.size()], limit + 1);
}

size_t AllowedEdits(size_t length) {
  if (length < 6) return 0;
  if (length <= 8) return 1;
  return length <= 12 ? 2 : 3;
}

std::optional<size_t> CloseIngredient(const Formulary& formulary, std::string_view word) {
  const size_t allowed = AllowedEdits(word.size());
  if (allowed == 0) return std::nullopt;
  // The best distance of each ingredient within allowed + 1 (to see near rivals).
  std::vector<std::pair<size_t, size_t>> best;  // (ingredient, distance); a handful at most
  const auto& names = formulary.name_index().spelling_names;  // sorted: one range per first letter
  const auto first = std::lower_bound(names.begin(), names.end(), std::string(1, word.front()),
                                      [](const auto& entry, const std::string& key) { return entry.first < key; });
  for (auto entry = first; entry != names.end() && entry->first.front() == word.front(); ++entry) {
    const auto& [name, ingredient] = *entry;
    const size_t gap = name.size() > word.size() ? name.size() - word.size() : word.size() - name.size();
    if (gap > allowed + 1) continue;
    const size_t distance = EditDistance(word, name, allowed + 1);
    if (distance > allowed + 1) continue;
    const size_t id = ingredient;
    const auto seen = std::find_if(best.begin(), best.end(), [&](const auto& b) { return b.first == id; });
    if (seen == best.end()) best.emplace_back(ingredient, distance);
    else seen->second = std::min(seen->second, distance);
  }
  std::optional<size_t> chosen;
  size_t chosen_distance = allowed + 2;
  for (const auto& [ingredient, distance] : best) {
    if (distance < chosen_distance) {
      chosen = ingredient;
      chosen_distance = distance;
    }
  }
  if (!chosen || chosen_distance == 0 || chosen_distance > allowed) return std::nullopt;
  for (const auto& [ingredient, distance] : best) {
    if (ingredient != *chosen && distance <= chosen_distance + 1) return std::nullopt;  // a near rival
  }
  return chosen;
}

std::vector<std::string> NearestNames(const Formulary& formulary, std::string_view word, size_t limit) {
  if (word.size() < 4 || limit == 0) return {};
  const size_t allowed = std::max<size_t>(1, word.size() / 3);
  std::vector<std::pair<size_t, std::string>> found;
  auto consider = [&](const std::string& name) {
    const std::string key = NameKey(name);
    const size_t distance = EditDistance(word, key, allowed);
    if (distance <= allowed) found.emplace_back(distance, name);
  };
  for (const Ingredient& ingredient : formulary.ingredients()) {
    consider(ingredient.name);
    for (const std::string& synonym : ingredient.synonyms) consider(synonym);
  }
  for (const NamedProduct& brand : formulary.tables().brands) consider(brand.name);
  std::sort(found.begin(), found.end());
  std::vector<std::string> names;
  for (const auto& [distance, name] : found) {
    if (std::find(names.begin(), names.end(), name) == names.end()) names.push_back(name);
    if (names.size() == limit) break;
  }
  return names;
}

}  // namespace medload::formulary_internal
