// `medload formulary load-dictionary FILE... --system dmd|rxnorm|csv --into DIR`: reads a
// national dictionary release (or a simple CSV list) into DIR/dictionary.csv, a copy of
// the formulary the user keeps, so that its codes, product names and brands resolve.
#include <ostream>

#include <nlohmann/json.hpp>

#include "cli/options.h"
#include "medload/core/caution.h"
#include "medload/formulary/dictionary.h"
#include "medload/formulary/formulary.h"
#include "medload/io/json_text.h"
#include "medload/io/output.h"

namespace medload::cli {
namespace {

int Fail(Context& context, const Status& status) {
  *context.err << "medload: " << status.message() << "\n";
  return status.exit_code();
}

void WriteLoad(Context& context, const std::string& dir, const DictionaryLoad& load, size_t rows_in_file) {
  std::ostream& out = *context.out;
  if (context.format == Format::kJson) {
    out << JsonText(nlohmann::json{{"dictionary", dir + "/dictionary.csv"},
                                   {"code_system", load.code_system},
                                   {"rows_loaded", load.entries.size()},
                                   {"rows_in_file", rows_in_file},
                                   {"products_skipped", load.skipped},
                                   {"unknown_substances", load.unknown_substances},
                                   {"caution", std::string(kCaution)}})
        << "\n";
    return;
  }
  out << dir << "/dictionary.csv: " << load.entries.size() << " " << load.code_system << " rows loaded, "
      << rows_in_file << " rows in the file\n";
  if (load.skipped > 0) out << load.skipped << " products left out: no ingredient\n";
  if (!load.unknown_substances.empty()) {
    out << load.unknown_substances.size()
        << " substances are not in ingredients.csv; products naming them resolve as partial until they are added:\n";
    for (const std::string& name : load.unknown_substances) out << "  " << name << "\n";
  }
  WriteTextCaution(out);
}

}  // namespace

int RunFormularyLoadDictionary(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary load-dictionary options");
  options.add_options()("system", po::value<std::string>(), "the release's layout: dmd, rxnorm or csv")(
      "into", po::value<std::string>(), "the formulary folder (a copy of formulary/) to write dictionary.csv into");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload formulary load-dictionary FILE... --system dmd|rxnorm|csv --into DIR",
                         options, {{"file", -1}}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format != Format::kText && context.format != Format::kJson) {
    return Fail(context, Status::Usage("formulary load-dictionary writes text or json"));
  }
  if (vm->count("file") == 0 || vm->count("system") == 0 || vm->count("into") == 0) {
    return Fail(context, Status::Usage("formulary load-dictionary needs FILE..., --system and --into DIR"));
  }
  const auto system = DictionarySystemFromName((*vm)["system"].as<std::string>());
  if (!system) return Fail(context, Status::Usage("--system must be dmd, rxnorm or csv"));
  const std::string dir = (*vm)["into"].as<std::string>();
  auto formulary = LoadFormulary(dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  auto load = ReadDictionaryRelease(*formulary, *system, (*vm)["file"].as<std::vector<std::string>>());
  if (!load.ok()) return Fail(context, load.status());
  if (Status written = WriteDictionary(dir, *load); !written.ok()) return Fail(context, written);
  const FormularyCheck check = CheckFormulary(dir);
  for (const std::string& fault : check.faults) *context.err << "medload: " << fault << "\n";
  if (!check.ok()) return Fail(context, Status::Input("formulary " + dir + ": faults after loading the dictionary"));
  WriteLoad(context, dir, *load, check.dictionary_rows);
  return 0;
}

}  // namespace medload::cli
