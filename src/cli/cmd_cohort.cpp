// `medload cohort`: counts and rates per group per census date, one pass over the store;
// `--shard K/N` counts one shard of the patients and `--merge FILES...` adds shard outputs.
#include <fstream>
#include <ostream>

#include "cli/measure_flags.h"
#include "medload/burden/patient_pass.h"
#include "medload/burden/run_context.h"
#include "medload/cohort/cohort.h"
#include "medload/cohort/cohort_table.h"
#include "medload/cohort/cohort_wide_writer.h"
#include "medload/cohort/cohort_writer.h"
#include "medload/cohort/series.h"
#include "medload/format/json_text.h"
#include "medload/input/json_file.h"
#include "medload/store/practice_codes.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

constexpr const char* kUsage =
    "medload cohort --from D --to D [--every month|quarter|year] [--on D] [--by GROUP]\n"
    "       [--practice CODE]... [--suppress-below N] [--shard K/N] [criteria] [measure options]\n"
    "       medload cohort --merge FILE... [--suppress-below N]";

// The census dates as written: --on alone, or --from, --to and --every. "latest" (in --on
// or --to) is nullopt until the store is open (ResolveDates).
struct DateFlags {
  bool single = false;           // --on
  std::optional<Date> on_or_from;
  std::optional<Date> to;
  SeriesStep step = SeriesStep::kMonth;
};

Result<DateFlags> ReadDateFlags(const po::variables_map& vm) {
  DateFlags flags;
  if (vm.count("on") != 0U) {
    if (vm.count("from") != 0U || vm.count("to") != 0U) {
      return Status::Usage("give either --on DATE or --from and --to, not both");
    }
    auto on = ReadCensusDateFlag(vm, "on");
    if (!on.ok()) return on.status();
    flags.single = true;
    flags.on_or_from = *on;
    return flags;
  }
  auto from = ReadDateFlag(vm, "from");
  if (!from.ok()) return from.status();
  auto to = ReadCensusDateFlag(vm, "to");
  if (!to.ok()) return to.status();
  const std::string every = vm["every"].as<std::string>();
  const std::optional<SeriesStep> step = ParseSeriesStep(every);
  if (!step) return Status::Usage("--every \"" + every + "\" is not month, quarter or year");
  flags.on_or_from = *from;
  flags.to = *to;
  flags.step = *step;
  return flags;
}

Result<std::vector<Date>> ResolveDates(const Context& context, const DateFlags& flags, const Store& store) {
  if (flags.single) {
    auto on = ResolveCensusDate(context, flags.on_or_from, store);
    if (!on.ok()) return on.status();
    return std::vector<Date>{*on};
  }
  auto to = ResolveCensusDate(context, flags.to, store);
  if (!to.ok()) return to.status();
  const Date from = *flags.on_or_from;
  if (*to < from) return Status::Usage("--to " + to->ToIso() + " is before --from " + from.ToIso());
  return SeriesDates(from, *to, flags.step);
}

// The options except the dates (ResolveDates, once the store is open).
Result<CohortOptions> ReadCohortOptions(const po::variables_map& vm) {
  CohortOptions options;
  const std::string by = vm["by"].as<std::string>();
  const std::optional<GroupBy> group_by = ParseGroupBy(by);
  if (!group_by) {
    return Status::Usage("--by \"" + by + "\" is not practice, network, age-band, sex or none");
  }
  options.group_by = *group_by;
  auto criteria = ReadCriteriaFlags(vm);
  if (!criteria.ok()) return criteria.status();
  options.criteria = std::move(*criteria);
  // Without criteria the cohort counts ten or more medicines (docs/cohort.md).
  if (options.criteria.empty()) options.criteria.push_back(*ParseCriterion("items=10"));
  if (vm.count("shard") != 0U) {
    auto shard = ParseShard(vm["shard"].as<std::string>());
    if (!shard.ok()) return AsFlagFault(shard.status());
    options.shard = *shard;
  }
  if (vm.count("practice") != 0U) options.practices = vm["practice"].as<std::vector<std::string>>();
  return options;
}

Result<CohortTally> MergeFiles(const std::vector<std::string>& files) {
  std::vector<CohortTally> tallies;
  for (const std::string& file : files) {
    auto document = ReadJsonFile(file);
    if (!document.ok()) return document.status();
    auto tally = TallyFromJson(*document, file);
    if (!tally.ok()) return tally.status();
    tallies.push_back(std::move(*tally));
  }
  return MergeTallies(tallies, files);
}

// A store holding one shard (import --shard) is counted as that shard: --shard may be left
// out, and must name it when given.
Status FitHeldShard(const Store& store, bool given, ShardSpec& shard) {
  Result<std::optional<ShardSpec>> held = store.HeldShard();
  if (!held.ok()) return held.status();
  if (!*held) return Status::Ok();
  if (!given) {
    shard = **held;
    return Status::Ok();
  }
  if (shard == **held) return Status::Ok();
  return Status::Input("--shard " + ShardName(shard) + ": the store " + store.path() + " holds shard " +
                       ShardName(**held) + " (leave --shard out, or give --shard " + ShardName(**held) + ")");
}

