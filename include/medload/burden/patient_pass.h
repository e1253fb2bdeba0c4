// The one ordered pass over every patient that review, cohort and report make. The calling
// thread reads the store and resolves products; a second thread builds timelines and runs
// the visitor, so reading and computing share the machine's two cores. Order is kept.
#pragma once

#include <functional>
#include <optional>
#include <span>
#include <vector>

#include "medload/burden/analysis.h"
#include "medload/core/status.h"
#include "medload/store/store.h"

namespace medload {

// One patient as the visitor sees it: the history, and its timeline built on first use.
class PassPatient {
 public:
  PassPatient(const PatientHistory& history, std::span<const ResolvedProduct* const> products,
              Analysis& analysis)
      : history_(history), products_(products), analysis_(analysis) {}

  const PatientHistory& history() const { return history_; }
  // The timeline of history().dispensings, built once on the first call.
  const Timeline& timeline();
  // The burden on `on` (age: completed years then, if known). Rule matches are worked out
  // once per patient, so a series of dates costs little more than one.
  Burden Evaluate(Date on, std::optional<int> age);

 private:
  const PatientHistory& history_;
  std::span<const ResolvedProduct* const> products_;  // products_[i] resolves dispensing i
  Analysis& analysis_;
  std::optional<Timeline> timeline_;
  std::optional<std::vector<bool>> matches_;  // MatchRuleRequirements of the timeline
};

// Returns false to stop the pass early.
using PassVisit = std::function<bool(PassPatient&)>;

// Calls `visit` for every patient of Store::ForEachPatient, in the same order, all on one
// thread (not the caller's), so `visit` may update state of its own without locks; that
// state is safe to read again when this returns. `analysis` must not be used by anyone
// else during the pass. Memory holds a bounded number of patients. Returns the store's
// error, if any; stopping early is Ok.
Status ForEachPatientTimeline(const Store& store, Analysis& analysis, const PassVisit& visit);

}  // namespace medload
