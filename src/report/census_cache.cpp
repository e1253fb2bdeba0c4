#include "medload/report/census_cache.h"

#include <algorithm>
#include <array>

#include <nlohmann/json.hpp>

#include "medload/burden/run_context.h"
#include "medload/core/hash.h"

namespace medload {
namespace {

// Bumped whenever what a saved entry holds, or how a cell is counted, changes.
constexpr int kFiguresLayout = 1;

nlohmann::json MeasureJson(const MeasureOptions& options) {
  nlohmann::json routes = nlohmann::json::array();
  for (const Route route : options.exclude_routes) routes.push_back(std::string(RouteName(route)));
  return {{"measure", std::string(MeasureName(options.measure))},
          {"window_days", options.window_days},
          {"grace_days", options.episodes.grace_days},
          {"carryover", options.episodes.carryover},
          {"default_supply_days", options.supply.default_supply_days},
          {"max_supply_days", options.supply.max_supply_days},
          {"count_by", std::string(CountByName(options.count_by))},
          {"exclude_prn", options.exclude_prn},
          {"exclude_routes", routes},
          {"scale", options.scale},
          {"exposure_years", options.exposure_years ? nlohmann::json(*options.exposure_years) : nlohmann::json()},
          {"pdc_groups", options.pdc_groups}};
}

nlohmann::json CellJson(const CohortCell& cell) {
  return {{"registered", cell.registered},
          {"registered_by_band", cell.registered_by_band},
          {"counts", cell.counts},
          {"counts_by_band", cell.counts_by_band}};
}

bool IsCount(const nlohmann::json& value) { return value.is_number_integer() && value.get<long>() >= 0; }

// An array of exactly kEspBands counts into `bands`.
bool ReadBands(const nlohmann::json& value, std::array<long, kEspBands>& bands) {
  if (!value.is_array() || value.size() != kEspBands) return false;
  for (size_t b = 0; b < kEspBands; ++b) {
    if (!IsCount(value[b])) return false;
    bands[b] = value[b].get<long>();
  }
  return true;
}

std::optional<CohortCell> ReadCell(const nlohmann::json& value, size_t keys) {
  if (!value.is_object() || !value.contains("registered") || !IsCount(value["registered"]) ||
      !value.contains("counts") || !value["counts"].is_array() || value["counts"].size() != keys ||
      !value.contains("counts_by_band") || !value["counts_by_band"].is_array() ||
      value["counts_by_band"].size() != keys || !value.contains("registered_by_band")) {
    return std::nullopt;
  }
  CohortCell cell;
  cell.registered = value["registered"].get<long>();
  if (!ReadBands(value["registered_by_band"], cell.registered_by_band)) return std::nullopt;
  cell.counts_by_band.resize(keys);
  for (size_t k = 0; k < keys; ++k) {
    if (!IsCount(value["counts"][k]) || !ReadBands(value["counts_by_band"][k], cell.counts_by_band[k])) {
      return std::nullopt;
    }
    cell.counts.push_back(value["counts"][k].get<long>());
  }
  return cell;
}

std::optional<UnseenCell> ReadUnseen(const nlohmann::json& value) {
  if (!value.is_object() || !value.contains("registered") || !IsCount(value["registered"]) ||
      !value.contains("registered_by_band")) {
    return std::nullopt;
  }
  UnseenCell cell;
  cell.registered = value["registered"].get<long>();
  if (!ReadBands(value["registered_by_band"], cell.registered_by_band)) return std::nullopt;
  return cell;
}

// The parts of a figures document after its layout and date were checked.
bool ReadFigureParts(const nlohmann::json& doc, size_t keys, DateFigures& figures) {
  for (const char* part : {"cells", "practices", "unseen"}) {
    if (!doc.contains(part) || !doc[part].is_object()) return false;
  }
  for (const auto& [group, value] : doc["cells"].items()) {
    std::optional<CohortCell> cell = ReadCell(value, keys);
    if (!cell) return false;
    figures.cells[group] = std::move(*cell);
  }
  for (const auto& [group, value] : doc["practices"].items()) {
    if (!value.is_array()) return false;
    for (const auto& code : value) {
      if (!code.is_string()) return false;
      figures.practices[group].insert(code.get<std::string>());
    }
  }
  for (const auto& [group, by_practice] : doc["unseen"].items()) {
    if (!by_practice.is_object()) return false;
    for (const auto& [practice, value] : by_practice.items()) {
      std::optional<UnseenCell> cell = ReadUnseen(value);
      if (!cell) return false;
      figures.unseen[group][practice] = *cell;
    }
  }
  return true;
}

}  // namespace

std::string CensusSettingsKey(const ReportConfig& config, const RunContext& analysis,
                              const std::string& registry_digest, size_t history_bound) {
  nlohmann::json criteria = nlohmann::json::array();
  for (const Criterion& criterion : config.criteria) criteria.push_back(criterion.Key());
  const nlohmann::json settings = {
      {"layout", kFiguresLayout},
      {"criteria", criteria},
      {"age_min", config.age_min ? nlohmann::json(*config.age_min) : nlohmann::json()},
      {"measure", MeasureJson(analysis.options())},
      {"resolutions", analysis.ResolutionKey()},
      {"history_bound", history_bound},
      {"registry", registry_digest}};
  return Sha256Hex(settings.dump());
}

std::string FiguresJson(Date on, const DateFigures& figures) {
  nlohmann::json cells = nlohmann::json::object();
  for (const auto& [group, cell] : figures.cells) cells[group] = CellJson(cell);
  nlohmann::json practices = nlohmann::json::object();
  for (const auto& [group, codes] : figures.practices) practices[group] = codes;
  nlohmann::json unseen = nlohmann::json::object();
  for (const auto& [group, by_practice] : figures.unseen) {
    for (const auto& [practice, cell] : by_practice) {
      unseen[group][practice] = {{"registered", cell.registered}, {"registered_by_band", cell.registered_by_band}};
    }
  }
  const nlohmann::json doc = {{"layout", kFiguresLayout}, {"on", on.ToIso()}, {"cells", cells},
                              {"practices", practices}, {"unseen", unseen}};
  return doc.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
}

std::optional<DateFigures> ParseFigures(const std::string& text, Date on, size_t keys) {
  const nlohmann::json doc = nlohmann::json::parse(text, nullptr, false);
  if (!doc.is_object() || !doc.contains("layout") || doc["layout"] != kFiguresLayout || !doc.contains("on") ||
      doc["on"] != on.ToIso()) {
    return std::nullopt;
  }
  DateFigures figures;
  if (!ReadFigureParts(doc, keys, figures)) return std::nullopt;
  return figures;
}

Result<CensusCache> OpenCensusCache(const Store& store, const ReportConfig& config, const RunContext& analysis,
                                    const std::vector<Date>& dates, Date on) {
  CensusCache cache;
  Result<std::string> registry = store.RegistryDigest();
  if (!registry.ok()) return registry.status();
  cache.settings_key = CensusSettingsKey(config, analysis, *registry, store.history_bound());
  Result<DataMarks> marks = store.CurrentDataMarks();
  if (!marks.ok()) return marks.status();
  cache.marks = *marks;
  Result<std::vector<SavedFigures>> saved = store.SavedCensusFigures(cache.settings_key);
  if (!saved.ok()) return saved.status();
  // Entries saved by one run share their marks: one look at the changes per distinct mark.
  std::map<std::pair<long, long>, std::optional<std::string>> changes;
  const size_t keys = config.criteria.size() + 1;
  for (const SavedFigures& entry : *saved) {
    const std::optional<Date> date = ParseDate(entry.census_date);
    if (!date || *date == on || std::find(dates.begin(), dates.end(), *date) == dates.end()) continue;
    const std::pair<long, long> mark{entry.marks.newest_dispensing, entry.marks.newest_edit};
    if (changes.count(mark) == 0) {
      Result<std::optional<std::string>> earliest = store.EarliestChangeSince(entry.marks);
      if (!earliest.ok()) return earliest.status();
      changes[mark] = *earliest;
    }
    const std::optional<std::string>& earliest = changes[mark];
    if (earliest && *earliest <= entry.census_date) continue;  // a dispensing on or before it changed
    std::optional<DateFigures> figures = entry.intact ? ParseFigures(entry.figures, *date, keys) : std::nullopt;
    if (!figures) {
      ++cache.damaged;
      continue;
    }
    cache.served[*date] = std::move(*figures);
  }
  return cache;
}

void SaveCountedFigures(Store& store, const CensusCache& cache) {
  for (const auto& [date, figures] : cache.counted) {
    // Best effort, like the resolutions: a store that cannot be written counts again.
    const Status saved = store.SaveCensusFigures(cache.settings_key, date.ToIso(), cache.marks, FiguresJson(date, figures));
    static_cast<void>(saved);
  }
}

}  // namespace medload
