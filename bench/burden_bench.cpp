// Kernels of the per-patient computation: building one patient's timeline (resolution
// cached, supplies, episodes) and evaluating it on one census date and on a year of
// month-ends.
#include <benchmark/benchmark.h>

#include "medload/burden/run_context.h"

namespace medload {
namespace {

// An invented older patient: 12 repeat medicines, monthly for a year, some as needed.
std::vector<DispensingRecord> Patient() {
  const char* products[] = {"Amitriptyline 10mg tablets", "Oxybutynin 5mg tablets", "Co-codamol 30mg/500mg tablets",
                            "Ramipril 5mg capsules", "Furosemide 40mg tablets", "Amlodipine 5mg tablets",
                            "Atorvastatin 20mg tablets", "Omeprazole 20mg gastro-resistant capsules",
                            "Metformin 500mg tablets", "Sertraline 50mg tablets", "Diazepam 2mg tablets",
                            "Donepezil 10mg tablets"};
  const char* dosages[] = {"one at night", "one twice a day", "two four times a day when required", "one daily",
                           "one in the morning", "one daily", "one at night", "one daily", "one three times a day",
                           "one daily", "one three times a day when required", "one at night"};
  std::vector<DispensingRecord> records;
  for (int month = 0; month < 12; ++month) {
    for (int i = 0; i < 12; ++i) {
      DispensingRecord r;
      r.patient_id = "BENCH1";
      r.dispensed_on = Date::FromCivil(2025, 1, 1) + (month * 28 + i % 5);
      r.product = products[i];
      r.dosage = dosages[i];
      r.quantity = 28;
      records.push_back(r);
    }
  }
  return records;
}

RunContext& SharedAnalysis() {
  static RunContext analysis = std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());
  return analysis;
}

void BM_BuildTimeline(benchmark::State& state) {
  const auto records = Patient();
  RunContext& analysis = SharedAnalysis();
  for (auto _ : state) benchmark::DoNotOptimize(analysis.BuildTimeline(records));
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(records.size()));
}
BENCHMARK(BM_BuildTimeline);

void BM_EvaluateOneDate(benchmark::State& state) {
  const auto records = Patient();
  RunContext& analysis = SharedAnalysis();
  const Timeline timeline = analysis.BuildTimeline(records);
  Date on = Date::FromCivil(2025, 6, 30);
  for (auto _ : state) benchmark::DoNotOptimize(analysis.Evaluate(timeline, on, 84));
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_EvaluateOneDate);

// One timeline evaluated on the 12 month-ends of a year, as a monthly cohort series does
// for each patient; items are patient-dates.
void BM_EvaluateSeries(benchmark::State& state) {
  const auto records = Patient();
  RunContext& analysis = SharedAnalysis();
  const Timeline timeline = analysis.BuildTimeline(records);
  std::vector<Date> dates;
  for (int month = 1; month <= 12; ++month) {
    dates.push_back(EndOfMonth(Date::FromCivil(2025, month, 1)));
  }
  for (auto _ : state) {
    for (Date on : dates) benchmark::DoNotOptimize(analysis.Evaluate(timeline, on, 84));
  }
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(dates.size()));
}
BENCHMARK(BM_EvaluateSeries);

}  // namespace
}  // namespace medload

