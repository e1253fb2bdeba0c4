#include <doctest/doctest.h>

#include <algorithm>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/formulary/formulary.h"

namespace medload {
namespace {

using testing::TempFolder;
using testing::WriteMinimalFormulary;

bool HasFault(const FormularyCheck& check, const std::string& fault) {
  return std::find(check.faults.begin(), check.faults.end(), fault) != check.faults.end();
}

// Writes the minimal formulary, replaces one file, and checks that `fault` is reported.
void ExpectFault(const std::string& file, const std::string& content, const std::string& fault) {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write(file, content);
  const FormularyCheck check = CheckFormulary(folder.path());
  CAPTURE(fault);
  CAPTURE(check.faults.size());
  for (const std::string& found : check.faults) CAPTURE(found);
  CHECK(HasFault(check, fault));
  CHECK_FALSE(check.ok());
  CHECK_FALSE(LoadFormulary(folder.path()).ok());
}

TEST_SUITE("formulary/check") {

TEST_CASE("the bundled formulary has no faults") {
  const FormularyCheck check = CheckFormulary(MEDLOAD_SOURCE_FORMULARY);
  for (const std::string& fault : check.faults) CAPTURE(fault);
  CHECK(check.faults.empty());
  CHECK(check.ingredients >= 300);
  CHECK(check.scales == 2);
  CHECK(check.rules >= 10);
}

TEST_CASE("a minimal formulary is clean and counted") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  const FormularyCheck check = CheckFormulary(folder.path());
  CHECK(check.ok());
  CHECK(check.ingredients == 3);
  CHECK(check.synonyms == 1);
  CHECK(check.scale_rows == 1);
  CHECK(check.dbi_rows == 1);
  CHECK(check.checksum.size() == 64);
}

TEST_CASE("a DBI class that no ingredient has, or named twice, is a fault") {
  ExpectFault("dbi_classes.csv", "class,effect,source\nnsaid,sedative,test\nsleepers,sedative,test\n",
              "dbi_classes.csv:3: no ingredient has the class \"sleepers\"");
  ExpectFault("dbi_classes.csv", "class,effect,source\nnsaid,sedative,test\nnsaid,both,test\n",
              "dbi_classes.csv:3: duplicate class \"nsaid\" (first on line 2)");
  ExpectFault("dbi_classes.csv", "class,effect,source\nnsaid,drowsy,test\n",
              "dbi_classes.csv:2: effect: \"drowsy\" is not anticholinergic, sedative or both");
}

TEST_CASE("a row with the wrong number of fields is a fault") {
  ExpectFault("ingredients.csv", "ingredient,synonyms,atc,classes,source\nibuprofen,,M01AE01,nsaid\n",
              "ingredients.csv:2: 4 fields, expected 5");
}

TEST_CASE("an empty name is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source\n,3,test\n",
              "anticholinergic/acb.csv:2: ingredient: empty");
}

TEST_CASE("a row without a source is a fault") {
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,4,both,\n",
              "dbi.csv:2: source: empty (every row cites its source)");
}

TEST_CASE("a missing column is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,source\nibuprofen,test\n",
              "anticholinergic/acb.csv:1: missing column \"score\"");
}

TEST_CASE("a score that is not a whole number is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source\nchlorphenamine,high,test\n",
              "anticholinergic/acb.csv:2: score: \"high\" is not a whole number");
}

TEST_CASE("a score out of 0..3 is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source\nchlorphenamine,4,test\n",
              "anticholinergic/acb.csv:2: score: 4 is out of range 0..3");
}

TEST_CASE("a DBI dose that is not a number is a fault") {
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,four,both,test\n",
              "dbi.csv:2: min_daily_dose_mg: \"four\" is not a number");
}

TEST_CASE("a DBI dose of zero or less is a fault") {
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,0,both,test\n",
              "dbi.csv:2: min_daily_dose_mg: 0 must be greater than 0");
}

TEST_CASE("a DBI effect other than anticholinergic, sedative or both is a fault") {
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,4,sleepy,test\n",
              "dbi.csv:2: effect: \"sleepy\" is not anticholinergic, sedative or both");
}

TEST_CASE("a duplicate ingredient is a fault naming the first line") {
  ExpectFault("ingredients.csv",
              "ingredient,synonyms,atc,classes,source\nchlorphenamine,,,x,test\nibuprofen,,,nsaid,test\n"
              "Chlorphenamine,,,x,test\n",
              "ingredients.csv:4: duplicate ingredient \"Chlorphenamine\" (first on line 2)");
}

