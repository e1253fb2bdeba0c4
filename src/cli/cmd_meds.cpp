// `medload meds PATIENT --on DATE`: one patient's medicines active on a date.
#include <ostream>

#include "cli/measure_flags.h"
#include "medload/burden/meds_writer.h"
#include "medload/burden/patient_facts.h"
#include "medload/burden/run_context.h"
#include "medload/core/data_coverage.h"
#include "medload/format/json_text.h"
#include "medload/store/store.h"

namespace medload::cli {

int RunMeds(Context& context, const std::vector<std::string>& args) {
  po::options_description options("meds options");
  options.add_options()("on", po::value<std::string>(), "the census date (YYYY-MM-DD)");
  AddMeasureFlags(options);
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload meds PATIENT --on DATE [measure options]", options,
                         {{"patient", 1}}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  if (vm->count("patient") == 0U) return fail(Status::Usage("meds needs a PATIENT identifier"));
  const std::string patient = (*vm)["patient"].as<std::vector<std::string>>().front();
  auto on = ReadDateFlag(*vm, "on");
  if (!on.ok()) return fail(on.status());
  auto measure = ReadMeasureFlags(*vm);
  if (!measure.ok()) return fail(measure.status());

  auto store = Store::Open(context.db_path, StoreOptions{30000, true});
  if (!store.ok()) return fail(store.status());
  auto analysis = OpenRunContext(context, *measure, &*store);
  if (!analysis.ok()) return fail(analysis.status());
  auto records = store->DispensingsOf(patient);
  if (!records.ok()) return fail(records.status());
  auto registry = store->PatientOf(patient);
  if (!registry.ok()) return fail(registry.status());
  if (records->empty() && !registry->has_value()) {
    // A patient whose every dispensing has a status that does not count is still known.
    auto all = store->AllDispensingsOf(patient);
    if (!all.ok()) return fail(all.status());
    if (all->empty()) {
      return fail(Status::Input("patient \"" + patient + "\" is not in the store " + context.db_path));
    }
  }

  auto not_counted = store->NotCountingOf(patient, *on);
  if (!not_counted.ok()) return fail(not_counted.status());
  // The practice whose data coverage applies: the registry's, else the one named by the
  // latest dispensing on or before the date (nothing later: the point-in-time rule).
  std::string practice = registry->has_value() ? (*registry)->practice : "";
  if (!registry->has_value()) {
    for (const DispensingRecord& record : *records) {
      if (record.dispensed_on <= *on) practice = record.practice;
    }
  }
  auto spans = store->PracticeDataSpans();
  if (!spans.ok()) return fail(spans.status());
  const auto span_it = spans->find(practice);
  const std::optional<DataSpan> span =
      span_it == spans->end() ? std::nullopt : std::optional<DataSpan>(span_it->second);
  const int history_days = HistoryDays(*measure);
  const DataState data = DataStateOn(span, *on, history_days);
  std::optional<std::string> data_note = DataStateNote(practice, data, span, *on, history_days);
  if (data_note) Warn(context, *data_note);

  const Timeline timeline = analysis->BuildTimeline(*records);
  const std::optional<int> age = AgeOn(*registry, *on);
  const Burden burden = analysis->Evaluate(timeline, *on, age);
  MedsModel model;
  model.patient = patient;
  model.practice = practice;
  model.data = data;
  model.age = age;
  model.registered = registry->has_value();
  model.timeline = &timeline;
  model.burden = &burden;
  model.tables = &analysis->tables();
  model.records = *records;
  model.options = *measure;
  model.data_note = data_note;
  model.not_counted = std::move(not_counted.value());
  switch (context.format) {
    case Format::kJson: *context.out << JsonText(MedsJson(model)) << "\n"; break;
    case Format::kCsv: WriteMedsCsv(*context.out, model); break;
    case Format::kHtml: WriteMedsHtml(*context.out, model); break;
    case Format::kSvg: return fail(Status::Usage("meds writes text, csv, json or html"));
    case Format::kText: WriteMedsText(*context.out, model); break;
  }
  return 0;
}

}  // namespace medload::cli
