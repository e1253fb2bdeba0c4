// The warning given when a census date lies after the latest counting dispensing in the
// store: medicines dispensed since then are missing, so counts may be too low. It only
// words the warning; it does not read the store or decide where the warning is printed.
#pragma once

#include <optional>
#include <string>

#include "medload/core/date.h"

namespace medload {

// A plain sentence when `on` is after `latest_dispensed` ("the census date 2026-12-31 is
// 61 days after the latest dispensing loaded (2026-10-31): ..."); nullopt when `on` is on
// or before it, or when no counting dispensing is loaded (`latest_dispensed` absent).
std::optional<std::string> CensusBeyondDataNote(Date on, std::optional<Date> latest_dispensed);

}  // namespace medload
