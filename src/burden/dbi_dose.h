// The Drug Burden Index dose of one ingredient on a census date: which of its active
// products are taken together, and each one's daily dose (the stage of a changing dose in
// force on the date). Private to src/burden/; burden.cpp turns the dose into D/(D+delta).
#pragma once

#include <optional>
#include <string>

#include "medload/burden/burden.h"

namespace medload::burden_internal {

// The daily dose of `ingredient` from dispensing `use`, in mg a day on `on`, for a supply
// taken from `taken_from` (its first day, after any carry-over), first that applies: the
// rate strength; a transdermal patch's labelled release rate (tables.unit_doses, by its
// content); strength x the units per day in force on `on` (UnitsPerDayOnDay: a taper's
// stage); a depot injection's strength per ampoule or syringe / its labelled interval
// (tables.unit_doses); strength x quantity / days of supply. nullopt when unknown (no
// strength, or not a finite number > 0; a taper stage of 0 after "then stop" gives 0).
std::optional<DoseSource> DailyDose(const DispensingUse& use, const std::string& ingredient,
                                    const BurdenTables& tables, Date on, Date taken_from);

// The DBI dose of `ingredient` on burden.on: the sum over its products taken together
// (products on a route the DBI does not count for it left out). `counted` is set to
// false when no product of it counts (only routes the DBI does not count); nullopt
// with `counted` true when some dose is unknown. REQUIRES: burden.active is filled.
std::optional<DbiContribution> IngredientDbiDose(const Timeline& timeline, const Burden& burden,
                                                 const BurdenTables& tables, const std::string& ingredient,
                                                 const MeasureOptions& options, bool& counted,
                                                 size_t& owner);

}  // namespace medload::burden_internal
