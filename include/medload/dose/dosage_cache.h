// Remembers how each distinct dosage text, and each product description's pack content,
// was read, so that a run reading millions of dispensings reads each text once. It bounds
// its size; it does not know records.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <unordered_map>

#include "medload/dose/dosage_text.h"
#include "medload/dose/pack_content.h"

namespace medload {

class DosageTextCache {
 public:
  // Holds at most `capacity` texts; when full it starts again empty (the readings are
  // pure, so forgetting one only costs a re-read).
  explicit DosageTextCache(size_t capacity = 200'000) : capacity_(capacity) {}

  // ReadDosageText(text), computed once per distinct text while it stays cached. The
  // reference is valid until the next call.
  const DosageReading& Read(std::string_view text);

  // SupplyPackContent(description, form, ingredient_count), computed once per distinct
  // description while it stays cached (within one run a description always resolves to
  // the same form and ingredients). The reference is valid until the next call of Pack.
  const PackContent& Pack(std::string_view description, std::string_view form, size_t ingredient_count);

  size_t size() const { return readings_.size(); }

 private:
  struct Hash {
    using is_transparent = void;
    size_t operator()(std::string_view text) const { return std::hash<std::string_view>{}(text); }
  };
  size_t capacity_;
  std::unordered_map<std::string, DosageReading, Hash, std::equal_to<>> readings_;
  std::unordered_map<std::string, PackContent, Hash, std::equal_to<>> packs_;
};

}  // namespace medload