TEST_CASE("a synonym claimed by two ingredients is a fault") {
  ExpectFault("ingredients.csv",
              "ingredient,synonyms,atc,classes,source\nchlorphenamine,chlorpheniramine,,x,test\n"
              "ibuprofen,chlorpheniramine,,nsaid,test\n",
              "ingredients.csv:3: synonym \"chlorpheniramine\" is already a name of \"chlorphenamine\" (line 2)");
}

TEST_CASE("an ATC code claimed by two ingredients is a fault") {
  ExpectFault("ingredients.csv",
              "ingredient,synonyms,atc,classes,source\nchlorphenamine,,R06AB04,x,test\nibuprofen,,R06AB04,nsaid,test\n",
              "ingredients.csv:3: atc: \"R06AB04\" is already the code of \"chlorphenamine\" (line 2)");
}

TEST_CASE("a malformed ATC code or class name is a fault") {
  ExpectFault("ingredients.csv", "ingredient,synonyms,atc,classes,source\nibuprofen,,M01-AE,nsaid,test\n",
              "ingredients.csv:2: atc: \"M01-AE\" is not an ATC code");
  ExpectFault("ingredients.csv", "ingredient,synonyms,atc,classes,source\nibuprofen,,,NSAID,test\n",
              "ingredients.csv:2: classes: \"NSAID\" is not lower-case-hyphenated");
}

TEST_CASE("a scale naming an unknown ingredient is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source\nunobtainium,3,test\n",
              "anticholinergic/acb.csv:2: unknown ingredient \"unobtainium\" (not in ingredients.csv)");
}

TEST_CASE("a scale listing one ingredient twice under two names is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source\nchlorphenamine,3,a\nchlorpheniramine,3,b\n",
              "anticholinergic/acb.csv:3: duplicate ingredient \"chlorphenamine\" (first on line 2)");
}

TEST_CASE("dbi.csv naming an unknown ingredient is a fault") {
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nunobtainium,4,both,test\n",
              "dbi.csv:2: unknown ingredient \"unobtainium\" (not in ingredients.csv)");
}

TEST_CASE("a product naming an unknown ingredient or route is a fault") {
  const std::string header = "product,requires,ingredients,form,route,dose_unit,supply_days_per_unit,source\n";
  ExpectFault("products.csv", header + "co-thing,,ibuprofen|unobtainium,,,,,test\n",
              "products.csv:2: unknown ingredient \"unobtainium\" (not in ingredients.csv)");
  ExpectFault("products.csv", header + "co-thing,,ibuprofen,,by mouth,,,test\n",
              "products.csv:2: route: \"by mouth\" is not a route name");
  ExpectFault("products.csv", header + "co-thing,,ibuprofen,,,,weekly,test\n",
              "products.csv:2: supply_days_per_unit: \"weekly\" is not a whole number > 0");
  ExpectFault("products.csv", header + "co-thing,,ibuprofen,,,,,a\nCo-Thing,,ramipril,,,,,b\n",
              "products.csv:3: duplicate product \"Co-Thing\" (first on line 2)");
}

TEST_CASE("a code naming nothing, or given twice, is a fault") {
  const std::string header = "code_system,code,product_or_ingredient,source\n";
  ExpectFault("codes.csv", header + "ATC,X01XX01,unobtainium,test\n",
              "codes.csv:2: \"unobtainium\" is not a product, ingredient or non-medicine term");
  ExpectFault("codes.csv", header + "ATC,M01AE01,ibuprofen,a\nATC,M01AE01,ibuprofen,b\n",
              "codes.csv:3: duplicate code ATC M01AE01 (first on line 2)");
}

TEST_CASE("a non-medicine term that is an ingredient name is a fault") {
  ExpectFault("non_medicines.csv", "term,category,source\nibuprofen,appliance,test\n",
              "non_medicines.csv:2: term \"ibuprofen\" is also a name of the ingredient \"ibuprofen\", which could "
              "then never resolve");
}

TEST_CASE("a rule naming an unknown class, ingredient or scale is a fault with its JSON pointer") {
  ExpectFault("rules.json",
              R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
                  "require": [{"classes": ["nsaid", "nsaids"]}]}]})",
              "rules.json: /rules/0/require/0/classes/1: unknown class \"nsaids\" (no ingredient carries it)");
  ExpectFault("rules.json",
              R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
                  "require": [{"ingredients": ["unobtainium"]}]}]})",
              "rules.json: /rules/0/require/0/ingredients/0: unknown ingredient \"unobtainium\" (not in "
              "ingredients.csv)");
  ExpectFault("rules.json",
              R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
                  "require": [{"scale_score_at_least": 3, "scale": "xyz"}]}]})",
              "rules.json: /rules/0/require/0/scale: unknown scale \"xyz\"");
}

