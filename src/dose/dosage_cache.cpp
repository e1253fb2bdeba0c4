#include "medload/dose/dosage_cache.h"

namespace medload {

const DosageReading& DosageTextCache::Read(std::string_view text) {
  if (auto found = readings_.find(text); found != readings_.end()) return found->second;
  if (readings_.size() >= capacity_) readings_.clear();
  return readings_.emplace(std::string(text), ReadDosageText(text)).first->second;
}

}  // namespace medload
