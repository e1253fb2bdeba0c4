// The bundled formulary's rules and route policy on product descriptions as dispensed:
// each classic combination fires, and the cases a clinical audit found wrong do not.
#include <doctest/doctest.h>

#include <algorithm>
#include <map>

#include "medload/burden/burden.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

const Formulary& Bundled() {
  static const Formulary formulary = [] {
    auto loaded = LoadFormulary(MEDLOAD_SOURCE_FORMULARY);
    if (!loaded.ok()) FAIL("bundled formulary does not load: " << loaded.status().message());
    return std::move(loaded).value();
  }();
  return formulary;
}

// The burden on 10 January of `descriptions`, each dispensed on 1 January for 28 days.
struct Evaluated {
  Timeline timeline;
  Burden burden;
  std::vector<std::string> rules;
};

Evaluated Evaluate(const std::vector<std::string>& descriptions, std::optional<int> age,
                   const std::string& scale = "acb") {
  static std::map<std::string, ResolvedProduct> resolved;
  std::vector<DispensingRecord> records;
  for (const std::string& description : descriptions) {
    DispensingRecord record;
    record.patient_id = "T1";
    record.product = description;
    record.dispensed_on = D(2024, 1, 1);
    record.quantity = 28;
    record.days_supply = 28;
    records.push_back(record);
    if (resolved.count(description) == 0) resolved[description] = Resolve(Bundled(), description, "", "");
  }
  Evaluated out;
  const BurdenTables tables = TablesFromFormulary(Bundled(), scale);
  out.timeline = BuildTimeline(records, [](const DispensingRecord& r) -> const ResolvedProduct& {
    return resolved.at(r.product);
  }, MeasureOptions{});
  out.burden = EvaluateBurden(out.timeline, D(2024, 1, 10), tables, MeasureOptions{}, age);
  for (const FiredRule& fired : out.burden.rules) out.rules.push_back(fired.rule->id);
  return out;
}

bool Fires(const Evaluated& evaluated, const std::string& id) {
  return std::find(evaluated.rules.begin(), evaluated.rules.end(), id) != evaluated.rules.end();
}

struct Combination {
  std::vector<std::string> products;
  const char* rule;
  const char* source;  // the published source, as cited in rules.json
};

}  // namespace

