// The census dates of a cohort series: the end of every month, quarter or year from a
// start to an end date, or one given date. It does not decide who is counted on a date.
#pragma once

#include <optional>
#include <string_view>
#include <vector>

#include "medload/core/date.h"
#include "medload/core/status.h"

namespace medload {

// How far apart the census dates are (`--every`).
enum class SeriesStep { kMonth, kQuarter, kYear };

// "month", "quarter" or "year"; nullopt for anything else.
std::optional<SeriesStep> ParseSeriesStep(std::string_view text);
std::string_view SeriesStepName(SeriesStep step);

// The last day of the period of `step` that contains `date`.
Date PeriodEnd(Date date, SeriesStep step);

// The period ends from the period containing `from` to the period containing `to`, both
// included, oldest first (docs/cohort.md, "Census dates": each date is normalised to its period end).
// Fails with Usage when `to` is before `from` or the series would exceed `max_dates`.
Result<std::vector<Date>> SeriesDates(Date from, Date to, SeriesStep step,
                                      size_t max_dates = 1200);

}  // namespace medload
