#include "medload/cohort/cohort.h"

#include <algorithm>
#include <optional>
#include <utility>

#include "medload/burden/patient_facts.h"
#include "medload/burden/patient_pass.h"
#include "medload/burden/run_context.h"
#include "medload/core/text.h"

namespace medload {

CohortCounter::CohortCounter(const CohortOptions& options,
                             std::map<std::string, std::string> networks, std::string measure)
    : options_(options), networks_(std::move(networks)) {
  for (const Criterion& criterion : options_.criteria) tally_.criteria.push_back(criterion.Key());
  tally_.dates = options_.dates;
  tally_.group_by = options_.group_by;
  tally_.measure = std::move(measure);
  tally_.population = DescribePopulation(options_);
  tally_.shard_count = options_.shard.count;
  tally_.shards.insert(options_.shard.index);
  practices_on_.resize(options_.dates.size());
}

void CohortCounter::SkipDates(std::vector<bool> skipped) { skipped_ = std::move(skipped); }

DateFigures CohortCounter::FiguresOn(size_t index) const {
  DateFigures figures;
  for (const auto& [group, cells] : tally_.groups) {
    if (index < cells.size() && cells[index].registered > 0) figures.cells[group] = cells[index];
  }
  if (index < practices_on_.size()) figures.practices = practices_on_[index];
  for (const auto& [group, by_practice] : tally_.unseen) {
    for (const auto& [practice, per_date] : by_practice) {
      if (index < per_date.size() && per_date[index].registered > 0) figures.unseen[group][practice] = per_date[index];
    }
  }
  return figures;
}

void CohortCounter::PutFigures(size_t index, const DateFigures& figures) {
  for (const auto& [group, cell] : figures.cells) CellOf(group, index) = cell;
  for (const auto& [group, practices] : figures.practices) {
    tally_.practices[group].insert(practices.begin(), practices.end());
    if (index < practices_on_.size()) practices_on_[index][group].insert(practices.begin(), practices.end());
  }
  for (const auto& [group, by_practice] : figures.unseen) {
    for (const auto& [practice, cell] : by_practice) {
      auto& per_date = tally_.unseen[group][practice];
      per_date.resize(options_.dates.size());
      per_date[index] = cell;
    }
  }
}

void CohortCounter::See(const PatientHistory& history) { AddHistoryToSpans(history, tally_.spans); }

void CohortCounter::SeeCoverage(const PracticeSpans& spans) { MergeSpans(tally_.spans, spans); }

Status SeeOtherShards(const Store& store, CohortCounter& counter) {
  Result<PracticeSpans> others = store.OtherShardCoverage();
  if (!others.ok()) return others.status();
  others->erase("");  // attributed by their own shard's store only
  counter.SeeCoverage(*others);
  return Status::Ok();
}

bool CohortCounter::Settled(const std::string& practice) const {
  const auto it = tally_.spans.find(practice);
  return !options_.dates.empty() && it != tally_.spans.end() && it->second.first <= options_.dates.front();
}

bool CohortCounter::Counts(const std::string& practice) const {
  return options_.practices.empty() ||
         std::find(options_.practices.begin(), options_.practices.end(), practice) != options_.practices.end();
}

bool CohortCounter::Wants(const PatientHistory& history) const {
  return InShard(history.patient_id, options_.shard);
}

CohortCell& CohortCounter::CellOf(const std::string& group, size_t date_index) {
  auto [it, added] = tally_.groups.try_emplace(group);
  if (added) {
    const size_t keys = options_.criteria.size() + 1;
    CohortCell empty;
    empty.counts.assign(keys, 0);
    empty.counts_by_band.assign(keys, std::array<long, kEspBands>{});
    it->second.assign(options_.dates.size(), empty);
  }
  return it->second[date_index];
}

void CohortCounter::Add(const PatientHistory& history, const BurdenOnDate& burden) {
  if (!Wants(history)) return;
  ++tally_.patients;
  const std::string_view sex = history.registry ? std::string_view(history.registry->sex) : "";
  for (size_t d = 0; d < options_.dates.size(); ++d) {
    if (d < skipped_.size() && skipped_[d]) continue;
    const Date on = options_.dates[d];
    std::optional<std::string> practice = RegisteredPractice(history, on);
    if (!practice || !Counts(*practice)) continue;
    const std::optional<int> age = AgeOn(history.registry, on);
    if (options_.age_min && (!age || *age < *options_.age_min)) continue;
    const std::string group =
        GroupOf(options_.group_by, GroupFacts{*practice, age, sex}, networks_);
    CohortCell& cell = CellOf(group, d);
    const std::optional<size_t> band =
        age && *age >= 0 ? std::optional<size_t>(EspBandOf(*age)) : std::nullopt;
    ++cell.registered;
    if (band) ++cell.registered_by_band[*band];
    tally_.practices[group].insert(*practice);
    practices_on_[d][group].insert(*practice);
    const bool unseen = history.dispensings.empty() || history.dispensings.front().dispensed_on > on;
    if (unseen && !Settled(*practice)) {
      auto& per_date = tally_.unseen[group][*practice];
      per_date.resize(options_.dates.size());
      ++per_date[d].registered;
      if (band) ++per_date[d].registered_by_band[*band];
    }
    if (options_.criteria.empty()) continue;
    const Burden value = burden(on, age);
    bool any = false;
    for (size_t c = 0; c <= options_.criteria.size(); ++c) {
      const bool met = c < options_.criteria.size() ? options_.criteria[c].Met(value) : any;
      any = any || met;
      if (!met) continue;
      ++cell.counts[c];
      if (band) ++cell.counts_by_band[c][*band];
    }
  }
}

namespace {

// Takes off the unseen patients of practices whose data began on or before the first
// date: those are counted as they are (CohortTally::unseen).
void DropSettledUnseen(CohortTally& tally) {
  const auto settled = [&](const std::string& practice) {
    const auto it = tally.spans.find(practice);
    return !tally.dates.empty() && it != tally.spans.end() && it->second.first <= tally.dates.front();
  };
  for (auto& [group, by_practice] : tally.unseen) {
    std::erase_if(by_practice, [&](const auto& entry) { return settled(entry.first); });
  }
  std::erase_if(tally.unseen, [](const auto& entry) { return entry.second.empty(); });
}

}  // namespace

CohortTally CohortCounter::Take() {
  DropSettledUnseen(tally_);
  return std::move(tally_);
}

Result<CohortTally> RunCohort(const Store& store, RunContext& analysis,
                              const CohortOptions& options) {
  auto practices = store.Practices();
  if (!practices.ok()) return practices.status();
  std::map<std::string, std::string> networks;
  for (const PracticeRecord& practice : *practices) networks[practice.practice] = practice.network;
  CohortCounter counter(options, std::move(networks), DescribeMeasure(analysis.options()));
  if (Status status = SeeOtherShards(store, counter); !status.ok()) return status;
  PassFacts facts;
  Status status = ForEachPatientTimeline(store, analysis, [&](PassPatient& patient) {
    counter.See(patient.history());
    if (!counter.Wants(patient.history())) return true;
    // The timeline is built on the first date that needs it, then reused.
    counter.Add(patient.history(), [&](Date on, std::optional<int> age) {
      return patient.Evaluate(on, age);
    });
    return true;
  }, &facts);
  if (!status.ok()) return status;
  CohortTally tally = counter.Take();
  tally.capped_patients = facts.capped_patients;
  tally.history_bound = facts.history_bound;
  return tally;
}

namespace {

Status CheckSameRun(const CohortTally& first, const CohortTally& other, const std::string& name) {
  auto fault = [&](const std::string& what) {
    return Status::Input(name + ": " + what + " differ from the first file's; merge only the "
                         "shards of one cohort run");
  };
  if (other.criteria != first.criteria) return fault("criteria");
  if (other.dates != first.dates) return fault("census dates");
  if (other.group_by != first.group_by) return fault("groups (--by)");
  if (other.measure != first.measure) return fault("measure options");
  if (other.population != first.population) return fault("patients counted (--practice)");
  if (other.shard_count != first.shard_count) return fault("shard counts (N of --shard K/N)");
  return Status::Ok();
}

}  // namespace

void AddCell(CohortCell& into, const CohortCell& from) {
  into.registered += from.registered;
  for (size_t b = 0; b < kEspBands; ++b) into.registered_by_band[b] += from.registered_by_band[b];
  for (size_t k = 0; k < into.counts.size() && k < from.counts.size(); ++k) {
    into.counts[k] += from.counts[k];
    for (size_t b = 0; b < kEspBands; ++b) into.counts_by_band[k][b] += from.counts_by_band[k][b];
  }
}

Result<CohortTally> MergeTallies(const std::vector<CohortTally>& tallies,
                                 const std::vector<std::string>& names) {
  if (tallies.empty()) return Status::Usage("nothing to merge");
  CohortTally merged = tallies.front();
  for (size_t i = 1; i < tallies.size(); ++i) {
    const CohortTally& other = tallies[i];
    if (Status status = CheckSameRun(merged, other, names[i]); !status.ok()) return status;
    for (const uint32_t shard : other.shards) {
      if (!merged.shards.insert(shard).second) {
        return Status::Input(names[i] + ": shard " + std::to_string(shard) + "/" +
                             std::to_string(other.shard_count) +
                             " is already in an earlier file; each shard may be merged once");
      }
    }
    merged.patients += other.patients;
    MergeSpans(merged.spans, other.spans);
    for (const auto& [group, codes] : other.practices) merged.practices[group].insert(codes.begin(), codes.end());
    for (const auto& [group, by_practice] : other.unseen) {
      for (const auto& [practice, cells] : by_practice) {
        auto& into = merged.unseen[group][practice];
        into.resize(std::max(into.size(), cells.size()));
        for (size_t d = 0; d < cells.size(); ++d) {
          into[d].registered += cells[d].registered;
          for (size_t b = 0; b < kEspBands; ++b) into[d].registered_by_band[b] += cells[d].registered_by_band[b];
        }
      }
    }
    for (const auto& [group, cells] : other.groups) {
      auto [it, added] = merged.groups.try_emplace(group, cells);
      if (added) continue;
      for (size_t d = 0; d < cells.size() && d < it->second.size(); ++d) AddCell(it->second[d], cells[d]);
    }
  }
  DropSettledUnseen(merged);
  return merged;
}

std::string DescribePopulation(const CohortOptions& options) {
  std::vector<std::string> parts;
  if (!options.practices.empty()) {
    std::vector<std::string> codes = options.practices;
    std::sort(codes.begin(), codes.end());
    codes.erase(std::unique(codes.begin(), codes.end()), codes.end());
    parts.push_back("registered at " + Join(codes, ", "));
  }
  if (options.age_min) parts.push_back("aged " + std::to_string(*options.age_min) + " or more");
  return Join(parts, "; ");
}

std::string DescribeMeasure(const MeasureOptions& options) {
  std::string text = std::string(MeasureName(options.measure));
  if (options.measure == Measure::kLookback) text += " window " + std::to_string(options.window_days);
  text += ", grace " + std::to_string(options.episodes.grace_days);
  if (options.episodes.carryover) text += ", carry-over";
  text += ", default supply " + std::to_string(options.supply.default_supply_days);
  text += ", max supply " + std::to_string(options.supply.max_supply_days);
  text += ", count by " + std::string(CountByName(options.count_by));
  if (options.exclude_prn) text += ", PRN excluded";
  for (const Route route : options.exclude_routes) text += ", no " + std::string(RouteName(route));
  text += ", scale " + options.scale;
  return text;
}

}  // namespace medload
