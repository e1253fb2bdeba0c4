#include "medload/formulary/rules_listing.h"

#include <doctest/doctest.h>

#include <sstream>
#include <string>

#include "formulary/formulary_fixture.h"
#include "medload/core/caution.h"

namespace medload {
namespace {

// A minimal formulary with one rule that has every kind of field.
Formulary ListedFormulary(const testing::TempFolder& folder) {
  testing::WriteMinimalFormulary(folder);
  folder.Write("ingredients.csv",
               "ingredient,synonyms,atc,classes,source\n"
               "chlorphenamine,chlorpheniramine,R06AB04,antihistamine-sedating,test\n"
               "ibuprofen,,M01AE01,nsaid,test\n"
               "aspirin,,B01AC06,antiplatelet,test\n"
               "omeprazole,,A02BC01,ppi,test\n"
               "paracetamol,,N02BE01,analgesic,test\n");
  folder.Write("rules.json", R"({"rules": [
    {"id": "nsaid-antiplatelet", "title": "NSAID <with> antiplatelet", "explanation": "e",
     "source": "STOPP/START criteria version 3", "age_min": 65,
     "require": [{"classes": ["nsaid"]}, {"classes": ["antiplatelet"]}], "forbid": [{"classes": ["ppi"]}]},
    {"id": "two-paracetamol", "title": "Two paracetamol products", "explanation": "e", "source": "labelling",
     "source_checked": true, "routes": ["oral", "rectal"],
     "require": [{"ingredients": ["paracetamol"], "count": "medicines", "at_least": 2}]}]})");
  auto loaded = LoadFormulary(folder.path());
  REQUIRE(loaded.ok());
  return std::move(loaded).value();
}

}  // namespace

TEST_SUITE("formulary/rules_listing") {

TEST_CASE("requirements read as words") {
  RuleRequirement requirement;
  requirement.classes = {"ace-inhibitor", "arb"};
  CHECK(RuleRequirementText(requirement) == "ace-inhibitor or arb");
  requirement.at_least = 2;
  CHECK(RuleRequirementText(requirement) == "2 different: ace-inhibitor or arb");
  requirement.count = RuleCount::kMedicines;
  CHECK(RuleRequirementText(requirement) == "2 medicines with: ace-inhibitor or arb");
  RuleRequirement scored;
  scored.scale_score_at_least = 3;
  CHECK(RuleRequirementText(scored) == "score 3 or more on acb");
}

TEST_CASE("the text listing shows classes required and forbidden, routes, minimum age and source") {
  testing::TempFolder folder;
  const Formulary formulary = ListedFormulary(folder);
  std::ostringstream out;
  WriteRulesListingText(out, formulary);
  const std::string text = out.str();
  CHECK(text.find("2 combination rules; systemic routes by default: oral, transdermal, injection, rectal, "
                  "sublingual/buccal.") == 0);
  CHECK(text.find("nsaid-antiplatelet: NSAID <with> antiplatelet\n"
                  "  requires: nsaid + antiplatelet\n"
                  "  forbids: no ppi\n"
                  "  routes: systemic (oral, transdermal, injection, rectal, sublingual/buccal)\n"
                  "  minimum age: 65\n"
                  "  source: STOPP/START criteria version 3; not yet checked against the publication: check "
                  "against the current edition before local use\n") != std::string::npos);
  CHECK(text.find("two-paracetamol: Two paracetamol products\n"
                  "  requires: 2 medicines with: paracetamol\n"
                  "  routes: oral, rectal\n"
                  "  minimum age: none\n"
                  "  source: labelling\n") != std::string::npos);
  CHECK(text.find("from memory") == std::string::npos);
  CHECK(text.find("CAUTION") != std::string::npos);
}

TEST_CASE("the JSON listing has the rule's fields and the caution") {
  testing::TempFolder folder;
  const nlohmann::json json = RulesListingJson(ListedFormulary(folder));
  REQUIRE(json["rules"].size() == 2);
  const nlohmann::json& rule = json["rules"][0];
  CHECK(rule["id"] == "nsaid-antiplatelet");
  CHECK(rule["classes_required"] == nlohmann::json({"nsaid", "antiplatelet"}));
  CHECK(rule["classes_forbidden"] == nlohmann::json({"ppi"}));
  CHECK(rule["routes_default"] == true);
  CHECK(rule["routes"][0] == "oral");
  CHECK(rule["age_min"] == 65);
  CHECK(rule["source_checked"] == false);
  CHECK(json["rules"][1]["age_min"].is_null());
  CHECK(json["rules"][1]["require"][0]["count"] == "medicines");
  CHECK(json["caution"] == std::string(kCaution));
}

TEST_CASE("the CSV listing starts with the caution and the HTML listing escapes every value") {
  testing::TempFolder folder;
  const Formulary formulary = ListedFormulary(folder);
  std::ostringstream csv;
  WriteRulesListingCsv(csv, formulary);
  CHECK(csv.str().rfind("\"# CAUTION: ", 0) == 0);
  CHECK(csv.str().find("id,title,requires,forbids,routes,minimum age,source\n") != std::string::npos);
  CHECK(csv.str().find("nsaid-antiplatelet,NSAID <with> antiplatelet,nsaid + antiplatelet,no ppi,") !=
        std::string::npos);
  std::ostringstream html;
  WriteRulesListingHtml(html, formulary);
  CHECK(html.str().find("NSAID &lt;with&gt; antiplatelet") != std::string::npos);
  CHECK(html.str().find("<with>") == std::string::npos);
}

}  // TEST_SUITE

}  // namespace medload
