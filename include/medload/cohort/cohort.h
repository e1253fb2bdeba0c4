// Practice cohort counts: in one ordered pass over the store, for every census date, how
// many registered patients each group has and how many of them meet each criterion (and
// any), kept as exact integers per ESP 2013 age band so that shard results add up and
// rates can be standardised. It does not format anything (cohort_writer.h does).
#pragma once

#include <array>
#include <functional>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "medload/burden/burden.h"
#include "medload/burden/criteria.h"
#include "medload/cohort/groups.h"
#include "medload/cohort/shard.h"
#include "medload/cohort/standard_population.h"
#include "medload/core/status.h"
#include "medload/store/store.h"

namespace medload {

class Analysis;

struct CohortOptions {
  std::vector<Date> dates;               // census dates, oldest first (series.h)
  GroupBy group_by = GroupBy::kPractice; // --by (default practice)
  std::vector<Criterion> criteria;       // one count each, plus "any"
  ShardSpec shard;                       // --shard K/N (default 1/1: every patient)
};

// The integer counts of one group on one census date.
struct CohortCell {
  long registered = 0;               // patients registered in the group that day
  std::vector<long> counts;          // per criterion, then "any"
  // The same split by ESP 2013 band, for patients whose age is known (standardisation).
  std::array<long, kEspBands> registered_by_band{};
  std::vector<std::array<long, kEspBands>> counts_by_band;  // per criterion, then "any"
};

// Everything a cohort run counted; exact, so tallies of disjoint shards add up.
struct CohortTally {
  std::vector<std::string> criteria;  // criterion keys, in option order ("any" not included)
  std::vector<Date> dates;
  GroupBy group_by = GroupBy::kPractice;
  std::string measure;                // the measure options in words (merges must agree)
  uint32_t shard_count = 1;           // N of the shards this tally is made of
  std::set<uint32_t> shards;          // which of the N shards it covers
  long patients = 0;                  // patients in these shards, registered or not
  std::map<std::string, std::vector<CohortCell>> groups;  // group -> one cell per date
  // The latest counting dispensing in the store RunCohort read (every patient, whatever
  // the shard), for the census-date warning. Not saved with the tally nor merged.
  std::optional<Date> latest_dispensed;
  // Patients whose oldest dispensings the pass left out (PassFacts::capped_patients). Not
  // saved with the tally nor merged.
  long capped_patients = 0;
  size_t history_bound = 0;  // PassFacts::history_bound

  // True when every one of the N shards is covered.
  bool complete() const { return shards.size() == shard_count; }
};

// Calls back for a patient's burden on a date, given their completed age that day.
using BurdenOnDate = std::function<Burden(Date on, std::optional<int> age)>;

// Adds patients one at a time; memory holds the tally only (groups x dates), never
// patients.
class CohortCounter {
 public:
  // `networks`: practice code -> network (for --by network). `measure`: as in CohortTally.
  CohortCounter(const CohortOptions& options, std::map<std::string, std::string> networks,
                std::string measure);

  // True when the patient belongs to the counter's shard.
  bool Wants(const PatientHistory& history) const;
  // Counts the patient on every census date on which they are registered (registration.h),
  // calling `burden` once for each such date and never for others. Patients outside the
  // shard are ignored.
  void Add(const PatientHistory& history, const BurdenOnDate& burden);

  const CohortTally& tally() const { return tally_; }
  CohortTally Take() { return std::move(tally_); }

 private:
  CohortCell& CellOf(const std::string& group, size_t date_index);

  CohortOptions options_;
  std::map<std::string, std::string> networks_;
  CohortTally tally_;
};

// One pass over the store (Store::ForEachPatient): each patient of the shard has their
// timeline built once and evaluated on every census date on which they are registered.
// Fails with the store's Status.
Result<CohortTally> RunCohort(const Store& store, Analysis& analysis,
                              const CohortOptions& options);

// Adds tallies of disjoint shards of the same run. Fails with Input (naming `names[i]`)
// when criteria, dates, grouping, measure or shard count differ, or a shard is given twice.
// REQUIRES: names.size() == tallies.size(), at least one tally.
Result<CohortTally> MergeTallies(const std::vector<CohortTally>& tallies,
                                 const std::vector<std::string>& names);

// The measure options in words, for CohortTally::measure.
std::string DescribeMeasure(const MeasureOptions& options);

}  // namespace medload
