// Why an active medicine adds nothing to a measure because of its route ("eye: not a
// systemic route for the acb scale"), and whether its route was stated at all, in the
// words outputs show. For explanations only: the measures themselves are in burden.h.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "medload/burden/burden.h"

namespace medload {

struct RouteNote {
  size_t active = 0;  // index into Burden::active
  std::string text;   // "eye: not a systemic route for the acb scale"
};

// One note per active medicine and measure it does not count for because of its routes:
// the run's scale (an ingredient with a score), the Drug Burden Index (an ingredient
// with a minimum dose), and each rule that would fire if every route counted (same age
// test; RulesLeftOutByRoute). In Burden::active order, then scale, DBI, rules.
// REQUIRES: `burden` = EvaluateBurden(timeline, ..., tables, ..., age).
std::vector<RouteNote> RouteNotes(const Timeline& timeline, const Burden& burden, const BurdenTables& tables,
                                  std::optional<int> age);

// True when a product of the medicine in use on the date does not state its route (no
// form in the description): it is counted as systemic, and outputs say so.
bool RouteNotStated(const ActiveMedicine& active);

}  // namespace medload
