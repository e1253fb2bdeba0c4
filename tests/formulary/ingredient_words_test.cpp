// Combinations with a part the tables do not know, and close spellings: nothing dropped
// silently, no strength given to the wrong ingredient, no guess between similar names.
#include "formulary/ingredient_words.h"

#include <doctest/doctest.h>

#include <optional>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "formulary/spelling.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using testing::BundledFormulary;
using testing::TempFolder;
using testing::WriteMinimalFormulary;

struct PartialCase {
  const char* description;
  const char* known;                // the ingredient the tables know
  std::optional<double> known_mg;   // its strength, or none
  const char* unknown;              // the part kept as unknown
};

TEST_SUITE("formulary/ingredient_words") {

// Invented ingredient names; strengths as written (common practice).
TEST_CASE("a combination part that names no known ingredient makes the match partial, never dropped") {
  const std::vector<PartialCase> cases = {
      {"Frobazine 10mg and paracetamol 500mg tablets", "paracetamol", 500, "frobazine"},
      {"Paracetamol 500mg with Xylodrone 10mg capsules", "paracetamol", 500, "xylodrone"},
      {"Quindrolate/amlodipine 20mg/5mg tablets", "amlodipine", 5, "quindrolate"},
      {"Ibuprofen + Velmotrine 200mg/15mg tablets", "ibuprofen", 200, "velmotrine"},
      {"Metformin and Glorzaprin 500mg/2.5mg tablets", "metformin", 500, "glorzaprin"},
      // Strengths written after both names with one missing: none rather than a guess.
      {"Frobazine and paracetamol 500mg tablets", "paracetamol", std::nullopt, "frobazine"},
      {"Frobazine and paracetamol tablets", "paracetamol", std::nullopt, "frobazine"},
      // A mineral alone in a part is an ingredient, not a salt word.
      {"Calcium and vitamin D3 tablets", "colecalciferol", std::nullopt, "calcium"},
      {"Iron and folic acid tablets", "folic acid", std::nullopt, "iron"},
  };
  for (const PartialCase& c : cases) {
    CAPTURE(c.description);
    const ResolvedProduct product = Resolve(BundledFormulary(), c.description);
    CHECK(product.match == MatchKind::kPartial);
    CHECK(product.flagged());
    REQUIRE(product.ingredients.size() == 1);
    CHECK(product.ingredients[0].ingredient == c.known);
    CHECK(product.ingredients[0].mg_per_unit == c.known_mg);
    REQUIRE(product.unknown.size() == 1);
    CHECK(product.unknown[0] == c.unknown);
    CHECK(product.match_detail.find(std::string("not in the formulary: ") + c.unknown) != std::string::npos);
  }
}

// The reported failure: the opioid vanished and paracetamol took its 5 mg.
TEST_CASE("a US combination whose opioid the tables lack keeps the opioid as unknown and paracetamol its own 325 mg") {
  TempFolder folder;
  WriteMinimalFormulary(folder);
  folder.Write("ingredients.csv",
               "ingredient,synonyms,atc,classes,source\n"
               "paracetamol,acetaminophen,N02BE01,analgesic,test\n"
               "ibuprofen,,M01AE01,nsaid,test\n"
               "chlorphenamine,chlorpheniramine,R06AB04,antihistamine-sedating,test\n");
  auto formulary = LoadFormulary(folder.path());
  REQUIRE(formulary.ok());
  const ResolvedProduct product = Resolve(*formulary, "Hydrocodone bitartrate and acetaminophen 5 mg/325 mg tablet");
  CHECK(product.match == MatchKind::kPartial);
  REQUIRE(product.ingredients.size() == 1);
  CHECK(product.ingredients[0].ingredient == "paracetamol");
  CHECK(product.ingredients[0].mg_per_unit == 325);
  CHECK(product.unknown == std::vector<std::string>{"hydrocodone"});
  CHECK(product.route == Route::kOral);
}

TEST_CASE("the bundled tables know the US combinations dispensing data commonly holds") {
  struct Case {
    const char* description;
    std::vector<std::pair<const char*, double>> ingredients;
  };
  const std::vector<Case> cases = {
      {"Hydrocodone bitartrate and acetaminophen 5 mg/325 mg tablet", {{"hydrocodone", 5}, {"paracetamol", 325}}},
      {"Hydrocodone bitartrate and ibuprofen 7.5 mg/200 mg tablet", {{"hydrocodone", 7.5}, {"ibuprofen", 200}}},
      {"Butalbital, acetaminophen and caffeine 50 mg/325 mg/40 mg tablet",
       {{"butalbital", 50}, {"paracetamol", 325}, {"caffeine", 40}}},
      {"Oxycodone and acetaminophen 5 mg/325 mg tablet", {{"oxycodone", 5}, {"paracetamol", 325}}},
      {"Norco 10-325 mg tablet", {{"hydrocodone", 10}, {"paracetamol", 325}}},
  };
  for (const Case& c : cases) {
    CAPTURE(c.description);
    const ResolvedProduct product = Resolve(BundledFormulary(), c.description);
    CHECK_FALSE(product.flagged());
    REQUIRE(product.ingredients.size() == c.ingredients.size());
    for (size_t i = 0; i < c.ingredients.size(); ++i) {
      CHECK(product.ingredients[i].ingredient == c.ingredients[i].first);
      CHECK(product.ingredients[i].mg_per_unit == c.ingredients[i].second);
    }
  }
}

TEST_CASE("a mineral beside a name is a salt, not an ingredient") {
  for (const char* description : {"Levothyroxine sodium 50microgram tablets", "Atorvastatin calcium 40mg tablets",
                                  "Losartan potassium-hydrochlorothiazide 50-12.5 mg tablet"}) {
    CAPTURE(description);
    CHECK(Resolve(BundledFormulary(), description).match == MatchKind::kIngredient);
  }
}

TEST_CASE("words set off by a comma count as an unknown ingredient only with strength evidence") {
  const ResolvedProduct maker = Resolve(BundledFormulary(), "Omeprazole 20mg capsules, Accordion");
  CHECK(maker.match == MatchKind::kIngredient);
  const ResolvedProduct listed = Resolve(BundledFormulary(), "Frobazine 10mg, paracetamol 500mg tablets");
  CHECK(listed.match == MatchKind::kPartial);
}

// Misspellings seen in dispensing text (common practice); expected names: the BNF's.
TEST_CASE("a close, unique spelling of a known ingredient is read as approximate and says so") {
  struct Case {
    const char* description;
    const char* ingredient;
    const char* written;
  };
  const std::vector<Case> cases = {
      {"Amitriptilline 10mg tabs", "amitriptyline", "amitriptilline"},
      {"Oxybutinin 5mg tabs", "oxybutynin", "oxybutinin"},
      {"Olanzipine 5mg tablets", "olanzapine", "olanzipine"},
      {"Mirtazepine 30mg tabs", "mirtazapine", "mirtazepine"},
      {"Zoplicone 7.5mg tabs", "zopiclone", "zoplicone"},
  };
  for (const Case& c : cases) {
    CAPTURE(c.description);
    const ResolvedProduct product = Resolve(BundledFormulary(), c.description);
    CHECK(product.match == MatchKind::kApproximate);
    REQUIRE(product.ingredients.size() == 1);
    CHECK(product.ingredients[0].ingredient == c.ingredient);
    REQUIRE(product.spellings.size() == 1);
    CHECK(product.spellings[0].written == c.written);
    CHECK(product.spellings[0].read_as == c.ingredient);
    CHECK(product.route == Route::kOral);
  }
}

TEST_CASE("no spelling is guessed for short words, far words, another first letter, or two close names") {
  for (const char* description : {
           "Sotal 80mg tabs",            // five letters: too short to judge
           "Frobnicate 10mg tablets",    // close to nothing
           "Mitriptyline 10mg tablets",  // first letter lost
           "Chlorpromamide 100mg tabs",  // one edit from chlorpropamide, two from chlorpromazine
       }) {
    CAPTURE(description);
    const ResolvedProduct product = Resolve(BundledFormulary(), description);
    CHECK(product.match == MatchKind::kUnmatched);
    CHECK(product.ingredients.empty());
  }
}

TEST_CASE("edit distances count insertions, deletions, substitutions and swaps") {
  using formulary_internal::EditDistance;
  CHECK(EditDistance("oxybutinin", "oxybutynin", 3) == 1);
  CHECK(EditDistance("amitriptilline", "amitriptyline", 3) == 2);
  CHECK(EditDistance("zoplicone", "zopiclone", 3) == 2);
  CHECK(EditDistance("abcd", "abdc", 3) == 1);
  CHECK(EditDistance("same", "same", 0) == 0);
  CHECK(EditDistance("frobnicate", "paracetamol", 2) == 3);  // over the limit: limit + 1
  CHECK(formulary_internal::AllowedEdits(5) == 0);
  CHECK(formulary_internal::AllowedEdits(8) == 1);
  CHECK(formulary_internal::AllowedEdits(12) == 2);
  CHECK(formulary_internal::AllowedEdits(13) == 3);
}

TEST_CASE("strengths pair in order when the counts agree and never across ingredients otherwise") {
  using formulary_internal::PairStrengths;
  const std::vector<Strength> two = ParseStrengths("a 10mg and b 500mg");
  REQUIRE(two.size() == 2);
  CHECK(PairStrengths(2, {}, two) == std::vector<const Strength*>{&two[0], &two[1]});
  CHECK(PairStrengths(1, {}, two) == std::vector<const Strength*>{&two[0]});
  const std::vector<Strength> one = ParseStrengths("a and b 5mg");
  REQUIRE(one.size() == 1);
  CHECK(PairStrengths(2, {}, one) == std::vector<const Strength*>{nullptr, nullptr});
  CHECK(PairStrengths(2, {0, 6}, one) == std::vector<const Strength*>{nullptr, nullptr});
  const std::vector<Strength> three = ParseStrengths("a 10mg b 5mg 2mg");
  REQUIRE(three.size() == 3);
  CHECK(PairStrengths(2, {0, 7}, three) == std::vector<const Strength*>{&three[0], nullptr});
  // One ingredient named after a strength that is not its own ("xyz 10mg and b 500mg").
  const std::vector<Strength> before = ParseStrengths("xyz 10mg and b 500mg");
  REQUIRE(before.size() == 2);
  CHECK(PairStrengths(1, {13}, before) == std::vector<const Strength*>{&before[1]});
  const std::vector<Strength> only_before = ParseStrengths("xyz 10mg and b");
  CHECK(PairStrengths(1, {13}, only_before) == std::vector<const Strength*>{nullptr});
  const std::vector<Strength> two_before = ParseStrengths("x 1mg y 10mg and b");
  CHECK(PairStrengths(1, {17}, two_before) == std::vector<const Strength*>{nullptr});
}

TEST_CASE("suggestions for an unmatched product name the nearest ingredients and brands") {
  CHECK(Resolve(BundledFormulary(), "Zertraline 50mg tablets (Frobco)").match == MatchKind::kUnmatched);
  const std::vector<std::string> names = SuggestNames(BundledFormulary(), "Zertraline 50mg tablets (Frobco)");
  REQUIRE_FALSE(names.empty());
  CHECK(names.front() == "sertraline");
  CHECK(SuggestNames(BundledFormulary(), "Zzq 10mg tablets").empty());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
