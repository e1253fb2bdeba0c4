// The report's HTML pages and SVG charts, written from a finished ReportModel: the
// network overview (per-criterion tables, trend charts, funnel plots against list size)
// and one page per practice (its trend and its worklist). Every value is escaped; pages
// are self-contained. It runs no queries and writes no files (report_writer.h does).
#pragma once

#include <map>
#include <string>
#include <vector>

#include "medload/cohort/cohort_table.h"
#include "medload/format/chart_layout.h"
#include "medload/report/report.h"

namespace medload {

// The label of the network total in trend charts and in cohort.csv / cohort.json.
inline constexpr std::string_view kNetworkGroup = "network total";

// File names of one practice's outputs, from its sanitised code (report_files.h).
struct PracticeFiles {
  std::string page;      // "practice-<stem>.html"
  std::string worklist;  // "worklist-<stem>.csv"
  std::string digest;    // "digests/<stem>.eml"
};

// Warnings about the report, plain sentences: each practice's census dates without figures,
// in its short-history window or beyond its data (CoverageNotes), and the patients whose
// histories the store's bound cut (CappedHistoriesNote); of practice `*only` when given.
// Empty when there is nothing to warn of.
std::vector<std::string> ReportWarnings(const ReportModel& model, const std::string* only = nullptr);

// The worklist of practice `code` as the report writes it (page and CSV): the model's
// list with config.suppress_below applied to its meeting count and the practice's
// ReportWarnings as notes.
// REQUIRES: model.worklists has `code`.
Worklist ReportWorklist(const ReportModel& model, const std::string& code);

// The cohort table of the report: the chosen practices and the network total, counts
// suppressed below config.suppress_below. With `only` set, that practice and the total.
CohortTable ReportCohortTable(const ReportModel& model, const std::string* only = nullptr);

// A funnel plot (Spiegelhalter 2005) of `model.keys[key]` on the census date: each
// practice's rate per 1000 against its registered patients as a point in its colour, the
// network rate, and the 95% (dashed) and 99.8% (dotted) exact binomial control limits.
// Practice codes stand in a column right of the plot, joined to their points by leader
// lines and never overlapping: every practice when all fit, else those outside the 95%
// limits, farthest first; a note under the key says which. Practices without figures on
// the census date or whose count is withheld are left out.
std::string FunnelSvg(const ReportModel& model, size_t key, const SeriesColours& colours = {});

// index.html. `files` maps practice code to its file names; `digests` lists the codes
// that got a digest.
std::string IndexHtml(const ReportModel& model, const std::map<std::string, PracticeFiles>& files,
                      const std::vector<std::string>& digests);
// The page of practice `index` of model.practices.
std::string PracticeHtml(const ReportModel& model, size_t index, const PracticeFiles& files);

}  // namespace medload
