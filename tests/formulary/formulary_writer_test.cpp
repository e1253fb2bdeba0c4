#include "medload/format/output.h"
#include "medload/formulary/formulary_writer.h"

#include <doctest/doctest.h>

#include <sstream>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/core/caution.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using testing::BundledFormulary;

ProductCount Counted(std::string product, long items, long patients) {
  ProductCount count;
  count.product = std::move(product);
  count.items = items;
  count.patients = patients;
  return count;
}

UnresolvedProduct Unresolved(std::string product, long items, long patients, MatchKind match) {
  return UnresolvedProduct{Counted(std::move(product), items, patients), match, "", {}};
}

TEST_SUITE("formulary/formulary_writer") {

TEST_CASE("unmatched products are those nothing resolves, most items first, then most patients") {
  const std::vector<ProductCount> counts = {
      Counted("Amitriptyline 10mg tablets", 50, 20),   // resolves: left out
      Counted("Zzqx blue liquid", 3, 3),
      Counted("Qqvz green cream", 9, 2),
      Counted("Vvzq red drops", 9, 5),
  };
  const std::vector<UnresolvedProduct> unmatched = UnmatchedProducts(BundledFormulary(), counts, 0);
  REQUIRE(unmatched.size() == 3);
  CHECK(unmatched[0].count.product == "Vvzq red drops");
  CHECK(unmatched[1].count.product == "Qqvz green cream");
  CHECK(unmatched[2].count.product == "Zzqx blue liquid");
  for (const UnresolvedProduct& product : unmatched) CHECK(product.match == MatchKind::kUnmatched);
  CHECK(UnmatchedProducts(BundledFormulary(), counts, 2).size() == 2);
}

TEST_CASE("products read only in part or from a close spelling are listed with the unmatched, an unmatched one with names to try") {
  const std::vector<ProductCount> counts = {
      Counted("Amitriptyline 10mg tablets", 50, 20),            // resolves cleanly: left out
      Counted("Oxybutinin 5mg tablets", 7, 3),                  // a close spelling
      Counted("Paracetamol and zorblaxine 500mg tablets", 5, 2),  // an unknown second part
      Counted("Amitriptylline", 2, 1),                          // a close spelling with no strength
      Counted("Sertralign capsules", 1, 1),
  };
  const std::vector<UnresolvedProduct> products = UnmatchedProducts(BundledFormulary(), counts, 0);
  REQUIRE(products.size() == 4);
  CHECK(products[0].count.product == "Oxybutinin 5mg tablets");
  CHECK(products[0].match == MatchKind::kApproximate);
  CHECK(products[0].suggestions.empty());
  CHECK(products[1].count.product == "Paracetamol and zorblaxine 500mg tablets");
  CHECK(products[1].match == MatchKind::kPartial);
  CHECK(products[1].detail.find("zorblaxine") != std::string::npos);
}

TEST_CASE("the unmatched text names the totals of each kind and carries the caution footer") {
  std::ostringstream out;
  WriteUnmatchedText(out, {Unresolved("Zzqx blue liquid", 3, 2, MatchKind::kUnmatched),
                           Unresolved("Qqvz green cream", 4, 1, MatchKind::kUnmatched),
                           Unresolved("Oxybutinin 5mg tablets", 6, 2, MatchKind::kApproximate)});
  const std::string text = out.str();
  CHECK(text.rfind("2 unmatched products, 7 items; 0 recognised only in part, 0 items; 1 read from a close "
                   "spelling, 6 items\n",
                   0) == 0);
  std::ostringstream footer;
  WriteTextCaution(footer);
  CHECK(text.size() > footer.str().size());
  CHECK(text.substr(text.size() - footer.str().size()) == footer.str());
}

TEST_CASE("the check CSV starts with the caution and lists each fault before the counts") {
  FormularyCheck check;
  check.faults = {"dbi.csv:3: dose \"x\" is not a number"};
  check.ingredients = 4;
  std::ostringstream out;
  WriteFormularyCheckCsv(out, check);
  const std::string csv = out.str();
  CHECK(csv.rfind("\"# " + std::string(kCaution) + "\"\n", 0) == 0);
  const size_t fault = csv.find("fault,");
  const size_t ingredients = csv.find("ingredients,4");
  REQUIRE(fault != std::string::npos);
  REQUIRE(ingredients != std::string::npos);
  CHECK(fault < ingredients);
}

TEST_CASE("the lookup JSON adds each ingredient's classes, scores and DBI dose from the tables") {
  LookupModel model;
  model.description = "Amitriptyline 10mg tablets";
  model.formulary = &BundledFormulary();
  model.product = Resolve(BundledFormulary(), model.description, "", "");
  const nlohmann::json json = LookupJson(model);
  REQUIRE(json.at("ingredients").size() == 1);
  const nlohmann::json& ingredient = json.at("ingredients").at(0);
  CHECK(ingredient.at("ingredient") == "amitriptyline");
  CHECK(ingredient.at("scores").contains("acb"));
  CHECK(ingredient.contains("dbi"));
  CHECK(json.at("caution") == std::string(kCaution));
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
