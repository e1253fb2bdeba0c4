// The three parts of AddLongitudinalMeasures, one per source file (falls.cpp,
// exposure.cpp, adherence.cpp). Private to src/burden/.
#pragma once

#include "medload/burden/burden.h"
#include "medload/burden/longitudinal.h"

namespace medload::longitudinal_internal {

// burden.longitudinal.falls and falls_ingredients, from burden.active.
void AddFalls(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
              Burden& burden);
// burden.longitudinal.tsdd, tsdd_from, tsdd_contributions and tsdd_incomplete.
void AddExposure(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
                 Burden& burden);
// burden.longitudinal.adherence and adherence_groups.
void AddAdherence(const Timeline& timeline, const BurdenTables& tables, const MeasureOptions& options,
                  Burden& burden);

// True for the routes the formulary's route policy counts (tables.systemic_routes, from
// routes.csv: the same policy as the scales and the DBI; by default oral, transdermal,
// injection, rectal, sublingual/buccal) and for a route not stated (never lose a
// medicine silently).
bool SystemicRoute(const BurdenTables& tables, Route route);

}  // namespace medload::longitudinal_internal
