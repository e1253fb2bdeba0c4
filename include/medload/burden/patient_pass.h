// The one ordered pass over every patient that review, cohort and report make. Reader
// threads (two, each on its own connection to one snapshot, taking every other range of
// patients) read the store, resolve products and build each patient's timeline; the
// calling thread runs the visitor, in patient order, so the work shares the machine's cores.
#pragma once

#include <functional>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "medload/burden/run_context.h"
#include "medload/core/data_coverage.h"
#include "medload/core/status.h"
#include "medload/store/store.h"

namespace medload {

// One patient as the visitor sees it: the history, its timeline and the rule matches of
// the timeline (MatchRuleRequirements), which the pass's readers have built.
class PassPatient {
 public:
  PassPatient(const PatientHistory& history, const Timeline& timeline,
              const std::vector<bool>& matches, const RunContext& analysis)
      : history_(history), timeline_(timeline), matches_(matches), analysis_(analysis) {}

  const PatientHistory& history() const { return history_; }
  // The timeline of history().dispensings.
  const Timeline& timeline() const { return timeline_; }
  // The burden on `on` (age: completed years then, if known). Rule matches were worked
  // out once per patient, so a series of dates costs little more than one.
  Burden Evaluate(Date on, std::optional<int> age) const;

 private:
  const PatientHistory& history_;
  const Timeline& timeline_;
  const std::vector<bool>& matches_;
  const RunContext& analysis_;
};

// What the pass saw besides what it showed the visitor.
struct PassFacts {
  // The latest counting dispensing among the patients read (every patient, unless the
  // visitor stopped the pass early), without a walk of the table.
  std::optional<Date> latest_dispensed;
  // Each practice's first and latest counting dispensing among them (data coverage). A
  // dispensing belongs to the practice it names, else to the patient's registry practice,
  // else to "" (PracticeOfDispensing). A history cut by the store's bound adds only the
  // dispensings it kept. In a shard's store, both also take in the dispensings its
  // imports left to other shards (Store::OtherShardCoverage; spans: those naming a
  // practice), so that they are the network's.
  PracticeSpans practice_spans;
  // Patients whose oldest dispensings were left out (PatientHistory::dropped > 0), among
  // every patient read, and the bound that cut them (Store::history_bound).
  long capped_patients = 0;
  size_t history_bound = kMaxDispensingsPerPatient;
};

// The note outputs carry when `patients` histories were cut to their latest `bound`
// dispensings; nullopt when none were.
std::optional<std::string> CappedHistoriesNote(long patients, size_t bound);

// The practice whose data a dispensing is part of: the one it names, else the patient's
// registry practice, else "".
const std::string& PracticeOfDispensing(const DispensingRecord& record,
                                        const std::optional<PatientRecord>& registry);

// Adds every dispensing of `history` to `spans` (PracticeOfDispensing).
void AddHistoryToSpans(const PatientHistory& history, PracticeSpans& spans);

// Returns false to stop the pass early.
using PassVisit = std::function<bool(PassPatient&)>;

// Calls `visit` for every patient of Store::Patients, in the same order, all on the
// calling thread, so `visit` may update state of its own without locks. `analysis` must
// not be used by anyone else during the pass. The pass reads one snapshot: the caller's
// if one is open on `store`, else its own; resolutions made inside it are saved in the
// store afterwards (RunContext::SaveResolutions) when no snapshot of the caller's is open.
// Memory holds a bounded number of patients. Returns the store's error, if any; stopping
// early is Ok. A store in memory, or one an import has just committed to, is read on
// its own connection by one reader thread. `facts` (may be null) is filled on success.
Status ForEachPatientTimeline(const Store& store, RunContext& analysis, const PassVisit& visit,
                              PassFacts* facts = nullptr);

}  // namespace medload