TEST_SUITE("burden/bundled_rules") {

TEST_CASE("each classic combination fires its bundled rule at 70") {
  // Sources beside each case; all recalled from memory and marked in rules.json as not
  // yet checked against the publication.
  const std::vector<Combination> cases = {
      {{"Warfarin 3mg tablets", "Aspirin 75mg dispersible tablets"}, "anticoagulant-antiplatelet",
       "STOPP/START version 3, O'Mahony et al. 2023"},
      {{"Apixaban 5mg tablets", "Clopidogrel 75mg tablets"}, "anticoagulant-antiplatelet",
       "STOPP/START version 3, O'Mahony et al. 2023"},
      {{"Morphine sulfate 10mg modified-release tablets", "Zopiclone 7.5mg tablets"}, "opioid-z-drug",
       "FDA Drug Safety Communication 2016; MHRA Drug Safety Update 2020"},
      {{"Naproxen 500mg tablets", "Prednisolone 5mg tablets"}, "nsaid-corticosteroid",
       "2023 AGS Beers Criteria; STOPP/START version 3"},
      {{"Lithium carbonate 400mg modified-release tablets", "Ramipril 5mg capsules"}, "lithium-ras-loop",
       "2023 AGS Beers Criteria"},
      {{"Lithium carbonate 400mg modified-release tablets", "Losartan 50mg tablets"}, "lithium-ras-loop",
       "2023 AGS Beers Criteria"},
      {{"Lithium carbonate 400mg modified-release tablets", "Furosemide 40mg tablets"}, "lithium-ras-loop",
       "2023 AGS Beers Criteria"},
      {{"Warfarin 3mg tablets", "Amiodarone 200mg tablets"}, "warfarin-amiodarone", "2023 AGS Beers Criteria"},
      {{"Warfarin 3mg tablets", "Clarithromycin 500mg tablets"}, "warfarin-macrolide", "2023 AGS Beers Criteria"},
      {{"Ramipril 5mg capsules", "Amiloride 5mg tablets"}, "ras-potassium-sparing", "2023 AGS Beers Criteria"},
      {{"Losartan 50mg tablets", "Co-amilofruse 5mg/40mg tablets"}, "ras-potassium-sparing",
       "2023 AGS Beers Criteria"},
      {{"Methotrexate 2.5mg tablets", "Trimethoprim 200mg tablets"}, "methotrexate-trimethoprim",
       "methotrexate and trimethoprim product information"},
      {{"Simvastatin 40mg tablets", "Clarithromycin 500mg tablets"}, "simvastatin-macrolide",
       "MHRA Drug Safety Update 2012"},
      {{"Paracetamol 500mg tablets", "Co-codamol 30mg/500mg tablets"}, "paracetamol-two-products",
       "paracetamol product information"},
      {{"Omeprazole 20mg gastro-resistant capsules", "Lansoprazole 30mg gastro-resistant capsules"},
       "duplicate-ppi", "STOPP/START version 3 (duplicate drug class)"},
      {{"Codeine phosphate 30mg tablets", "Diazepam 2mg tablets"}, "opioid-benzodiazepine",
       "FDA Drug Safety Communication 2016; 2023 AGS Beers Criteria"},
  };
  for (const Combination& combination : cases) {
    const std::string rule = combination.rule;
    const std::string source = combination.source;
    CAPTURE(rule);
    CAPTURE(source);
    CHECK(Fires(Evaluate(combination.products, 70), rule));
  }
}

TEST_CASE("an ibuprofen gel fires no kidney-injury or NSAID bleeding rule; ibuprofen tablets do") {
  // Source: Lapi et al. BMJ 2013;346:e8525; STOPP/START version 3 (from memory); product
  // specification section 5 (systemic routes only).
  const std::vector<std::string> base = {"Ramipril 5mg capsules", "Furosemide 40mg tablets",
                                         "Warfarin 3mg tablets", "Aspirin 75mg dispersible tablets"};
  std::vector<std::string> gel = base, tablets = base;
  gel.push_back("Ibuprofen 5% gel");
  tablets.push_back("Ibuprofen 400mg tablets");
  const Evaluated with_gel = Evaluate(gel, 70);
  for (const char* id : {"aki-triple", "nsaid-anticoagulant", "nsaid-antiplatelet"}) {
    const std::string rule = id;
    CAPTURE(rule);
    CHECK_FALSE(Fires(with_gel, rule));
    CHECK(Fires(Evaluate(tablets, 70), rule));
  }
}

TEST_CASE("eye drops and creams score nothing on either scale") {
  // Source: Boustani et al. 2008 (atropine 3, hydrocortisone 1) and Rudolph et al. 2008
  // (atropine 3): these are systemic scores; product specification section 5.
  CHECK(Evaluate({"Atropine 1% eye drops"}, 70).burden.acb == 0);
  CHECK(Evaluate({"Atropine 1% eye drops"}, 70, "ars").burden.acb == 0);
  CHECK(Evaluate({"Hydrocortisone 1% cream"}, 70).burden.acb == 0);
  CHECK(Evaluate({"Hydrocortisone 10mg tablets"}, 70).burden.acb == 1);
}

TEST_CASE("codeine with co-codamol and sertraline is two CNS-active drugs and one opioid") {
  // Source: 2023 AGS Beers Criteria (three or more CNS-active drugs); STOPP/START version
  // 3 (duplicate drug class); product specification section 5 (distinct ingredients).
  const Evaluated evaluated =
      Evaluate({"Codeine phosphate 30mg tablets", "Co-codamol 30mg/500mg tablets", "Sertraline 50mg tablets"}, 80);
  CHECK_FALSE(Fires(evaluated, "cns-active-3"));
  CHECK_FALSE(Fires(evaluated, "duplicate-opioid"));
}

TEST_CASE("rules from criteria for older people do not fire at 19 or 30 and fire at 65") {
  // Source: product specification section 5 (Beers and STOPP apply from 65).
  const std::vector<std::string> three = {"Codeine phosphate 30mg tablets", "Sertraline 50mg tablets",
                                          "Pregabalin 75mg capsules"};
  CHECK_FALSE(Fires(Evaluate(three, 19), "cns-active-3"));
  CHECK_FALSE(Fires(Evaluate(three, 30), "cns-active-3"));
  CHECK(Fires(Evaluate(three, 65), "cns-active-3"));
  // Regulators' warnings apply at any age: an opioid with a gabapentinoid fires at 19.
  CHECK(Fires(Evaluate(three, 19), "opioid-gabapentinoid"));
}

TEST_CASE("an NSAID with aspirin fires only without a PPI") {
  // Source: STOPP/START version 3, O'Mahony et al. 2023 (without PPI prophylaxis).
  const std::vector<std::string> pair = {"Naproxen 500mg tablets", "Aspirin 75mg dispersible tablets"};
  CHECK(Fires(Evaluate(pair, 70), "nsaid-antiplatelet"));
  std::vector<std::string> with_ppi = pair;
  with_ppi.push_back("Omeprazole 20mg gastro-resistant capsules");
  CHECK_FALSE(Fires(Evaluate(with_ppi, 70), "nsaid-antiplatelet"));
}

TEST_CASE("baclofen counts in the extended CNS rule only") {
  // Source: 2023 AGS Beers Criteria (its list does not name baclofen; from memory).
  const Evaluated evaluated =
      Evaluate({"Baclofen 10mg tablets", "Sertraline 50mg tablets", "Codeine phosphate 30mg tablets"}, 80);
  CHECK_FALSE(Fires(evaluated, "cns-active-3"));
  CHECK(Fires(evaluated, "cns-active-3-extended"));
}

}  // TEST_SUITE

}  // namespace medload
