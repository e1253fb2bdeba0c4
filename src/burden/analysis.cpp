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
  analysis.cache_ = std::make_unique<ResolutionCache>(*analysis.formulary_);
  analysis.tables_ = TablesFromFormulary(*analysis.formulary_, options.scale);
  analysis.options_ = options;
  analysis.store_ = store;
  return analysis;
}

const ResolvedProduct& Analysis::Resolve(const DispensingRecord& record) {
  return cache_->Resolve(record.product, record.code, record.code_system);
}

Timeline Analysis::BuildTimeline(std::span<const DispensingRecord> records) {
  return medload::BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
    return Resolve(r);
  }, options_);
}

Burden Analysis::Evaluate(const Timeline& timeline, Date on, std::optional<int> age) const {
  return EvaluateBurden(timeline, on, tables_, options_, age);
}

size_t Analysis::resolved_products() const { return cache_->size(); }

std::optional<int> AgeOn(const std::optional<PatientRecord>& registry, Date on) {
  if (!registry || !registry->birth_date) return std::nullopt;
  return CompletedYears(*registry->birth_date, on);
}

}  // namespace medload
