// The options that change how medicines are counted and scored on a date (docs/measures.md), shared by meds, review, cohort and the report config. Each
// field's comment is the text of its --help line.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "medload/dose/supply.h"
#include "medload/episode/episodes.h"
#include "medload/formulary/product.h"

namespace medload {

enum class Measure {
  kConcurrent,  // active on D: an episode contains D
  kLookback,    // active on D: dispensed in the `window_days` days ending on D
};

enum class CountBy {
  kMedicine,    // a medicine is the set of active ingredients of a product
  kIngredient,  // every ingredient is its own medicine
};

struct MeasureOptions {
  Measure measure = Measure::kConcurrent;  // --measure concurrent|lookback (default concurrent)
  int window_days = 84;                    // --window DAYS: lookback window (default 84)
  EpisodeOptions episodes;                 // --grace-days N (default 30), --carryover
  SupplyOptions supply;                    // --default-supply-days (28), --max-supply-days (180)
  CountBy count_by = CountBy::kMedicine;   // --count-by medicine|ingredient (default medicine)
  bool exclude_prn = false;                // --exclude-prn: leave out as-needed dispensings
  std::vector<Route> exclude_routes;       // --exclude-route ROUTE (repeatable)
  std::string scale = "acb";               // --scale NAME: anticholinergic scale (default acb)
  // --history-days N: a date in the first N days of a practice's data is marked
  // short-history (default max(84, grace days)). Changes no figure, only its marking.
  std::optional<int> history_days;
};

// The short-history window in force: history_days, or max(84, grace days).
int HistoryDays(const MeasureOptions& options);

std::string_view MeasureName(Measure measure);
std::string_view CountByName(CountBy count_by);

}  // namespace medload
