// The cohort table in wide layout (`cohort --layout wide`): one row per group and one
// column per census date, per criterion, so that a year of months reads across like a
// trend. It shows what the long layout (cohort_writer.h) shows per cell: the count and its
// rate per 1000, suppressed counts as "<N", dates without figures as "no data" and marks
// for short-history and beyond-data dates. JSON keeps its one shape (docs/cohort.md).
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "medload/cohort/cohort_table.h"

namespace medload {

// The cell of one group on one date for `key`: "12 (11.6)", "<5", "no data", with " s"
// (short history) or " b" (beyond the data) after it when the date's figures are marked.
std::string WideCell(const CohortTable& table, const CohortRow& row, size_t key);

// Rows of the wide table for `key`: the group, then a cell per census date (dates where
// the group has no row are "-").
std::vector<std::vector<std::string>> WideRows(const CohortTable& table, size_t key);

// "2025-11-30", ... : the census dates as column headers.
std::vector<std::string> WideHeader(const CohortTable& table);

// Text: the preamble, then for each criterion (and any) a block "KEY: patients (per 1000
// registered)" with the table, a registered-patients block, the legend and the caution.
void WriteCohortWideText(std::ostream& out, const CohortTable& table);
// CSV: the caution and notes as comment lines, then "group,criterion,figure,DATE..."
// with figure "registered", "count" and "rate_per_1000" rows (empty where suppressed or
// without figures) and a "data" row with each date's coverage.
void WriteCohortWideCsv(std::ostream& out, const CohortTable& table);
// HTML: the preamble, the trend charts and one table per criterion.
void WriteCohortWideHtml(std::ostream& out, const CohortTable& table);

}  // namespace medload
