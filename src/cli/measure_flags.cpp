#include "cli/measure_flags.h"

#include <ostream>

#include "cli/progress.h"
#include "medload/report/report.h"

namespace medload::cli {

void AddMeasureFlags(po::options_description& options) {
  options.add_options()
      ("measure", po::value<std::string>()->default_value("concurrent"),
       "concurrent (an episode contains the date) or lookback (dispensed in the window)")
      ("window", po::value<int>()->default_value(84), "lookback window in days")
      ("grace-days", po::value<int>()->default_value(30),
       "the longest tail after a supply runs out in which it still counts (the tail is "
       "min(grace, days supplied)); supplies whose tails meet join one episode")
      ("history-days", po::value<int>(),
       "dates in the first N days of a practice's data are marked short-history "
       "(default: max(84, grace days))")
      ("carryover", po::bool_switch(), "an early refill starts the day after the previous supply ends")
      ("default-supply-days", po::value<int>()->default_value(28),
       "days of supply when neither the record, the dosage nor the product gives them")
      ("max-supply-days", po::value<int>()->default_value(180), "cap on the days of supply of one dispensing")
      ("count-by", po::value<std::string>()->default_value("medicine"),
       "medicine (a product's set of ingredients) or ingredient (each ingredient counts)")
      ("exclude-prn", po::bool_switch(), "leave out as-needed dispensings")
      ("exclude-route", po::value<std::vector<std::string>>()->composing(),
       "leave out products given by this route (repeatable): oral, skin, eye, ...")
      ("scale", po::value<std::string>()->default_value("acb"),
       "anticholinergic scale: a file name in formulary/anticholinergic/ (acb, ars, ...)")
      ("exposure-years", po::value<int>(),
       "cumulative anticholinergic exposure (tsdd) counts the dispensings of the N years "
       "ending on the date (default: all data)")
      ("pdc-class", po::value<std::vector<std::string>>()->composing(),
       "also work out the combined proportion of days covered of these classes "
       "(repeatable; CLASS or CLASS|CLASS, e.g. statin, ace-inhibitor|arb)");
}

Result<MeasureOptions> ReadMeasureFlags(const po::variables_map& vm) {
  MeasureOptions options;
  const std::string measure = vm["measure"].as<std::string>();
  if (measure == "concurrent") options.measure = Measure::kConcurrent;
  else if (measure == "lookback") options.measure = Measure::kLookback;
  else return Status::Usage("--measure \"" + measure + "\" is not concurrent or lookback");
  const std::string count_by = vm["count-by"].as<std::string>();
  if (count_by == "medicine") options.count_by = CountBy::kMedicine;
  else if (count_by == "ingredient") options.count_by = CountBy::kIngredient;
  else return Status::Usage("--count-by \"" + count_by + "\" is not medicine or ingredient");
  options.window_days = vm["window"].as<int>();
  options.episodes.grace_days = vm["grace-days"].as<int>();
  options.episodes.carryover = vm["carryover"].as<bool>();
  options.supply.default_supply_days = vm["default-supply-days"].as<int>();
  options.supply.max_supply_days = vm["max-supply-days"].as<int>();
  if (options.window_days < 1) return Status::Usage("--window must be at least 1 day");
  if (options.episodes.grace_days < 0) return Status::Usage("--grace-days must be 0 or more");
  if (options.supply.default_supply_days < 1) return Status::Usage("--default-supply-days must be at least 1");
  if (options.supply.max_supply_days < 1) return Status::Usage("--max-supply-days must be at least 1");
  if (vm.count("history-days") != 0U) {
    options.history_days = vm["history-days"].as<int>();
    if (*options.history_days < 0) return Status::Usage("--history-days must be 0 or more");
  }
  options.exclude_prn = vm["exclude-prn"].as<bool>();
  if (vm.count("exclude-route") != 0U) {
    for (const std::string& name : vm["exclude-route"].as<std::vector<std::string>>()) {
      auto route = RouteFromName(name);
      if (!route) return Status::Usage("--exclude-route \"" + name + "\" is not a known route");
      options.exclude_routes.push_back(*route);
    }
  }
  options.scale = vm["scale"].as<std::string>();
  if (vm.count("exposure-years") != 0U) {
    options.exposure_years = vm["exposure-years"].as<int>();
    if (*options.exposure_years < 1) return Status::Usage("--exposure-years must be at least 1");
  }
  if (vm.count("pdc-class") != 0U) {
    for (const std::string& classes : vm["pdc-class"].as<std::vector<std::string>>()) {
      auto group = ParseBelowCriterion("pdc=1:" + classes);
      if (!group.ok()) return Status::Usage("--pdc-class \"" + classes + "\" is not CLASS or CLASS|CLASS");
      AddPdcGroups({*group}, options);
    }
  }
  return options;
}

void AddCriteriaFlags(po::options_description& options) {
  options.add_options()
      ("at-least", po::value<std::vector<std::string>>()->composing(),
       "a threshold (repeatable): items=N, acb=N, dbi=X, falls=N or tsdd=N (also items>=N, as outputs print it)")
      ("below", po::value<std::vector<std::string>>()->composing(),
       "adherence below a threshold (repeatable): pdc=X (any medicine) or pdc=X:CLASS|CLASS "
       "(the combined proportion of days covered of those classes)")
      ("rule", po::value<std::vector<std::string>>()->composing(),
       "a combination rule, ID or rule:ID (repeatable); 'medload formulary rules' lists them");
}

Result<std::vector<Criterion>> ReadCriteriaFlags(const po::variables_map& vm) {
  std::vector<Criterion> criteria;
  if (vm.count("at-least") != 0U) {
    for (const std::string& text : vm["at-least"].as<std::vector<std::string>>()) {
      auto criterion = ParseCriterion(text);
      if (!criterion.ok()) return criterion.status();
      if (criterion->kind == CriterionKind::kRule) return Status::Usage("use --rule ID for a rule");
      if (criterion->kind == CriterionKind::kPdcBelow) return Status::Usage("use --below pdc=X for adherence");
      criteria.push_back(*criterion);
    }
  }
  if (vm.count("below") != 0U) {
    for (const std::string& text : vm["below"].as<std::vector<std::string>>()) {
      auto criterion = ParseBelowCriterion(text);
      if (!criterion.ok()) return criterion.status();
      criteria.push_back(*criterion);
    }
  }
  if (vm.count("rule") != 0U) {
    for (const std::string& text : vm["rule"].as<std::vector<std::string>>()) {
      auto criterion = ParseRuleCriterion(text);
      if (!criterion.ok()) return AsFlagFault(criterion.status());
      criteria.push_back(*criterion);
    }
  }
  return criteria;
}

Result<Date> ReadDateFlag(const po::variables_map& vm, const char* name) {
  if (vm.count(name) == 0U) return Status::Usage(std::string("--") + name + " DATE is required");
  const std::string text = vm[name].as<std::string>();
  auto date = ParseDate(text);
  if (!date) return Status::Usage(std::string("--") + name + " \"" + text + "\" is not a date (YYYY-MM-DD)");
  return *date;
}

Result<std::optional<Date>> ReadCensusDateFlag(const po::variables_map& vm, const char* name) {
  if (vm.count(name) == 0U) return Status::Usage(std::string("--") + name + " DATE is required (YYYY-MM-DD or latest)");
  const std::string text = vm[name].as<std::string>();
  if (text == "latest") return std::optional<Date>();
  auto date = ParseDate(text);
  if (!date) {
    return Status::Usage(std::string("--") + name + " \"" + text + "\" is not a date (YYYY-MM-DD) or latest");
  }
  return std::optional<Date>(*date);
}

Result<Date> ResolveCensusDate(const Context& context, std::optional<Date> date, const Store& store) {
  if (date) return *date;
  auto summary = store.Summary();
  if (!summary.ok()) return summary.status();
  auto latest = LatestCensusDate(*summary);
  if (!latest.ok()) {
    return Status::Input("latest needs dispensing records: the store " + store.path() + " holds none");
  }
  if (!context.quiet) {
    *context.err << "medload: note: latest is " << latest->ToIso()
                 << ", the last month end on or before the latest dispensing (" << summary->latest_dispensed->ToIso()
                 << ")\n";
  }
  return *latest;
}

Result<RunContext> OpenRunContext(const Context& context, const MeasureOptions& options, Store* store,
                                  const std::string& label) {
  Result<RunContext> run = RunContext::Open(context.formulary_dir, options, store);
  // Open's only usage fault is an unknown scale, which came from --scale here.
  if (!run.ok() && run.status().code() == StatusCode::kUsage) return AsFlagFault(run.status());
  if (run.ok()) run->set_pass_progress(PassProgressPrinter(context, label));
  return run;
}

Status ReportFault(const Status& status, const ReportRunOptions& run) {
  if (run.out_dir.empty() && status.code() == StatusCode::kUsage) return Status::Usage("--out needs a folder");
  return status;
}

}  // namespace medload::cli
