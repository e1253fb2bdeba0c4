#include "medload/report/report.h"

#include <algorithm>
#include <set>
#include <utility>

#include "medload/burden/patient_facts.h"
#include "medload/burden/patient_pass.h"
#include "medload/burden/run_context.h"
#include "medload/cohort/cohort_table.h"
#include "medload/report/census_cache.h"
#include "medload/format/suppression.h"
#include "medload/store/practice_codes.h"

namespace medload {
namespace {

constexpr long kProgressEvery = 5000;

// The month ends of the `months - 1` months before `on`, then `on` itself.
std::vector<Date> CensusDates(Date on, int months) {
  std::vector<Date> dates;
  for (int back = months - 1; back >= 1; --back) {
    int year = on.year();
    int month = on.month() - back;
    while (month < 1) {
      month += 12;
      --year;
    }
    dates.push_back(EndOfMonth(Date::FromCivil(year, month, 1)));
  }
  dates.push_back(on);
  return dates;
}

std::vector<std::string> EntryWarnings(const Burden& burden) {
  std::vector<std::string> warnings;
  if (!burden.dbi_incomplete.empty()) {
    std::string names;
    for (const std::string& name : burden.dbi_incomplete) names += (names.empty() ? "" : ", ") + name;
    warnings.push_back("dose unknown: " + names);
  }
  if (burden.age_unknown_for_rules) warnings.push_back("age unknown: age-limited rules not checked");
  return warnings;
}

// The practices the report covers: the configured list, or every practice in the store
// and every practice seen in the counts (codes that are empty or "unknown" left out).
Result<std::vector<PracticeRecord>> ChoosePractices(const std::vector<PracticeRecord>& known,
                                                    const ReportConfig& config,
                                                    const CohortTally& tally) {
  std::map<std::string, PracticeRecord> by_code;
  for (const PracticeRecord& record : known) by_code[record.practice] = record;
  std::vector<PracticeRecord> chosen;
  if (!config.practices.empty()) {
    for (const std::string& code : config.practices) {
      const auto it = by_code.find(code);
      if (it == by_code.end() && tally.groups.count(code) == 0) {
        std::set<std::string> codes;  // the practices table and every practice the counts saw
        for (const auto& [known_code, record] : by_code) codes.insert(known_code);
        for (const auto& [group, cells] : tally.groups) {
          if (!group.empty() && group != kUnknownGroup) codes.insert(group);
        }
        return Status::Input("the config's /practices: " +
                             UnknownPracticeMessage(code, std::vector<std::string>(codes.begin(), codes.end())));
      }
      chosen.push_back(it != by_code.end() ? it->second : PracticeRecord{code, "", "", std::nullopt});
    }
  } else {
    for (const auto& [code, cells] : tally.groups) {
      if (!code.empty() && code != kUnknownGroup && by_code.count(code) == 0) {
        by_code[code] = PracticeRecord{code, "", "", std::nullopt};
      }
    }
    for (const auto& [code, record] : by_code) chosen.push_back(record);
  }
  std::sort(chosen.begin(), chosen.end(),
            [](const PracticeRecord& a, const PracticeRecord& b) { return a.practice < b.practice; });
  return chosen;
}

ReportSeries SeriesOf(const PracticeRecord& practice, const CohortTally& tally, size_t keys,
                      size_t dates, int history_days) {
  ReportSeries series;
  series.code = practice.practice;
  series.name = practice.name;
  series.list_size = practice.list_size;
  series.registered.assign(dates, 0);
  series.counts.assign(keys, std::vector<long>(dates, 0));
  series.practices_without_data.assign(dates, 0);
  const auto span = tally.spans.find(practice.practice);
  for (size_t d = 0; d < dates; ++d) {
    series.data.push_back(DataStateOn(span == tally.spans.end() ? std::nullopt : std::optional<DataSpan>(span->second),
                                      tally.dates[d], history_days));
  }
  const auto it = tally.groups.find(practice.practice);
  if (it == tally.groups.end()) return series;
  for (size_t d = 0; d < dates && d < it->second.size(); ++d) {
    series.registered[d] = it->second[d].registered;
    for (size_t k = 0; k < keys && k < it->second[d].counts.size(); ++k) series.counts[k][d] = it->second[d].counts[k];
  }
  return series;
}

// Adds a practice's series into the network total on the dates it has figures, and
// combines the coverage states (REQUIRES: `into.data` starts all kNoData).
void AddSeries(ReportSeries& into, const ReportSeries& from) {
  for (size_t d = 0; d < into.registered.size(); ++d) {
    if (!HasFigures(from.data[d])) {
      ++into.practices_without_data[d];
      continue;
    }
    into.registered[d] += from.registered[d];
    for (size_t k = 0; k < into.counts.size(); ++k) into.counts[k][d] += from.counts[k][d];
    DataState& state = into.data[d];
    if (from.data[d] == DataState::kShortHistory || state == DataState::kNoData) state = from.data[d];
    else if (from.data[d] == DataState::kBeyondData && state == DataState::kFull) state = from.data[d];
  }
}

}  // namespace

Result<Date> LatestCensusDate(const StoreSummary& summary) {
  if (!summary.latest_dispensed) return Status::Input("the store holds no dispensing; \"on\": \"latest\" needs data");
  const Date latest = *summary.latest_dispensed;
  if (EndOfMonth(latest) == latest) return latest;
  return Date::FromCivil(latest.year(), latest.month(), 1) - 1;
}

namespace {

// The pass: the cohort counter gets every patient; the census date's burden, computed once
// inside the counter's call, also gives the worklist row.
struct Pass {
  CohortCounter counter;
  ReviewDates reviewed;                    // for reviewed_within and the last review column
  std::map<std::string, Worklist> lists;   // practice -> rows and figures, unranked
  long patients = 0;
  // practice (the registry's; "" when none) -> patients whose oldest dispensings the
  // store's bound left out
  std::map<std::string, long> capped;
};

// Adds the patient registered at `practice` on the census date to its list, after the
// config's age and review filters (each counted, as review counts them).
void AddToList(Pass& pass, PassPatient& patient, const std::string& practice, const std::optional<Burden>& census,
               const ReportConfig& config, Date on, const BurdenTables& tables) {
  const PatientHistory& history = patient.history();
  Worklist& list = pass.lists[practice];
  const std::optional<int> age = AgeOn(history.registry, on);
  if (config.age_min && age && *age < *config.age_min) return;
  // The counter does not evaluate a patient whom age_min leaves out.
  const Burden burden = census ? *census : patient.Evaluate(on, age);
  WorklistEntry entry;
  for (const Criterion& criterion : config.criteria) {
    if (criterion.Met(burden)) entry.criteria_met.push_back(criterion.Key());
  }
  if (config.age_min && !age) {
    ++list.excluded_age_unknown;
    if (!entry.criteria_met.empty()) ++list.excluded_age_unknown_meeting;
    return;
  }
  ++list.patients_considered;
  if (entry.criteria_met.empty()) return;
  const auto reviews = pass.reviewed.find(history.patient_id);
  if (reviews != pass.reviewed.end()) {
    if (config.reviewed_within_days && ReviewedWithin(reviews->second, on, *config.reviewed_within_days)) {
      ++list.excluded_recent_review;
      return;
    }
    entry.last_reviewed = LastReviewOn(reviews->second, on);
  }
  FillFigures(entry, history.patient_id, practice, age, patient.timeline(), burden, tables);
  entry.warnings = EntryWarnings(burden);
  // Longitudinal fields and the trajectory; the earlier date's coverage is marked after
  // the pass (FinishWorklist), when each practice's data span is known.
  const Date before_on = MonthsBefore(on, kTrajectoryMonths);
  FillLongitudinal(entry, patient.timeline(), burden, patient.Evaluate(before_on, AgeOn(history.registry, before_on)),
                   DataState::kFull);
  list.patients.push_back(std::move(entry));
}

Status RunPass(const Store& store, RunContext& analysis, const ReportConfig& config, Date on,
               Pass& pass, const ReportProgress& progress) {
  return ForEachPatientTimeline(store, analysis, [&](PassPatient& patient) {
    const PatientHistory& history = patient.history();
    ++pass.patients;
    if (history.dropped > 0) ++pass.capped[history.registry ? history.registry->practice : ""];
    pass.counter.See(history);
    if (progress && pass.patients % kProgressEvery == 0) progress(pass.patients);
    std::optional<Burden> census;
    pass.counter.Add(history, [&](Date date, std::optional<int> age) {
      Burden burden = patient.Evaluate(date, age);
      if (date == on) census = burden;
      return burden;
    });
    const std::optional<std::string> practice = RegisteredPractice(history, on);
    if (practice) AddToList(pass, patient, *practice, census, config, on, analysis.tables());
    return true;
  });
}

// Ranks a practice's rows, marks those not on the previous report's list of the practice
// (when it kept one), keeps the first worklist_limit and pseudonymises them.
Worklist FinishWorklist(Worklist worklist, const std::string& practice, const ReportModel& model,
                        const std::string& scale, const std::function<std::string(const std::string&)>& pseudonymise,
                        std::vector<std::string>& listed) {
  worklist.on = model.on;
  worklist.criteria = model.config.criteria;
  worklist.scale = scale;
  worklist.age_min_setting = "age_min";
  std::vector<WorklistEntry>& rows = worklist.patients;
  for (WorklistEntry& row : rows) {
    if (!row.trajectory) continue;
    const auto span = model.tally.spans.find(row.practice);
    MarkTrajectoryCoverage(*row.trajectory,
                           DataStateOn(span == model.tally.spans.end() ? std::nullopt : std::optional<DataSpan>(span->second),
                                       row.trajectory->before_on, model.history_days));
  }
  std::sort(rows.begin(), rows.end(), RanksBefore);
  worklist.patients_meeting = static_cast<long>(rows.size());
  for (const WorklistEntry& row : rows) listed.push_back(row.patient);
  if (model.previous && model.previous->listed) {
    worklist.has_previous_run = true;
    const auto before = model.previous->listed->find(practice);
    for (WorklistEntry& row : rows) {
      row.is_new = before == model.previous->listed->end() || before->second.count(row.patient) == 0;
    }
  }
  if (rows.size() > model.config.worklist_limit) rows.resize(model.config.worklist_limit);
  for (size_t i = 0; i < rows.size(); ++i) {
    rows[i].rank = static_cast<int>(i + 1);
    if (pseudonymise) rows[i].patient = pseudonymise(rows[i].patient);
  }
  return worklist;
}

}  // namespace

namespace {

// The model's census dates, keys and provenance, and the checks worth making before the
// pass (rule ids, practice codes).
Status PrepareModel(const Store& store, const RunContext& analysis, ReportModel& model) {
  const ReportConfig& config = model.config;
  auto summary = store.Summary();
  if (!summary.ok()) return summary.status();
  model.data = *summary;
  if (config.on) {
    model.on = *config.on;
  } else {
    auto latest = LatestCensusDate(model.data);
    if (!latest.ok()) return latest.status();
    model.on = *latest;
  }
  model.dates = CensusDates(model.on, config.months);
  if (Status status = CheckRulesExist(config.criteria, analysis.tables()); !status.ok()) return status;
  // Before the pass, so that a typing slip does not cost a whole run.
  if (Status known = CheckPracticeCodes(store, config.practices); !known.ok()) {
    return known.code() == StatusCode::kInput ? Status::Input("the config's /practices: " + known.message()) : known;
  }
  for (const Criterion& criterion : config.criteria) model.keys.push_back(criterion.Key());
  model.keys.push_back("any");
  model.measure = DescribeMeasure(analysis.options());
  model.formulary_checksum = analysis.formulary().checksum();
  model.history_days = HistoryDays(analysis.options());
  return Status::Ok();
}

// The series of the chosen practices, the network total and each practice's worklist.
void AssembleModel(const std::vector<PracticeRecord>& chosen, Pass& pass, const std::string& scale,
                   const std::function<std::string(const std::string&)>& pseudonymise, ReportModel& model) {
  const size_t dates = model.dates.size();
  model.network = ReportSeries{model.config.network, model.config.network, std::nullopt,
                               std::vector<long>(dates, 0),
                               std::vector<std::vector<long>>(model.keys.size(), std::vector<long>(dates, 0)),
                               std::vector<DataState>(dates, DataState::kNoData), std::vector<long>(dates, 0)};
  for (const PracticeRecord& practice : chosen) {
    model.practices.push_back(SeriesOf(practice, model.tally, model.keys.size(), dates, model.history_days));
    AddSeries(model.network, model.practices.back());
    model.worklists[practice.practice] = FinishWorklist(std::move(pass.lists[practice.practice]), practice.practice,
                                                        model, scale, pseudonymise, model.listed[practice.practice]);
  }
}

// The pass, with the census dates the cache serves skipped and their figures put back;
// the figures of the dates it counted are kept in the cache to save. When some patient's
// oldest dispensings were left out by the store's bound, a figure for an older date may
// depend on later dispensings: then nothing is served (the pass runs again counting every
// date) and nothing is saved.
Result<Pass> CountPatients(const Store& store, RunContext& analysis, const ReportConfig& config,
                           const CohortCounter& fresh_counter, ReportModel& model, const ReportProgress& progress) {
  CensusCache& cache = model.census_cache;
  std::vector<bool> skipped(model.dates.size(), false);
  for (size_t d = 0; d < model.dates.size(); ++d) skipped[d] = cache.served.count(model.dates[d]) > 0;
  auto reviewed = ReadReviewDates(store);
  if (!reviewed.ok()) return reviewed.status();
  Pass pass{fresh_counter, std::move(*reviewed), {}, 0, {}};
  pass.counter.SkipDates(skipped);
  if (Status status = SeeOtherShards(store, pass.counter); !status.ok()) return status;
  if (Status status = RunPass(store, analysis, config, model.on, pass, progress); !status.ok()) return status;
  if (!pass.capped.empty() && !cache.served.empty()) {
    cache.served.clear();
    return CountPatients(store, analysis, config, fresh_counter, model, progress);
  }
  if (progress) progress(pass.patients);
  for (size_t d = 0; d < model.dates.size(); ++d) {
    if (skipped[d]) pass.counter.PutFigures(d, cache.served.at(model.dates[d]));
    else if (pass.capped.empty()) cache.counted.emplace_back(model.dates[d], pass.counter.FiguresOn(d));
  }
  return pass;
}

}  // namespace

Result<ReportModel> BuildReportModel(const Store& store, RunContext& analysis, const ReportConfig& config,
                                     const std::function<std::string(const std::string&)>& pseudonymise,
                                     const ReportProgress& progress) {
  ReportModel model;
  model.config = config;
  if (Status status = PrepareModel(store, analysis, model); !status.ok()) return status;
  auto known = store.Practices();
  if (!known.ok()) return known.status();
  std::map<std::string, std::string> networks;
  for (const PracticeRecord& record : *known) networks[record.practice] = record.network;
  CohortOptions cohort;
  cohort.dates = model.dates;
  cohort.group_by = GroupBy::kPractice;
  cohort.criteria = config.criteria;
  cohort.age_min = config.age_min;
  auto cache = OpenCensusCache(store, config, analysis, model.dates, model.on);
  if (!cache.ok()) return cache.status();
  model.census_cache = std::move(*cache);
  auto counted = CountPatients(store, analysis, config, CohortCounter(cohort, networks, model.measure), model, progress);
  if (!counted.ok()) return counted.status();
  Pass& pass = *counted;
  model.patients_seen = pass.patients;
  model.capped_patients = std::move(pass.capped);
  model.history_bound = store.history_bound();
  model.tally = pass.counter.Take();
  auto chosen = ChoosePractices(*known, config, model.tally);
  if (!chosen.ok()) return chosen.status();
  auto previous = store.LatestRun("report", ReportRunKey(model), model.on.ToIso());
  if (!previous.ok()) return previous.status();
  if (previous->has_value()) model.previous = ParsePreviousReport(**previous);
  AssembleModel(*chosen, pass, analysis.tables().scale, pseudonymise, model);
  return model;
}

std::string ReportRunKey(const ReportModel& model) {
  std::string key = "network=" + model.config.network + "|criteria=";
  for (size_t k = 0; k + 1 < model.keys.size(); ++k) key += (k == 0 ? "" : ";") + model.keys[k];
  key += "|measure=" + model.measure;
  if (model.config.age_min) key += "|age_min=" + std::to_string(*model.config.age_min);
  return key;
}

nlohmann::json ReportRunPayload(const ReportModel& model) {
  nlohmann::json counts = nlohmann::json::object();
  nlohmann::json data = nlohmann::json::object();
  for (const ReportSeries& series : model.practices) {
    nlohmann::json values = nlohmann::json::array();
    for (const auto& per_date : series.counts) values.push_back(per_date.back());
    counts[series.code] = values;
    data[series.code] = std::string(DataStateName(series.data.back()));
  }
  nlohmann::json listed = nlohmann::json::object();
  for (const auto& [practice, ids] : model.listed) listed[practice] = ids;
  return {{"on", model.on.ToIso()}, {"keys", model.keys}, {"counts", counts}, {"data", data}, {"listed", listed}};
}

std::optional<PreviousReport> ParsePreviousReport(const std::string& payload) {
  const nlohmann::json doc = nlohmann::json::parse(payload, nullptr, false);
  if (!doc.is_object() || !doc.contains("on") || !doc.at("on").is_string() || !doc.contains("counts") ||
      !doc.at("counts").is_object()) {
    return std::nullopt;
  }
  const std::optional<Date> on = ParseDate(doc.at("on").get<std::string>());
  if (!on) return std::nullopt;
  PreviousReport previous;
  previous.on = *on;
  for (const auto& item : doc.at("counts").items()) {
    if (!item.value().is_array()) return std::nullopt;
    std::vector<long> values;
    for (const auto& value : item.value()) {
      if (!value.is_number_integer()) return std::nullopt;
      values.push_back(value.get<long>());
    }
    previous.counts[item.key()] = std::move(values);
  }
  if (doc.contains("listed") && doc.at("listed").is_object()) {  // absent in reports saved before lists were kept
    previous.listed.emplace();
    for (const auto& item : doc.at("listed").items()) {
      if (!item.value().is_array()) return std::nullopt;
      auto& ids = (*previous.listed)[item.key()];
      for (const auto& id : item.value()) {
        if (!id.is_string()) return std::nullopt;
        ids.insert(id.get<std::string>());
      }
    }
  }
  if (doc.contains("data") && doc.at("data").is_object()) {
    for (const auto& item : doc.at("data").items()) {
      for (const DataState state : {DataState::kNoData, DataState::kShortHistory, DataState::kFull,
                                    DataState::kBeyondData}) {
        if (item.value().is_string() && item.value().get<std::string>() == DataStateName(state)) {
          previous.data[item.key()] = state;
        }
      }
    }
  }
  return previous;
}

Change SeriesChange(const ReportSeries& series, size_t key, size_t back, long suppress_below) {
  const std::vector<long>& counts = series.counts[key];
  if (counts.size() <= back) return {};
  const size_t last = counts.size() - 1;
  if (!Comparable(series.data[last]) || !Comparable(series.data[last - back])) return {};
  if (IsSuppressed(counts[last], suppress_below) || IsSuppressed(counts[last - back], suppress_below)) return {};
  return ChangeOf(counts[last], counts[last - back]);
}

Change ChangeOf(std::optional<long> now, std::optional<long> before) {
  Change change;
  if (!now || !before) return change;
  change.patients = *now - *before;
  if (*before != 0) change.percent = 100.0 * static_cast<double>(*now - *before) / static_cast<double>(*before);
  return change;
}

}  // namespace medload
