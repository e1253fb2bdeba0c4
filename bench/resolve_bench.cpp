// Kernels of product resolution against the bundled formulary: distinct descriptions
// resolved cold (the resolver alone, and through a fresh ResolutionCache), and the cached
// hit that every later dispensing of the same product costs in a command (RunContext).
#include <benchmark/benchmark.h>

#include <cstdio>
#include <string>
#include <vector>

#include "medload/burden/run_context.h"
#include "medload/core/records.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

constexpr size_t kDistinct = 1000;

RunContext& SharedAnalysis() {
  static RunContext analysis =
      std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());
  return analysis;
}

// `count` distinct descriptions written as dispensing lines write them: every formulary
// ingredient in turn with a strength and a form ("Amitriptyline 12.5mg tablets"), the
// strength changing on each pass so that no two are the same.
std::vector<std::string> DistinctDescriptions(const Formulary& formulary, size_t count) {
  static const char* kForms[] = {"tablets", "capsules", "modified-release tablets",
                                 "oral solution sugar free", "film-coated tablets",
                                 "gastro-resistant capsules"};
  const auto& ingredients = formulary.ingredients();
  std::vector<std::string> descriptions;
  descriptions.reserve(count);
  for (size_t i = 0; i < count; ++i) {
    std::string name = ingredients[i % ingredients.size()].name;
    if (!name.empty() && name[0] >= 'a' && name[0] <= 'z') {
      name[0] = static_cast<char>(name[0] - 'a' + 'A');
    }
    const size_t pass = i / ingredients.size();
    char strength[32];
    std::snprintf(strength, sizeof strength, " %zu.%zumg ", 1 + pass / 2, (pass % 2) * 5);
    descriptions.push_back(name + strength + kForms[i % std::size(kForms)]);
  }
  return descriptions;
}

// The resolver alone: each description read, normalised and matched every time.
void BM_ResolveDistinctCold(benchmark::State& state) {
  const Formulary& formulary = SharedAnalysis().formulary();
  const auto descriptions = DistinctDescriptions(formulary, kDistinct);
  for (auto _ : state) {
    for (const std::string& text : descriptions) benchmark::DoNotOptimize(Resolve(formulary, text));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(descriptions.size()));
}
BENCHMARK(BM_ResolveDistinctCold)->Unit(benchmark::kMillisecond);

// Descriptions as messy dispensing data writes them: brands with their maker, US names and
// combinations, abbreviations, glued strengths, misspellings, a part the tables do not
// know, and lines nothing resolves (the slowest path: every word tried as a spelling).
const std::vector<std::string>& MessyDescriptions() {
  static const std::vector<std::string> kMessy = {
      "Detrusitol 2mg tablets (Pfizer Ltd)", "Seroquel XL 50mg tablets (AstraZeneca UK Ltd)",
      "Symbicort 200/6 Turbohaler (AstraZeneca UK Ltd)", "Norco 10-325 mg tablet",
      "Hydrocodone bitartrate and acetaminophen 5 mg/325 mg tablet",
      "Butalbital, acetaminophen and caffeine 50 mg/325 mg/40 mg tablet", "Lansoprazole30mg caps",
      "Metformin 500mg m/r tabs", "Hyoscine HBr 300mcg tabs", "Chloramphenicol 0.5% e/d",
      "Amitriptilline 10mg tabs", "Oxybutinin 5mg tabs", "Frobazine 10mg and paracetamol 500mg tablets",
      "Ensure Plus milkshake style liquid (Abbott Laboratories Ltd)", "Frobnicate 10mg tablets",
      "Unlicensed special 5ml", "Chlorpromamide 100mg tabs", "Co-codamol 30/500 caps",
      "Atorvastatin Calcium 40 MG Oral Tablet", "Fentanyl 12mcg/hr patch"};
  return kMessy;
}

// The resolver alone on the messy descriptions, each resolved every time.
void BM_ResolveMessyCold(benchmark::State& state) {
  const Formulary& formulary = SharedAnalysis().formulary();
  for (auto _ : state) {
    for (const std::string& text : MessyDescriptions()) benchmark::DoNotOptimize(Resolve(formulary, text));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(MessyDescriptions().size()));
}
BENCHMARK(BM_ResolveMessyCold)->Unit(benchmark::kMicrosecond);

// A fresh ResolutionCache per pass: every description is a miss, resolved and stored.
void BM_ResolutionCacheMisses(benchmark::State& state) {
  const Formulary& formulary = SharedAnalysis().formulary();
  const auto descriptions = DistinctDescriptions(formulary, kDistinct);
  for (auto _ : state) {
    ResolutionCache cache(formulary);
    for (const std::string& text : descriptions) benchmark::DoNotOptimize(cache.Resolve(text));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(descriptions.size()));
}
BENCHMARK(BM_ResolutionCacheMisses)->Unit(benchmark::kMillisecond);

// A ResolutionCache that already holds every description: the lookup alone.
void BM_ResolutionCacheHits(benchmark::State& state) {
  const Formulary& formulary = SharedAnalysis().formulary();
  const auto descriptions = DistinctDescriptions(formulary, kDistinct);
  ResolutionCache cache(formulary);
  for (const std::string& text : descriptions) cache.Resolve(text);
  for (auto _ : state) {
    for (const std::string& text : descriptions) benchmark::DoNotOptimize(&cache.Resolve(text));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(descriptions.size()));
}
BENCHMARK(BM_ResolutionCacheHits)->Unit(benchmark::kMicrosecond);

// The path the commands take for every dispensing: RunContext::Resolve on a record whose
// product this run has already resolved (no store behind it).
void BM_AnalysisResolveCached(benchmark::State& state) {
  RunContext& analysis = SharedAnalysis();
  const auto descriptions = DistinctDescriptions(analysis.formulary(), kDistinct);
  std::vector<DispensingRecord> records(descriptions.size());
  for (size_t i = 0; i < records.size(); ++i) {
    records[i].patient_id = "BENCH1";
    records[i].product = descriptions[i];
    analysis.Resolve(records[i]);
  }
  for (auto _ : state) {
    for (const DispensingRecord& record : records) {
      benchmark::DoNotOptimize(&analysis.Resolve(record));
    }
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(records.size()));
}
BENCHMARK(BM_AnalysisResolveCached)->Unit(benchmark::kMicrosecond);

}  // namespace
}  // namespace medload
