// Reading and checking unit_doses.csv (patch release rates, patch and depot intervals;
// format in docs/formulary.md). Private to src/formulary/: the loader calls the reader,
// CheckTables the cross-check. Faults are "file:line: fault".
#pragma once

#include <string>
#include <vector>

#include "formulary/table_reader.h"
#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {

inline constexpr const char* kUnitDosesFile = "unit_doses.csv";

// Rows of unit_doses.csv (ingredient, form, strength_mg, release_mg_per_day,
// interval_days, source): a form of patch or depot, numbers > 0, a release rate for
// every patch and none for a depot, an interval a whole number from 1 to 3650.
void ReadUnitDoses(const Table& table, FormularyTables& tables, std::vector<std::string>& faults);

// Unknown ingredients, and an ingredient, form and strength listed twice.
void CheckUnitDoses(const Formulary& formulary, std::vector<std::string>& faults);

}  // namespace medload::formulary_internal
