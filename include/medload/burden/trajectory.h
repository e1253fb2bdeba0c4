// One patient's measures on a census date beside the same measures 12 months before, and
// the medicines started and stopped in between, so that a reviewer sees the trajectory.
// Both burdens come from one timeline evaluated on two dates, so each figure uses only
// the records dispensed by its own date. It computes nothing new and writes no output.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "medload/burden/burden.h"
#include "medload/core/data_coverage.h"

namespace medload {

// How far back the trajectory looks.
inline constexpr int kTrajectoryMonths = 12;

// The figures compared.
struct BurdenFigures {
  int items = 0;
  int acb = 0;
  double dbi = 0;
  int falls = 0;
  double tsdd = 0;
};

BurdenFigures FiguresOf(const Burden& burden);

struct Trajectory {
  Date before_on;                        // the census date minus kTrajectoryMonths
  DataState before_data = DataState::kFull;  // the practice's data coverage then
  BurdenFigures now;
  std::optional<BurdenFigures> before;   // nullopt: no figures then (no data)
  // Medicine keys active on the census date and not on before_on, and the reverse; empty
  // when the earlier date cannot be compared (short history or no data).
  std::vector<std::string> started;
  std::vector<std::string> stopped;

  // Whether a change may be read from it (docs/measures.md, "Data coverage").
  bool Comparable() const { return before.has_value() && medload::Comparable(before_data); }
};

// The same calendar day `months` months earlier (the month's last day when it is shorter).
Date MonthsBefore(Date on, int months);

// Compares `now` and `before` (REQUIRES: both evaluated on `timeline`, `before` on
// MonthsBefore(now.on, kTrajectoryMonths)). `before_data` is the coverage on that date:
// without figures there, `before` is left empty; where not comparable, no medicine is
// listed as started or stopped.
Trajectory CompareBurdens(const Timeline& timeline, const Burden& now, const Burden& before,
                          DataState before_data);

// Applies a data coverage learnt after CompareBurdens (a pass learns each practice's
// coverage only at its end): the same clearing as CompareBurdens.
void MarkTrajectoryCoverage(Trajectory& trajectory, DataState before_data);

// "12 months before (2023-03-31): 8 medicines, ACB 4, DBI 0.5, falls-risk 1, TSDD 300;
// started: a, b; stopped: c", or a sentence saying why no change is shown. `scale` names
// the anticholinergic score ("ACB").
std::string TrajectoryText(const Trajectory& trajectory, const std::string& scale);

}  // namespace medload
