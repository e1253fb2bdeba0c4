// Reading and checking the tables of the longitudinal measures (anticholinergic/tsdd.csv,
// falls_risk.csv; formats in docs/formulary.md). Private to src/formulary/: the loader
// calls the readers, CheckTables the cross-checks. Faults are "file:line: fault".
#pragma once

#include <string>
#include <vector>

#include "formulary/table_reader.h"
#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {

inline constexpr const char* kTsddFile = "anticholinergic/tsdd.csv";
inline constexpr const char* kFallsRiskFile = "falls_risk.csv";

// Rows of tsdd.csv (ingredient, min_effective_daily_dose_mg, source) with a number > 0.
void ReadTsdd(const Table& table, FormularyTables& tables, std::vector<std::string>& faults);
// Rows of falls_risk.csv (category, class, ingredient, source) naming one member each.
void ReadFallsRisk(const Table& table, FormularyTables& tables, std::vector<std::string>& faults);

// Unknown ingredients and classes, and repeated rows, in both tables.
void CheckLongitudinalTables(const Formulary& formulary, std::vector<std::string>& faults);

}  // namespace medload::formulary_internal
