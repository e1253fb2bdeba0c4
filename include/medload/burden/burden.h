// What a patient's active medicines add up to on one census date: the count of
// medicines, the anticholinergic score, the Drug Burden Index with each contribution,
// and the combination rules that fire. Pure: a Timeline and tables in, a value out.
#pragma once

#include <optional>
#include <span>
#include <string>
#include <vector>

#include "medload/burden/longitudinal.h"
#include "medload/burden/measure_options.h"
#include "medload/burden/tables.h"
#include "medload/burden/timeline.h"
#include "medload/core/date.h"

namespace medload {

struct ActiveMedicine {
  size_t medicine = 0;     // index into Timeline::medicines
  Date since;              // episode start (lookback: first dispensing in the window)
  // The last day the supplies dispensed on or before D count, tail included (lookback:
  // end of the latest supply). Later dispensings may extend it; they never shorten it.
  Date until;
  Date supply_end;         // the last day those supplies cover, without the tail
  bool in_tail = false;    // D is after every supply ran out: only a tail covers it
  size_t latest_use = 0;   // index into Medicine::uses: the latest dispensing on or before D
  int score = 0;           // scale points attributed to this medicine (each ingredient once)
  double dbi = 0;          // DBI attributed to this medicine
  // The routes of its dispensings in force on D (the latest one's always): what the
  // scales, the DBI and the rules judge it by (spec section 5, "Routes").
  RouteSet routes = {};
};

struct ScoreContribution {
  std::string ingredient;
  int score = 0;
};

// How the daily dose of an ingredient was worked out for the Drug Burden Index.
enum class DoseBasis {
  kRateStrength,   // a rate strength (patch per hour / per 24 hours)
  kDosage,         // strength x units per day from the dosage instruction
  kQuantity,       // strength x quantity / days of supply
  kPatchRelease,   // a patch's labelled release rate (unit_doses.csv), not its content
  kDepotInterval,  // a depot's strength per ampoule or syringe / its labelled interval
};

// One product's daily dose within an ingredient's DBI dose.
struct DoseSource {
  size_t medicine = 0;          // index into Timeline::medicines
  size_t use = 0;               // index into Medicine::uses: the product's latest dispensing
  double dose_mg_per_day = 0;
  DoseBasis basis = DoseBasis::kDosage;
  bool as_needed_max = false;   // the units per day are an as-needed instruction's maximum
  bool range_upper = false;     // the units per day take the upper value of a range ("1-2")
  bool staged = false;          // a changing dose: the units per day of the stage in force on D
  bool supply_assumed = false;  // the days of supply came from a default, not the record
};

struct DbiContribution {
  std::string ingredient;
  double dose_mg_per_day = 0;  // the sum over `sources`
  double min_daily_dose_mg = 0;
  double value = 0;            // dose / (dose + delta)
  DoseBasis basis = DoseBasis::kDosage;  // of the most recently dispensed product
  bool supply_assumed = false; // some source's days of supply came from a default
  bool as_needed_max = false;  // some source's dose is an as-needed maximum
  bool range_upper = false;    // some source's dose is the upper value of a range
  bool staged = false;         // some source's dose is a changing dose's stage on D
  // The products taken together: the most recently dispensed first, then every other
  // active product of the ingredient dispensed again since that product's run began.
  std::vector<DoseSource> sources;
};

struct FiredRule {
  const Rule* rule = nullptr;
  // Indexes into Timeline::medicines holding an ingredient that met a requirement.
  std::vector<size_t> medicines;
};

struct Burden {
  Date on;
  int items = 0;
  int acb = 0;                    // on tables.scale
  double dbi = 0;
  std::vector<ActiveMedicine> active;  // sorted by medicine key
  std::vector<ScoreContribution> score_contributions;  // ingredients scoring > 0, highest first
  std::vector<DbiContribution> dbi_contributions;      // by ingredient
  // DBI ingredients whose contribution is unknown: no known dose, or (also listed in
  // dbi_no_minimum) in a class the DBI counts but without a minimum dose in the table.
  std::vector<std::string> dbi_incomplete;
  std::vector<std::string> dbi_no_minimum;
  std::vector<FiredRule> rules;             // in table order
  // A rule with a minimum age would have fired but the age is not known, so it was not
  // judged (outputs say so).
  bool age_unknown_for_rules = false;
  LongitudinalMeasures longitudinal;  // falls, tsdd, adherence (longitudinal.h)
};

std::string_view DoseBasisName(DoseBasis basis);

// What a reader must know about how a DBI dose was reached, as a bracketed phrase to
// append (" (as-needed maximum)", " (upper value of a range)", " (2 products summed)"),
// or "" when nothing needs saying.
std::string DoseBasisMark(const DbiContribution& contribution);

// Which medicines may meet which rule requirements: one flag per medicine of `timeline`
// and requirement of `tables.rules` (rules in order; each rule's `require`, then its
// `forbid`), medicine-major; a flag is set when some ingredient of the medicine matches.
// It does not depend on a date (nor on routes), so every date of a series can share it.
std::vector<bool> MatchRuleRequirements(const Timeline& timeline, const BurdenTables& tables);

// The rules that did not fire on `burden`'s date only because of a route: each would
// fire if every route counted (same age test), with the medicines it would involve.
// For explanations (`meds`); `burden` must come from EvaluateBurden on `timeline`.
std::vector<FiredRule> RulesLeftOutByRoute(const Timeline& timeline, const Burden& burden,
                                           const BurdenTables& tables, std::optional<int> age);

// Evaluates the timeline on `on`. `age` is the completed age on that date, if known.
// `matches`, if given, must be MatchRuleRequirements(timeline, tables); without it the
// matches are worked out for the medicines active on `on`.
Burden EvaluateBurden(const Timeline& timeline, Date on, const BurdenTables& tables,
                      const MeasureOptions& options, std::optional<int> age,
                      const std::vector<bool>* matches = nullptr);

}  // namespace medload
