#include "medload/io/worklist_writer.h"

#include <ostream>

#include "medload/core/caution.h"
#include "medload/io/output.h"

namespace medload {
namespace {

std::string Join(const std::vector<std::string>& parts, std::string_view separator) {
  std::string joined;
  for (const auto& part : parts) joined += (joined.empty() ? "" : std::string(separator)) + part;
  return joined;
}

std::string Age(const WorklistEntry& e) { return e.age ? std::to_string(*e.age) : ""; }

std::vector<std::string> CriteriaKeys(const Worklist& worklist) {
  std::vector<std::string> keys;
  for (const Criterion& c : worklist.criteria) keys.push_back(c.Key());
  return keys;
}

std::string Summary(const Worklist& w) {
  return std::to_string(w.patients_meeting) + " of " + std::to_string(w.patients_considered) +
         " registered patients meet " + Join(CriteriaKeys(w), " or ") + " on " + w.on.ToIso() +
         (w.patients.size() < static_cast<size_t>(w.patients_meeting)
              ? "; the first " + std::to_string(w.patients.size()) + " are listed"
              : "") +
         (w.excluded_recent_review > 0
              ? "; " + std::to_string(w.excluded_recent_review) + " left out after a recent review"
              : "");
}

}  // namespace

nlohmann::json WorklistJson(const Worklist& worklist) {
  nlohmann::json patients = nlohmann::json::array();
  for (const WorklistEntry& e : worklist.patients) {
    patients.push_back({{"rank", e.rank}, {"patient", e.patient}, {"practice", e.practice},
                        {"age", e.age ? nlohmann::json(*e.age) : nlohmann::json(nullptr)},
                        {"items", e.items}, {"acb", e.acb}, {"dbi", e.dbi}, {"reasons", e.reasons},
                        {"rules", e.rule_ids}, {"criteria_met", e.criteria_met}, {"warnings", e.warnings},
                        {"new", e.is_new}});
  }
  return {{"on", worklist.on.ToIso()}, {"criteria", CriteriaKeys(worklist)}, {"scale", worklist.scale},
          {"patients", patients}, {"patients_considered", worklist.patients_considered},
          {"patients_meeting", worklist.patients_meeting},
          {"excluded_recent_review", worklist.excluded_recent_review},
          {"compared_with_previous_run", worklist.has_previous_run}, {"caution", std::string(kCaution)}};
}

void WriteWorklistText(std::ostream& out, const Worklist& worklist) {
  out << "Review worklist: " << Summary(worklist) << "\n\n";
  std::vector<std::vector<std::string>> rows;
  for (const WorklistEntry& e : worklist.patients) {
    rows.push_back({std::to_string(e.rank), e.patient + (e.is_new ? " *" : ""), e.practice, Age(e),
                    std::to_string(e.items), std::to_string(e.acb), FormatNumber(e.dbi, 2),
                    std::to_string(e.rule_ids.size())});
  }
  WriteTextTable(out, {"rank", "patient", "practice", "age", "items", worklist.scale, "DBI", "rules"}, rows);
  if (!worklist.patients.empty()) out << "\nReasons:\n";
  for (const WorklistEntry& e : worklist.patients) {
    out << std::to_string(e.rank) << ". " << e.patient << ": " << Join(e.reasons, "; ") << "\n";
    if (!e.warnings.empty()) out << "   check: " << Join(e.warnings, "; ") << "\n";
  }
  if (worklist.has_previous_run) out << "\n* new on the list since the previous run with these criteria\n";
  WriteTextCaution(out);
}

void WriteWorklistCsv(std::ostream& out, const Worklist& worklist) {
  WriteCsvCaution(out);
  out << CsvRow({"rank", "patient", "practice", "age", "items", "acb", "dbi", "rules", "criteria_met", "new",
                 "reasons", "warnings"});
  for (const WorklistEntry& e : worklist.patients) {
    out << CsvRow({std::to_string(e.rank), e.patient, e.practice, Age(e), std::to_string(e.items),
                   std::to_string(e.acb), FormatNumber(e.dbi, 4), Join(e.rule_ids, "|"), Join(e.criteria_met, "|"),
                   e.is_new ? "yes" : "no", Join(e.reasons, "; "), Join(e.warnings, "; ")});
  }
}

void WriteWorklistHtmlTable(std::ostream& out, const Worklist& worklist) {
  std::vector<std::vector<std::string>> rows;
  for (const WorklistEntry& e : worklist.patients) {
    rows.push_back({std::to_string(e.rank), e.patient + (e.is_new ? " (new)" : ""), e.practice, Age(e),
                    std::to_string(e.items), std::to_string(e.acb), FormatNumber(e.dbi, 2),
                    Join(e.reasons, "; ") + (e.warnings.empty() ? "" : ". Check: " + Join(e.warnings, "; "))});
  }
  WriteHtmlTable(out, {"rank", "patient", "practice", "age", "items", worklist.scale, "DBI", "reasons"}, rows);
}

void WriteWorklistHtml(std::ostream& out, const Worklist& worklist, const std::string& title) {
  WriteHtmlStart(out, title);
  out << "<p>" << EscapeHtml(Summary(worklist)) << ".</p>\n";
  WriteWorklistHtmlTable(out, worklist);
  WriteHtmlEnd(out);
}

}  // namespace medload
