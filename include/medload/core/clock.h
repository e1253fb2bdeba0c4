// The wall clock, read in one place: the time stamps that import runs and report
// provenance record. Figures never depend on it (every measure is for a census date).
#pragma once

#include <string>

namespace medload {

// The current time in UTC as ISO 8601 to the second, e.g. "2026-10-31T09:15:02Z".
std::string UtcNow();

}  // namespace medload
