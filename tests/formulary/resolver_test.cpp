#include "medload/formulary/resolver.h"

#include <doctest/doctest.h>

#include <chrono>
#include <cmath>
#include <optional>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "medload/synth/catalogue.h"

namespace medload {
namespace {

using testing::BundledFormulary;

struct Expected {
  std::string ingredient;
  std::optional<double> mg_per_unit;
  std::optional<double> mg_per_day;
};

struct Case {
  const char* description;
  MatchKind match;
  std::vector<Expected> ingredients;
  Route route;
  const char* dose_unit;
};

void CheckIngredients(const ResolvedProduct& product, const std::vector<Expected>& expected) {
  REQUIRE(product.ingredients.size() == expected.size());
  for (size_t i = 0; i < expected.size(); ++i) {
    CAPTURE(i);
    CHECK(product.ingredients[i].ingredient == expected[i].ingredient);
    CHECK(product.ingredients[i].mg_per_unit.has_value() == expected[i].mg_per_unit.has_value());
    if (expected[i].mg_per_unit && product.ingredients[i].mg_per_unit) {
      CHECK(*product.ingredients[i].mg_per_unit == doctest::Approx(*expected[i].mg_per_unit));
    }
    CHECK(product.ingredients[i].mg_per_day.has_value() == expected[i].mg_per_day.has_value());
    if (expected[i].mg_per_day && product.ingredients[i].mg_per_day) {
      CHECK(*product.ingredients[i].mg_per_day == doctest::Approx(*expected[i].mg_per_day));
    }
  }
}

TEST_SUITE("formulary/resolver") {

// Expected values are the arithmetic of the strength as written (common practice).
TEST_CASE("product descriptions resolve to ingredients, strengths, route and dose unit") {
  const std::vector<Case> cases = {
      {"Amlodipine 5mg tablets", MatchKind::kIngredient, {{"amlodipine", 5, {}}}, Route::kOral, "tablet"},
      {"Co-codamol 30mg/500mg tablets", MatchKind::kProduct, {{"codeine", 30, {}}, {"paracetamol", 500, {}}},
       Route::kOral, "tablet"},
      {"Co-codamol 8/500 effervescent tablets", MatchKind::kProduct, {{"codeine", 8, {}}, {"paracetamol", 500, {}}},
       Route::kOral, "tablet"},
      {"co codamol 15mg/500mg capsules", MatchKind::kProduct, {{"codeine", 15, {}}, {"paracetamol", 500, {}}},
       Route::kOral, "capsule"},
      {"Co-careldopa 25mg/100mg tablets", MatchKind::kProduct, {{"carbidopa", 25, {}}, {"levodopa", 100, {}}},
       Route::kOral, "tablet"},
      {"Co-amoxiclav 500mg/125mg tablets", MatchKind::kProduct,
       {{"amoxicillin", 500, {}}, {"clavulanic acid", 125, {}}}, Route::kOral, "tablet"},
      {"Co-magaldrox 195mg/220mg/5ml oral suspension", MatchKind::kProduct,
       {{"magnesium hydroxide", 39, {}}, {"aluminium hydroxide", 44, {}}}, Route::kOral, "ml"},
      {"Amiloride 5mg / Furosemide 40mg tablets", MatchKind::kIngredient,
       {{"amiloride", 5, {}}, {"furosemide", 40, {}}}, Route::kOral, "tablet"},
      {"Calcium carbonate 1.25g / Colecalciferol 10micrograms chewable tablets", MatchKind::kIngredient,
       {{"calcium carbonate", 1250, {}}, {"colecalciferol", 0.01, {}}}, Route::kOral, "tablet"},
      {"Morphine sulfate 10mg/5ml oral solution", MatchKind::kIngredient, {{"morphine", 2, {}}}, Route::kOral, "ml"},
      {"Lactulose 3.35g/5ml oral solution", MatchKind::kIngredient, {{"lactulose", 670, {}}}, Route::kOral, "ml"},
      {"Fentanyl 25micrograms/hour transdermal patches", MatchKind::kProduct, {{"fentanyl", {}, 0.6}},
       Route::kTransdermal, "patch"},
      {"Buprenorphine 5micrograms/hour seven day patches", MatchKind::kProduct, {{"buprenorphine", {}, 0.12}},
       Route::kTransdermal, "patch"},
      {"Rivastigmine 4.6mg/24hours transdermal patches", MatchKind::kProduct, {{"rivastigmine", {}, 4.6}},
       Route::kTransdermal, "patch"},
      {"Hydrocortisone 1% cream", MatchKind::kIngredient, {{"hydrocortisone", 10, {}}}, Route::kSkin, "g"},
      {"Hypromellose 0.3% eye drops", MatchKind::kIngredient, {{"hypromellose", 3, {}}}, Route::kEye, "ml"},
      {"Salbutamol 100micrograms/dose inhaler CFC free", MatchKind::kIngredient, {{"salbutamol", 0.1, {}}},
       Route::kInhaled, "puff"},
      {"Symbicort 200/6 Turbohaler", MatchKind::kProduct, {{"budesonide", 0.2, {}}, {"formoterol", 0.006, {}}},
       Route::kInhaled, "dose"},
      {"Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", MatchKind::kIngredient,
       {{"insulin glargine", {}, {}}}, Route::kInjection, "ml"},
      {"Glyceryl trinitrate 400micrograms/dose sublingual spray", MatchKind::kIngredient,
       {{"glyceryl trinitrate", 0.4, {}}}, Route::kSublingualBuccal, "dose"},
      {"Prochlorperazine 3mg buccal tablets", MatchKind::kIngredient, {{"prochlorperazine", 3, {}}}, Route::kSublingualBuccal,
       "tablet"},
      {"Paracetamol 500mg suppositories", MatchKind::kIngredient, {{"paracetamol", 500, {}}}, Route::kRectal,
       "suppository"},
      {"Clotrimazole 500mg pessary", MatchKind::kIngredient, {{"clotrimazole", 500, {}}}, Route::kVaginal, "pessary"},
      {"Beclometasone 50micrograms/dose nasal spray", MatchKind::kIngredient, {{"beclometasone", 0.05, {}}},
       Route::kNasal, "dose"},
      {"Levothyroxine sodium 25microgram tablets", MatchKind::kIngredient, {{"levothyroxine", 0.025, {}}},
       Route::kOral, "tablet"},
      {"Fostair 100micrograms/dose / 6micrograms/dose inhaler", MatchKind::kProduct,
       {{"beclometasone", 0.1, {}}, {"formoterol", 0.006, {}}}, Route::kInhaled, "puff"},
      {"Lidocaine 5% medicated plasters", MatchKind::kProduct, {{"lidocaine", {}, {}}}, Route::kSkin, "plaster"},
      {"Medroxyprogesterone 150mg/1ml suspension for injection pre-filled syringes", MatchKind::kProduct,
       {{"medroxyprogesterone", 150, {}}}, Route::kInjection, "ml"},
  };
  for (const Case& c : cases) {
    const std::string description = c.description;
    CAPTURE(description);
    const ResolvedProduct product = Resolve(BundledFormulary(), c.description);
    CHECK(product.match == c.match);
    CHECK(product.route == c.route);
    CHECK(product.dose_unit == c.dose_unit);
    CHECK_FALSE(product.non_medicine);
    CheckIngredients(product, c.ingredients);
  }
}

TEST_CASE("British and US spellings resolve to the same ingredient") {
  // Source for the pairs: British approved names and their US or former British names
  // (BNF; common practice).
  const std::vector<std::pair<const char*, const char*>> pairs = {
      {"Chlorphenamine 4mg tablets", "Chlorpheniramine 4mg tablets"},
      {"Hyoscine hydrobromide 300microgram tablets", "Scopolamine 300microgram tablets"},
      {"Pethidine 50mg tablets", "Meperidine 50mg tablets"},
      {"Levomepromazine 25mg tablets", "Methotrimeprazine 25mg tablets"},
      {"Dicycloverine 10mg tablets", "Dicyclomine 10mg tablets"},
      {"Paracetamol 500mg tablets", "Acetaminophen 500mg tablets"},
      {"Furosemide 40mg tablets", "Frusemide 40mg tablets"},
      {"Glyceryl trinitrate 500microgram sublingual tablets", "Nitroglycerin 500microgram sublingual tablets"},
      {"Salbutamol 2mg tablets", "Albuterol 2mg tablets"},
      {"Adrenaline 300micrograms/0.3ml auto-injector", "Epinephrine 300micrograms/0.3ml auto-injector"},
      {"Alimemazine 10mg tablets", "Trimeprazine 10mg tablets"},
      {"Trihexyphenidyl 2mg tablets", "Benzhexol 2mg tablets"},
      {"Ciclosporin 25mg capsules", "Cyclosporine 25mg capsules"},
      {"Colecalciferol 800unit capsules", "Cholecalciferol 800unit capsules"},
      {"Levothyroxine 50microgram tablets", "Thyroxine 50microgram tablets"},
      {"Bendroflumethiazide 2.5mg tablets", "Bendrofluazide 2.5mg tablets"},
      {"Amoxicillin 500mg capsules", "Amoxycillin 500mg capsules"},
      {"Benzatropine 2mg tablets", "Benztropine 2mg tablets"},
      {"Meclozine 25mg tablets", "Meclizine 25mg tablets"},
      {"Mepyramine 2% cream", "Pyrilamine 2% cream"},
      {"Chlortalidone 50mg tablets", "Chlorthalidone 50mg tablets"},
  };
  for (const auto& [british_text, other_text] : pairs) {
    const std::string british = british_text;
    const std::string other = other_text;
    CAPTURE(british);
    CAPTURE(other);
    const ResolvedProduct a = Resolve(BundledFormulary(), british);
    const ResolvedProduct b = Resolve(BundledFormulary(), other);
    REQUIRE(a.ingredients.size() == 1);
    REQUIRE(b.ingredients.size() == 1);
    CHECK(a.ingredients[0].ingredient == b.ingredients[0].ingredient);
    CHECK(a.ingredients[0].mg_per_unit == b.ingredients[0].mg_per_unit);
  }
}

TEST_CASE("case, accents and punctuation do not change the resolution") {
  const ResolvedProduct plain = Resolve(BundledFormulary(), "co-codamol 30mg/500mg tablets");
  for (const std::string text : {"CO-CODAMOL 30MG/500MG TABLETS", "Có-codamól 30mg/500mg tablets",
                           "co codamol 30 mg / 500 mg tablets"}) {
    CAPTURE(text);
    const ResolvedProduct other = Resolve(BundledFormulary(), text);
    REQUIRE(other.ingredients.size() == 2);
    CHECK(other.ingredients[0].ingredient == plain.ingredients[0].ingredient);
    CHECK(other.ingredients[0].mg_per_unit == plain.ingredients[0].mg_per_unit);
    CHECK(other.ingredients[1].mg_per_unit == plain.ingredients[1].mg_per_unit);
  }
}

TEST_CASE("salt and ester words are ignored unless they tell two ingredients apart") {
  const std::vector<std::pair<const char*, const char*>> salts = {
      {"Amlodipine besilate 10mg tablets", "amlodipine"},
      {"Amlodipine besylate 10mg tablets", "amlodipine"},
      {"Sertraline hydrochloride 50mg tablets", "sertraline"},
      {"Citalopram hydrobromide 20mg tablets", "citalopram"},
      {"Metoprolol tartrate 50mg tablets", "metoprolol"},
      {"Quetiapine fumarate 25mg tablets", "quetiapine"},
      {"Doxazosin mesilate 4mg tablets", "doxazosin"},
      {"Beclometasone dipropionate 100micrograms/dose inhaler", "beclometasone"},
      {"Sodium valproate 200mg gastro-resistant tablets", "valproate"},
      {"Ferrous sulphate 200mg tablets", "ferrous sulfate"},
      {"Morphine sulphate 10mg/5ml oral solution", "morphine"},
      {"Codeine phosphate 30mg tablets", "codeine"},
      {"Losartan potassium 50mg tablets", "losartan"},
      {"Perindopril erbumine 4mg tablets", "perindopril"},
  };
  for (const auto& [salt_text, ingredient] : salts) {
    const std::string text = salt_text;
    CAPTURE(text);
    const ResolvedProduct product = Resolve(BundledFormulary(), text);
    REQUIRE(product.ingredients.size() == 1);
    CHECK(product.ingredients[0].ingredient == ingredient);
  }
}

TEST_CASE("hyoscine hydrobromide and hyoscine butylbromide stay different ingredients") {
  const ResolvedProduct hydrobromide = Resolve(BundledFormulary(), "Hyoscine hydrobromide 300microgram tablets");
  const ResolvedProduct butylbromide = Resolve(BundledFormulary(), "Hyoscine butylbromide 10mg tablets");
  REQUIRE(hydrobromide.ingredients.size() == 1);
  REQUIRE(butylbromide.ingredients.size() == 1);
  CHECK(hydrobromide.ingredients[0].ingredient == "hyoscine hydrobromide");
  CHECK(butylbromide.ingredients[0].ingredient == "hyoscine butylbromide");
  // Source: Boustani et al. 2008 (scopolamine, ACB 3); hyoscine butylbromide is not listed.
  CHECK(BundledFormulary().ScoreOn("acb", "hyoscine hydrobromide") == 3);
  CHECK_FALSE(BundledFormulary().ScoreOn("acb", "hyoscine butylbromide").has_value());
}

TEST_CASE("dressings, appliances and testing items are non-medicines") {
  for (const std::string text : {"Softpore dressing 10cm x 10cm", "Activa class 2 compression stockings below knee",
                           "Blood glucose testing strips", "Unistik 3 lancets", "Insulin pen needles 4mm",
                           "Sharps bin 1 litre", "Nelaton catheter 12Ch", "Crepe bandage 7.5cm x 4.5m",
                           "Colostomy bag closed 38mm", "Inhaler spacer device"}) {
    CAPTURE(text);
    const ResolvedProduct product = Resolve(BundledFormulary(), text);
    CHECK(product.match == MatchKind::kNonMedicine);
    CHECK(product.non_medicine);
    CHECK(product.ingredients.empty());
    CHECK_FALSE(product.is_medicine());
  }
}

TEST_CASE("a pre-filled syringe of a medicine is still a medicine") {
  const ResolvedProduct product =
      Resolve(BundledFormulary(), "Methotrexate 10mg/0.2ml solution for injection pre-filled syringes");
  CHECK(product.is_medicine());
  CHECK(product.default_supply_days == 7);
}

TEST_CASE("unknown products come back unmatched") {
  for (const std::string text : {"Frobozz 10mg tablets", "", "   ", "28 tablets", "\xff\xfe garbage"}) {
    CAPTURE(text);
    const ResolvedProduct product = Resolve(BundledFormulary(), text);
    CHECK(product.match == MatchKind::kUnmatched);
    CHECK_FALSE(product.matched());
    CHECK(product.ingredients.empty());
  }
}

TEST_CASE("a code resolves before the description, through codes.csv or the ATC column") {
  const ResolvedProduct by_atc = Resolve(BundledFormulary(), "", "C08CA01", "ATC");
  CHECK(by_atc.match == MatchKind::kCode);
  REQUIRE(by_atc.ingredients.size() == 1);
  CHECK(by_atc.ingredients[0].ingredient == "amlodipine");
  const ResolvedProduct by_uri =
      Resolve(BundledFormulary(), "Istin 5mg tablets", "C08CA01", "http://www.whocc.no/atc");
  REQUIRE(by_uri.ingredients.size() == 1);
  CHECK(by_uri.ingredients[0].mg_per_unit == 5);
  CHECK(by_uri.route == Route::kOral);
  const ResolvedProduct product_code = Resolve(BundledFormulary(), "30/500 tablets", "N02AJ06", "ATC");
  CHECK(product_code.match == MatchKind::kCode);
  REQUIRE(product_code.ingredients.size() == 2);
  CHECK(product_code.ingredients[0].ingredient == "codeine");
  CHECK(product_code.ingredients[0].mg_per_unit == 30);
  // An unknown code falls back to the description.
  const ResolvedProduct fallback = Resolve(BundledFormulary(), "Amlodipine 5mg tablets", "999999", "http://snomed.info/sct");
  CHECK(fallback.match == MatchKind::kIngredient);
}

TEST_CASE("packs that imply a supply carry days per unit") {
  const std::vector<std::pair<const char*, int>> cases = {
      {"Fentanyl 25micrograms/hour transdermal patches", 3},
      {"Buprenorphine 10micrograms/hour seven day transdermal patches", 7},
      {"Medroxyprogesterone 150mg/1ml suspension for injection vials", 84},
      {"Haloperidol decanoate 50mg/1ml solution for injection ampoules", 28},
      {"Alendronic acid 70mg tablets", 7},
  };
  for (const auto& [case_text, days] : cases) {
    const std::string text = case_text;
    CAPTURE(text);
    const ResolvedProduct product = Resolve(BundledFormulary(), text);
    CHECK(product.default_supply_days == days);
  }
  const ResolvedProduct patches = Resolve(BundledFormulary(), "Fentanyl 12micrograms/hour transdermal patches");
  CHECK(ProductDefaultSupplyDays(patches, 5) == 15);
  CHECK_FALSE(ProductDefaultSupplyDays(Resolve(BundledFormulary(), "Amlodipine 5mg tablets"), 28).has_value());
}

TEST_CASE("the resolution cache resolves each distinct product once and returns stable references") {
  ResolutionCache cache(BundledFormulary());
  const ResolvedProduct& first = cache.Resolve("Amlodipine 5mg tablets");
  for (int i = 0; i < 100; ++i) cache.Resolve("Product " + std::to_string(i) + " 10mg tablets");
  const ResolvedProduct& again = cache.Resolve("Amlodipine 5mg tablets");
  CHECK(&first == &again);
  CHECK(cache.size() == 101);
  CHECK(&cache.Resolve("Amlodipine 5mg tablets", "C08CA01", "ATC") != &first);
  CHECK(cache.size() == 102);
}

TEST_CASE("every medicine in the synthetic data catalogue resolves") {
  size_t medicines = 0;
  for (const CatalogueProduct& product : SynthCatalogue()) {
    const std::string description(product.description);
    CAPTURE(description);
    const ResolvedProduct resolved = Resolve(BundledFormulary(), product.description);
    if (product.kind == CatalogueKind::kNonMedicine) {
      CHECK(resolved.non_medicine);
      continue;
    }
    ++medicines;
    CHECK(resolved.is_medicine());
    CHECK(resolved.route != Route::kUnknown);
  }
  CHECK(medicines > 0);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
