// The measure options and the selection criteria as command-line flags, shared by meds,
// review, cohort (spec section 4). The help texts repeat the MeasureOptions comments.
#pragma once

#include <vector>

#include "cli/options.h"
#include "medload/burden/criteria.h"
#include "medload/burden/measure_options.h"
#include "medload/core/status.h"

namespace medload::cli {

// Adds --measure, --window, --grace-days, --carryover, --default-supply-days,
// --max-supply-days, --count-by, --exclude-prn, --exclude-route, --scale, --exposure-years,
// --pdc-class.
void AddMeasureFlags(po::options_description& options);
// Reads them back; a bad value is a usage error naming the flag.
Result<MeasureOptions> ReadMeasureFlags(const po::variables_map& vm);

// Adds --at-least, --below and --rule (each repeatable).
void AddCriteriaFlags(po::options_description& options);
// Criteria in command-line order: every --at-least, then every --below, then every --rule.
Result<std::vector<Criterion>> ReadCriteriaFlags(const po::variables_map& vm);

// Reads a date option that must be present ("--on"); usage error naming it otherwise.
Result<Date> ReadDateFlag(const po::variables_map& vm, const char* name);

}  // namespace medload::cli
