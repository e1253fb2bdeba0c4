// The review worklist: patients who meet any selection criterion on a census date,
// ranked by the fixed order (requested criteria met, ACB, items, DBI, age, identifier), each with
// readable reasons. It streams the store once; it does not write any output format.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "medload/burden/run_context.h"
#include "medload/burden/criteria.h"
#include "medload/burden/longitudinal_writer.h"
#include "medload/burden/trajectory.h"
#include "medload/core/data_coverage.h"
#include "medload/core/status.h"

namespace medload {

class Store;

struct WorklistOptions {
  Date on;                                   // --on: the census date
  std::vector<Criterion> criteria;           // --at-least / --rule: a patient meets any
  std::vector<std::string> practices;        // --practice CODE (repeatable); empty = all
  std::optional<int> age_min;                // --age-min N: only patients aged N or more
  std::optional<int> reviewed_within_days;   // --reviewed-within DAYS: exclude recent reviews
  std::optional<size_t> limit;               // --limit N: the first N after ranking
  // Compare with the previous run of the same criteria and filters (marking patients new
  // on the list) and save this run in the store, before the limit is applied.
  bool remember_run = true;
};

struct WorklistEntry {
  int rank = 0;                   // 1-based, after sorting
  std::string patient;
  std::string practice;
  std::optional<int> age;
  int items = 0;
  int acb = 0;
  double dbi = 0;
  std::vector<std::string> rule_ids;      // rules fired (all, not only requested ones): information
  std::vector<std::string> criteria_met;  // keys of the requested criteria met: the first sort key
  std::vector<std::string> reasons;       // readable, for the pharmacist
  std::vector<std::string> warnings;      // unmatched products, unknown doses, ...
  bool is_new = false;                    // not on the previous run's list (same criteria)
  std::optional<Date> last_reviewed;      // latest completed review on or before the date
  // Longitudinal measures on the date (docs/measures.md), and the same figures 12 months
  // before with the medicines started and stopped since (FillLongitudinal).
  int falls = 0;
  double tsdd = 0;
  std::vector<AdherenceEntry> adherence;  // medicines and class groups with a PDC
  std::optional<Trajectory> trajectory;
};

// Fills the longitudinal fields of `entry` from the burden on the census date, and its
// trajectory from the burden 12 months before (REQUIRES: both evaluated on `timeline`).
// The reasons gain what stands out (falls-risk medicines, exposure, low PDCs).
void FillLongitudinal(WorklistEntry& entry, const Timeline& timeline, const Burden& now, const Burden& before,
                      DataState before_data);

struct Worklist {
  Date on;
  std::vector<Criterion> criteria;
  std::string scale;
  std::vector<WorklistEntry> patients;    // ranked
  long patients_considered = 0;           // registered on the date (after practice filter)
  long patients_meeting = 0;              // before --limit
  long excluded_recent_review = 0;
  // Registered (after the practice filter) but left out by --age-min because the age is
  // unknown; and how many of those would have met a criterion.
  long excluded_age_unknown = 0;
  long excluded_age_unknown_meeting = 0;
  // How the summary names the minimum age setting: "--age-min" in review, "age_min" in
  // the report (its config key).
  std::string age_min_setting = "--age-min";
  bool has_previous_run = false;          // "new" flags compare with an earlier run
  // The data coverage on the census date of each practice with patients registered that
  // day (after the practice filter), from the pass over every patient (data_coverage.h).
  std::map<std::string, DataState> practice_data;
  // Warnings about the whole list: BuildWorklist adds one per practice whose data are not
  // full on the date (DataStateNote); callers may add more. Every writer prints them.
  std::vector<std::string> notes;
  // The report's small-number threshold: when above 1, a meeting count from 1 to N-1 is
  // written "fewer than N" in the summary and notes (the rows still name the patients:
  // a worklist is a patient-level file). 0 in `review`.
  long suppress_below = 0;
};

// The fixed review order (docs/measures.md, "Review worklist"): more of the requested
// criteria met first (criteria_met: each --at-least and each --rule is one), then higher
// acb, more items, higher dbi, older age (unknown last), then patient id ascending. Rules
// fired that were not requested (rule_ids) do not change the order.
bool RanksBefore(const WorklistEntry& a, const WorklistEntry& b);

// The readable reasons of one patient: "11 medicines", "ACB 7: amitriptyline 3, ...",
// "DBI 1.25: ...", "rule: <title> (<medicines>)".
std::vector<std::string> ExplainBurden(const Timeline& timeline, const Burden& burden,
                                       const BurdenTables& tables);

// Fills a row's identity and figures (patient, practice, age, items, acb, dbi, the rules
// fired and the readable reasons) from the burden on the census date; the caller sets
// the criteria met, warnings and review facts.
void FillFigures(WorklistEntry& entry, const std::string& patient, const std::string& practice,
                 std::optional<int> age, const Timeline& timeline, const Burden& burden, const BurdenTables& tables);

// Completed review dates per patient, each patient's oldest first (Store::Reviews).
using ReviewDates = std::unordered_map<std::string, std::vector<Date>>;
Result<ReviewDates> ReadReviewDates(const Store& store);
// The latest of `reviews` on or before `on`; nullopt when there is none (a review after
// the census date is not known on it).
std::optional<Date> LastReviewOn(const std::vector<Date>& reviews, Date on);
// Whether a review falls in the `days` days ending on `on` (--reviewed-within).
bool ReviewedWithin(const std::vector<Date>& reviews, Date on, int days);

// Streams the store once and builds the ranked list. Status::Usage when no criterion is
// given; Status::Input for a rule id the tables do not have or a storage error.
Result<Worklist> BuildWorklist(Store& store, RunContext& analysis, const WorklistOptions& options);

// Marks `is_new` against the previous saved run (dated before this one) with the same
// criteria and filters, and saves this one (the store keeps runs; a re-run on the same
// date replaces it). Called by BuildWorklist when options.remember_run is set.
Status MarkNewAndSave(Store& store, const WorklistOptions& options, Worklist& worklist);

}  // namespace medload
