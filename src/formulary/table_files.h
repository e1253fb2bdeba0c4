// Reads the files of a formulary folder into FormularyTables, checking each field on its
// own (numbers, ranges, empty names) and computing the checksum of every file read.
// Private to src/formulary/; cross-table checks are CheckTables' job.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "medload/formulary/formulary.h"

namespace medload::formulary_internal {

// The files every formulary folder must have, relative to it (further scales in
// anticholinergic/, routes.csv and dictionary.csv are optional).
const std::vector<std::string_view>& RequiredTableFiles();

// Every fault goes to `faults` as "file:line: fault" with file relative to `dir`; a
// required file that is missing is "FILE: missing (required)".
FormularyTables ReadTableFiles(const std::string& dir, std::vector<std::string>& faults);

}  // namespace medload::formulary_internal
