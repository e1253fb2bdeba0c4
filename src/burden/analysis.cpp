#include "medload/burden/analysis.h"

#include "medload/formulary/resolver.h"
#include "medload/store/store.h"

namespace medload {

Analysis::Analysis(Analysis&&) noexcept = default;
Analysis& Analysis::operator=(Analysis&&) noexcept = default;
Analysis::~Analysis() = default;

Result<Analysis> Analysis::Open(const std::string& formulary_dir, const MeasureOptions& options,
                                Store* store) {
  auto formulary = LoadFormulary(formulary_dir);
  if (!formulary.ok()) return formulary.status();
  if (!formulary->HasScale(options.scale)) {
    std::string known;
    for (const auto& name : formulary->ScaleNames()) known += (known.empty() ? "" : ", ") + name;
    return Status::Usage("--scale \"" + options.scale + "\" is not a scale in " + formulary_dir +
                         "/anticholinergic/ (known: " + known + ")");
  }
  Analysis analysis;
  analysis.formulary_ = std::make_unique<Formulary>(std::move(formulary).value());
  analysis.tables_ = TablesFromFormulary(*analysis.formulary_, options.scale);
  analysis.options_ = options;
  analysis.store_ = store;
  return analysis;
}

void ProductKeyOf(const DispensingRecord& record, std::string& into) {
  into.assign(record.product).append(1, '\x1f').append(record.code).append(1, '\x1f').append(record.code_system);
}

const ResolvedProduct& Analysis::Resolve(const DispensingRecord& record) {
  std::string& key = key_scratch_;
  ProductKeyOf(record, key);
  if (auto it = resolved_.find(key); it != resolved_.end()) return it->second;
  const std::string checksum = ResolutionKey();
  if (store_ != nullptr) {
    auto saved = store_->CachedResolution(record.product, record.code, record.code_system, checksum);
    if (saved.ok() && saved->has_value()) {
      if (auto parsed = ParseResolution(**saved); parsed.ok()) {
        return resolved_.emplace(key, std::move(parsed).value()).first->second;
      }
    }
  }
  ResolvedProduct product = medload::Resolve(*formulary_, record.product, record.code, record.code_system);
  const ResolvedProduct& resolved = resolved_.emplace(key, std::move(product)).first->second;
  if (store_ != nullptr) {
    unsaved_.push_back({record.product, record.code, record.code_system, &resolved});
    SaveResolutions();  // now, unless a snapshot is open
  }
  return resolved;
}

void Analysis::SaveResolutions() {
  if (store_ == nullptr || store_->InSnapshot()) return;
  const std::string checksum = ResolutionKey();
  for (const Unsaved& entry : unsaved_) {
    // Best effort: a store that cannot be written (read-only file) only loses the cache.
    const Status saved = store_->SaveResolution(entry.product, entry.code, entry.code_system, checksum,
                                                SerialiseResolution(*entry.resolution));
    static_cast<void>(saved);
  }
  unsaved_.clear();
}

std::string Analysis::ResolutionKey() const {
  return formulary_->checksum() + " medload " MEDLOAD_VERSION " resolver " + std::to_string(kResolverVersion);
}

Timeline Analysis::BuildTimeline(std::span<const DispensingRecord> records) {
  return medload::BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
    return Resolve(r);
  }, options_, &dosages_);
}

Timeline Analysis::BuildTimeline(std::span<const DispensingRecord> records,
                                 std::span<const ResolvedProduct* const> products,
                                 DosageTextCache& dosages) const {
  return medload::BuildTimeline(records, [&](const DispensingRecord& r) -> const ResolvedProduct& {
    return *products[static_cast<size_t>(&r - records.data())];
  }, options_, &dosages);
}

Burden Analysis::Evaluate(const Timeline& timeline, Date on, std::optional<int> age,
                          const std::vector<bool>* matches) const {
  return EvaluateBurden(timeline, on, tables_, options_, age, matches);
}

size_t Analysis::resolved_products() const { return resolved_.size(); }

std::optional<int> AgeOn(const std::optional<PatientRecord>& registry, Date on) {
  if (!registry || !registry->birth_date) return std::nullopt;
  return CompletedYears(*registry->birth_date, on);
}

}  // namespace medload
