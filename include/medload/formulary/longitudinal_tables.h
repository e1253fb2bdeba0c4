// Rows of the two tables behind the longitudinal measures: anticholinergic/tsdd.csv (the
// minimum effective daily dose of each ingredient counted in cumulative anticholinergic
// exposure) and falls_risk.csv (classes or ingredients in falls-risk categories). Plain
// data read by the formulary loader; the measures themselves live in burden/.
#pragma once

#include <string>

namespace medload {

// One row of anticholinergic/tsdd.csv: the dose that makes one standardised daily dose
// (Gray et al. 2015: the minimum effective daily dose for older adults).
struct TsddDose {
  std::string ingredient;                  // canonical after loading
  double min_effective_daily_dose_mg = 0;  // > 0
  std::string source;
  int line = 0;
};

// One row of falls_risk.csv: every ingredient carrying `class_name`, or the one
// `ingredient`, belongs to the falls-risk `category`. Exactly one of the two is set.
struct FallsRiskRow {
  std::string category;    // lower-case-hyphenated ("sedative-hypnotic", "opioid", ...)
  std::string class_name;  // a class of ingredients.csv, or empty
  std::string ingredient;  // canonical after loading, or empty
  std::string source;
  int line = 0;
};

}  // namespace medload