// Counts from the store.
Result<CohortTally> CountFromStore(const Context& context, const po::variables_map& vm) {
  auto date_flags = ReadDateFlags(vm);
  if (!date_flags.ok()) return date_flags.status();
  auto options = ReadCohortOptions(vm);
  if (!options.ok()) return options.status();
  auto measure = ReadMeasureFlags(vm);
  if (!measure.ok()) return measure.status();
  AddPdcGroups(options->criteria, *measure);
  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return store.status();
  if (Status status = FitHeldShard(*store, vm.count("shard") != 0U, options->shard); !status.ok()) return status;
  auto dates = ResolveDates(context, *date_flags, *store);
  if (!dates.ok()) return dates.status();
  options->dates = std::move(*dates);
  if (Status known = CheckPracticeCodes(*store, options->practices); !known.ok()) return AsFlagFault(known);
  auto analysis = OpenRunContext(context, *measure, &*store, "cohort");
  if (!analysis.ok()) return analysis.status();
  if (Status status = CheckRulesExist(options->criteria, analysis->tables()); !status.ok()) {
    return status;
  }
  return medload::RunCohort(*store, *analysis, *options);
}

void Write(const Context& context, const CohortTable& table, const CohortTally& tally, bool wide) {
  if (wide && context.format != Format::kJson) {
    if (context.format == Format::kCsv) WriteCohortWideCsv(*context.out, table);
    else if (context.format == Format::kHtml) WriteCohortWideHtml(*context.out, table);
    else WriteCohortWideText(*context.out, table);
    return;
  }
  switch (context.format) {
    case Format::kJson: {
      // The raw tally would undo suppression, so it is only written when nothing is withheld.
      const CohortTally* raw = table.suppress_below <= 1 ? &tally : nullptr;
      *context.out << JsonText(CohortJson(table, raw)) << "\n";
      break;
    }
    case Format::kCsv: WriteCohortCsv(*context.out, table); break;
    case Format::kHtml: WriteCohortHtml(*context.out, table); break;
    case Format::kText:
    case Format::kSvg: WriteCohortText(*context.out, table); break;
  }
}

}  // namespace

int RunCohortCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("cohort options");
  options.add_options()
      ("from", po::value<std::string>(), "first date of the series (YYYY-MM-DD)")
      ("to", po::value<std::string>(),
       "last date of the series (YYYY-MM-DD), or latest: the last month end on or before the latest dispensing")
      ("every", po::value<std::string>()->default_value("month"),
       "month, quarter or year: census dates are the period ends from --from to --to")
      ("on", po::value<std::string>(), "one census date instead of a series (or latest)")
      ("practice", po::value<std::vector<std::string>>()->composing(),
       "count only patients registered at this practice (repeatable)")
      ("by", po::value<std::string>()->default_value("practice"),
       "groups: practice, network, age-band (0-17, 18-49, 50-64, 65-74, 75-84, 85+), sex, none")
      ("suppress-below", po::value<long>()->default_value(0),
       "withhold counts from 1 to N-1 and their rates (0: no suppression)")
      ("shard", po::value<std::string>(), "K/N: count only the patients of shard K of N")
      ("merge", po::bool_switch(), "add the JSON outputs of shard runs given as FILE arguments")
      ("layout", po::value<std::string>()->default_value("long"),
       "long: a row per date and group; wide: a row per group, a column per date (text, csv, html)");
  AddCriteriaFlags(options);
  AddMeasureFlags(options);
  int exit_code = 0;
  auto vm = ParseOptions(context, kUsage, options, {{"file", -1}}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  const long suppress_below = (*vm)["suppress-below"].as<long>();
  if (suppress_below < 0) return fail(Status::Usage("--suppress-below must be 0 or more"));
  const bool merge = (*vm)["merge"].as<bool>();
  const bool has_files = vm->count("file") != 0U;
  if (context.format == Format::kSvg) return fail(Status::Usage("cohort writes text, csv, json or html"));
  const std::string layout = (*vm)["layout"].as<std::string>();
  if (layout != "long" && layout != "wide") return fail(Status::Usage("--layout \"" + layout + "\" is not long or wide"));
  if (!merge && has_files) return fail(Status::Usage("file arguments are only taken with --merge"));
  if (merge && !has_files) return fail(Status::Usage("--merge needs one or more cohort JSON files"));
  auto measure = ReadMeasureFlags(*vm);
  if (!measure.ok()) return fail(measure.status());
  auto tally = merge ? MergeFiles((*vm)["file"].as<std::vector<std::string>>())
                     : CountFromStore(context, *vm);
  if (!tally.ok()) return fail(tally.status());
  CohortTable table = BuildCohortTable(*tally, suppress_below, HistoryDays(*measure));
  if (auto capped = CappedHistoriesNote(tally->capped_patients, tally->history_bound)) {
    table.notes.push_back(std::move(*capped));
  }
  for (const std::string& note : table.notes) Warn(context, note);
  if (!table.complete && !context.quiet) {
    *context.err << "medload: note: only " << table.shards << " are in this result\n";
  }
  Write(context, table, *tally, layout == "wide");
  return 0;
}

}  // namespace medload::cli
