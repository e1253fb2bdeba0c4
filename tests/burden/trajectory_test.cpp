// The trajectory: one timeline evaluated on the census date and 12 months before, the
// figures side by side, and the medicines started and stopped in between; no change is
// read against a date without comparable figures (docs/measures.md, "Data coverage").
#include <doctest/doctest.h>

#include "burden/longitudinal_fixture.h"
#include "medload/burden/trajectory.h"

namespace medload {
namespace {

using testing::D;
using testing::LongitudinalFixture;
using testing::Rx;

struct TwoDates {
  Timeline timeline;
  Burden now, before;
};

// Amitriptyline taken in 2023 and stopped; ramipril and diazepam started in 2024.
TwoDates Example(const LongitudinalFixture& f) {
  TwoDates t;
  t.timeline = f.Build({Rx("amitriptyline 10mg tablets", D(2023, 5, 1), 28, 28),
                        Rx("amitriptyline 10mg tablets", D(2023, 5, 29), 28, 28),
                        Rx("ramipril 5mg capsules", D(2024, 6, 1), 28, 28),
                        Rx("diazepam 5mg tablets", D(2024, 6, 10), 28, 28)});
  t.now = EvaluateBurden(t.timeline, D(2024, 6, 30), f.tables, f.options, 80);
  t.before = EvaluateBurden(t.timeline, MonthsBefore(D(2024, 6, 30), kTrajectoryMonths), f.tables, f.options, 79);
  return t;
}

}  // namespace

TEST_SUITE("burden/trajectory") {

TEST_CASE("months before keep the day of the month, or the month's last day when shorter") {
  CHECK(MonthsBefore(D(2024, 3, 31), 12) == D(2023, 3, 31));
  CHECK(MonthsBefore(D(2024, 2, 29), 12) == D(2023, 2, 28));
  CHECK(MonthsBefore(D(2024, 5, 31), 3) == D(2024, 2, 29));
  CHECK(MonthsBefore(D(2024, 1, 15), 13) == D(2022, 12, 15));
}

TEST_CASE("the trajectory sets the figures of both dates side by side with the medicines started and stopped") {
  LongitudinalFixture f;
  const TwoDates t = Example(f);
  const Trajectory trajectory = CompareBurdens(t.timeline, t.now, t.before, DataState::kFull);
  CHECK(trajectory.before_on == D(2023, 6, 30));
  CHECK(trajectory.now.items == 2);
  CHECK(trajectory.now.falls == 1);  // diazepam
  REQUIRE(trajectory.before);
  CHECK(trajectory.before->items == 1);  // amitriptyline, supplied to 25 Jun 2023
  CHECK(trajectory.before->falls == 1);  // amitriptyline is an antidepressant
  // 56 tablets x 10 mg / 25 mg (from memory) = 22.4 TSDD both then and now.
  CHECK(trajectory.before->tsdd == doctest::Approx(22.4));
  CHECK(trajectory.now.tsdd == doctest::Approx(22.4));
  CHECK(trajectory.started == std::vector<std::string>{"diazepam", "ramipril"});
  CHECK(trajectory.stopped == std::vector<std::string>{"amitriptyline"});
  CHECK(trajectory.Comparable());
  CHECK(TrajectoryText(trajectory, "ACB") ==
        "12 months before (2023-06-30): 1 medicine, ACB 0, DBI 0, falls-risk 1, TSDD 22; started since: diazepam, "
        "ramipril; stopped since: amitriptyline");
}

TEST_CASE("no figures before the practice's data begin, and no change read from a short history") {
  LongitudinalFixture f;
  const TwoDates t = Example(f);
  Trajectory none = CompareBurdens(t.timeline, t.now, t.before, DataState::kNoData);
  CHECK_FALSE(none.before);
  CHECK(none.started.empty());
  CHECK(none.stopped.empty());
  CHECK(TrajectoryText(none, "ACB") == "12 months before (2023-06-30): no figures (before the practice's data begin)");
  Trajectory short_history = CompareBurdens(t.timeline, t.now, t.before, DataState::kFull);
  MarkTrajectoryCoverage(short_history, DataState::kShortHistory);
  REQUIRE(short_history.before);
  CHECK_FALSE(short_history.Comparable());
  CHECK(short_history.started.empty());
  CHECK(TrajectoryText(short_history, "ACB").find("(short-history: no change is read from it)") != std::string::npos);
}

}  // TEST_SUITE
}  // namespace medload
