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
#include "medload/core/shard.h"
#include "medload/cohort/standard_population.h"
#include "medload/core/data_coverage.h"
#include "medload/core/status.h"
#include "medload/store/store.h"

namespace medload {

class RunContext;

struct CohortOptions {
  std::vector<Date> dates;               // census dates, oldest first (series.h)
  GroupBy group_by = GroupBy::kPractice; // --by (default practice)
  std::vector<Criterion> criteria;       // one count each, plus "any"
  ShardSpec shard;                       // --shard K/N (default 1/1: every patient)
  // --practice CODE (repeatable): count only patients registered at one of these on each
  // date; empty = every practice.
  std::vector<std::string> practices;
  // A report config's "age_min": count only patients aged at least N on each date (an
  // unknown age is left out); nullopt = every age.
  std::optional<int> age_min;
};

// The patients a cohort with these options counts, in words ("" for every registered
// patient): "registered at WV001, WV002; aged 65 or more". Merged shards must agree.
std::string DescribePopulation(const CohortOptions& options);

// The integer counts of one group on one census date.
struct CohortCell {
  long registered = 0;               // patients registered in the group that day
  std::vector<long> counts;          // per criterion, then "any"
  // The same split by ESP 2013 band, for patients whose age is known (standardisation).
  std::array<long, kEspBands> registered_by_band{};
  std::vector<std::array<long, kEspBands>> counts_by_band;  // per criterion, then "any"
};

// Adds `from`'s counts into `into` (the same date and criteria; counts beyond the shorter
// of the two lists are left as they are).
void AddCell(CohortCell& into, const CohortCell& from);
// Patients counted as registered on a date who had no dispensing on or before it: what a
// practice whose data have not begun adds to a group that also holds other practices.
struct UnseenCell {
  long registered = 0;
  std::array<long, kEspBands> registered_by_band{};
};

// Everything a cohort run counted; exact, so tallies of disjoint shards add up.
struct CohortTally {
  std::vector<std::string> criteria;  // criterion keys, in option order ("any" not included)
  std::vector<Date> dates;
  GroupBy group_by = GroupBy::kPractice;
  std::string measure;                // the measure options in words (merges must agree)
  std::string population;             // DescribePopulation (merges must agree)
  uint32_t shard_count = 1;           // N of the shards this tally is made of
  std::set<uint32_t> shards;          // which of the N shards it covers
  long patients = 0;                  // patients in these shards, registered or not
  std::map<std::string, std::vector<CohortCell>> groups;  // group -> one cell per date
  // Data coverage: each practice's first and latest counting dispensing among every
  // patient read, whatever the shard (PracticeOfDispensing); merged by widening.
  PracticeSpans spans;
  // The practices whose registered patients each group holds (registered practice codes,
  // "" when not known), to judge a group's coverage on a date.
  std::map<std::string, std::set<std::string>> practices;
  // group -> practice -> per date: patients without any dispensing by then (UnseenCell),
  // kept only for practices whose data may begin after the first census date, so that a
  // group leaves out the practices without figures on a date.
  std::map<std::string, std::map<std::string, std::vector<UnseenCell>>> unseen;
  // Patients whose oldest dispensings the pass left out (PassFacts::capped_patients), among
  // every patient read whatever the shard, and the bound. Not saved with the tally nor
  // merged: the run that reads the store warns of them.
  long capped_patients = 0;
  size_t history_bound = 0;

  // True when every one of the N shards is covered.
  bool complete() const { return shards.size() == shard_count; }
};

// What a counter counted on one census date, taken out (CohortCounter::FiguresOn) to be
// put back in a later run over the same data (CohortCounter::PutFigures).
struct DateFigures {
  std::map<std::string, CohortCell> cells;                       // group -> its cell
  std::map<std::string, std::set<std::string>> practices;        // group -> practices seen
  std::map<std::string, std::map<std::string, UnseenCell>> unseen;  // group -> practice -> cell
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

  // Notes the patient's dispensings in the data coverage; call for EVERY patient read,
  // in or out of the shard, before Add.
  void See(const PatientHistory& history);
  // Widens the data coverage with spans of dispensings the store does not hold (the
  // rows a shard store's imports left to other shards: SeeOtherShards).
  void SeeCoverage(const PracticeSpans& spans);
  // True when the patient belongs to the counter's shard.
  bool Wants(const PatientHistory& history) const;
  // Counts the patient on every census date on which they are registered (burden/patient_facts.h),
  // calling `burden` once for each such date and never for others. Patients outside the
  // shard are ignored.
  void Add(const PatientHistory& history, const BurdenOnDate& burden);

  // Census dates (by index) whose figures come from elsewhere: Add leaves them alone
  // and never evaluates a patient on them. Call before the first Add.
  void SkipDates(std::vector<bool> skipped);
  // The figures counted on date `index` so far (a date Add did not skip).
  DateFigures FiguresOn(size_t index) const;
  // Puts figures in for date `index` (one SkipDates skipped), before Take.
  void PutFigures(size_t index, const DateFigures& figures);

  const CohortTally& tally() const { return tally_; }
  // The tally, with the unseen cells of practices that turned out to have data on every
  // census date dropped.
  CohortTally Take();

 private:
  CohortCell& CellOf(const std::string& group, size_t date_index);
  // Whether the practice's data are known to begin on or before the first census date.
  bool Settled(const std::string& practice) const;
  // Whether patients registered at `practice` are counted (CohortOptions::practices).
  bool Counts(const std::string& practice) const;

  CohortOptions options_;
  std::vector<bool> skipped_;  // by date index; empty: none
  // date index -> group -> practices, for FiguresOn (the tally keeps them for every date)
  std::vector<std::map<std::string, std::set<std::string>>> practices_on_;
  std::map<std::string, std::string> networks_;
  CohortTally tally_;
};

// Gives `counter` the coverage of the dispensings that `store`'s imports left to other
// shards (Store::OtherShardCoverage, rows naming a practice), so that a shard store's
// tally knows the network's coverage. Fails with the store's Status.
Status SeeOtherShards(const Store& store, CohortCounter& counter);

// One pass over the store (ForEachPatientTimeline): each patient of the shard has their
// timeline built once and evaluated on every census date on which they are registered.
// Fails with the store's Status.
Result<CohortTally> RunCohort(const Store& store, RunContext& analysis,
                              const CohortOptions& options);

// Adds tallies of disjoint shards of the same run; unseen cells of practices whose merged
// coverage begins by the first date are dropped (as Take does). Fails with Input (naming `names[i]`)
// when criteria, dates, grouping, measure or shard count differ, or a shard is given twice.
// REQUIRES: names.size() == tallies.size(), at least one tally.
Result<CohortTally> MergeTallies(const std::vector<CohortTally>& tallies,
                                 const std::vector<std::string>& names);

// The measure options in words, for CohortTally::measure.
std::string DescribeMeasure(const MeasureOptions& options);

}  // namespace medload
