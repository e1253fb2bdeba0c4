#include "medload/cohort/series.h"

namespace medload {

std::optional<SeriesStep> ParseSeriesStep(std::string_view text) {
  if (text == "month") return SeriesStep::kMonth;
  if (text == "quarter") return SeriesStep::kQuarter;
  if (text == "year") return SeriesStep::kYear;
  return std::nullopt;
}

std::string_view SeriesStepName(SeriesStep step) {
  switch (step) {
    case SeriesStep::kMonth: return "month";
    case SeriesStep::kQuarter: return "quarter";
    case SeriesStep::kYear: return "year";
  }
  return "month";
}

Date PeriodEnd(Date date, SeriesStep step) {
  switch (step) {
    case SeriesStep::kMonth: return EndOfMonth(date);
    case SeriesStep::kQuarter: return EndOfQuarter(date);
    case SeriesStep::kYear: return EndOfYear(date);
  }
  return EndOfMonth(date);
}

Result<std::vector<Date>> SeriesDates(Date from, Date to, SeriesStep step, size_t max_dates) {
  if (to < from) {
    return Status::Usage("the series ends on " + to.ToIso() + ", before its start " + from.ToIso());
  }
  std::vector<Date> dates;
  const Date last = PeriodEnd(to, step);
  // The day after a period end is the first day of the next period, so its end is the
  // next census date.
  for (Date date = PeriodEnd(from, step); date <= last; date = PeriodEnd(date + 1, step)) {
    if (dates.size() == max_dates) {
      return Status::Usage("the series from " + from.ToIso() + " to " + to.ToIso() +
                           " has more than " + std::to_string(max_dates) + " dates");
    }
    dates.push_back(date);
  }
  return dates;
}

}  // namespace medload
