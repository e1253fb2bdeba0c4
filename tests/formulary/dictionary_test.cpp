// Dictionary releases in the dm+d and RxNorm layouts, read from small invented files
// (tests/data/formulary/dmd and rxnorm: every code, brand and maker is made up).
#include "medload/formulary/dictionary.h"

#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using testing::BundledFormulary;
using testing::TempFolder;

std::string Data(const std::string& name) { return std::string(MEDLOAD_TEST_DATA) + "/formulary/" + name; }

// A copy of the bundled formulary with `load` written into its dictionary.csv, loaded.
Formulary WithDictionary(const TempFolder& folder, const DictionaryLoad& load) {
  std::filesystem::copy(MEDLOAD_SOURCE_FORMULARY, folder.path(),
                        std::filesystem::copy_options::recursive | std::filesystem::copy_options::overwrite_existing);
  REQUIRE(WriteDictionary(folder.path(), load).ok());
  auto formulary = LoadFormulary(folder.path());
  if (!formulary.ok()) FAIL(formulary.status().message());
  return std::move(formulary).value();
}

std::vector<std::string> Names(const ResolvedProduct& product) {
  std::vector<std::string> names;
  for (const ResolvedIngredient& ingredient : product.ingredients) names.push_back(ingredient.ingredient);
  return names;
}

const std::vector<std::string> kDmdFiles = {Data("dmd/f_vmp_invented.xml"), Data("dmd/f_amp_invented.xml"),
                                            Data("dmd/f_ingredient_invented.xml"), Data("dmd/f_lookup_invented.xml")};

TEST_SUITE("formulary/dictionary") {

TEST_CASE("a dm+d release gives one row per valid VMP and AMP with canonical ingredients") {
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kDmd, kDmdFiles);
  REQUIRE_MESSAGE(load.ok(), load.status().message());
  CHECK(load->code_system == "dmd");
  CHECK(load->skipped == 1);  // the pad has no ingredient
  CHECK(load->unknown_substances == std::vector<std::string>{"frobazine"});
  const std::string text = DictionaryCsv(load->entries);
  CHECK(text.find("dmd,800001,Tolterodine 2mg tablets,,tolterodine,") != std::string::npos);
  // VPIs listed paracetamol first; the row follows the name's order, with the lookup's units.
  CHECK(text.find("dmd,800002,Co-codamol 30mg/500mg tablets,,codeine=30mg|paracetamol=500mg,") != std::string::npos);
  CHECK(text.find("dmd,700001,Quellitol 2mg tablets (Invented Pharma Ltd),Quellitol,tolterodine,") != std::string::npos);
  // A generic AMP carries no brand; an invalid VMP and its AMP are left out.
  CHECK(text.find("dmd,700002,Tolterodine 2mg tablets (Made Up Generics Ltd),,tolterodine,") != std::string::npos);
  CHECK(text.find("800004") == std::string::npos);
  CHECK(text.find("700004") == std::string::npos);
}

TEST_CASE("without the lookup file a combination's strengths are placed by the values its name writes") {
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kDmd,
                                    {kDmdFiles[0], kDmdFiles[1], kDmdFiles[2]});
  REQUIRE(load.ok());
  CHECK(DictionaryCsv(load->entries).find("codeine=30mg|paracetamol=500mg") != std::string::npos);
}

// FHIR input stores dm+d codes under "dm+d" and RxNorm codes under "RxNorm"
// (docs/input-formats.md); CSV records may carry the FHIR system URI.
TEST_CASE("dictionary codes resolve under every spelling of their code system the records use") {
  TempFolder folder;
  auto dmd = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kDmd, kDmdFiles);
  REQUIRE(dmd.ok());
  const Formulary formulary = WithDictionary(folder, *dmd);
  for (const char* system : {"dmd", "dm+d", "DM+D", "https://dmd.nhs.uk", "http://dmd.nhs.uk/"}) {
    CAPTURE(system);
    const ResolvedProduct product = Resolve(formulary, "", "800001", system);
    CHECK(product.match == MatchKind::kCode);
    CHECK(Names(product) == std::vector<std::string>{"tolterodine"});
  }
  // Another system with the same code names nothing.
  CHECK(Resolve(formulary, "", "800001", "SNOMED CT").match == MatchKind::kUnmatched);
  TempFolder rx_folder;
  auto rxnorm = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kRxnorm,
                                      {Data("rxnorm/RXNCONSO.RRF"), Data("rxnorm/RXNREL.RRF")});
  REQUIRE(rxnorm.ok());
  const Formulary rx = WithDictionary(rx_folder, *rxnorm);
  for (const char* system : {"rxnorm", "RxNorm", "http://www.nlm.nih.gov/research/umls/rxnorm"}) {
    CAPTURE(system);
    CHECK(Resolve(rx, "", "9000008", system).match == MatchKind::kCode);
  }
}

