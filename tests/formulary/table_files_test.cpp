#include "formulary/table_files.h"

#include <doctest/doctest.h>

#include <filesystem>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"

namespace medload::formulary_internal {
namespace {

TEST_SUITE("formulary/table_files") {

TEST_CASE("every file of the folder is read, and tables with a header only are empty") {
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

TEST_CASE("each required table missing from the folder is a fault naming it") {
  for (const std::string_view required : RequiredTableFiles()) {
    const std::string file(required);
    CAPTURE(file);
    testing::TempFolder folder;
    testing::WriteMinimalFormulary(folder);
    std::filesystem::remove(std::filesystem::path(folder.path()) / file);
    std::vector<std::string> faults;
    (void)ReadTableFiles(folder.path(), faults);
    const std::string expected = file == "anticholinergic/acb.csv"
                                     ? "anticholinergic/acb.csv: missing (required: the default scale)"
                                     : file + ": missing (required)";
    CHECK(faults == std::vector<std::string>{expected});
    CHECK_FALSE(LoadFormulary(folder.path()).ok());
  }
}

TEST_CASE("a minimum daily dose that is not finite, not normal or absurd is a fault") {
  struct Case {
    std::string value;
    std::string fault;
  };
  const Case cases[] = {
      {"inf", "dbi.csv:2: min_daily_dose_mg: inf is outside 0.001 to 10000 mg a day"},
      {"1e-320", "dbi.csv:2: min_daily_dose_mg: 1e-320 is outside 0.001 to 10000 mg a day"},
      {"1e-9", "dbi.csv:2: min_daily_dose_mg: 1e-9 is outside 0.001 to 10000 mg a day"},
      {"20000", "dbi.csv:2: min_daily_dose_mg: 20000 is outside 0.001 to 10000 mg a day"},
      {"nan", "dbi.csv:2: min_daily_dose_mg: nan must be greater than 0"},
      {"-4", "dbi.csv:2: min_daily_dose_mg: -4 must be greater than 0"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.value);
    testing::TempFolder folder;
    testing::WriteMinimalFormulary(folder);
    folder.Write("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine," + c.value + ",both,test\n");
    std::vector<std::string> faults;
    const FormularyTables tables = ReadTableFiles(folder.path(), faults);
    CHECK(faults == std::vector<std::string>{c.fault});
    CHECK(tables.dbi.empty());
  }
  // The bounds themselves are kept.
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  folder.Write("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,0.001,both,a\nibuprofen,10000,both,b\n");
  std::vector<std::string> faults;
  CHECK(ReadTableFiles(folder.path(), faults).dbi.size() == 2);
  CHECK(faults.empty());
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
