// `medload review --on DATE [criteria]`: the ranked review worklist.
#include <ostream>

#include "cli/measure_flags.h"
#include "medload/format/json_text.h"
#include "medload/review/pseudonym.h"
#include "medload/review/worklist.h"
#include "medload/review/worklist_writer.h"
#include "medload/store/practice_codes.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

// The flags except --on, which may be "latest" and is read by the caller.
Result<WorklistOptions> ReadWorklistFlags(const po::variables_map& vm) {
  WorklistOptions options;
  auto criteria = ReadCriteriaFlags(vm);
  if (!criteria.ok()) return criteria.status();
  options.criteria = std::move(criteria).value();
  if (vm.count("practice") != 0U) options.practices = vm["practice"].as<std::vector<std::string>>();
  if (vm.count("age-min") != 0U) options.age_min = vm["age-min"].as<int>();
  if (vm.count("reviewed-within") != 0U) {
    options.reviewed_within_days = vm["reviewed-within"].as<int>();
    if (*options.reviewed_within_days < 1) return Status::Usage("--reviewed-within must be at least 1 day");
  }
  if (vm.count("limit") != 0U) {
    const int limit = vm["limit"].as<int>();
    if (limit < 1) return Status::Usage("--limit must be at least 1");
    options.limit = static_cast<size_t>(limit);
  }
  return options;
}

}  // namespace

int RunReview(Context& context, const std::vector<std::string>& args) {
  po::options_description options("review options");
  options.add_options()("on", po::value<std::string>(),
                        "the census date (YYYY-MM-DD), or latest: the last month end on or before the latest dispensing")(
      "practice", po::value<std::vector<std::string>>()->composing(), "only this practice (repeatable)")(
      "age-min", po::value<int>(), "only patients aged at least N on the date")(
      "reviewed-within", po::value<int>(), "leave out patients with a completed review in the last DAYS days")(
      "limit", po::value<int>(), "list the first N patients after ranking")(
      "pseudonymise", po::value<std::string>(), "replace identifiers by HMAC-SHA-256 pseudonyms under KEYFILE");
  AddCriteriaFlags(options);
  AddMeasureFlags(options);
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload review --on DATE [--at-least items=N] [--below pdc=X] [--rule ID] [options]", options,
                         {}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  auto on = ReadCensusDateFlag(*vm, "on");
  if (!on.ok()) return fail(on.status());
  auto worklist_options = ReadWorklistFlags(*vm);
  if (!worklist_options.ok()) return fail(worklist_options.status());
  auto measure = ReadMeasureFlags(*vm);
  if (!measure.ok()) return fail(measure.status());
  AddPdcGroups(worklist_options->criteria, *measure);
  std::optional<Pseudonymiser> pseudonymiser;
  if (vm->count("pseudonymise") != 0U) {
    auto loaded = Pseudonymiser::FromKeyFile((*vm)["pseudonymise"].as<std::string>());
    if (!loaded.ok()) return fail(loaded.status());
    pseudonymiser = std::move(loaded).value();
  }
  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return fail(store.status());
  auto census = ResolveCensusDate(context, *on, *store);
  if (!census.ok()) return fail(census.status());
  worklist_options->on = *census;
  if (Status known = CheckPracticeCodes(*store, worklist_options->practices); !known.ok()) {
    return fail(AsFlagFault(known));
  }
  auto analysis = OpenRunContext(context, *measure, &*store, "review");
  if (!analysis.ok()) return fail(analysis.status());
  auto worklist = BuildWorklist(*store, *analysis, *worklist_options);
  if (!worklist.ok()) {
    // Without criteria the worklist's first fault is that; named here with the flags.
    if (worklist_options->criteria.empty()) {
      return fail(Status::Usage("review needs at least one criterion (--at-least items=N, acb=N, dbi=X, falls=N, tsdd=N, --below pdc=X or --rule ID)"));
    }
    return fail(worklist.status());
  }
  for (const std::string& note : worklist->notes) Warn(context, note);
  if (pseudonymiser) {
    for (WorklistEntry& entry : worklist->patients) entry.patient = pseudonymiser->Pseudonym(entry.patient);
  }
  switch (context.format) {
    case Format::kJson: *context.out << JsonText(WorklistJson(*worklist)) << "\n"; break;
    case Format::kCsv: WriteWorklistCsv(*context.out, *worklist); break;
    case Format::kHtml: WriteWorklistHtml(*context.out, *worklist, "Review worklist on " + worklist->on.ToIso()); break;
    case Format::kSvg: return fail(Status::Usage("review writes text, csv, json or html"));
    case Format::kText: WriteWorklistText(*context.out, *worklist); break;
  }
  return 0;
}

}  // namespace medload::cli
