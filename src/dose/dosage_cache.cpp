#include "medload/dose/dosage_cache.h"

namespace medload {

const DosageReading& DosageTextCache::Read(std::string_view text) {
  if (auto found = readings_.find(text); found != readings_.end()) return found->second;
  if (readings_.size() >= capacity_) readings_.clear();
  return readings_.emplace(std::string(text), ReadDosageText(text)).first->second;
}

const PackContent& DosageTextCache::Pack(std::string_view description, std::string_view form,
                                         size_t ingredient_count) {
  if (auto found = packs_.find(description); found != packs_.end()) return found->second;
  if (packs_.size() >= capacity_) packs_.clear();
  return packs_.emplace(std::string(description), SupplyPackContent(description, form, ingredient_count)).first->second;
}

}  // namespace medload
