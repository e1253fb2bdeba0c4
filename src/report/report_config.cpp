#include "medload/report/report_config.h"

#include <cmath>
#include <fstream>
#include <set>
#include <utility>
#include <vector>

#include "medload/input/json_file.h"

namespace medload {
namespace {

using nlohmann::json;

// Arrays and objects nested deeper than this are refused before the document is copied:
// a config needs four levels, and the JSON library copies and prints values recursively.
constexpr size_t kMaxNesting = 32;

// True if `doc` has arrays or objects more than `limit` levels deep (walked without
// recursion, so any depth is safe to ask about).
bool NestedDeeperThan(const json& doc, size_t limit) {
  std::vector<std::pair<const json*, size_t>> stack = {{&doc, 1}};
  while (!stack.empty()) {
    const auto [value, depth] = stack.back();
    stack.pop_back();
    if (!value->is_structured()) continue;
    if (depth > limit) return true;
    for (const json& child : *value) stack.emplace_back(&child, depth + 1);
  }
  return false;
}

// Builds messages "FILE: /pointer: fault".
class Reader {
 public:
  explicit Reader(const std::string& file) : file_(file) {}

  Status Fault(const std::string& pointer, const std::string& fault) const {
    return Status::Input(file_ + ": " + (pointer.empty() ? "/" : pointer) + ": " + fault);
  }
  Status String(const json& doc, const std::string& key, const std::string& at, std::string& out) const {
    if (!doc.contains(key)) return Status::Ok();
    if (!doc.at(key).is_string()) return Fault(at + "/" + key, "must be a string");
    out = doc.at(key).get<std::string>();
    return Status::Ok();
  }
  Status Integer(const json& doc, const std::string& key, const std::string& at, long min, long max,
                 long& out) const {
    if (!doc.contains(key)) return Status::Ok();
    const json& value = doc.at(key);
    if (!value.is_number_integer()) return Fault(at + "/" + key, "must be a whole number");
    const long number = value.get<long>();
    if (number < min || number > max) {
      return Fault(at + "/" + key, std::to_string(number) + " is outside " + std::to_string(min) + " to " +
                                       std::to_string(max));
    }
    out = number;
    return Status::Ok();
  }
  Status Bool(const json& doc, const std::string& key, const std::string& at, bool& out) const {
    if (!doc.contains(key)) return Status::Ok();
    if (!doc.at(key).is_boolean()) return Fault(at + "/" + key, "must be true or false");
    out = doc.at(key).get<bool>();
    return Status::Ok();
  }
  Status Strings(const json& doc, const std::string& key, const std::string& at,
                 std::vector<std::string>& out) const {
    if (!doc.contains(key)) return Status::Ok();
    const json& value = doc.at(key);
    if (!value.is_array()) return Fault(at + "/" + key, "must be a list of strings");
    out.clear();
    for (size_t i = 0; i < value.size(); ++i) {
      if (!value[i].is_string()) return Fault(at + "/" + key + "/" + std::to_string(i), "must be a string");
      out.push_back(value[i].get<std::string>());
    }
    return Status::Ok();
  }
  Status OnlyKeys(const json& doc, const std::string& at, const std::set<std::string>& known) const {
    for (const auto& item : doc.items()) {
      if (known.count(item.key()) == 0) {
        return Fault(at + "/" + item.key(), "is not a known key (see docs/report.md)");
      }
    }
    return Status::Ok();
  }

