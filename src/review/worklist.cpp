#include "medload/review/worklist.h"

#include <algorithm>
#include <set>
#include <unordered_map>

#include <nlohmann/json.hpp>

#include "medload/burden/patient_facts.h"
#include "medload/burden/patient_pass.h"
#include "medload/burden/route_notes.h"
#include "medload/core/text.h"
#include "medload/format/json_text.h"
#include "medload/format/output.h"
#include "medload/store/store.h"

namespace medload {
namespace {

// A completed review in the `days` days ending on D.
bool RecentlyReviewed(const std::vector<Date>& reviews, Date on, int days) {
  return std::any_of(reviews.begin(), reviews.end(), [&](Date d) { return d <= on && d > on - days; });
}

std::string RunKey(const WorklistOptions& options, const std::string& scale) {
  std::vector<std::string> parts;
  for (const Criterion& c : options.criteria) parts.push_back(c.Key());
  std::sort(parts.begin(), parts.end());
  std::vector<std::string> practices = options.practices;
  std::sort(practices.begin(), practices.end());
  return "criteria=" + Join(parts, ";") + "|practices=" + Join(practices, ";") + "|age_min=" +
         (options.age_min ? std::to_string(*options.age_min) : "") + "|scale=" + scale;
}

}  // namespace

bool RanksBefore(const WorklistEntry& a, const WorklistEntry& b) {
  if (a.rule_ids.size() != b.rule_ids.size()) return a.rule_ids.size() > b.rule_ids.size();
  if (a.acb != b.acb) return a.acb > b.acb;
  if (a.items != b.items) return a.items > b.items;
  if (a.dbi != b.dbi) return a.dbi > b.dbi;
  if (a.age != b.age) {
    if (!a.age || !b.age) return a.age.has_value();
    return *a.age > *b.age;
  }
  return a.patient < b.patient;
}

std::vector<std::string> ExplainBurden(const Timeline& timeline, const Burden& burden,
                                       const BurdenTables& tables) {
  std::vector<std::string> reasons;
  reasons.push_back(std::to_string(burden.items) + (burden.items == 1 ? " medicine" : " medicines"));
  if (burden.acb > 0) {
    std::vector<std::string> parts;
    for (const auto& c : burden.score_contributions) parts.push_back(c.ingredient + " " + std::to_string(c.score));
    std::string scale = tables.scale;
    std::transform(scale.begin(), scale.end(), scale.begin(), [](unsigned char ch) { return static_cast<char>(std::toupper(ch)); });
    reasons.push_back(scale + " " + std::to_string(burden.acb) + ": " + Join(parts, ", "));
  }
  if (burden.dbi > 0) {
    std::vector<std::string> parts;
    for (const auto& c : burden.dbi_contributions) {
      parts.push_back(c.ingredient + " " + FormatNumber(c.value, 2) + DoseBasisMark(c));
    }
    reasons.push_back("DBI " + FormatNumber(burden.dbi, 2) + ": " + Join(parts, ", "));
  }
  for (const FiredRule& fired : burden.rules) {
    std::vector<std::string> names;
    for (size_t index : fired.medicines) names.push_back(Join(timeline.medicines[index].ingredients, "+"));
    reasons.push_back("rule: " + fired.rule->title + " (" + Join(names, ", ") + ")");
  }
  return reasons;
}

namespace {

std::vector<std::string> EntryWarnings(const Timeline& timeline, const Burden& burden, Date on,
                                       int max_supply_days) {
  std::vector<std::string> warnings;
  const auto recent = [&](const UnmatchedProduct& product) {
    const std::optional<Date> last = product.LastBy(on);
    return last && *last > on - max_supply_days;
  };
  int unmatched = 0, partial = 0, approximate = 0;
  for (const auto& product : timeline.unmatched) unmatched += recent(product) ? 1 : 0;
  for (const auto& product : timeline.flagged) {
    if (!recent(product)) continue;
    (product.match == MatchKind::kPartial ? partial : approximate) += 1;
  }
  if (unmatched > 0) warnings.push_back(std::to_string(unmatched) + " recent product(s) not recognised");
  if (partial > 0) warnings.push_back(std::to_string(partial) + " recent product(s) recognised only in part");
  if (approximate > 0) warnings.push_back(std::to_string(approximate) + " recent product(s) read from a close spelling");
  if (!burden.dbi_incomplete.empty()) warnings.push_back("dose unknown: " + Join(burden.dbi_incomplete, ", "));
  if (burden.age_unknown_for_rules) warnings.push_back("age unknown: age-limited rules not checked");
  std::vector<std::string> not_stated;
  for (const ActiveMedicine& active : burden.active) {
    if (RouteNotStated(active)) not_stated.push_back(Join(timeline.medicines[active.medicine].ingredients, "+"));
  }
  if (!not_stated.empty()) warnings.push_back("route not stated, counted as systemic: " + Join(not_stated, ", "));
  return warnings;
}

// Each practice's data coverage on the date, a note for each that is not full, and a
// warning on each row of such a practice.
void NoteCoverage(const PracticeSpans& spans, int history_days, Worklist& worklist) {
  for (auto& [practice, state] : worklist.practice_data) {
    const auto it = spans.find(practice);
    const std::optional<DataSpan> span = it == spans.end() ? std::nullopt : std::optional<DataSpan>(it->second);
    state = DataStateOn(span, worklist.on, history_days);
    if (auto note = DataStateNote(practice, state, span, worklist.on, history_days)) worklist.notes.push_back(*note);
  }
  for (WorklistEntry& entry : worklist.patients) {
    const DataState state = worklist.practice_data[entry.practice];
    if (state != DataState::kFull) entry.warnings.push_back("practice data " + std::string(DataStateName(state)));
  }
}

}  // namespace

Result<Worklist> BuildWorklist(Store& store, RunContext& analysis, const WorklistOptions& options) {
  if (options.criteria.empty()) {
    return Status::Usage("a worklist needs at least one criterion (items>=N, acb>=N, dbi>=X or rule:ID)");
  }
  if (Status status = CheckRulesExist(options.criteria, analysis.tables()); !status.ok()) return status;
  std::unordered_map<std::string, std::vector<Date>> reviewed;  // patient -> review dates
  if (options.reviewed_within_days) {
    auto reviews = store.Reviews();
    if (!reviews.ok()) return reviews.status();
    for (const ReviewRecord& review : *reviews) reviewed[review.patient_id].push_back(review.reviewed_on);
  }
  Worklist worklist;
  worklist.on = options.on;
  worklist.criteria = options.criteria;
  worklist.scale = analysis.tables().scale;
  const std::set<std::string> practices(options.practices.begin(), options.practices.end());
  PassFacts facts;
  Status status = ForEachPatientTimeline(store, analysis, [&](PassPatient& patient) {
    const PatientHistory& history = patient.history();
    const auto practice = RegisteredPractice(history, options.on);
    if (!practice || (!practices.empty() && practices.count(*practice) == 0)) return true;
    worklist.practice_data.try_emplace(*practice, DataState::kFull);
    const std::optional<int> age = AgeOn(history.registry, options.on);
    if (options.age_min && age && *age < *options.age_min) return true;
    const Timeline& timeline = patient.timeline();
    const Burden burden = analysis.Evaluate(timeline, options.on, age);
    WorklistEntry entry;
    for (const Criterion& criterion : options.criteria) {
      if (criterion.Met(burden)) entry.criteria_met.push_back(criterion.Key());
    }
    if (options.age_min && !age) {
      ++worklist.excluded_age_unknown;
      if (!entry.criteria_met.empty()) ++worklist.excluded_age_unknown_meeting;
      return true;
    }
    ++worklist.patients_considered;
    if (entry.criteria_met.empty()) return true;
    if (options.reviewed_within_days) {
      const auto it = reviewed.find(history.patient_id);
      if (it != reviewed.end() && RecentlyReviewed(it->second, options.on, *options.reviewed_within_days)) {
        ++worklist.excluded_recent_review;
        return true;
      }
    }
    entry.patient = history.patient_id;
    entry.practice = *practice;
    entry.age = age;
    entry.items = burden.items;
    entry.acb = burden.acb;
    entry.dbi = burden.dbi;
    for (const FiredRule& fired : burden.rules) entry.rule_ids.push_back(fired.rule->id);
    entry.reasons = ExplainBurden(timeline, burden, analysis.tables());
    entry.warnings = EntryWarnings(timeline, burden, options.on, analysis.options().supply.max_supply_days);
    worklist.patients.push_back(std::move(entry));
    return true;
  }, &facts);
  if (!status.ok()) return status;
  NoteCoverage(facts.practice_spans, HistoryDays(analysis.options()), worklist);
  std::sort(worklist.patients.begin(), worklist.patients.end(), RanksBefore);
  worklist.patients_meeting = static_cast<long>(worklist.patients.size());
  if (options.remember_run) {
    if (Status saved = MarkNewAndSave(store, options, worklist); !saved.ok()) return saved;
  }
  if (options.limit && worklist.patients.size() > *options.limit) worklist.patients.resize(*options.limit);
  for (size_t i = 0; i < worklist.patients.size(); ++i) worklist.patients[i].rank = static_cast<int>(i + 1);
  return worklist;
}

Status MarkNewAndSave(Store& store, const WorklistOptions& options, Worklist& worklist) {
  const std::string key = RunKey(options, worklist.scale);
  auto previous = store.LatestRun("review", key, worklist.on.ToIso());
  if (!previous.ok()) return previous.status();
  std::set<std::string> before;
  if (previous->has_value()) {
    worklist.has_previous_run = true;
    const auto json = nlohmann::json::parse(**previous, nullptr, false);
    if (json.is_object() && json.contains("patients") && json["patients"].is_array()) {
      for (const auto& id : json["patients"]) {
        if (id.is_string()) before.insert(id.get<std::string>());
      }
    }
  }
  nlohmann::json saved = {{"on", worklist.on.ToIso()}, {"patients", nlohmann::json::array()}};
  for (WorklistEntry& entry : worklist.patients) {
    entry.is_new = worklist.has_previous_run && before.count(entry.patient) == 0;
    saved["patients"].push_back(entry.patient);
  }
  return store.SaveRun("review", key, worklist.on.ToIso(), JsonText(saved, -1));
}

}  // namespace medload
