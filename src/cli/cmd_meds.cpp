// `medload meds PATIENT --on DATE`: one patient's medicines active on a date.
#include <ostream>

#include "cli/measure_flags.h"
#include "medload/burden/analysis.h"
#include "medload/core/census_note.h"
#include "medload/io/json_text.h"
#include "medload/io/meds_writer.h"
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
  auto fail = [&](const Status& status) {
    *context.err << "medload: " << status.message() << "\n";
    return status.exit_code();
  };
  if (vm->count("patient") == 0U) return fail(Status::Usage("meds needs a PATIENT identifier"));
  const std::string patient = (*vm)["patient"].as<std::vector<std::string>>().front();
  auto on = ReadDateFlag(*vm, "on");
  if (!on.ok()) return fail(on.status());
  auto measure = ReadMeasureFlags(*vm);
  if (!measure.ok()) return fail(measure.status());

  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return fail(store.status());
  auto analysis = Analysis::Open(context.formulary_dir, *measure, &*store);
  if (!analysis.ok()) return fail(analysis.status());
  long dropped = 0;
  auto records = store->DispensingsOf(patient, &dropped);
  if (!records.ok()) return fail(records.status());
  auto registry = store->PatientOf(patient);
  if (!registry.ok()) return fail(registry.status());
  if (records->empty() && !registry->has_value()) {
    return fail(Status::Input("patient \"" + patient + "\" is not in the store " + context.db_path));
  }

  auto latest = store->LatestDispensed();
  if (!latest.ok()) return fail(latest.status());
  std::optional<std::string> census_note = CensusBeyondDataNote(*on, *latest);
  if (dropped > 0) {  // a history past the bound on one patient's dispensings
    const std::string capped = "only the latest " + std::to_string(records->size()) + " of the patient's " +
                               std::to_string(static_cast<long>(records->size()) + dropped) +
                               " counting dispensings are read: medicines dispensed only before them are missing";
    census_note = census_note ? *census_note + "; " + capped : capped;
  }
  if (census_note) Warn(context, *census_note);

  const Timeline timeline = analysis->BuildTimeline(*records);
  const std::optional<int> age = AgeOn(*registry, *on);
  const Burden burden = analysis->Evaluate(timeline, *on, age);
  MedsModel model;
  model.patient = patient;
  model.practice = registry->has_value() ? (*registry)->practice
                                         : (records->empty() ? "" : records->back().practice);
  model.age = age;
  model.registered = registry->has_value();
  model.timeline = &timeline;
  model.burden = &burden;
  model.tables = &analysis->tables();
  model.records = *records;
  model.options = *measure;
  model.census_note = census_note;
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
