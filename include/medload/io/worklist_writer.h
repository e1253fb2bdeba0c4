// The review worklist in text (a table that fits a terminal, reasons below each row),
// CSV (caution first), JSON (the spec's shape) and HTML. Identifiers are written as
// given: pseudonymise the Worklist before writing when asked. No queries.
#pragma once

#include <iosfwd>

#include <nlohmann/json.hpp>

#include "medload/review/worklist.h"

namespace medload {

nlohmann::json WorklistJson(const Worklist& worklist);
void WriteWorklistText(std::ostream& out, const Worklist& worklist);
void WriteWorklistCsv(std::ostream& out, const Worklist& worklist);
// `title` heads the page (the report uses it for per-practice pages).
void WriteWorklistHtml(std::ostream& out, const Worklist& worklist, const std::string& title);
// The rows only, for embedding in a larger page.
void WriteWorklistHtmlTable(std::ostream& out, const Worklist& worklist);

}  // namespace medload
