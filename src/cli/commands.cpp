// The command table: one line per command; each command lives in its own cmd_*.cpp.
#include "cli/context.h"

namespace medload::cli {

// Entry points, one per command (declared here, defined in the cmd_*.cpp files).
int RunMeds(Context& context, const std::vector<std::string>& args);
int RunTimeline(Context& context, const std::vector<std::string>& args);
int RunCohortCommand(Context& context, const std::vector<std::string>& args);
int RunReview(Context& context, const std::vector<std::string>& args);
int RunImportDispensing(Context& context, const std::vector<std::string>& args);
int RunImportPatients(Context& context, const std::vector<std::string>& args);
int RunImportPractices(Context& context, const std::vector<std::string>& args);
int RunImportReviews(Context& context, const std::vector<std::string>& args);
int RunSynth(Context& context, const std::vector<std::string>& args);
int RunReportCommand(Context& context, const std::vector<std::string>& args);
int RunDemo(Context& context, const std::vector<std::string>& args);
int RunFormularyCheck(Context& context, const std::vector<std::string>& args);
int RunFormularyLookup(Context& context, const std::vector<std::string>& args);
int RunFormularyUnmatched(Context& context, const std::vector<std::string>& args);
int RunFormularyLoadDictionary(Context& context, const std::vector<std::string>& args);
int RunFormularyRules(Context& context, const std::vector<std::string>& args);

const std::vector<Command>& Commands() {
  static const std::vector<Command> kCommands = {
      {"meds", "one patient's medicines active on a date, with scores and rules", RunMeds},
      {"timeline", "one patient's medication episodes as a chart or table", RunTimeline},
      {"cohort", "counts and rates per group per census date (--shard, --merge)", RunCohortCommand},
      {"review", "ranked worklist of patients meeting any criterion on a date", RunReview},
      {"import dispensing", "load dispensing records (CSV or FHIR NDJSON; - is standard input)",
       RunImportDispensing},
      {"import patients", "load the patient registry (CSV or FHIR Patient NDJSON)", RunImportPatients},
      {"import practices", "load practices: code, name, network, list size", RunImportPractices},
      {"import reviews", "load completed medication reviews", RunImportReviews},
      {"formulary check", "validate the formulary tables; every fault as file:line: fault", RunFormularyCheck},
      {"formulary lookup", "show how a product description or code resolves", RunFormularyLookup},
      {"formulary unmatched", "stored products that nothing in the formulary recognises", RunFormularyUnmatched},
      {"formulary load-dictionary", "read a dm+d or RxNorm release (or a CSV list) into a formulary's dictionary.csv",
       RunFormularyLoadDictionary},
      {"formulary rules", "the combination rules: classes, routes, minimum age and source of each",
       RunFormularyRules},
      {"report", "the batch report of a care network into a folder (--config, --out)", RunReportCommand},
      {"demo", "the bundled invented network: worklist, cohort table and report into a folder", RunDemo},
      {"synth", "write a synthetic, deterministic data set (invented network)", RunSynth},
  };
  return kCommands;
}

}  // namespace medload::cli
