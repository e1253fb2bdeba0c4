// anticholinergic/tsdd.csv and falls_risk.csv: read, cross-checked, faults named exactly,
// and flattened into the burden tables with classes expanded.
#include <doctest/doctest.h>

#include <algorithm>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/burden/tables.h"
#include "medload/formulary/formulary.h"

namespace medload {
namespace {

using testing::TempFolder;
using testing::WriteMinimalFormulary;

const char* const kTsddHeader = "ingredient,min_effective_daily_dose_mg,source\n";
const char* const kFallsHeader = "category,class,ingredient,source\n";

FormularyCheck CheckWith(const std::string& file, const std::string& content) {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write(file, content);
  return CheckFormulary(folder.path());
}

}  // namespace

TEST_SUITE("formulary/longitudinal_tables") {

TEST_CASE("the bundled tsdd and falls-risk tables load without faults and are counted") {
  const FormularyCheck check = CheckFormulary(MEDLOAD_SOURCE_FORMULARY);
  for (const std::string& fault : check.faults) CAPTURE(fault);
  CHECK(check.ok());
  CHECK(check.tsdd_rows >= 40);
  CHECK(check.falls_risk_rows >= 12);
  CHECK(check.scales == 2);  // tsdd.csv sits beside the scales but is not one
}

TEST_CASE("each fault of the tsdd table is named with its file and line") {
  struct Case {
    std::string content;
    std::string fault;
  };
  const std::vector<Case> cases = {
      {",5,test\n", "anticholinergic/tsdd.csv:2: ingredient: empty"},
      {"chlorphenamine,4,\n", "anticholinergic/tsdd.csv:2: source: empty (every row cites its source)"},
      {"chlorphenamine,four,test\n", "anticholinergic/tsdd.csv:2: min_effective_daily_dose_mg: \"four\" is not a number"},
      {"chlorphenamine,0,test\n", "anticholinergic/tsdd.csv:2: min_effective_daily_dose_mg: 0 must be greater than 0"},
      {"chlorphenamine,-1,test\n", "anticholinergic/tsdd.csv:2: min_effective_daily_dose_mg: -1 must be greater than 0"},
      {"oxybutynin,5,test\n", "anticholinergic/tsdd.csv:2: unknown ingredient \"oxybutynin\" (not in ingredients.csv)"},
      {"chlorphenamine,4,test\nchlorpheniramine,4,test\n",
       "anticholinergic/tsdd.csv:3: duplicate ingredient \"chlorphenamine\" (first on line 2)"},
      {"chlorphenamine,4\n", "anticholinergic/tsdd.csv:2: 2 fields, expected 3"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.content);
    const FormularyCheck check = CheckWith("anticholinergic/tsdd.csv", kTsddHeader + c.content);
    REQUIRE(check.faults.size() == 1);
    CHECK(check.faults.front() == c.fault);
    CHECK(check.scales == 1);
  }
}

TEST_CASE("each fault of the falls-risk table is named with its file and line") {
  struct Case {
    std::string content;
    std::string fault;
  };
  const std::vector<Case> cases = {
      {",nsaid,,test\n", "falls_risk.csv:2: category: empty"},
      {"Sedative,nsaid,,test\n", "falls_risk.csv:2: category: \"Sedative\" is not lower-case-hyphenated"},
      {"sedative,,,test\n", "falls_risk.csv:2: class, ingredient: both empty (give one)"},
      {"sedative,nsaid,ibuprofen,test\n", "falls_risk.csv:2: class, ingredient: both given (give one)"},
      {"sedative,nsaid,,\n", "falls_risk.csv:2: source: empty (every row cites its source)"},
      {"sedative,benzodiazepine,,test\n", "falls_risk.csv:2: unknown class \"benzodiazepine\" (no ingredient carries it)"},
      {"sedative,,diazepam,test\n", "falls_risk.csv:2: unknown ingredient \"diazepam\" (not in ingredients.csv)"},
      {"sedative,,chlorphenamine,test\nsedative,,chlorpheniramine,test\n",
       "falls_risk.csv:3: duplicate ingredient \"chlorphenamine\" in category \"sedative\" (first on line 2)"},
      {"sedative,nsaid,,test\nsedative,nsaid,,again\n",
       "falls_risk.csv:3: duplicate class \"nsaid\" in category \"sedative\" (first on line 2)"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.content);
    const FormularyCheck check = CheckWith("falls_risk.csv", kFallsHeader + c.content);
    REQUIRE(check.faults.size() == 1);
    CHECK(check.faults.front() == c.fault);
  }
}

TEST_CASE("the burden tables expand falls-risk classes to their ingredients and canonicalise names") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("falls_risk.csv", std::string(kFallsHeader) +
                                     "sedating-antihistamine,antihistamine-sedating,,test\n"
                                     "other,,chlorpheniramine,test\n"
                                     "nsaid-test,nsaid,,test\n");
  folder.Write("anticholinergic/tsdd.csv", std::string(kTsddHeader) + "chlorpheniramine,4,test\n");
  auto formulary = LoadFormulary(folder.path());
  REQUIRE(formulary.ok());
  const BurdenTables tables = TablesFromFormulary(*formulary, "acb");
  REQUIRE(tables.falls_categories.count("chlorphenamine") == 1);
  CHECK(tables.falls_categories.at("chlorphenamine") == std::vector<std::string>{"other", "sedating-antihistamine"});
  CHECK(tables.falls_categories.at("ibuprofen") == std::vector<std::string>{"nsaid-test"});
  CHECK(tables.falls_categories.count("ramipril") == 0);
  REQUIRE(tables.tsdd_doses.count("chlorphenamine") == 1);
  CHECK(tables.tsdd_doses.at("chlorphenamine") == doctest::Approx(4));
}

TEST_CASE("a formulary without the two tables loads, with no falls-risk or tsdd rows") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  auto formulary = LoadFormulary(folder.path());
  REQUIRE(formulary.ok());
  const BurdenTables tables = TablesFromFormulary(*formulary, "acb");
  CHECK(tables.falls_categories.empty());
  CHECK(tables.tsdd_doses.empty());
}

}  // TEST_SUITE
}  // namespace medload
