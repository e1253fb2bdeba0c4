// The review worklist in text (a table that fits a terminal, reasons below each row),
// CSV (caution first), JSON (the fixed shape of README and docs/measures.md) and HTML. Identifiers are written as
// given: pseudonymise the Worklist before writing when asked. No queries.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/review/worklist.h"

namespace medload {

// What the rank means, in words: a sorting order, not a clinical priority.
extern const char* const kRankIsSortingOrder;

// The lines every format prints about the list as a whole, in this order: the caller's
// warnings (Worklist::notes), what the rank means, and, when a limit cut the list, how
// many meeting patients are not shown. Plain sentences, no trailing full stop.
std::vector<std::string> WorklistNotes(const Worklist& worklist);

// The one-line summary: how many meet the criteria of how many registered, on which date,
// how many are listed, and who was left out (recent review, unknown age under --age-min).
std::string WorklistSummary(const Worklist& worklist);

// JSON: the fixed shape plus "notes" (WorklistNotes), "warnings" (Worklist::notes),
// "summary", "patients_not_shown" and the exclusion counts.
nlohmann::json WorklistJson(const Worklist& worklist);
void WriteWorklistText(std::ostream& out, const Worklist& worklist);
// CSV: the caution line, then `# census date: YYYY-MM-DD`, `# summary: ...` and one
// `# note: ...` line per WorklistNotes entry, then the header and rows.
void WriteWorklistCsv(std::ostream& out, const Worklist& worklist);
// `title` heads the page (the report uses it for per-practice pages).
void WriteWorklistHtml(std::ostream& out, const Worklist& worklist, const std::string& title);
// The WorklistNotes as HTML paragraphs (class "note"), for embedding in a larger page.
void WriteWorklistHtmlNotes(std::ostream& out, const Worklist& worklist);
// The rows only, for embedding in a larger page.
void WriteWorklistHtmlTable(std::ostream& out, const Worklist& worklist);

}  // namespace medload
