#include "medload/review/worklist_writer.h"

#include <ostream>

#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/format/output.h"
#include "medload/format/suppression.h"

namespace medload {
namespace {

std::string Age(const WorklistEntry& e) { return e.age ? std::to_string(*e.age) : ""; }
std::string LastReviewed(const WorklistEntry& e) { return e.last_reviewed ? e.last_reviewed->ToIso() : ""; }

// The score's label in text and HTML: the chosen scale's name in capitals ("ACB", "ARS").
std::string ScaleLabel(const Worklist& worklist) {
  std::string label = worklist.scale;
  for (char& c : label) c = (c >= 'a' && c <= 'z') ? static_cast<char>(c - 32) : c;
  return label;
}

std::vector<std::string> CriteriaKeys(const Worklist& worklist) {
  std::vector<std::string> keys;
  for (const Criterion& c : worklist.criteria) keys.push_back(c.Key());
  return keys;
}

// The report's suppression applies to the count of meeting patients.
bool MeetingWithheld(const Worklist& w) { return IsSuppressed(w.patients_meeting, w.suppress_below); }

size_t NotShown(const Worklist& w) {
  const size_t meeting = static_cast<size_t>(w.patients_meeting);
  return meeting > w.patients.size() ? meeting - w.patients.size() : 0;
}

// Each practice's data coverage on the census date, by name.
nlohmann::json PracticeData(const Worklist& worklist) {
  nlohmann::json data = nlohmann::json::object();
  for (const auto& [practice, state] : worklist.practice_data) data[practice] = std::string(DataStateName(state));
  return data;
}

// ---- longitudinal measures and trajectory (docs/measures.md) ----

nlohmann::json AdherenceJson(const WorklistEntry& e) {
  nlohmann::json list = nlohmann::json::array();
  for (const AdherenceEntry& a : e.adherence) {
    list.push_back({{a.group ? "group" : "medicine", a.name}, {"pdc", a.figure.pdc},
                    {"dispensings", a.figure.dispensings}});
  }
  return list;
}

std::string LowPdc(const WorklistEntry& e) {
  std::vector<std::string> low;
  for (const AdherenceEntry& a : e.adherence) {
    if (a.figure.pdc < kAdherentPdc - 1e-12) low.push_back(a.name + " " + PdcPercent(a.figure.pdc));
  }
  return Join(low, "; ");
}

std::string TrajectoryLine(const WorklistEntry& e, const std::string& scale) {
  return e.trajectory ? TrajectoryText(*e.trajectory, scale) : "";
}

std::vector<std::string> TrajectoryCells(const WorklistEntry& e) {
  if (!e.trajectory) return {"", "", "", "", "", "", "", ""};
  const Trajectory& t = *e.trajectory;
  const auto figure = [&](auto text) { return t.before ? text(*t.before) : std::string(); };
  return {t.before_on.ToIso(),
          figure([](const BurdenFigures& b) { return std::to_string(b.items); }),
          figure([](const BurdenFigures& b) { return std::to_string(b.acb); }),
          figure([](const BurdenFigures& b) { return FormatNumber(b.dbi, 4); }),
          figure([](const BurdenFigures& b) { return std::to_string(b.falls); }),
          figure([](const BurdenFigures& b) { return FormatNumber(b.tsdd, 1); }),
          Join(t.started, "|"), Join(t.stopped, "|")};
}

}  // namespace

const char* const kRankIsSortingOrder =
    "the rank is a sorting order (more of the requested criteria met, then higher score, more items, "
    "higher DBI, older age), not a clinical priority: every criterion weighs the same, and rules that "
    "were not requested are shown but do not change the order, so judge each patient's need";

std::vector<std::string> WorklistNotes(const Worklist& worklist) {
  std::vector<std::string> notes = worklist.notes;
  notes.emplace_back(kRankIsSortingOrder);
  if (MeetingWithheld(worklist)) {
    if (NotShown(worklist) > 0) {
      notes.push_back("more patients meet the criteria than are shown: the list stops at the first " +
                      std::to_string(worklist.patients.size()));
    }
    notes.push_back(SuppressionNote(worklist.suppress_below));
  } else if (const size_t hidden = NotShown(worklist); hidden > 0) {
    notes.push_back(std::to_string(hidden) + " more patient(s) who meet the criteria are not shown: the list stops at " +
                    "the first " + std::to_string(worklist.patients.size()));
  }
  return notes;
}

std::string WorklistSummary(const Worklist& w) {
  const std::string meeting = MeetingWithheld(w) ? "fewer than " + std::to_string(w.suppress_below)
                                                 : std::to_string(w.patients_meeting);
  std::string summary = meeting + " of " + std::to_string(w.patients_considered) +
                        " registered patients meet " + Join(CriteriaKeys(w), " or ") + " on " + w.on.ToIso();
  if (NotShown(w) > 0) summary += "; the first " + std::to_string(w.patients.size()) + " are listed";
  if (w.excluded_recent_review > 0) {
    summary += "; " + std::to_string(w.excluded_recent_review) + " left out after a recent review";
  }
  if (w.excluded_age_unknown > 0) {
    summary += "; " + std::to_string(w.excluded_age_unknown) + " left out by " + w.age_min_setting + " because their age is unknown (" +
               std::to_string(w.excluded_age_unknown_meeting) + " of them meet a criterion)";
  }
  return summary;
}

nlohmann::json WorklistJson(const Worklist& worklist) {
  nlohmann::json patients = nlohmann::json::array();
  for (const WorklistEntry& e : worklist.patients) {
    patients.push_back({{"rank", e.rank}, {"patient", e.patient}, {"practice", e.practice},
                        {"age", e.age ? nlohmann::json(*e.age) : nlohmann::json(nullptr)},
                        {"items", e.items}, {"acb", e.acb}, {"dbi", e.dbi}, {"reasons", e.reasons},
                        {"rules", e.rule_ids}, {"criteria_met", e.criteria_met}, {"warnings", e.warnings},
                        {"new", e.is_new},
                        {"last_reviewed", e.last_reviewed ? nlohmann::json(e.last_reviewed->ToIso()) : nlohmann::json(nullptr)},
                        {"falls", e.falls}, {"tsdd", e.tsdd},
                        {"tsdd_band", std::string(TsddBand(e.tsdd))}, {"adherence", AdherenceJson(e)},
                        {"before", e.trajectory ? TrajectoryJson(*e.trajectory) : nlohmann::json(nullptr)}});
  }
  return {{"on", worklist.on.ToIso()}, {"criteria", CriteriaKeys(worklist)}, {"scale", worklist.scale},
          {"patients", patients}, {"patients_considered", worklist.patients_considered},
          {"patients_meeting", worklist.patients_meeting},
          {"excluded_recent_review", worklist.excluded_recent_review},
          {"excluded_age_unknown", worklist.excluded_age_unknown},
          {"excluded_age_unknown_meeting", worklist.excluded_age_unknown_meeting},
          {"patients_not_shown", NotShown(worklist)}, {"summary", WorklistSummary(worklist)},
          {"notes", WorklistNotes(worklist)}, {"warnings", worklist.notes}, {"practice_data", PracticeData(worklist)},
          {"compared_with_previous_run", worklist.has_previous_run}, {"caution", std::string(kCaution)}};
}

void WriteWorklistText(std::ostream& out, const Worklist& worklist) {
  out << "Review worklist: " << WorklistSummary(worklist) << "\n";
  for (const std::string& note : WorklistNotes(worklist)) out << "Note: " << note << ".\n";
  out << "\n";
  std::vector<std::vector<std::string>> rows;
  for (const WorklistEntry& e : worklist.patients) {
    rows.push_back({std::to_string(e.rank), e.patient + (e.is_new ? " *" : ""), e.practice, Age(e),
                    std::to_string(e.items), std::to_string(e.acb), FormatNumber(e.dbi, 2),
                    std::to_string(e.rule_ids.size()), std::to_string(e.falls), FormatNumber(e.tsdd, 0),
                    e.last_reviewed ? e.last_reviewed->ToIso() : "-"});
  }
  WriteTextTable(out, {"rank", "patient", "practice", "age", "items", ScaleLabel(worklist), "DBI", "rules", "falls", "TSDD",
                       "last review"},
                 rows);
  if (!worklist.patients.empty()) out << "\nReasons:\n";
  for (const WorklistEntry& e : worklist.patients) {
    out << std::to_string(e.rank) << ". " << e.patient << ": " << Join(e.reasons, "; ") << "\n";
    if (!e.warnings.empty()) out << "   check: " << Join(e.warnings, "; ") << "\n";
    if (e.trajectory) out << "   " << TrajectoryLine(e, worklist.scale) << "\n";
  }
  if (worklist.has_previous_run) out << "\n* new on the list since the previous run with these criteria\n";
  WriteTextCaution(out);
}

void WriteWorklistCsv(std::ostream& out, const Worklist& worklist) {
  WriteCsvCaution(out);
  WriteCsvComment(out, "census date: " + worklist.on.ToIso());
  WriteCsvComment(out, "summary: " + WorklistSummary(worklist));
  for (const std::string& note : WorklistNotes(worklist)) WriteCsvComment(out, "note: " + note);
  // "acb" is the score's key whatever the scale (as in JSON); "scale" names the scale.
  out << CsvRow({"rank", "patient", "practice", "age", "items", "acb", "scale", "dbi", "rules", "criteria_met",
                 "new", "last_reviewed", "reasons", "warnings", "falls", "tsdd", "pdc_below_80", "before_on",
                 "before_items", "before_acb", "before_dbi", "before_falls", "before_tsdd", "started", "stopped"});
  for (const WorklistEntry& e : worklist.patients) {
    std::vector<std::string> cells = {std::to_string(e.rank), e.patient, e.practice, Age(e), std::to_string(e.items),
                                      std::to_string(e.acb), worklist.scale, FormatNumber(e.dbi, 4),
                                      Join(e.rule_ids, "|"), Join(e.criteria_met, "|"), e.is_new ? "yes" : "no",
                                      LastReviewed(e), Join(e.reasons, "; "), Join(e.warnings, "; "),
                                      std::to_string(e.falls), FormatNumber(e.tsdd, 1), LowPdc(e)};
    for (std::string& cell : TrajectoryCells(e)) cells.push_back(std::move(cell));
    out << CsvRow(cells);
  }
}

void WriteWorklistHtmlTable(std::ostream& out, const Worklist& worklist) {
  std::vector<std::vector<std::string>> rows;
  for (const WorklistEntry& e : worklist.patients) {
    rows.push_back({std::to_string(e.rank), e.patient + (e.is_new ? " (new)" : ""), e.practice, Age(e),
                    std::to_string(e.items), std::to_string(e.acb), FormatNumber(e.dbi, 2),
                    std::to_string(e.falls), FormatNumber(e.tsdd, 0), LastReviewed(e),
                    Join(e.reasons, "; ") + (e.warnings.empty() ? "" : ". Check: " + Join(e.warnings, "; ")) +
                        (e.trajectory ? ". " + TrajectoryLine(e, worklist.scale) : "")});
  }
  WriteHtmlTable(out, {"rank", "patient", "practice", "age", "items", ScaleLabel(worklist), "DBI", "falls", "TSDD",
                       "last review", "reasons"},
                 rows);
}

void WriteWorklistHtmlNotes(std::ostream& out, const Worklist& worklist) {
  for (const std::string& note : WorklistNotes(worklist)) out << "<p class=\"note\">" << EscapeHtml(note) << ".</p>\n";
}

void WriteWorklistHtml(std::ostream& out, const Worklist& worklist, const std::string& title) {
  WriteHtmlStart(out, title);
  out << "<p>" << EscapeHtml(WorklistSummary(worklist)) << ".</p>\n";
  WriteWorklistHtmlNotes(out, worklist);
  WriteWorklistHtmlTable(out, worklist);
  WriteHtmlEnd(out);
}

}  // namespace medload