TEST_CASE("dm+d codes, exact names and brands resolve through the dictionary") {
  TempFolder folder;
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kDmd, kDmdFiles);
  REQUIRE(load.ok());
  const Formulary formulary = WithDictionary(folder, *load);
  const ResolvedProduct by_code = Resolve(formulary, "", "800002", "dmd");
  CHECK(by_code.match == MatchKind::kCode);
  CHECK(Names(by_code) == std::vector<std::string>{"codeine", "paracetamol"});
  CHECK(by_code.ingredients[0].mg_per_unit == 30);
  CHECK(by_code.ingredients[1].mg_per_unit == 500);
  CHECK(by_code.route == Route::kOral);  // from the dictionary's name: the record gave none
  const ResolvedProduct by_name = Resolve(formulary, "Quellitol 2mg tablets (Invented Pharma Ltd)");
  CHECK(by_name.match == MatchKind::kProduct);
  CHECK(Names(by_name) == std::vector<std::string>{"tolterodine"});
  CHECK(by_name.ingredients[0].mg_per_unit == 2);
  const ResolvedProduct by_brand = Resolve(formulary, "Quellitol 1mg tabs");
  CHECK(by_brand.match == MatchKind::kProduct);
  CHECK(Names(by_brand) == std::vector<std::string>{"tolterodine"});
  CHECK(by_brand.ingredients[0].mg_per_unit == 1);
  const ResolvedProduct partial = Resolve(formulary, "", "800003", "dmd");
  CHECK(partial.match == MatchKind::kPartial);
  CHECK(Names(partial) == std::vector<std::string>{"paracetamol"});
  CHECK(partial.unknown == std::vector<std::string>{"frobazine"});
  CHECK(partial.ingredients[0].mg_per_unit == 500);
}

TEST_CASE("an RxNorm release gives clinical and branded drugs and brand names with their ingredients") {
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kRxnorm,
                                    {Data("rxnorm/RXNREL.RRF"), Data("rxnorm/RXNCONSO.RRF")});
  REQUIRE_MESSAGE(load.ok(), load.status().message());
  CHECK(load->code_system == "rxnorm");
  CHECK(load->unknown_substances == std::vector<std::string>{"frobazine"});
  const std::string text = DictionaryCsv(load->entries);
  CHECK(text.find("rxnorm,9000006,acetaminophen 325 MG / hydrocodone bitartrate 5 MG Oral Tablet,,"
                  "paracetamol=325mg|hydrocodone=5mg,") != std::string::npos);
  CHECK(text.find("rxnorm,9000008,acetaminophen 325 MG / hydrocodone bitartrate 5 MG Oral Tablet [Quellodin],"
                  "Quellodin,paracetamol=325mg|hydrocodone=5mg,") != std::string::npos);
  CHECK(text.find("rxnorm,9000007,Quellodin,Quellodin,") != std::string::npos);
  CHECK(text.find("rxnorm,9000009,frobazine 10 MG Oral Tablet,,?frobazine,") != std::string::npos);
  CHECK(text.find("9000011") == std::string::npos);  // suppressed
}

TEST_CASE("RxNorm codes and brands resolve; a dictionary's combination brand takes no strength from the text") {
  TempFolder folder;
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kRxnorm,
                                    {Data("rxnorm/RXNCONSO.RRF"), Data("rxnorm/RXNREL.RRF")});
  REQUIRE(load.ok());
  const Formulary formulary = WithDictionary(folder, *load);
  const ResolvedProduct by_code = Resolve(formulary, "Quellodin 5/325 tablet", "9000008", "RxNorm");
  CHECK(by_code.match == MatchKind::kCode);
  CHECK(Names(by_code) == std::vector<std::string>{"paracetamol", "hydrocodone"});
  CHECK(by_code.ingredients[0].mg_per_unit == 325);
  CHECK(by_code.ingredients[1].mg_per_unit == 5);
  const ResolvedProduct by_brand = Resolve(formulary, "Quellodin 5 mg/325 mg tablet");
  CHECK(by_brand.match == MatchKind::kProduct);
  CHECK(Names(by_brand) == std::vector<std::string>{"hydrocodone", "paracetamol"});
  CHECK_FALSE(by_brand.ingredients[0].mg_per_unit.has_value());
  CHECK_FALSE(by_brand.ingredients[1].mg_per_unit.has_value());
}

