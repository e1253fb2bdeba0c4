// The criteria on the longitudinal measures (falls>=N, tsdd>=N, pdc<X[:CLASSES]): their
// keys, whether a burden meets them, and their parsing. Private to src/burden/; the
// public entry points are in criteria.h.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/burden/criteria.h"

namespace medload {

// "falls>=3", "tsdd>=1095", "pdc<0.8", "pdc<0.8:ace-inhibitor|arb".
std::string LongitudinalKey(const Criterion& criterion);
// True when `measures` meet the criterion (kFalls, kTsdd or kPdcBelow).
bool LongitudinalMet(const Criterion& criterion, const LongitudinalMeasures& measures);
// The criterion when `text` names a longitudinal measure ("falls=3", "falls>=3",
// "tsdd=1095", "pdc<0.8:statin"), with its error when malformed; nullopt otherwise.
std::optional<Result<Criterion>> ParseLongitudinalCriterion(std::string_view text);
// Status::Input naming the first pdc criterion class that no ingredient carries.
Status CheckPdcClassesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables);

}  // namespace medload
