// The run context: what one command's run needs to turn patients' records into burden:
// the formulary, its tables flattened for the chosen scale, the measure options, and
// product resolutions cached per run and in the store (keyed by the formulary checksum
// and the medload version, so a changed table or an upgrade re-resolves).
#pragma once

#include <memory>
#include <optional>
#include <span>
#include <string>
#include <unordered_map>
#include <vector>

#include "medload/burden/burden.h"
#include "medload/burden/measure_options.h"
#include "medload/core/status.h"
#include "medload/dose/dosage_cache.h"
#include "medload/formulary/formulary.h"

namespace medload {

class Store;

class RunContext {
 public:
  // Loads the formulary in `formulary_dir` and checks that `options.scale` is one of its
  // scales. `store` (may be null) remembers resolutions; it must outlive the RunContext.
  // Status::Input for a bad formulary; Status::Usage for an unknown scale, whose message
  // starts with the setting's name: `scale "NAME" is not a scale in DIR/anticholinergic/
  // (known: ...)` (a caller may say where the setting came from).
  static Result<RunContext> Open(const std::string& formulary_dir, const MeasureOptions& options,
                                 Store* store);

  RunContext(RunContext&&) noexcept;
  RunContext& operator=(RunContext&&) noexcept;
  ~RunContext();

  // The resolution of a record's product, resolved once per run: from this run's cache,
  // else from the store's saved resolutions under ResolutionKey(), else by the
  // resolver (then saved in the store, best effort: a read-only store still resolves).
  // The reference stays valid for the RunContext's lifetime.
  const ResolvedProduct& Resolve(const DispensingRecord& record);
  // The key saved resolutions are kept under: the formulary checksum, this medload's
  // version and kResolverVersion, so that a changed table or a changed resolver resolves
  // again.
  std::string ResolutionKey() const;
  // Saves in the store the resolutions made while it was inside a snapshot (which cannot
  // be written); does nothing while it still is. Best effort, like every save of the
  // cache: a store that cannot be written only loses the cache.
  void SaveResolutions();
  Timeline BuildTimeline(std::span<const DispensingRecord> records);
  // The same, with each record's product already resolved (products[i] for records[i])
  // and the caller's dosage-text cache: reads only the options, so several threads may
  // call it at once (each with its own cache) while another Resolves.
  Timeline BuildTimeline(std::span<const DispensingRecord> records,
                         std::span<const ResolvedProduct* const> products,
                         DosageTextCache& dosages) const;
  // `matches`: MatchRuleRequirements(timeline, tables()), or null (see EvaluateBurden).
  Burden Evaluate(const Timeline& timeline, Date on, std::optional<int> age,
                  const std::vector<bool>* matches = nullptr) const;

  const Formulary& formulary() const { return *formulary_; }
  const BurdenTables& tables() const { return tables_; }
  const MeasureOptions& options() const { return options_; }
  // Distinct products resolved in this run.
  size_t resolved_products() const;

 private:
  RunContext() = default;
  std::unique_ptr<Formulary> formulary_;
  // Keyed by product, code and code system; node-based, so references stay valid.
  std::unordered_map<std::string, ResolvedProduct> resolved_;
  std::string key_scratch_;  // Resolve's lookup key, reused to save an allocation per call
  DosageTextCache dosages_;  // each distinct dosage text read once per run
  struct Unsaved {
    std::string product, code, code_system;
    const ResolvedProduct* resolution;
  };
  std::vector<Unsaved> unsaved_;  // resolved, not yet saved (a snapshot was open)
  BurdenTables tables_;
  MeasureOptions options_;
  Store* store_ = nullptr;
};

// The key a record's product is resolved under within a run: product, code and code
// system (RunContext::Resolve's cache, and the pass's per-reader maps in front of it).
void ProductKeyOf(const DispensingRecord& record, std::string& into);

}  // namespace medload
