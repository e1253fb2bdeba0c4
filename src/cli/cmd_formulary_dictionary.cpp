// `medload formulary load-dictionary FILE... --system dmd|rxnorm|csv --into DIR`: reads a
// national dictionary release (or a simple CSV list) into DIR/dictionary.csv, a copy of
// the formulary the user keeps, so that its codes, product names and brands resolve.
#include <ostream>

#include "cli/options.h"
#include "medload/format/json_text.h"
#include "medload/formulary/dictionary.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/formulary_writer.h"

namespace medload::cli {

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
  const std::string dictionary = dir + "/dictionary.csv";
  if (context.format == Format::kJson) {
    *context.out << JsonText(DictionaryLoadJson(dictionary, *load, check.dictionary_rows)) << "\n";
  } else {
    WriteDictionaryLoadText(*context.out, dictionary, *load, check.dictionary_rows);
  }
  return 0;
}

}  // namespace medload::cli
