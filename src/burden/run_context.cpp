#include "medload/burden/run_context.h"

#include "medload/core/text.h"
#include "medload/formulary/resolver.h"
#include "medload/store/store.h"

namespace medload {

RunContext::RunContext(RunContext&&) noexcept = default;
RunContext& RunContext::operator=(RunContext&&) noexcept = default;
RunContext::~RunContext() = default;

Result<RunContext> RunContext::Open(const std::string& formulary_dir, const MeasureOptions& options,
                                    Store* store) {
  auto formulary = LoadFormulary(formulary_dir);
  if (!formulary.ok()) return formulary.status();
  if (!formulary->HasScale(options.scale)) {
    return Status::Usage("scale \"" + options.scale + "\" is not a scale in " + formulary_dir +
                         "/anticholinergic/ (known: " + Join(formulary->ScaleNames(), ", ") + ")");
  }
  RunContext analysis;
  analysis.formulary_ = std::make_unique<Formulary>(std::move(formulary).value());
  analysis.tables_ = TablesFromFormulary(*analysis.formulary_, options.scale);
  analysis.options_ = options;
  analysis.store_ = store;
  return analysis;
}

void ProductKeyOf(const DispensingRecord& record, std::string& into) {
  into.assign(record.product).append(1, '\x1f').append(record.code).append(1, '\x1f').append(record.code_system);
}

const ResolvedProduct& RunContext::Resolve(const DispensingRecord& record) {
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

void RunContext::SaveResolutions() {
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

std::string RunContext::ResolutionKey() const {
  return formulary_->checksum() + " medload " MEDLOAD_VERSION " resolver " + std::to_string(kResolverVersion);
}

Timeline RunContext::BuildTimeline(std::span<const DispensingRecord> records) {
  return medload::BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
    return Resolve(r);
  }, options_, &dosages_);
}

Timeline RunContext::BuildTimeline(std::span<const DispensingRecord> records,
                                 std::span<const ResolvedProduct* const> products,
                                 DosageTextCache& dosages) const {
  return medload::BuildTimeline(records, [&](const DispensingRecord& r) -> const ResolvedProduct& {
    return *products[static_cast<size_t>(&r - records.data())];
  }, options_, &dosages);
}

Burden RunContext::Evaluate(const Timeline& timeline, Date on, std::optional<int> age,
                          const std::vector<bool>* matches) const {
  return EvaluateBurden(timeline, on, tables_, options_, age, matches);
}

size_t RunContext::resolved_products() const { return resolved_.size(); }

}  // namespace medload
