// Writers of a finished cohort table: text (a terminal table), CSV (one line per date,
// group and criterion, the caution first), JSON (the fixed shape of docs/cohort.md plus standardised rates
// and, when nothing is suppressed, the raw tally that `cohort --merge` adds up) and HTML
// (an SVG trend chart per criterion and the table). They run no queries.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/cohort/cohort.h"
#include "medload/cohort/cohort_table.h"

namespace medload {

// The JSON document (docs/cohort.md, "Outputs"): {"criteria","rows":[{"date","group","registered",
// "counts","rates_per_1000","standardised_per_1000"}],...,"caution"}; suppressed values are
// null. `raw`, when given, is written as "tally" (TallyJson) so the output can be merged;
// callers pass it only when nothing is suppressed, since the raw counts would undo it.
nlohmann::json CohortJson(const CohortTable& table, const CohortTally* raw);

// The tally as JSON, and back. TallyFromJson reads the "tally" member of a cohort JSON
// document (or a bare tally) and fails with Input naming `file` and the JSON pointer of a
// missing or malformed member.
nlohmann::json TallyJson(const CohortTally& tally);
Result<CohortTally> TallyFromJson(const nlohmann::json& document, const std::string& file);

// The header lines every format repeats: what was counted and how (groups, criteria,
// measure, patients counted, rates, suppression, warnings, the coverage legend).
std::vector<std::string> CohortPreamble(const CohortTable& table);

void WriteCohortText(std::ostream& out, const CohortTable& table);
void WriteCohortCsv(std::ostream& out, const CohortTable& table);
void WriteCohortHtml(std::ostream& out, const CohortTable& table);

}  // namespace medload
