// `medload formulary check|lookup|unmatched`: validate the tables, show how one product
// resolves, and list the stored products that nothing in the tables recognises.
#include <ostream>

#include "cli/options.h"
#include "medload/core/text.h"
#include "medload/format/json_text.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/formulary_writer.h"
#include "medload/formulary/resolver.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

void WriteCheck(Context& context, const std::string& dir, const FormularyCheck& check) {
  std::ostream& out = *context.out;
  switch (context.format) {
    case Format::kJson: out << JsonText(FormularyCheckJson(dir, check)) << "\n"; return;
    case Format::kCsv: WriteFormularyCheckCsv(out, check); return;
    case Format::kHtml: WriteFormularyCheckHtml(out, dir, check); return;
    default: WriteFormularyCheckText(out, dir, check); return;
  }
}

int CheckCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary check options");
  int exit_code = 0;
  if (!ParseOptions(context, "medload formulary check [--formulary DIR]", options, {}, args, exit_code)) {
    return exit_code;
  }
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary check writes text, csv, json or html"));
  const FormularyCheck check = CheckFormulary(context.formulary_dir);
  WriteCheck(context, context.formulary_dir, check);
  if (!check.ok() && !context.quiet) {
    *context.err << "medload: formulary " << context.formulary_dir << " has " << check.faults.size()
                 << (check.faults.size() == 1 ? " fault\n" : " faults\n");
  }
  return check.ok() ? 0 : kExitInput;
}

// ---- formulary lookup ----

void WriteLookup(Context& context, const LookupModel& model) {
  std::ostream& out = *context.out;
  switch (context.format) {
    // The description and code are echoed as given: bytes that are not UTF-8 become U+FFFD.
    case Format::kJson: out << JsonText(LookupJson(model)) << "\n"; return;
    case Format::kCsv: WriteLookupCsv(out, model); return;
    case Format::kHtml: WriteLookupHtml(out, model); return;
    default: WriteLookupText(out, model); return;
  }
}

int LookupCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary lookup options");
  options.add_options()("code", po::value<std::string>()->default_value(""), "a product code to resolve")(
      "code-system", po::value<std::string>()->default_value(""), "the code's system, e.g. ATC");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload formulary lookup TEXT [--code CODE --code-system SYSTEM]", options,
                         {{"text", -1}}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary lookup writes text, csv, json or html"));
  LookupModel model;
  if (vm->count("text") != 0U) model.description = Join((*vm)["text"].as<std::vector<std::string>>(), " ");
  model.code = (*vm)["code"].as<std::string>();
  model.code_system = (*vm)["code-system"].as<std::string>();
  if (model.description.empty() && model.code.empty()) {
    return Fail(context, Status::Usage("formulary lookup needs a product description TEXT or --code"));
  }
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  model.formulary = &*formulary;
  model.product = Resolve(*formulary, model.description, model.code, model.code_system);
  WriteLookup(context, model);
  return 0;
}

// ---- formulary unmatched ----

void WriteUnmatched(Context& context, const std::vector<UnresolvedProduct>& products, const std::string& checksum) {
  std::ostream& out = *context.out;
  switch (context.format) {
    case Format::kJson: out << JsonText(UnmatchedJson(products, checksum)) << "\n"; return;
    case Format::kCsv: WriteUnmatchedCsv(out, products); return;
    case Format::kHtml: WriteUnmatchedHtml(out, products); return;
    default: WriteUnmatchedText(out, products); return;
  }
}

int UnmatchedCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary unmatched options");
  options.add_options()("limit", po::value<long>()->default_value(0), "show at most N products (0: all)");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload formulary unmatched [--limit N]", options, {}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary unmatched writes text, csv, json or html"));
  const long limit = (*vm)["limit"].as<long>();
  if (limit < 0) return Fail(context, Status::Usage("--limit must be 0 or more"));
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  auto store = Store::Open(context.db_path, StoreOptions{30000, true});
  if (!store.ok()) return Fail(context, store.status());
  auto counts = store->ProductCounts();
  if (!counts.ok()) return Fail(context, counts.status());
  const std::vector<UnresolvedProduct> unmatched = UnmatchedProducts(*formulary, *counts, static_cast<size_t>(limit));
  WriteUnmatched(context, unmatched, formulary->checksum());
  return 0;
}

}  // namespace

int RunFormularyCheck(Context& context, const std::vector<std::string>& args) {
  return CheckCommand(context, args);
}
int RunFormularyLookup(Context& context, const std::vector<std::string>& args) {
  return LookupCommand(context, args);
}
int RunFormularyUnmatched(Context& context, const std::vector<std::string>& args) {
  return UnmatchedCommand(context, args);
}

}  // namespace medload::cli
