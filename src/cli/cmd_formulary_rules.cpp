// `medload formulary rules`: lists the combination rules of the formulary (id, title,
// classes required and forbidden, routes, minimum age, source) in any output format.
#include <ostream>

#include "cli/options.h"
#include "medload/formulary/rules_listing.h"
#include "medload/format/json_text.h"

namespace medload::cli {

int RunFormularyRules(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary rules options");
  int exit_code = 0;
  if (!ParseOptions(context, "medload formulary rules [--formulary DIR]", options, {}, args, exit_code)) {
    return exit_code;
  }
  if (context.format == Format::kSvg) {
    return Fail(context, Status::Usage("formulary rules writes text, csv, json or html"));
  }
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  switch (context.format) {
    case Format::kJson: *context.out << JsonText(RulesListingJson(*formulary)) << "\n"; break;
    case Format::kCsv: WriteRulesListingCsv(*context.out, *formulary); break;
    case Format::kHtml: WriteRulesListingHtml(*context.out, *formulary); break;
    default: WriteRulesListingText(*context.out, *formulary); break;
  }
  return 0;
}

}  // namespace medload::cli