 private:
  const std::string& file_;
};

#define MEDLOAD_TRY(expr)                  \
  do {                                     \
    if (Status s_ = (expr); !s_.ok()) return s_; \
  } while (false)

const std::set<std::string> kTopKeys = {
    "title", "network", "on", "months", "criteria", "suppress_below", "practices", "measure",
    "window", "grace_days", "carryover", "default_supply_days", "max_supply_days", "count_by",
    "exclude_prn", "exclude_route", "scale", "history_days", "worklist_limit", "pseudonymise_key", "digests",
    "exposure_years", "age_min", "reviewed_within"};

Status ReadMeasure(const Reader& r, const json& doc, MeasureOptions& m) {
  std::string measure = std::string(MeasureName(m.measure));
  MEDLOAD_TRY(r.String(doc, "measure", "", measure));
  if (measure == "concurrent") m.measure = Measure::kConcurrent;
  else if (measure == "lookback") m.measure = Measure::kLookback;
  else return r.Fault("/measure", "\"" + measure + "\" is not concurrent or lookback");
  long window = m.window_days, grace = m.episodes.grace_days;
  long default_supply = m.supply.default_supply_days, max_supply = m.supply.max_supply_days;
  MEDLOAD_TRY(r.Integer(doc, "window", "", 1, 3660, window));
  MEDLOAD_TRY(r.Integer(doc, "grace_days", "", 0, 3660, grace));
  MEDLOAD_TRY(r.Integer(doc, "default_supply_days", "", 1, 3660, default_supply));
  MEDLOAD_TRY(r.Integer(doc, "max_supply_days", "", 1, 3660, max_supply));
  if (doc.contains("history_days")) {
    long history = 0;
    MEDLOAD_TRY(r.Integer(doc, "history_days", "", 0, 3660, history));
    m.history_days = static_cast<int>(history);
  }
  if (doc.contains("exposure_years") && !doc["exposure_years"].is_null()) {  // null: all data
    long years = 0;
    MEDLOAD_TRY(r.Integer(doc, "exposure_years", "", 1, 100, years));
    m.exposure_years = static_cast<int>(years);
  }
  m.window_days = static_cast<int>(window);
  m.episodes.grace_days = static_cast<int>(grace);
  m.supply.default_supply_days = static_cast<int>(default_supply);
  m.supply.max_supply_days = static_cast<int>(max_supply);
  MEDLOAD_TRY(r.Bool(doc, "carryover", "", m.episodes.carryover));
  MEDLOAD_TRY(r.Bool(doc, "exclude_prn", "", m.exclude_prn));
  std::string count_by = std::string(CountByName(m.count_by));
  MEDLOAD_TRY(r.String(doc, "count_by", "", count_by));
  if (count_by == "medicine") m.count_by = CountBy::kMedicine;
  else if (count_by == "ingredient") m.count_by = CountBy::kIngredient;
  else return r.Fault("/count_by", "\"" + count_by + "\" is not medicine or ingredient");
  std::vector<std::string> routes;
  MEDLOAD_TRY(r.Strings(doc, "exclude_route", "", routes));
  for (size_t i = 0; i < routes.size(); ++i) {
    const auto route = RouteFromName(routes[i]);
    if (!route) return r.Fault("/exclude_route/" + std::to_string(i), "\"" + routes[i] + "\" is not a known route");
    m.exclude_routes.push_back(*route);
  }
  return r.String(doc, "scale", "", m.scale);
}

Status ReadTriggers(const Reader& r, const json& doc, DigestTriggers& triggers) {
  const std::string at = "/digests/triggers";
  if (!doc.is_object()) return r.Fault(at, "must be an object");
  MEDLOAD_TRY(r.OnlyKeys(doc, at, {"rise_patients", "rise_percent", "above_upper_limit", "combine"}));
  std::string combine = "any";
  MEDLOAD_TRY(r.String(doc, "combine", at, combine));
  if (combine != "any" && combine != "all") {
    return r.Fault(at + "/combine", "\"" + combine + "\" is not any (one trigger is enough) or all (every trigger set)");
  }
  triggers.all = combine == "all";
  if (doc.contains("rise_patients")) {
    long rise = 0;
    MEDLOAD_TRY(r.Integer(doc, "rise_patients", at, 1, 1000000000, rise));
    triggers.rise_patients = rise;
  }
  if (doc.contains("rise_percent")) {
    const json& value = doc.at("rise_percent");
    if (!value.is_number() || !(value.get<double>() > 0) || !std::isfinite(value.get<double>())) {
      return r.Fault(at + "/rise_percent", "must be a number above 0");
    }
    triggers.rise_percent = value.get<double>();
  }
  return r.Bool(doc, "above_upper_limit", at, triggers.above_upper_limit);
}

Status ReadDigests(const Reader& r, const json& doc, DigestConfig& digests) {
  const std::string at = "/digests";
  if (!doc.is_object()) return r.Fault(at, "must be an object");
  MEDLOAD_TRY(r.OnlyKeys(doc, at, {"from", "to", "practice_to", "triggers"}));
  digests.enabled = true;
  MEDLOAD_TRY(r.String(doc, "from", at, digests.from));
  MEDLOAD_TRY(r.Strings(doc, "to", at, digests.default_to));
  if (doc.contains("practice_to")) {
    const json& map = doc.at("practice_to");
    if (!map.is_object()) return r.Fault(at + "/practice_to", "must be an object of practice code: [addresses]");
    for (const auto& item : map.items()) {
      MEDLOAD_TRY(r.Strings(map, item.key(), at + "/practice_to", digests.practice_to[item.key()]));
    }
  }
  if (doc.contains("triggers")) MEDLOAD_TRY(ReadTriggers(r, doc.at("triggers"), digests.triggers));
  const auto bad_header = [](const std::string& text) {
    return text.find_first_of("\r\n") != std::string::npos;
  };
  if (bad_header(digests.from)) return r.Fault(at + "/from", "must be one line");
  for (const std::string& to : digests.default_to) {
    if (bad_header(to)) return r.Fault(at + "/to", "addresses must be one line each");
  }
  for (const auto& [practice, list] : digests.practice_to) {
    for (const std::string& to : list) {
      if (bad_header(to)) return r.Fault(at + "/practice_to/" + practice, "addresses must be one line each");
    }
  }
  return Status::Ok();
}

Status ReadCriteria(const Reader& r, const json& doc, std::vector<Criterion>& criteria) {
  if (!doc.contains("criteria")) return r.Fault("/criteria", "is required: a list such as [\"items>=10\", \"acb>=3\"]");
  std::vector<std::string> texts;
  MEDLOAD_TRY(r.Strings(doc, "criteria", "", texts));
  if (texts.empty()) return r.Fault("/criteria", "needs at least one criterion");
  for (size_t i = 0; i < texts.size(); ++i) {
    auto criterion = ParseCriterion(texts[i]);
    if (!criterion.ok()) return r.Fault("/criteria/" + std::to_string(i), criterion.status().message());
    for (const Criterion& seen : criteria) {
      if (seen.Key() == criterion->Key()) return r.Fault("/criteria/" + std::to_string(i), "\"" + texts[i] + "\" is given twice");
    }
    criteria.push_back(*criterion);
  }
  return Status::Ok();
}

// "age_min" and "reviewed_within", as review's --age-min and --reviewed-within; null is
// "not set", as run.json's parameters write it.
Status ReadPopulation(const Reader& r, const json& doc, ReportConfig& config) {
  if (doc.contains("age_min") && !doc["age_min"].is_null()) {
    long age = 0;
    MEDLOAD_TRY(r.Integer(doc, "age_min", "", 0, 150, age));
    config.age_min = static_cast<int>(age);
  }
  if (doc.contains("reviewed_within") && !doc["reviewed_within"].is_null()) {
    long days = 0;
    MEDLOAD_TRY(r.Integer(doc, "reviewed_within", "", 1, 3660, days));
    config.reviewed_within_days = static_cast<int>(days);
  }
  return Status::Ok();
}

Status ReadRequired(const Reader& r, const json& doc, ReportConfig& config) {
  for (const char* key : {"title", "network"}) {
    if (!doc.contains(key)) return r.Fault(std::string("/") + key, "is required");
  }
  MEDLOAD_TRY(r.String(doc, "title", "", config.title));
  MEDLOAD_TRY(r.String(doc, "network", "", config.network));
  if (config.title.empty()) return r.Fault("/title", "must not be empty");
  if (config.network.empty()) return r.Fault("/network", "must not be empty");
  std::string on = "latest";
  MEDLOAD_TRY(r.String(doc, "on", "", on));
  if (on != "latest") {
    config.on = ParseDate(on);
    if (!config.on || on.size() != 10) return r.Fault("/on", "\"" + on + "\" is not a date (YYYY-MM-DD) or \"latest\"");
  }
  return Status::Ok();
}

}  // namespace

Result<ReportConfig> ReadReportConfig(const json& doc, const std::string& file) {
  const Reader r(file);
  if (!doc.is_object()) return r.Fault("", "the config must be a JSON object");
  if (NestedDeeperThan(doc, kMaxNesting)) {
    return r.Fault("", "nests arrays and objects more than " + std::to_string(kMaxNesting) +
                           " levels deep");
  }
  MEDLOAD_TRY(r.OnlyKeys(doc, "", kTopKeys));
  ReportConfig config;
  config.source = doc;
  MEDLOAD_TRY(ReadRequired(r, doc, config));
  long months = config.months, suppress = config.suppress_below;
  long limit = static_cast<long>(config.worklist_limit);
  MEDLOAD_TRY(r.Integer(doc, "months", "", 1, 240, months));
  MEDLOAD_TRY(r.Integer(doc, "suppress_below", "", 0, 1000, suppress));
  MEDLOAD_TRY(r.Integer(doc, "worklist_limit", "", 1, 100000, limit));
  config.months = static_cast<int>(months);
  config.suppress_below = suppress;
  config.worklist_limit = static_cast<size_t>(limit);
  MEDLOAD_TRY(ReadCriteria(r, doc, config.criteria));
  MEDLOAD_TRY(ReadPopulation(r, doc, config));
  MEDLOAD_TRY(r.Strings(doc, "practices", "", config.practices));
  std::set<std::string> seen;
  for (size_t i = 0; i < config.practices.size(); ++i) {
    if (!seen.insert(config.practices[i]).second) return r.Fault("/practices/" + std::to_string(i), "\"" + config.practices[i] + "\" is listed twice");
  }
  MEDLOAD_TRY(ReadMeasure(r, doc, config.measure));
  AddPdcGroups(config.criteria, config.measure);  // pdc criteria with classes need their groups
  MEDLOAD_TRY(r.String(doc, "pseudonymise_key", "", config.pseudonymise_key));
  if (doc.contains("digests")) MEDLOAD_TRY(ReadDigests(r, doc.at("digests"), config.digests));
  return config;
}

Result<ReportConfig> LoadReportConfig(const std::string& path) {
  auto doc = ReadJsonFile(path);
  if (!doc.ok()) return doc.status();
  return ReadReportConfig(*doc, path);
}

json ConfigParameters(const ReportConfig& config) {
  json criteria = json::array();
  for (const Criterion& c : config.criteria) criteria.push_back(c.Key());
  json routes = json::array();
  for (const Route route : config.measure.exclude_routes) routes.push_back(std::string(RouteName(route)));
  const MeasureOptions& m = config.measure;
  json digests = nullptr;
  if (config.digests.enabled) {
    const DigestTriggers& t = config.digests.triggers;
    digests = {{"from", config.digests.from},
               {"to", config.digests.default_to},
               {"practice_to", config.digests.practice_to},
               {"triggers",
                {{"rise_patients", t.rise_patients ? json(*t.rise_patients) : json(nullptr)},
                 {"rise_percent", t.rise_percent ? json(*t.rise_percent) : json(nullptr)},
                 {"above_upper_limit", t.above_upper_limit},
                 {"combine", t.all ? "all" : "any"}}}};
  }
  return {{"title", config.title},
          {"network", config.network},
          {"on", config.on ? config.on->ToIso() : "latest"},
          {"months", config.months},
          {"criteria", criteria},
          {"suppress_below", config.suppress_below},
          {"practices", config.practices},
          {"age_min", config.age_min ? json(*config.age_min) : json(nullptr)},
          {"reviewed_within", config.reviewed_within_days ? json(*config.reviewed_within_days) : json(nullptr)},
          {"measure", std::string(MeasureName(m.measure))},
          {"window", m.window_days},
          {"grace_days", m.episodes.grace_days},
          {"carryover", m.episodes.carryover},
          {"default_supply_days", m.supply.default_supply_days},
          {"max_supply_days", m.supply.max_supply_days},
          {"count_by", std::string(CountByName(m.count_by))},
          {"exclude_prn", m.exclude_prn},
          {"exclude_route", routes},
          {"scale", m.scale},
          {"history_days", HistoryDays(m)},
          {"exposure_years", m.exposure_years ? json(*m.exposure_years) : json(nullptr)},
          {"worklist_limit", config.worklist_limit},
          {"pseudonymise_key", config.pseudonymise_key.empty() ? json(nullptr) : json("(set)")},
          {"digests", digests}};
}

}  // namespace medload
