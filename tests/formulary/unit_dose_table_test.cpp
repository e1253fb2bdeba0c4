// unit_doses.csv: patch release rates and patch and depot intervals, read, cross-checked,
// faults named exactly, and flattened into the burden tables under canonical names.
#include <doctest/doctest.h>

#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/burden/tables.h"
#include "medload/formulary/formulary.h"

namespace medload {
namespace {

using testing::TempFolder;
using testing::WriteMinimalFormulary;

const char* const kHeader = "ingredient,form,strength_mg,release_mg_per_day,interval_days,source\n";

FormularyCheck CheckWith(const std::string& content) {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("unit_doses.csv", kHeader + content);
  return CheckFormulary(folder.path());
}

}  // namespace

TEST_SUITE("formulary/unit_dose_table") {

TEST_CASE("the bundled unit dose table loads without faults and is counted") {
  const FormularyCheck check = CheckFormulary(MEDLOAD_SOURCE_FORMULARY);
  for (const std::string& fault : check.faults) CAPTURE(fault);
  CHECK(check.ok());
  CHECK(check.unit_dose_rows >= 10);
}

TEST_CASE("each fault of the unit dose table is named with its file, line and field") {
  struct Case {
    std::string content;
    std::string fault;
  };
  const std::vector<Case> cases = {
      {",patch,1,0.5,3,test\n", "unit_doses.csv:2: ingredient: empty"},
      {"chlorphenamine,spray,1,0.5,3,test\n", "unit_doses.csv:2: form: \"spray\" is not patch or depot"},
      {"chlorphenamine,patch,one,0.5,3,test\n", "unit_doses.csv:2: strength_mg: \"one\" is not a number"},
      {"chlorphenamine,patch,0,0.5,3,test\n", "unit_doses.csv:2: strength_mg: 0 must be greater than 0"},
      {"chlorphenamine,patch,1,,3,test\n",
       "unit_doses.csv:2: release_mg_per_day: empty (a patch needs its labelled release rate)"},
      {"chlorphenamine,depot,40,1,14,test\n",
       "unit_doses.csv:2: release_mg_per_day: given for a depot (its dose is the strength over the interval)"},
      {"chlorphenamine,patch,1,-0.5,3,test\n", "unit_doses.csv:2: release_mg_per_day: -0.5 must be greater than 0"},
      {"chlorphenamine,patch,1,0.5,0,test\n", "unit_doses.csv:2: interval_days: \"0\" is not a whole number from 1 to 3650"},
      {"chlorphenamine,depot,,,2.5,test\n", "unit_doses.csv:2: interval_days: \"2.5\" is not a whole number from 1 to 3650"},
      {"chlorphenamine,patch,1,0.5,3,\n", "unit_doses.csv:2: source: empty (every row cites its source)"},
      {"frobazine,depot,,,14,test\n", "unit_doses.csv:2: unknown ingredient \"frobazine\" (not in ingredients.csv)"},
      {"chlorphenamine,patch,1.5,0.5,3,test\nchlorpheniramine,patch,1.50,0.4,3,test\n",
       "unit_doses.csv:3: duplicate patch of \"chlorphenamine\" at strength 1.5 mg (first on line 2)"},
      {"chlorphenamine,depot,,,14,test\nchlorphenamine,depot,,,28,test\n",
       "unit_doses.csv:3: duplicate depot of \"chlorphenamine\" at strength any (first on line 2)"},
      {"chlorphenamine,patch,1,0.5,3\n", "unit_doses.csv:2: 5 fields, expected 6"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.content);
    const FormularyCheck check = CheckWith(c.content);
    REQUIRE(check.faults.size() == 1);
    CHECK(check.faults.front() == c.fault);
  }
}

TEST_CASE("unit dose rows reach the burden tables under the canonical ingredient name") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("unit_doses.csv", std::string(kHeader) + "chlorpheniramine,patch,1.5,0.3333,3,test\n"
                                                        "chlorphenamine,depot,,,14,test\n");
  auto formulary = LoadFormulary(folder.path());
  REQUIRE(formulary.ok());
  const BurdenTables tables = TablesFromFormulary(*formulary, "acb");
  const UnitDoseRow* patch = tables.UnitDose("chlorphenamine", UnitDoseForm::kPatch, 1.5);
  REQUIRE(patch != nullptr);
  CHECK(*patch->release_mg_per_day == doctest::Approx(0.3333));
  CHECK(patch->interval_days == 3);
  CHECK(tables.UnitDose("chlorphenamine", UnitDoseForm::kPatch, 2.0) == nullptr);
  // A row without a strength holds for every strength of that form.
  const UnitDoseRow* depot = tables.UnitDose("chlorphenamine", UnitDoseForm::kDepot, 40);
  REQUIRE(depot != nullptr);
  CHECK(depot->interval_days == 14);
}

}  // TEST_SUITE

}  // namespace medload
