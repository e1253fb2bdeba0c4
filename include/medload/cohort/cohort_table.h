// The cohort counts made ready to show: one row per census date and group with counts,
// crude rates per 1000 and ESP 2013 standardised rates, after small-number suppression.
// It does no counting (cohort.h) and no formatting (cohort_writer.h).
#pragma once

#include <optional>
#include <set>
#include <string>
#include <vector>

#include "medload/cohort/cohort.h"

namespace medload {

// One criterion (or "any") in one row. Absent values are suppressed or undefined.
struct CohortValue {
  std::optional<long> count;        // null when suppressed
  std::optional<double> rate;       // per 1000 registered; null when suppressed or none registered
  std::optional<StandardisedRate> standardised;  // per 1000, ESP 2013; null likewise
};

struct CohortRow {
  Date date;
  std::string group;
  long registered = 0;
  long registered_known_age = 0;    // the population the standardised rate rests on
  std::vector<CohortValue> values;  // per key of CohortTable::keys; all null without data
  // The group's data coverage that day (data_coverage.h): kNoData when none of its
  // practices' data have begun (no figures: null, never 0); else kShortHistory when any of
  // those with figures is in its first days, kBeyondData when any is past its latest
  // dispensing, kFull otherwise.
  DataState data = DataState::kFull;
  // Practices of the group left out that day because their data had not begun (their
  // registered patients are not in `registered`). Always 0 for --by practice.
  long practices_without_data = 0;
};

struct CohortTable {
  std::vector<std::string> criteria;  // criterion keys
  std::vector<std::string> keys;      // criteria, then "any"
  std::vector<Date> dates;
  std::vector<std::string> groups;    // sorted
  GroupBy group_by = GroupBy::kPractice;
  std::string measure;
  std::string population;             // CohortTally::population ("" = every registered patient)
  long suppress_below = 0;
  int history_days = 84;              // the short-history window (DataStateOn)
  bool complete = true;               // false when a merge lacked some shards
  std::string shards;                 // e.g. "1/1", "3 of 4 shards"
  std::vector<CohortRow> rows;        // by date, then group
  // Warnings about the whole table set by the caller (e.g. census dates after the latest
  // dispensing loaded); every writer prints them.
  std::vector<std::string> notes;
};

// Builds the table from a tally: rows for every date and every group seen on any date,
// each with its data coverage on that date (`history_days`: the short-history window), and
// one note per practice whose coverage is not full on some date.
CohortTable BuildCohortTable(const CohortTally& tally, long suppress_below, int history_days);

// The notes on a set of practices' data coverage over `dates`: for each practice, the
// dates without figures, in its short-history window and beyond its data, in words.
std::vector<std::string> CoverageNotes(const PracticeSpans& spans, const std::set<std::string>& practices,
                                       const std::vector<Date>& dates, int history_days);

}  // namespace medload
