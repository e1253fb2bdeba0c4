#include "formulary/table_files.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"

namespace medload::formulary_internal {
namespace {

TEST_SUITE("formulary/table_files") {

TEST_CASE("every file of the folder is read, optional ones may be absent") {
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  std::vector<std::string> faults;
  const FormularyTables tables = ReadTableFiles(folder.path(), faults);
  CHECK(faults.empty());
  CHECK(tables.ingredients.size() == 3);
  REQUIRE(tables.scales.size() == 1);
  CHECK(tables.scales[0].name == "acb");
  CHECK(tables.dbi.size() == 1);
  CHECK(tables.products.empty());
  CHECK(tables.rules.empty());
  CHECK(tables.checksum.size() == 64);
}

TEST_CASE("a folder without the default scale is a fault") {
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  std::filesystem::remove(std::filesystem::path(folder.path()) / "anticholinergic" / "acb.csv");
  std::vector<std::string> faults;
  (void)ReadTableFiles(folder.path(), faults);
  CHECK(faults == std::vector<std::string>{"anticholinergic/acb.csv: missing (required: the default scale)"});
}

TEST_CASE("ingredient rows split their lists and upper-case ATC codes") {
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  folder.Write("ingredients.csv",
               "ingredient,synonyms,atc,classes,source\n"
               "salbutamol, albuterol | salbutamol sulfate ,r03ac02|R03CC02,beta2-agonist|bronchodilator,test\n");
  folder.Write("anticholinergic/acb.csv", "ingredient,score,source\n");
  folder.Write("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\n");
  std::vector<std::string> faults;
  const FormularyTables tables = ReadTableFiles(folder.path(), faults);
  CHECK(faults.empty());
  REQUIRE(tables.ingredients.size() == 1);
  CHECK(tables.ingredients[0].synonyms == std::vector<std::string>{"albuterol", "salbutamol sulfate"});
  CHECK(tables.ingredients[0].atc == std::vector<std::string>{"R03AC02", "R03CC02"});
  CHECK(tables.ingredients[0].classes == std::vector<std::string>{"beta2-agonist", "bronchodilator"});
  CHECK(tables.ingredients[0].line == 2);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload::formulary_internal
