#include "medload/burden/trajectory.h"

#include <algorithm>
#include <set>

#include "medload/core/text.h"
#include "medload/format/output.h"

namespace medload {

BurdenFigures FiguresOf(const Burden& burden) {
  return {burden.items, burden.acb, burden.dbi, burden.longitudinal.falls, burden.longitudinal.tsdd};
}

Date MonthsBefore(Date on, int months) {
  int year = on.year();
  int month = on.month() - months;
  while (month < 1) {
    month += 12;
    --year;
  }
  const Date first = Date::FromCivil(year, month, 1);
  return std::min(Date::FromCivil(year, month, 1) + (on.day() - 1), EndOfMonth(first));
}

namespace {

std::set<std::string> ActiveKeys(const Timeline& timeline, const Burden& burden) {
  std::set<std::string> keys;
  for (const ActiveMedicine& active : burden.active) keys.insert(timeline.medicines[active.medicine].key);
  return keys;
}

std::vector<std::string> Difference(const std::set<std::string>& a, const std::set<std::string>& b) {
  std::vector<std::string> out;
  std::set_difference(a.begin(), a.end(), b.begin(), b.end(), std::back_inserter(out));
  return out;
}

}  // namespace

Trajectory CompareBurdens(const Timeline& timeline, const Burden& now, const Burden& before,
                          DataState before_data) {
  Trajectory trajectory;
  trajectory.before_on = before.on;
  trajectory.now = FiguresOf(now);
  trajectory.before = FiguresOf(before);
  const std::set<std::string> keys_now = ActiveKeys(timeline, now);
  const std::set<std::string> keys_before = ActiveKeys(timeline, before);
  trajectory.started = Difference(keys_now, keys_before);
  trajectory.stopped = Difference(keys_before, keys_now);
  MarkTrajectoryCoverage(trajectory, before_data);
  return trajectory;
}

void MarkTrajectoryCoverage(Trajectory& trajectory, DataState before_data) {
  trajectory.before_data = before_data;
  if (!HasFigures(before_data)) trajectory.before.reset();
  if (!trajectory.Comparable()) {
    trajectory.started.clear();
    trajectory.stopped.clear();
  }
}

std::string TrajectoryText(const Trajectory& trajectory, const std::string& scale) {
  std::string text = std::to_string(kTrajectoryMonths) + " months before (" + trajectory.before_on.ToIso() + "): ";
  if (!trajectory.before) return text + "no figures (before the practice's data begin)";
  const BurdenFigures& b = *trajectory.before;
  text += std::to_string(b.items) + (b.items == 1 ? " medicine" : " medicines") + ", " + scale + " " +
          std::to_string(b.acb) + ", DBI " + FormatNumber(b.dbi, 2) + ", falls-risk " + std::to_string(b.falls) +
          ", TSDD " + FormatNumber(b.tsdd, 0);
  if (!trajectory.Comparable()) {
    return text + " (" + std::string(DataStateName(trajectory.before_data)) + ": no change is read from it)";
  }
  text += "; started since: " + (trajectory.started.empty() ? std::string("none") : Join(trajectory.started, ", "));
  text += "; stopped since: " + (trajectory.stopped.empty() ? std::string("none") : Join(trajectory.stopped, ", "));
  return text;
}

}  // namespace medload
