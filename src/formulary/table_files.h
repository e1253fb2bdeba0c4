// Reads the files of a formulary folder into FormularyTables, checking each field on its
// own (numbers, ranges, empty names) and computing the checksum of every file read.
// Private to src/formulary/; cross-table checks are CheckTables' job.
#pragma once

#include <string>
#include <vector>

#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {

// Every fault goes to `faults` as "file:line: fault" with file relative to `dir`.
FormularyTables ReadTableFiles(const std::string& dir, std::vector<std::string>& faults);

}  // namespace medload::formulary_internal
