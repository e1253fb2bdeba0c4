// `medload timeline PATIENT [--from D] [--to D]`: the patient's episodes as a chart or table.
#include <algorithm>
#include <ostream>

#include "cli/measure_flags.h"
#include "medload/burden/run_context.h"
#include "medload/burden/timeline_writer.h"
#include "medload/format/json_text.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

// The default range: the first dispensing to the last day of the last episode (tail
// included).
void DefaultRange(const Timeline& timeline, Date& from, Date& to) {
  bool first = true;
  for (const Medicine& medicine : timeline.medicines) {
    for (const Episode& episode : medicine.episodes) {
      from = first ? episode.start : std::min(from, episode.start);
      to = first ? episode.end : std::max(to, episode.end);
      first = false;
    }
  }
}

}  // namespace

int RunTimeline(Context& context, const std::vector<std::string>& args) {
  po::options_description options("timeline options");
  options.add_options()("from", po::value<std::string>(), "first day shown (default: first dispensing)")(
      "to", po::value<std::string>(), "last day shown; dispensings after it are left out (default: end of the last episode)")(
      "on", po::value<std::string>(), "a census date to mark on the chart");
  AddMeasureFlags(options);
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload timeline PATIENT [--from D] [--to D] [--on D] [--format svg|html|text|csv]",
                         options, {{"patient", 1}}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  if (vm->count("patient") == 0U) return fail(Status::Usage("timeline needs a PATIENT identifier"));
  const std::string patient = (*vm)["patient"].as<std::vector<std::string>>().front();
  auto measure = ReadMeasureFlags(*vm);
  if (!measure.ok()) return fail(measure.status());
  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return fail(store.status());
  auto analysis = OpenRunContext(context, *measure, &*store, "timeline");
  if (!analysis.ok()) return fail(analysis.status());
  long dropped = 0;
  auto records = store->DispensingsOf(patient, &dropped);
  if (!records.ok()) return fail(records.status());
  if (records->empty()) return fail(Status::Input("patient \"" + patient + "\" has no dispensings in " + context.db_path));
  std::optional<Date> from, to, census;
  for (const char* name : {"from", "to", "on"}) {
    if (vm->count(name) == 0U) continue;
    auto date = ReadDateFlag(*vm, name);
    if (!date.ok()) return fail(date.status());
    (std::string_view(name) == "from" ? from : std::string_view(name) == "to" ? to : census) = *date;
  }
  // With --to, the timeline as known on that day: later dispensings are left out, so that
  // nothing shown depends on records dispensed after it (the point-in-time rule).
  if (to) std::erase_if(*records, [&](const DispensingRecord& r) { return r.dispensed_on > *to; });
  if (records->empty()) return fail(Status::Input("patient \"" + patient + "\" has no dispensings on or before --to"));
  const Timeline timeline = analysis->BuildTimeline(*records);

  TimelineModel model;
  model.patient = patient;
  model.timeline = &timeline;
  model.records = *records;
  model.dropped = dropped;
  model.from = records->front().dispensed_on;
  model.to = model.from;
  DefaultRange(timeline, model.from, model.to);
  if (from) model.from = *from;
  if (to) model.to = *to;
  model.census = census;
  if (model.to < model.from) return fail(Status::Usage("--to is before --from"));
  if (model.to - model.from > 366 * 20) return fail(Status::Usage("the range is longer than 20 years"));
  switch (context.format) {
    case Format::kSvg: WriteTimelineSvg(*context.out, model); break;
    case Format::kHtml: WriteTimelineHtml(*context.out, model); break;
    case Format::kCsv: WriteTimelineCsv(*context.out, model); break;
    case Format::kJson: *context.out << JsonText(TimelineJson(model)) << "\n"; break;
    case Format::kText: WriteTimelineText(*context.out, model); break;
  }
  return 0;
}

}  // namespace medload::cli