TEST_CASE("a simple CSV list maps codes and brands onto ingredients by any name") {
  TempFolder folder;
  folder.Write("list.csv",
               "code_system,code,name,brand,ingredients\n"
               "local,L-1,,Brindoxa,chlorpheniramine\n"
               "local,L-2,Invented compound 10/500,,Frobazine|acetaminophen\n");
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kCsv, {folder.path() + "/list.csv"});
  REQUIRE_MESSAGE(load.ok(), load.status().message());
  CHECK(load->unknown_substances == std::vector<std::string>{"frobazine"});
  TempFolder formulary_folder;
  const Formulary formulary = WithDictionary(formulary_folder, *load);
  const ResolvedProduct brand = Resolve(formulary, "Brindoxa 4mg tablets");
  CHECK(Names(brand) == std::vector<std::string>{"chlorphenamine"});
  CHECK(brand.ingredients[0].mg_per_unit == 4);
  const ResolvedProduct code = Resolve(formulary, "", "L-2", "local");
  CHECK(code.match == MatchKind::kPartial);
  CHECK(Names(code) == std::vector<std::string>{"paracetamol"});
  CHECK(code.unknown == std::vector<std::string>{"frobazine"});
}

TEST_CASE("loading a release replaces the rows of its code system and keeps the others") {
  TempFolder folder;
  folder.Write("dictionary.csv",
               "code_system,code,name,brand,ingredients,source\n"
               "local,L-9,Kept 1mg tablets,,ibuprofen,test\n"
               "dmd,1,Replaced 1mg tablets,,ibuprofen,test\n");
  auto load = ReadDictionaryRelease(BundledFormulary(), DictionarySystem::kDmd, kDmdFiles);
  REQUIRE(load.ok());
  REQUIRE(WriteDictionary(folder.path(), *load).ok());
  std::ifstream in(folder.path() + "/dictionary.csv");
  const std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  CHECK(text.find("local,L-9,Kept 1mg tablets") != std::string::npos);
  CHECK(text.find("Replaced") == std::string::npos);
  CHECK(text.find("dmd,800001") != std::string::npos);
}

TEST_CASE("release files that are missing or of another layout are input errors naming the file") {
  struct Case {
    DictionarySystem system;
    std::vector<std::string> files;
    std::string message;
  };
  TempFolder folder;
  folder.Write("other.xml", "<SOMETHING_ELSE/>");
  folder.Write("bad.csv", "code,ingredients\nX,ibuprofen\n");
  const std::vector<Case> cases = {
      {DictionarySystem::kDmd, {folder.path() + "/nosuch.xml"}, folder.path() + "/nosuch.xml: cannot be opened"},
      {DictionarySystem::kDmd, {folder.path() + "/other.xml"},
       folder.path() + "/other.xml: not a dm+d file (no VIRTUAL_MED_PRODUCTS, ACTUAL_MEDICINAL_PRODUCTS, "
                       "INGREDIENT_SUBSTANCES or UNIT_OF_MEASURE element)"},
      {DictionarySystem::kDmd, {kDmdFiles[0]}, "dm+d: the ingredient file (root INGREDIENT_SUBSTANCES) is missing"},
      {DictionarySystem::kRxnorm, {Data("rxnorm/RXNCONSO.RRF")}, "rxnorm: RXNREL.RRF (16 fields a line) is missing"},
      {DictionarySystem::kRxnorm, {kDmdFiles[0]},
       kDmdFiles[0] + ":1: 0 fields, expected 18 (RXNCONSO.RRF) or 16 (RXNREL.RRF)"},
      {DictionarySystem::kCsv, {folder.path() + "/bad.csv"}, folder.path() + "/bad.csv: bad.csv:1: missing column \"code_system\""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.message);
    auto load = ReadDictionaryRelease(BundledFormulary(), c.system, c.files);
    REQUIRE_FALSE(load.ok());
    CHECK(load.status().code() == StatusCode::kInput);
    CHECK(load.status().message() == c.message);
  }
}

TEST_CASE("the system names are dmd, rxnorm and csv") {
  CHECK(DictionarySystemFromName("dmd") == DictionarySystem::kDmd);
  CHECK(DictionarySystemFromName("rxnorm") == DictionarySystem::kRxnorm);
  CHECK(DictionarySystemFromName("csv") == DictionarySystem::kCsv);
  CHECK_FALSE(DictionarySystemFromName("snomed").has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