TEST_CASE("a forbidden class or ingredient nobody carries is a fault with its JSON pointer") {
  ExpectFault("rules.json",
              R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
                  "require": [{"classes": ["nsaid"]}], "forbid": [{"classes": ["ppis"]}]}]})",
              "rules.json: /rules/0/forbid/0/classes/0: unknown class \"ppis\" (no ingredient carries it)");
  ExpectFault("rules.json",
              R"({"rules": [{"id": "r", "title": "t", "explanation": "e", "source": "s",
                  "require": [{"classes": ["nsaid"]}], "forbid": [{"ingredients": ["omeprazol"]}]}]})",
              "rules.json: /rules/0/forbid/0/ingredients/0: unknown ingredient \"omeprazol\" (not in ingredients.csv)");
}

TEST_CASE("routes.csv names each route once, as a route, systemic yes or no") {
  struct Case {
    const char* content;
    const char* fault;
  };
  const std::vector<Case> cases = {
      {"route,systemic,source\nby mouth,yes,test\n", "routes.csv:2: route: \"by mouth\" is not a route name"},
      {"route,systemic,source\nnot stated,yes,test\n", "routes.csv:2: route: \"not stated\" is not a route name"},
      {"route,systemic,source\nnasal,maybe,test\n", "routes.csv:2: systemic: \"maybe\" is not yes or no"},
      {"route,systemic,source\neye,no,test\nophthalmic,yes,test\n",
       "routes.csv:3: duplicate route \"eye\" (first on line 2)"},
      {"route,systemic,source\nnasal,yes,\n", "routes.csv:2: source: empty (every row cites its source)"},
      {"route,source\nnasal,test\n", "routes.csv:1: missing column \"systemic\""},
  };
  for (const Case& c : cases) ExpectFault("routes.csv", c.content, c.fault);
}

TEST_CASE("a scale or DBI row naming a route that does not exist is a fault") {
  ExpectFault("anticholinergic/acb.csv", "ingredient,score,source,routes\nchlorpheniramine,3,test,oral|by mouth\n",
              "anticholinergic/acb.csv:2: routes: \"by mouth\" is not a route name");
  ExpectFault("dbi.csv", "ingredient,min_daily_dose_mg,effect,source,routes\nchlorphenamine,4,both,test,eyes\n",
              "dbi.csv:2: routes: \"eyes\" is not a route name");
}

TEST_CASE("routes.csv changes the systemic routes and entries keep their own routes") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  // Source: product specification section 5: oral, transdermal, injection, rectal and
  // sublingual/buccal are systemic by default.
  auto plain = LoadFormulary(folder.path());
  REQUIRE(plain.ok());
  CHECK(plain->SystemicRoutes() == DefaultSystemicRoutes());
  folder.Write("routes.csv", "route,systemic,source\nrectal,no,test\nnasal,yes,test\n");
  folder.Write("anticholinergic/acb.csv", "ingredient,score,source,routes\nchlorpheniramine,3,test,oral|eye\n");
  const FormularyCheck check = CheckFormulary(folder.path());
  CHECK(check.ok());
  CHECK(check.routes == 2);
  auto loaded = LoadFormulary(folder.path());
  REQUIRE(loaded.ok());
  CHECK(loaded->SystemicRoutes() == std::vector<Route>{Route::kOral, Route::kTransdermal, Route::kInjection,
                                                       Route::kSublingualBuccal, Route::kNasal});
  REQUIRE(loaded->tables().scales.size() == 1);
  CHECK(loaded->tables().scales[0].rows[0].routes == std::vector<Route>{Route::kOral, Route::kEye});
}

TEST_CASE("bad JSON in rules.json is a fault with its line") {
  ExpectFault("rules.json", "{\"rules\": [\n  {\"id\": \"r\",,}\n]}", "rules.json:2: not valid JSON (byte 26)");
}

TEST_CASE("a missing required table is a fault") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  std::filesystem::remove(std::filesystem::path(folder.path()) / "ingredients.csv");
  const FormularyCheck check = CheckFormulary(folder.path());
  CHECK(HasFault(check, "ingredients.csv: missing (required)"));
  CHECK(CheckFormulary(folder.path() + "/nowhere").faults ==
        std::vector<std::string>{folder.path() + "/nowhere: not a folder"});
}

