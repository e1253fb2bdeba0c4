// The cohort JSON document and the raw tally inside it (read back by `cohort --merge`).
#include <array>
#include <set>
#include <string>

#include "medload/cohort/cohort_writer.h"
#include "medload/core/caution.h"
#include "medload/format/suppression.h"

namespace medload {
namespace {

using nlohmann::json;

json OptionalNumber(const std::optional<double>& value) {
  return value ? json(*value) : json(nullptr);
}

json RowJson(const CohortTable& table, const CohortRow& row) {
  json counts = json::object();
  json rates = json::object();
  json standardised = json::object();
  for (size_t k = 0; k < table.keys.size(); ++k) {
    const CohortValue& value = row.values[k];
    const std::string& key = table.keys[k];
    counts[key] = value.count ? json(*value.count) : json(nullptr);
    rates[key] = OptionalNumber(value.rate);
    if (value.standardised) {
      standardised[key] = {{"rate", value.standardised->rate},
                           {"lower", OptionalNumber(value.standardised->lower)},
                           {"upper", OptionalNumber(value.standardised->upper)}};
    } else {
      standardised[key] = nullptr;
    }
  }
  return {{"date", row.date.ToIso()},
          {"group", row.group},
          {"registered", row.registered},
          {"registered_known_age", row.registered_known_age},
          {"data", std::string(DataStateName(row.data))},
          {"practices_without_data", row.practices_without_data},
          {"counts", counts},
          {"rates_per_1000", rates},
          {"standardised_per_1000", standardised}};
}

// The tally's data coverage: spans per practice, practices per group, unseen cells.
json CoverageJson(const CohortTally& tally) {
  json spans = json::object();
  for (const auto& [practice, span] : tally.spans) spans[practice] = {span.first.ToIso(), span.latest.ToIso()};
  json practices = json::object();
  for (const auto& [group, codes] : tally.practices) practices[group] = codes;
  json unseen = json::object();
  for (const auto& [group, by_practice] : tally.unseen) {
    for (const auto& [practice, cells] : by_practice) {
      json list = json::array();
      for (const UnseenCell& cell : cells) list.push_back({cell.registered, cell.registered_by_band});
      unseen[group][practice] = list;
    }
  }
  return {{"spans", spans}, {"practices", practices}, {"unseen", unseen}};
}

}  // namespace

json CohortJson(const CohortTable& table, const CohortTally* raw) {
  json document = json::object();
  document["criteria"] = table.criteria;
  document["group_by"] = std::string(GroupByName(table.group_by));
  json dates = json::array();
  for (const Date date : table.dates) dates.push_back(date.ToIso());
  document["dates"] = dates;
  document["measure"] = table.measure;
  document["population"] = table.population.empty() ? "every registered patient" : table.population;
  document["suppress_below"] = table.suppress_below;
  document["suppression"] = SuppressionNote(table.suppress_below);
  document["history_days"] = table.history_days;
  document["standard_population"] =
      "European Standard Population 2013 (Eurostat 2013), 19 bands 0-4 to 90+, patients of "
      "known age; 95% limits by Dobson et al. 1991";
  document["shards"] = table.shards;
  document["complete"] = table.complete;
  document["notes"] = table.notes;
  json rows = json::array();
  for (const CohortRow& row : table.rows) rows.push_back(RowJson(table, row));
  document["rows"] = rows;
  if (raw != nullptr) document["tally"] = TallyJson(*raw);
  document["caution"] = std::string(kCaution);
  return document;
}

json TallyJson(const CohortTally& tally) {
  json dates = json::array();
  for (const Date date : tally.dates) dates.push_back(date.ToIso());
  json groups = json::object();
  for (const auto& [group, cells] : tally.groups) {
    json list = json::array();
    for (const CohortCell& cell : cells) {
      list.push_back({{"registered", cell.registered},
                      {"counts", cell.counts},
                      {"registered_by_band", cell.registered_by_band},
                      {"counts_by_band", cell.counts_by_band}});
    }
    groups[group] = list;
  }
  return {{"criteria", tally.criteria},
          {"dates", dates},
          {"group_by", std::string(GroupByName(tally.group_by))},
          {"measure", tally.measure},
          {"population", tally.population},
          {"shard_count", tally.shard_count},
          {"shards", tally.shards},
          {"patients", tally.patients},
          {"groups", groups},
          {"coverage", CoverageJson(tally)}};
}

namespace {

// Reads `document[key]` as T, or explains which member is missing or malformed.
template <typename T>
Status Read(const json& document, const std::string& pointer, const std::string& file, T& out) {
  try {
    out = document.at(json::json_pointer(pointer)).get<T>();
    return Status::Ok();
  } catch (const json::exception&) {
    return Status::Input(file + ": " + pointer + ": missing or not the expected type");
  }
}

Status ReadCells(const json& list, const std::string& pointer, const std::string& file,
                 size_t dates, size_t keys, std::vector<CohortCell>& cells) {
  if (!list.is_array() || list.size() != dates) {
    return Status::Input(file + ": " + pointer + ": expected one cell per census date");
  }
  for (size_t d = 0; d < dates; ++d) {
    const std::string at = pointer + "/" + std::to_string(d);
    CohortCell cell;
    Status status = Read(list, "/" + std::to_string(d) + "/registered", file, cell.registered);
    if (status.ok()) status = Read(list, "/" + std::to_string(d) + "/counts", file, cell.counts);
    if (status.ok()) {
      status = Read(list, "/" + std::to_string(d) + "/registered_by_band", file,
                    cell.registered_by_band);
    }
    if (status.ok()) {
      status = Read(list, "/" + std::to_string(d) + "/counts_by_band", file, cell.counts_by_band);
    }
    if (!status.ok()) return Status::Input(file + ": " + at + ": a cell is malformed");
    if (cell.counts.size() != keys || cell.counts_by_band.size() != keys) {
      return Status::Input(file + ": " + at + ": expected one count per criterion and any");
    }
    cells.push_back(std::move(cell));
  }
  return Status::Ok();
}

Status ReadSpans(const json& spans, const std::string& at, const std::string& file, CohortTally& tally) {
  for (const auto& [practice, pair] : spans.items()) {
    std::optional<Date> first, latest;
    if (pair.is_array() && pair.size() == 2 && pair[0].is_string() && pair[1].is_string()) {
      first = ParseDate(pair[0].get<std::string>());
      latest = ParseDate(pair[1].get<std::string>());
    }
    if (!first || !latest) {
      return Status::Input(file + ": " + at + "/spans/" + practice + ": expected [first, latest] as dates");
    }
    tally.spans[practice] = DataSpan{*first, *latest};
  }
  return Status::Ok();
}

// The coverage member, absent from tallies written before coverage was kept (their
// groups then count as fully covered).
Status ReadCoverage(const json& document, const std::string& base, const std::string& file, CohortTally& tally) {
  const json::json_pointer pointer(base + "/coverage");
  if (!document.contains(pointer)) return Status::Ok();
  const std::string at = base + "/coverage";
  try {
    const json& coverage = document.at(pointer);
    if (Status spans = ReadSpans(coverage.at("spans"), at, file, tally); !spans.ok()) return spans;
    for (const auto& [group, codes] : coverage.at("practices").items()) {
      tally.practices[group] = codes.get<std::set<std::string>>();
    }
    for (const auto& [group, by_practice] : coverage.at("unseen").items()) {
      for (const auto& [practice, list] : by_practice.items()) {
        std::vector<UnseenCell> cells;
        for (const json& cell : list) {
          cells.push_back(UnseenCell{cell.at(0).get<long>(), cell.at(1).get<std::array<long, kEspBands>>()});
        }
        tally.unseen[group][practice] = std::move(cells);
      }
    }
  } catch (const json::exception&) {
    return Status::Input(file + ": " + at + ": malformed (expected spans, practices and unseen)");
  }
  return Status::Ok();
}

}  // namespace

Result<CohortTally> TallyFromJson(const json& document, const std::string& file) {
  if (!document.is_object()) return Status::Input(file + ": not a JSON object");
  if (document.contains("rows") && !document.contains("tally")) {
    return Status::Input(file + ": /tally: missing; the file has no raw counts (it was written "
                         "with --suppress-below or by another command): write shard outputs "
                         "with --format json and without --suppress-below");
  }
  const std::string base = document.contains("tally") ? "/tally" : "";
  CohortTally tally;
  std::vector<std::string> dates;
  std::string group_by;
  std::vector<uint32_t> shards;
  Status status = Read(document, base + "/criteria", file, tally.criteria);
  if (status.ok()) status = Read(document, base + "/dates", file, dates);
  if (status.ok()) status = Read(document, base + "/group_by", file, group_by);
  if (status.ok()) status = Read(document, base + "/measure", file, tally.measure);
  if (status.ok() && document.contains(json::json_pointer(base + "/population"))) {
    status = Read(document, base + "/population", file, tally.population);  // absent before it was kept
  }
  if (status.ok()) status = Read(document, base + "/shard_count", file, tally.shard_count);
  if (status.ok()) status = Read(document, base + "/shards", file, shards);
  if (status.ok()) status = Read(document, base + "/patients", file, tally.patients);
  if (!status.ok()) return status;
  for (const std::string& text : dates) {
    const std::optional<Date> date = ParseDate(text);
    if (!date) return Status::Input(file + ": " + base + "/dates: \"" + text + "\" is not a date");
    tally.dates.push_back(*date);
  }
  const std::optional<GroupBy> parsed = ParseGroupBy(group_by);
  if (!parsed) return Status::Input(file + ": " + base + "/group_by: \"" + group_by + "\" is unknown");
  tally.group_by = *parsed;
  tally.shards.insert(shards.begin(), shards.end());
  const json* groups = nullptr;
  try {
    groups = &document.at(json::json_pointer(base + "/groups"));
  } catch (const json::exception&) {
    return Status::Input(file + ": " + base + "/groups: missing");
  }
  if (!groups->is_object()) return Status::Input(file + ": " + base + "/groups: not an object");
  for (const auto& [group, list] : groups->items()) {
    std::vector<CohortCell> cells;
    status = ReadCells(list, base + "/groups/" + group, file, tally.dates.size(),
                       tally.criteria.size() + 1, cells);
    if (!status.ok()) return status;
    tally.groups[group] = std::move(cells);
  }
  if (Status coverage = ReadCoverage(document, base, file, tally); !coverage.ok()) return coverage;
  return tally;
}

}  // namespace medload
