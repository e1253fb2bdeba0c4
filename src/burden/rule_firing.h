// Combination rules on a date: which active medicines' routes count for a rule, which
// distinct ingredients (or medicines) meet each requirement, what a rule forbids, and the
// minimum age. Private to src/burden/; burden.cpp calls it after the scores.
#pragma once

#include <optional>
#include <vector>

#include "medload/burden/burden.h"

namespace medload::burden_internal {

// The routes of `medicine`'s dispensings in force on `on`: the latest dispensing's
// route, and that of every dispensing whose supply plus tail (min(grace, days)) covers
// `on` (with --measure lookback: every dispensing in the window).
RouteSet RoutesInForce(const Medicine& medicine, const ActiveMedicine& active, Date on,
                                 const MeasureOptions& options);

// Appends to burden.rules the rules of `tables` that fire on burden.active, in table
// order, and sets burden.age_unknown_for_rules when a rule with a minimum age would have
// fired but `age` is not known. `matches`: MatchRuleRequirements(timeline, tables), or null.
void FireRules(const Timeline& timeline, const BurdenTables& tables, std::optional<int> age,
               const std::vector<bool>* matches, Burden& burden);

}  // namespace medload::burden_internal
