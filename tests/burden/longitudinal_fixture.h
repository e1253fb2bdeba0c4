// Shared by the tests of the longitudinal measures: a few invented products resolved by
// hand, the tables the measures read, and a helper that evaluates a history on a date.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "medload/burden/burden.h"

namespace medload::testing {

inline Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

inline ResolvedProduct Made(std::vector<ResolvedIngredient> ingredients, Route route = Route::kOral) {
  ResolvedProduct product;
  product.ingredients = std::move(ingredients);
  product.route = route;
  product.match = MatchKind::kIngredient;
  return product;
}

struct LongitudinalFixture {
  std::map<std::string, ResolvedProduct> products;
  ResolvedProduct unmatched;
  BurdenTables tables;
  MeasureOptions options;

  LongitudinalFixture() {
    products["atorvastatin 20mg tablets"] = Made({{"atorvastatin", 20.0, {}}});
    products["simvastatin 40mg tablets"] = Made({{"simvastatin", 40.0, {}}});
    products["ramipril 5mg capsules"] = Made({{"ramipril", 5.0, {}}});
    products["losartan 50mg tablets"] = Made({{"losartan", 50.0, {}}});
    products["oxybutynin 5mg tablets"] = Made({{"oxybutynin", 5.0, {}}});
    products["oxybutynin 3.9mg/24 hours patches"] = Made({{"oxybutynin", {}, 3.9}}, Route::kTransdermal);
    products["amitriptyline 10mg tablets"] = Made({{"amitriptyline", 10.0, {}}});
    products["amitriptyline tablets"] = Made({{"amitriptyline", {}, {}}});
    products["atropine 1% eye drops"] = Made({{"atropine", 10.0, {}}}, Route::kEye);
    products["diazepam 5mg tablets"] = Made({{"diazepam", 5.0, {}}});
    products["diazepam 10mg rectal tubes"] = Made({{"diazepam", 10.0, {}}}, Route::kRectal);
    products["doxepin 5% cream"] = Made({{"doxepin", 50.0, {}}}, Route::kSkin);
    products["furosemide 40mg tablets"] = Made({{"furosemide", 40.0, {}}});
    products["tamsulosin 400 micrograms"] = Made({{"tamsulosin", 0.4, {}}}, Route::kUnknown);
    products["paracetamol 500mg tablets"] = Made({{"paracetamol", 500.0, {}}});

    tables.classes["atorvastatin"] = {"statin", "lipid-regulating"};
    tables.classes["simvastatin"] = {"statin", "lipid-regulating"};
    tables.classes["ramipril"] = {"ace-inhibitor"};
    tables.classes["losartan"] = {"arb"};
    // Falls-risk categories as formulary/falls_risk.csv gives them (STOPPFall, Seppala et
    // al. 2021; from memory): benzodiazepines, antidepressants, diuretics, alpha-blockers.
    tables.falls_categories["diazepam"] = {"sedative-hypnotic"};
    tables.falls_categories["doxepin"] = {"antidepressant"};
    tables.falls_categories["amitriptyline"] = {"antidepressant"};
    tables.falls_categories["furosemide"] = {"diuretic"};
    tables.falls_categories["tamsulosin"] = {"alpha-blocker"};
    // Minimum effective daily doses: oxybutynin 5 mg (Gray et al. 2015, JAMA Intern Med,
    // Table 3 footnote); amitriptyline 25 mg and atropine 0.4 mg from memory.
    tables.tsdd_doses["oxybutynin"] = 5.0;
    tables.tsdd_doses["amitriptyline"] = 25.0;
    tables.tsdd_doses["atropine"] = 0.4;
  }

  Timeline Build(const std::vector<DispensingRecord>& records) const {
    return BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
      auto it = products.find(r.product);
      return it == products.end() ? unmatched : it->second;
    }, options);
  }

  LongitudinalMeasures On(const std::vector<DispensingRecord>& records, Date on) const {
    return EvaluateBurden(Build(records), on, tables, options, 80).longitudinal;
  }
};

inline DispensingRecord Rx(const std::string& product, Date on, double quantity, int days) {
  DispensingRecord record;
  record.patient_id = "T1";
  record.product = product;
  record.dispensed_on = on;
  record.quantity = quantity;
  record.days_supply = days;
  return record;
}

}  // namespace medload::testing
