// Google Benchmark kernels for the dosage-text parser: typical instructions one at a
// time, a mixed batch, and text at the length cap.
#include <benchmark/benchmark.h>

#include <string>
#include <vector>

#include "medload/dose/dosage_text.h"

namespace {

// A mix of the instructions seen in primary-care dispensing: short abbreviations, full
// sentences, as-needed instructions with a maximum, and text that is not understood.
const std::vector<std::string>& Instructions() {
  static const std::vector<std::string> kInstructions = {
      "1 od",
      "one tablet twice a day",
      "take one tablet in the morning and one at night",
      "1-2 tablets every 4-6 hours when required, max 8 in 24 hours",
      "two 5ml spoonfuls three times a day",
      "apply thinly twice a day to the affected area",
      "2 puffs bd",
      "one tablet once a week on the same day each week",
      "as directed",
      "half a tablet at night",
      "one drop in each eye four times a day",
      "1 tablet three times a day for 5 days then twice a day",
  };
  return kInstructions;
}

void BM_ReadDosageTextShort(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(medload::ReadDosageText("1 bd"));
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_ReadDosageTextShort);

void BM_ReadDosageTextAsNeeded(benchmark::State& state) {
  const std::string text = "1-2 tablets every 4-6 hours when required, max 8 in 24 hours";
  for (auto _ : state) benchmark::DoNotOptimize(medload::ReadDosageText(text));
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_ReadDosageTextAsNeeded);

void BM_ReadDosageTextMix(benchmark::State& state) {
  const auto& texts = Instructions();
  for (auto _ : state) {
    for (const std::string& text : texts) benchmark::DoNotOptimize(medload::ReadDosageText(text));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(texts.size()));
}
BENCHMARK(BM_ReadDosageTextMix);

void BM_ReadDosageTextAtCap(benchmark::State& state) {
  std::string text;
  while (text.size() < 4000) text += "one tablet daily and ";
  for (auto _ : state) benchmark::DoNotOptimize(medload::ReadDosageText(text));
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_ReadDosageTextAtCap);

}  // namespace

