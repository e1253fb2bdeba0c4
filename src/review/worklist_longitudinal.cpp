// The worklist's longitudinal fields (declared in worklist.h): kept apart from the ranking
// and the pass so that each row's falls, tsdd, adherence and trajectory come from one place
// for both the review command and the report's per-practice lists.
#include "medload/review/worklist.h"

namespace medload {

void FillLongitudinal(WorklistEntry& entry, const Timeline& timeline, const Burden& now, const Burden& before,
                      DataState before_data) {
  const LongitudinalMeasures& measures = now.longitudinal;
  entry.falls = measures.falls;
  entry.tsdd = measures.tsdd;
  entry.adherence = AdherenceEntries(timeline, now);
  for (std::string& reason : LongitudinalReasons(timeline, now)) entry.reasons.push_back(std::move(reason));
  for (std::string& warning : LongitudinalWarnings(measures)) entry.warnings.push_back(std::move(warning));
  entry.trajectory = CompareBurdens(timeline, now, before, before_data);
}

}  // namespace medload