TEST_CASE("comment lines, blank lines, quoted fields and CRLF are read") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("dbi.csv",
               "ingredient,min_daily_dose_mg,effect,source\r\n# a comment, with \"quotes\"\r\n\r\n"
               "chlorphenamine,4,both,\"Source, with a comma and \"\"quotes\"\"\"\r\n");
  const FormularyCheck check = CheckFormulary(folder.path());
  for (const std::string& fault : check.faults) CAPTURE(fault);
  CHECK(check.ok());
  auto loaded = LoadFormulary(folder.path());
  REQUIRE(loaded.ok());
  REQUIRE(loaded->DbiOf("chlorphenamine") != nullptr);
  CHECK(loaded->DbiOf("chlorphenamine")->source == "Source, with a comma and \"quotes\"");
}

TEST_CASE("LoadFormulary fails with an input status listing every fault") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("anticholinergic/acb.csv", "ingredient,score,source\nunobtainium,3,test\nibuprofen,9,test\n");
  auto loaded = LoadFormulary(folder.path());
  REQUIRE_FALSE(loaded.ok());
  CHECK(loaded.status().code() == StatusCode::kInput);
  CHECK(loaded.status().message() ==
        "formulary " + folder.path() + ": 2 faults ('medload formulary check' lists them)\n"
        "anticholinergic/acb.csv:3: score: 9 is out of range 0..3\n"
        "anticholinergic/acb.csv:2: unknown ingredient \"unobtainium\" (not in ingredients.csv)");
}

TEST_CASE("faults in brands.csv and dictionary.csv name the file, line and fault") {
  struct Case {
    const char* file;
    const char* content;
    const char* fault;
  };
  const std::vector<Case> cases = {
      {"brands.csv", "brand,ingredients,source\nBrufex,,test\n",
       "brands.csv:2: ingredients: empty (ingredients or a products.csv name)"},
      {"brands.csv", "brand,ingredients,source\nBrufex,ibuprofen,\n", "brands.csv:2: source: empty (every row cites its source)"},
      {"brands.csv", "brand,ingredients,source\nBrufex,frobazine,test\n",
       "brands.csv:2: unknown ingredient or product \"frobazine\" (not in ingredients.csv or products.csv)"},
      {"brands.csv", "brand,ingredients,source\nBrufex,ibuprofen,test\nbrufex,ibuprofen,test\n",
       "brands.csv:3: duplicate brand \"brufex\" (first on line 2)"},
      {"brands.csv", "brand,ingredients,source\nRamipril,ibuprofen,test\n",
       "brands.csv:2: brand \"Ramipril\" is also a name of the ingredient \"ramipril\""},
      {"dictionary.csv", "code_system,code,name,brand,ingredients,source\nlocal,,,Brufex,ibuprofen,test\n",
       "dictionary.csv:2: code and name: both empty (a row needs one)"},
      {"dictionary.csv", "code_system,code,name,brand,ingredients,source\nlocal,1,Brufex 200mg,,,test\n",
       "dictionary.csv:2: ingredients: empty"},
      {"dictionary.csv", "code_system,code,name,brand,ingredients,source\nlocal,1,Brufex 200mg,,ibuprofen=lots,test\n",
       "dictionary.csv:2: ingredients: \"ibuprofen=lots\" has a strength that does not read"},
      {"dictionary.csv", "code_system,code,name,brand,ingredients,source\nlocal,1,Brufex 200mg,,frobazine,test\n",
       "dictionary.csv:2: unknown ingredient \"frobazine\" (not in ingredients.csv); write \"?frobazine\" for a "
       "substance it does not know"},
      {"dictionary.csv",
       "code_system,code,name,brand,ingredients,source\nlocal,1,Brufex 200mg,,ibuprofen,test\nLOCAL,1,Other,,ibuprofen,test\n",
       "dictionary.csv:3: duplicate code LOCAL 1 (first on line 2)"},
  };
  for (const Case& c : cases) ExpectFault(c.file, c.content, c.fault);
}

TEST_CASE("brands and dictionary rows that name what the tables know, or mark what they do not, are clean") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("brands.csv", "brand,ingredients,source\nBrufex,ibuprofen,test\n");
  folder.Write("dictionary.csv",
               "code_system,code,name,brand,ingredients,source\n"
               "local,1,Brufex 200mg tablets,,ibuprofen=200mg,test\n"
               "local,2,Frobazine and ibuprofen tablets,,?frobazine|ibuprofen=,test\n");
  const FormularyCheck check = CheckFormulary(folder.path());
  for (const std::string& fault : check.faults) CAPTURE(fault);
  CHECK(check.ok());
  CHECK(check.brands == 1);
  CHECK(check.dictionary_rows == 2);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
