// The report's HTML pages: the network overview and one page per practice.
#include "medload/report/report_pages.h"

#include <set>
#include <sstream>

#include "medload/burden/patient_pass.h"
#include "medload/cohort/cohort_chart.h"
#include "medload/cohort/cohort_table.h"
#include "medload/cohort/cohort_writer.h"
#include "medload/format/output.h"
#include "medload/format/suppression.h"
#include "medload/report/funnel.h"
#include "medload/review/worklist_writer.h"

namespace medload {
namespace {

std::string CountText(const ReportSeries& s, size_t key, long suppress_below) {
  if (!HasFigures(s.data.back())) return "no data";
  const long count = s.counts[key].back();
  return IsSuppressed(count, suppress_below) ? "<" + std::to_string(suppress_below) : std::to_string(count);
}

std::string RateText(const ReportSeries& s, size_t key, long suppress_below) {
  const long count = s.counts[key].back();
  const long registered = s.registered.back();
  if (!HasFigures(s.data.back()) || registered < 1 || IsSuppressed(count, suppress_below)) return "-";
  return FormatNumber(1000.0 * static_cast<double>(count) / static_cast<double>(registered), 1);
}

// The change of a count since `back` census dates earlier; "-" when that date is outside
// the series, either date has no figures or short history, or either count is withheld.
std::string ChangeText(const ReportSeries& s, size_t key, size_t back, long suppress_below) {
  const Change change = SeriesChange(s, key, back, suppress_below);
  if (!change.patients) return "-";
  std::string text = (*change.patients > 0 ? "+" : "") + std::to_string(*change.patients);
  if (change.percent) text += " (" + std::string(*change.percent > 0 ? "+" : "") + FormatNumber(*change.percent, 1) + "%)";
  return text;
}

std::string PositionText(const ReportModel& model, const ReportSeries& s, size_t key) {
  const long n = s.registered.back();
  const long count = s.counts[key].back();
  const long network_n = model.network.registered.back();
  if (!HasFigures(s.data.back()) || n < 1 || network_n < 1 || IsSuppressed(count, model.config.suppress_below)) {
    return "-";
  }
  const double p0 = static_cast<double>(model.network.counts[key].back()) / static_cast<double>(network_n);
  for (const double coverage : {0.998, 0.95}) {
    const FunnelPosition position = PositionOf(count, n, p0, coverage);
    const std::string level = coverage > 0.99 ? "99.8%" : "95%";
    if (position == FunnelPosition::kAbove) return "above " + level + " limit";
    if (position == FunnelPosition::kBelow) return "below " + level + " limit";
  }
  return "within limits";
}

// The series' data coverage on the census date, blank when full.
std::string DataText(const ReportSeries& s) {
  std::string text = s.data.back() == DataState::kFull ? "" : std::string(DataStateName(s.data.back()));
  if (!s.practices_without_data.empty() && s.practices_without_data.back() > 0) {
    text += (text.empty() ? "" : "; ") + std::to_string(s.practices_without_data.back()) + " practice(s) without data";
  }
  return text;
}

std::vector<std::string> SeriesRow(const ReportModel& model, const ReportSeries& s, size_t key,
                                   const std::string& name) {
  const long sb = model.config.suppress_below;
  return {s.code == model.config.network ? std::string(kNetworkGroup) : s.code, name,
          std::to_string(s.registered.back()), DataText(s), CountText(s, key, sb),
          RateText(s, key, sb), ChangeText(s, key, 1, sb), ChangeText(s, key, 12, sb)};
}

void WriteWarnings(std::ostream& out, const ReportModel& model, const std::string* only) {
  for (const std::string& warning : ReportWarnings(model, only)) {
    out << "<p class=\"note\"><strong>Warning:</strong> " << EscapeHtml(warning) << ".</p>\n";
  }
}

void WriteRunFacts(std::ostream& out, const ReportModel& model, const std::string* only = nullptr) {
  std::string criteria;
  for (size_t k = 0; k + 1 < model.keys.size(); ++k) criteria += (k == 0 ? "" : ", ") + model.keys[k];
  out << "<p>Network: <strong>" << EscapeHtml(model.config.network) << "</strong>. Census date "
      << EscapeHtml(model.on.ToIso()) << "; trend over " << model.dates.size() << " month ends from "
      << EscapeHtml(model.dates.front().ToIso()) << ". Criteria: " << EscapeHtml(criteria)
      << " (\"any\" = at least one). Measure: " << EscapeHtml(model.measure) << ".</p>\n";
  if (model.data.earliest_dispensed && model.data.latest_dispensed) {
    out << "<p class=\"note\">Dispensing records from " << EscapeHtml(model.data.earliest_dispensed->ToIso())
        << " to " << EscapeHtml(model.data.latest_dispensed->ToIso()) << ". "
        << EscapeHtml(SuppressionNote(model.config.suppress_below)) << "</p>\n";
  }
  WriteWarnings(out, model, only);
}

// What the overview's trend chart shows, in words.
std::string TrendCaption(const ReportModel& model) {
  if (model.practices.size() <= kMaxTrendLines) {
    return "Monthly rate per 1000 registered: one line per practice, labelled at its end, and the network total.";
  }
  return "Monthly rate per 1000 registered: one panel per practice on a common scale, each with the network "
         "total in grey behind it.";
}

// The trend charts' style: the network total as the reference, and one colour per
// practice from the whole report's practices, so a practice has the same colour on the
// overview and on its own page.
TrendStyle ReportTrendStyle(const ReportModel& model) {
  std::vector<std::string> codes;
  for (const ReportSeries& s : model.practices) codes.push_back(s.code);
  return TrendStyle{std::string(kNetworkGroup), SeriesColours(codes)};
}

}  // namespace

std::vector<std::string> ReportWarnings(const ReportModel& model, const std::string* only) {
  std::set<std::string> practices;
  for (const ReportSeries& s : model.practices) {
    if (only == nullptr || *only == s.code) practices.insert(s.code);
  }
  std::vector<std::string> warnings = CoverageNotes(model.tally.spans, practices, model.dates, model.history_days);
  long capped = 0;
  for (const auto& [practice, patients] : model.capped_patients) {
    if (only == nullptr || *only == practice) capped += patients;
  }
  if (auto note = CappedHistoriesNote(capped, model.history_bound)) warnings.push_back(std::move(*note));
  return warnings;
}

Worklist ReportWorklist(const ReportModel& model, const std::string& code) {
  Worklist worklist = model.worklists.at(code);
  worklist.suppress_below = model.config.suppress_below;
  worklist.notes = ReportWarnings(model, &code);
  if (worklist.has_previous_run && model.previous) {
    worklist.notes.push_back("\"new\" marks patients who were not on this practice's list in the report of " +
                             model.previous->on.ToIso());
  }
  return worklist;
}

std::string IndexHtml(const ReportModel& model, const std::map<std::string, PracticeFiles>& files,
                      const std::vector<std::string>& digests) {
  std::ostringstream out;
  WriteHtmlStart(out, model.config.title);
  WriteRunFacts(out, model);
  out << "<h2>Practices</h2>\n<ul>\n";
  for (const ReportSeries& s : model.practices) {
    out << "<li><a href=\"" << EscapeHtml(files.at(s.code).page) << "\">" << EscapeHtml(s.code)
        << (s.name.empty() ? "" : " " + EscapeHtml(s.name)) << "</a> (worklist <a href=\""
        << EscapeHtml(files.at(s.code).worklist) << "\">CSV</a>)</li>\n";
  }
  out << "</ul>\n<p>Also in this folder: <a href=\"cohort.csv\">cohort.csv</a>, <a href=\"cohort.json\">"
         "cohort.json</a>, <a href=\"run.json\">run.json</a>.</p>\n";
  const CohortTable table = ReportCohortTable(model);
  const TrendStyle style = ReportTrendStyle(model);
  for (size_t k = 0; k < model.keys.size(); ++k) {
    out << "<section class=\"criterion\">\n<h2>" << EscapeHtml(model.keys[k]) << "</h2>\n";
    std::vector<std::vector<std::string>> rows;
    for (const ReportSeries& s : model.practices) {
      rows.push_back(SeriesRow(model, s, k, s.name));
      rows.back().push_back(PositionText(model, s, k));
    }
    rows.push_back(SeriesRow(model, model.network, k, model.config.network));
    rows.back().push_back("");
    WriteHtmlTable(out, {"practice", "name", "registered", "data", "patients", "per 1000",
                         "change since previous month", "change since 12 months before", "against the network (funnel)"},
                   rows);
    out << "<figure>\n" << CohortTrendSvg(table, k, style) << "<figcaption>" << TrendCaption(model) << "</figcaption>\n</figure>\n"
        << "<figure>\n" << FunnelSvg(model, k, style.colours.value())
        << "<figcaption>Each practice's rate on the census date against its registered patients, with the network "
           "rate and exact binomial control limits (Spiegelhalter 2005): 95% dashed, 99.8% dotted. Practices "
           "with withheld counts are not shown.</figcaption>\n</figure>\n</section>\n";
  }
  out << "<h2>Digests</h2>\n";
  if (digests.empty()) out << "<p>No practice crossed a digest trigger.</p>\n";
  else {
    out << "<ul>\n";
    for (const std::string& code : digests) {
      out << "<li><a href=\"" << EscapeHtml(files.at(code).digest) << "\">" << EscapeHtml(code) << "</a></li>\n";
    }
    out << "</ul>\n";
  }
  WriteHtmlEnd(out);
  return out.str();
}

std::string PracticeHtml(const ReportModel& model, size_t index, const PracticeFiles& files) {
  const ReportSeries& s = model.practices[index];
  std::ostringstream out;
  WriteHtmlStart(out, model.config.title + ": " + s.code + (s.name.empty() ? "" : " " + s.name));
  out << "<p class=\"screen\"><a href=\"index.html\">Network overview</a></p>\n";
  WriteRunFacts(out, model, &s.code);
  std::vector<std::vector<std::string>> rows;
  for (size_t k = 0; k < model.keys.size(); ++k) {
    rows.push_back(SeriesRow(model, s, k, model.keys[k]));
    rows.back()[0] = model.keys[k];
    rows.back()[1] = PositionText(model, s, k);
  }
  out << "<h2>On the census date</h2>\n";
  WriteHtmlTable(out, {"criterion", "against the network (funnel)", "registered", "data", "patients", "per 1000",
                       "change since previous month", "change since 12 months before"},
                 rows);
  const CohortTable table = ReportCohortTable(model, &s.code);
  out << "<h2>Trend</h2>\n";
  const TrendStyle style = ReportTrendStyle(model);
  for (size_t k = 0; k < model.keys.size(); ++k) out << "<figure>\n" << CohortTrendSvg(table, k, style) << "</figure>\n";
  const Worklist worklist = ReportWorklist(model, s.code);
  out << "<h2>Worklist on " << EscapeHtml(model.on.ToIso()) << "</h2>\n<p>" << EscapeHtml(WorklistSummary(worklist))
      << " (in review order; the same list is in <a href=\"" << EscapeHtml(files.worklist) << "\">"
      << EscapeHtml(files.worklist) << "</a>).</p>\n<p class=\"note\">This page and its worklist CSV name "
      << "patients: they are patient-level files for the practice, not for publication.</p>\n";
  WriteWorklistHtmlNotes(out, worklist);
  WriteWorklistHtmlTable(out, worklist);
  WriteHtmlEnd(out);
  return out.str();
}

}  // namespace medload
