// The measure options and the selection criteria as command-line flags, shared by meds,
// review, cohort (docs/measures.md). The help texts repeat the MeasureOptions comments.
#pragma once

#include <vector>

#include "cli/context.h"
#include "cli/options.h"
#include "medload/burden/criteria.h"
#include "medload/burden/measure_options.h"
#include "medload/burden/run_context.h"
#include "medload/core/status.h"
#include "medload/report/report_writer.h"
#include "medload/store/store.h"

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

// RunContext::Open for a command whose measure options came from its flags: an unknown
// scale is named as the flag (`--scale "NAME" is not a scale in ...`). Its patient passes
// print progress lines labelled `label` (cli/progress.h: terminals only, not --quiet).
Result<RunContext> OpenRunContext(const Context& context, const MeasureOptions& options, Store* store,
                                  const std::string& label);

// A report's fault as the command line names it: the report folder's usage fault, when
// --out was empty, names the flag ("--out needs a folder").
Status ReportFault(const Status& status, const ReportRunOptions& run);

// Reads a date option that must be present ("--on"); usage error naming it otherwise.
Result<Date> ReadDateFlag(const po::variables_map& vm, const char* name);

// A census date option that may also be "latest": the date, or nullopt for "latest"
// (resolve it with ResolveCensusDate once the store is open). Usage error naming the
// option when it is missing or neither a date nor "latest".
Result<std::optional<Date>> ReadCensusDateFlag(const po::variables_map& vm, const char* name);
// `date` itself, or for "latest" (nullopt) the last month end on or before the latest
// dispensing in the store, as a report config's "on": "latest" (LatestCensusDate); a
// note on the error stream says which date that is. Input failure on an empty store.
Result<Date> ResolveCensusDate(const Context& context, std::optional<Date> date, const Store& store);

}  // namespace medload::cli
