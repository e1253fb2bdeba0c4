// `medload formulary load-dictionary` as a process: a user's CSV list read into a copy
// of the formulary, then a code and a brand from it resolved by `formulary lookup`.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {

TEST_SUITE("cli/cmd_formulary_dictionary") {

TEST_CASE("a dictionary loaded into a copy of the formulary makes its codes and brands resolve") {
  TempFolder folder;
  const ProcessOptions run = InFolder(folder.File(""));
  std::filesystem::copy(MEDLOAD_SOURCE_FORMULARY, folder.File("local"), std::filesystem::copy_options::recursive);
  std::ofstream(folder.File("list.csv")) << "code_system,code,name,brand,ingredients\n"
                                            "local,L-1,,Brindoxa,chlorpheniramine\n"
                                            "local,L-2,Invented compound 10/500,,Frobazine|acetaminophen\n";
  const ProcessResult loaded = RunMedload(
      {"formulary", "load-dictionary", "list.csv", "--system", "csv", "--into", "local"}, run);
  REQUIRE_MESSAGE(loaded.exit_code == 0, loaded.err);
  CHECK(loaded.out.find("local/dictionary.csv: 2 csv rows loaded, 2 rows in the file") != std::string::npos);
  CHECK(loaded.out.find("  frobazine") != std::string::npos);
  const ProcessResult brand =
      RunMedload({"--formulary", "local", "--format", "json", "formulary", "lookup", "Brindoxa 4mg tablets"}, run);
  REQUIRE(brand.exit_code == 0);
  CHECK(brand.out.find("\"match\": \"product\"") != std::string::npos);
  CHECK(brand.out.find("\"ingredient\": \"chlorphenamine\"") != std::string::npos);
  const ProcessResult code = RunMedload(
      {"--formulary", "local", "--format", "json", "formulary", "lookup", "--code", "L-2", "--code-system", "local"}, run);
  REQUIRE(code.exit_code == 0);
  CHECK(code.out.find("\"match\": \"partial\"") != std::string::npos);
  CHECK(code.out.find("\"frobazine\"") != std::string::npos);
}

TEST_CASE("load-dictionary without --system or --into is a usage error, and a bad release an input error") {
  TempFolder folder;
  const ProcessOptions run = InFolder(folder.File(""));
  const ProcessResult missing = RunMedload({"formulary", "load-dictionary", "list.csv"}, run);
  CHECK(missing.exit_code == 1);
  CHECK(missing.err == "medload: formulary load-dictionary needs FILE..., --system and --into DIR\n");
  const ProcessResult system = RunMedload(
      {"formulary", "load-dictionary", "list.csv", "--system", "snomed", "--into", "x"}, run);
  CHECK(system.exit_code == 1);
  CHECK(system.err == "medload: --system must be dmd, rxnorm or csv\n");
  std::filesystem::copy(MEDLOAD_SOURCE_FORMULARY, folder.File("local"), std::filesystem::copy_options::recursive);
  const ProcessResult absent = RunMedload(
      {"formulary", "load-dictionary", "nosuch.csv", "--system", "csv", "--into", "local"}, run);
  CHECK(absent.exit_code == 2);
  CHECK(absent.err == "medload: nosuch.csv: cannot be opened\n");
  CHECK_FALSE(std::filesystem::exists(folder.File("local/dictionary.csv")));
}

}  // TEST_SUITE

}  // namespace medload
