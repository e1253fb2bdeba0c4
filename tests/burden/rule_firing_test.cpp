// Combination rules on a date: routes, distinct ingredients, forbidden classes, minimum
// age (src/burden/rule_firing.cpp), and the route notes that explain what did not count.
#include <doctest/doctest.h>

#include <map>

#include "medload/burden/burden.h"
#include "medload/burden/route_notes.h"

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

ResolvedProduct Product(std::vector<std::string> ingredients, Route route = Route::kOral) {
  ResolvedProduct product;
  for (std::string& name : ingredients) product.ingredients.push_back({std::move(name), 10.0, {}});
  product.route = route;
  product.match = MatchKind::kIngredient;
  return product;
}

RuleRequirement Needs(std::vector<std::string> classes, int at_least = 1) {
  RuleRequirement requirement;
  requirement.classes = std::move(classes);
  requirement.at_least = at_least;
  return requirement;
}

Rule MakeRule(std::string id, std::vector<RuleRequirement> require, std::optional<int> age_min = std::nullopt) {
  Rule rule;
  rule.id = std::move(id);
  rule.title = rule.id;
  rule.source = "test";
  rule.age_min = age_min;
  rule.require = std::move(require);
  return rule;
}

// Invented products resolved by hand, classes as in the bundled ingredients.csv.
struct Fixture {
  std::map<std::string, ResolvedProduct> products;
  ResolvedProduct unmatched;
  BurdenTables tables;
  MeasureOptions options;

  Fixture() {
    products["ramipril"] = Product({"ramipril"});
    products["furosemide"] = Product({"furosemide"});
    products["ibuprofen tablets"] = Product({"ibuprofen"});
    products["ibuprofen gel"] = Product({"ibuprofen"}, Route::kSkin);
    products["ibuprofen, no form"] = Product({"ibuprofen"}, Route::kUnknown);
    products["aspirin"] = Product({"aspirin"});
    products["omeprazole"] = Product({"omeprazole"});
    products["warfarin"] = Product({"warfarin"});
    products["codeine"] = Product({"codeine"});
    products["co-codamol"] = Product({"codeine", "paracetamol"});
    products["paracetamol tablets"] = Product({"paracetamol"});
    products["paracetamol suspension"] = Product({"paracetamol"});
    products["tramadol"] = Product({"tramadol"});
    products["sertraline"] = Product({"sertraline"});
    products["diazepam"] = Product({"diazepam"});
    products["fentanyl nasal spray"] = Product({"fentanyl"}, Route::kNasal);
    products["atropine eye drops"] = Product({"atropine"}, Route::kEye);
    products["hydrocortisone cream"] = Product({"hydrocortisone"}, Route::kSkin);
    products["hydrocortisone with miconazole cream"] = Product({"hydrocortisone", "miconazole"}, Route::kSkin);
    products["hydrocortisone tablets"] = Product({"hydrocortisone"});
    tables.classes = {{"ramipril", {"ace-inhibitor"}},  {"furosemide", {"loop-diuretic"}},
                      {"ibuprofen", {"nsaid"}},         {"aspirin", {"antiplatelet"}},
                      {"omeprazole", {"ppi"}},          {"warfarin", {"anticoagulant"}},
                      {"codeine", {"opioid", "cns-active"}}, {"tramadol", {"opioid", "cns-active"}},
                      {"fentanyl", {"opioid", "cns-active"}}, {"sertraline", {"ssri", "cns-active"}},
                      {"diazepam", {"benzodiazepine", "cns-active"}}, {"paracetamol", {"analgesic"}}};
    // Source: Boustani et al. 2008 (ACB, 2012 update): atropine 3, hydrocortisone 1.
    tables.scales["acb"] = {{"atropine", 3}, {"hydrocortisone", 1}};
    // Source: product specification section 5 ("Routes"): scales, DBI and rules count
    // systemic routes only by default.
    tables.systemic_routes = RouteSet(DefaultSystemicRoutes());
  }

  Timeline Build(const std::vector<std::string>& dispensed) const {
    std::vector<DispensingRecord> records;
    for (const std::string& product : dispensed) {
      DispensingRecord record;
      record.patient_id = "T1";
      record.product = product;
      record.dispensed_on = D(2024, 1, 1);
      record.quantity = 28;
      record.days_supply = 28;
      records.push_back(record);
    }
    return BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
      auto it = products.find(r.product);
      return it == products.end() ? unmatched : it->second;
    }, options);
  }

  // The rules fired on 10 January; the prepared matches must give the same answer.
  std::vector<std::string> Fired(const std::vector<std::string>& dispensed, std::optional<int> age = 80,
                                 bool* age_unknown = nullptr) const {
    const Timeline timeline = Build(dispensed);
    const Burden plain = EvaluateBurden(timeline, D(2024, 1, 10), tables, options, age);
    const std::vector<bool> matches = MatchRuleRequirements(timeline, tables);
    const Burden prepared = EvaluateBurden(timeline, D(2024, 1, 10), tables, options, age, &matches);
    std::vector<std::string> ids, prepared_ids;
    for (const FiredRule& fired : plain.rules) ids.push_back(fired.rule->id);
    for (const FiredRule& fired : prepared.rules) prepared_ids.push_back(fired.rule->id);
    CHECK(ids == prepared_ids);
    if (age_unknown != nullptr) *age_unknown = plain.age_unknown_for_rules;
    return ids;
  }
};

using Ids = std::vector<std::string>;

}  // namespace

TEST_SUITE("burden/rule_firing") {

TEST_CASE("an NSAID gel on the skin fires neither the kidney-injury rule nor the NSAID bleeding rules") {
  // Source: Lapi et al. BMJ 2013;346:e8525 (ACE inhibitor or ARB, diuretic and NSAID);
  // STOPP/START version 3, O'Mahony et al. 2023 (NSAID with an anticoagulant); product
  // specification section 5: rules count systemic routes only by default.
  Fixture f;
  f.tables.rules = {MakeRule("aki-triple", {Needs({"ace-inhibitor"}), Needs({"loop-diuretic"}), Needs({"nsaid"})}),
                    MakeRule("nsaid-anticoagulant", {Needs({"nsaid"}), Needs({"anticoagulant"})})};
  CHECK(f.Fired({"ramipril", "furosemide", "ibuprofen gel", "warfarin"}).empty());
  CHECK(f.Fired({"ramipril", "furosemide", "ibuprofen tablets", "warfarin"}) ==
        Ids{"aki-triple", "nsaid-anticoagulant"});
}

TEST_CASE("tablets and a gel of one ingredient in force together count through the tablets") {
  Fixture f;
  f.tables.rules = {MakeRule("nsaid-anticoagulant", {Needs({"nsaid"}), Needs({"anticoagulant"})})};
  const Timeline timeline = f.Build({"ibuprofen tablets", "ibuprofen gel", "warfarin"});
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  // One medicine (same ingredient), used by mouth and on the skin.
  REQUIRE(burden.items == 2);
  CHECK(burden.active[0].routes.Routes() == std::vector<Route>{Route::kOral, Route::kSkin});
  CHECK(burden.rules.size() == 1);
}

TEST_CASE("a product whose route is not stated counts as systemic and says so") {
  // Product specification section 5: an unknown route must not lose burden silently.
  Fixture f;
  f.tables.rules = {MakeRule("nsaid-anticoagulant", {Needs({"nsaid"}), Needs({"anticoagulant"})})};
  CHECK(f.Fired({"ibuprofen, no form", "warfarin"}) == Ids{"nsaid-anticoagulant"});
  const Timeline timeline = f.Build({"ibuprofen, no form"});
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  REQUIRE(burden.active.size() == 1);
  CHECK(RouteNotStated(burden.active[0]));
}

TEST_CASE("a rule with its own routes counts an opioid nasal spray") {
  // Intranasal fentanyl is a systemic opioid (common practice): the bundled opioid rules
  // list the nasal route.
  Fixture f;
  Rule rule = MakeRule("opioid-benzodiazepine", {Needs({"opioid"}), Needs({"benzodiazepine"})});
  f.tables.rules = {rule};
  CHECK(f.Fired({"fentanyl nasal spray", "diazepam"}).empty());
  rule.routes = {Route::kOral, Route::kNasal};
  f.tables.rules = {rule};
  CHECK(f.Fired({"fentanyl nasal spray", "diazepam"}) == Ids{"opioid-benzodiazepine"});
}

TEST_CASE("one ingredient in two products is one drug for a count of CNS-active medicines") {
  // Source: 2023 AGS Beers Criteria, J Am Geriatr Soc 2023;71:2052 (three or more
  // CNS-active drugs); product specification section 5: rules count distinct ingredients.
  Fixture f;
  f.tables.rules = {MakeRule("cns-active-3", {Needs({"cns-active"}, 3)})};
  CHECK(f.Fired({"codeine", "co-codamol", "sertraline"}).empty());
  CHECK(f.Fired({"codeine", "co-codamol", "sertraline", "diazepam"}) == Ids{"cns-active-3"});
}

TEST_CASE("two different opioids need two different opioid ingredients") {
  // Source: STOPP/START version 3 (duplicate drug class), O'Mahony et al. 2023, from memory.
  Fixture f;
  f.tables.rules = {MakeRule("duplicate-opioid", {Needs({"opioid"}, 2)})};
  CHECK(f.Fired({"codeine", "co-codamol"}).empty());
  CHECK(f.Fired({"co-codamol", "tramadol"}) == Ids{"duplicate-opioid"});
}

TEST_CASE("a requirement counting medicines fires on two paracetamol-containing products") {
  // Paracetamol labelling: do not take with other paracetamol-containing products
  // (common practice).
  Fixture f;
  RuleRequirement paracetamol;
  paracetamol.ingredients = {"paracetamol"};
  paracetamol.at_least = 2;
  paracetamol.count = RuleCount::kMedicines;
  f.tables.rules = {MakeRule("paracetamol-two-products", {paracetamol})};
  CHECK(f.Fired({"paracetamol tablets", "co-codamol"}) == Ids{"paracetamol-two-products"});
  // Tablets and a suspension of paracetamol alone are one medicine.
  CHECK(f.Fired({"paracetamol tablets", "paracetamol suspension"}).empty());
}

TEST_CASE("the NSAID and antiplatelet rule does not fire while a PPI is active") {
  // Source: STOPP/START version 3, O'Mahony et al. Eur Geriatr Med 2023 (NSAID with an
  // antiplatelet agent without PPI prophylaxis; from memory).
  Fixture f;
  Rule rule = MakeRule("nsaid-antiplatelet", {Needs({"nsaid"}), Needs({"antiplatelet"})});
  rule.forbid = {Needs({"ppi"})};
  f.tables.rules = {rule};
  CHECK(f.Fired({"ibuprofen tablets", "aspirin"}) == Ids{"nsaid-antiplatelet"});
  CHECK(f.Fired({"ibuprofen tablets", "aspirin", "omeprazole"}).empty());
}

TEST_CASE("a rule from criteria for older people fires from its minimum age only") {
  // Source: product specification section 5: Beers and STOPP apply from 65.
  Fixture f;
  f.tables.rules = {MakeRule("cns-active-3", {Needs({"cns-active"}, 3)}, 65)};
  const std::vector<std::string> three = {"codeine", "sertraline", "diazepam"};
  for (const int age : {19, 30, 64}) {
    CAPTURE(age);
    CHECK(f.Fired(three, age).empty());
  }
  CHECK(f.Fired(three, 65) == Ids{"cns-active-3"});
}

TEST_CASE("an unknown age is reported only when an age-limited rule would have fired") {
  Fixture f;
  f.tables.rules = {MakeRule("cns-active-3", {Needs({"cns-active"}, 3)}, 65)};
  bool age_unknown = false;
  CHECK(f.Fired({"codeine", "sertraline", "diazepam"}, std::nullopt, &age_unknown).empty());
  CHECK(age_unknown);
  CHECK(f.Fired({"codeine", "sertraline"}, std::nullopt, &age_unknown).empty());
  CHECK_FALSE(age_unknown);
}

TEST_CASE("eye drops and creams add nothing to the anticholinergic score and notes say why") {
  // Source: Boustani et al. 2008 (atropine 3, hydrocortisone 1); product specification
  // section 5: scales count systemic routes only by default.
  Fixture f;
  const Timeline timeline = f.Build({"atropine eye drops", "hydrocortisone cream"});
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  CHECK(burden.items == 2);
  CHECK(burden.acb == 0);
  const std::vector<RouteNote> notes = RouteNotes(timeline, burden, f.tables, 80);
  REQUIRE(notes.size() == 2);
  CHECK(notes[0].text == "eye: not a systemic route for the acb scale");
  CHECK(notes[1].text == "skin: not a systemic route for the acb scale");
}

TEST_CASE("a scale entry with its own routes counts them") {
  Fixture f;
  f.tables.scale_routes["acb"]["atropine"] = RouteSet(std::vector<Route>{Route::kOral, Route::kEye});
  const Timeline timeline = f.Build({"atropine eye drops"});
  CHECK(EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80).acb == 3);
}

TEST_CASE("tablets carry an ingredient's score when a cream holding it was dispensed later") {
  Fixture f;
  std::vector<DispensingRecord> records(2);
  records[0].product = "hydrocortisone tablets";
  records[0].dispensed_on = D(2024, 1, 1);
  records[1].product = "hydrocortisone with miconazole cream";
  records[1].dispensed_on = D(2024, 1, 5);
  for (DispensingRecord& record : records) {
    record.quantity = 28;
    record.days_supply = 28;
  }
  const Timeline timeline = BuildTimeline(records, [&f](const DispensingRecord& r) -> const ResolvedProduct& {
    return f.products.at(r.product);
  }, f.options);
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  CHECK(burden.acb == 1);
  REQUIRE(burden.score_contributions.size() == 1);
  CHECK(burden.score_contributions[0].ingredient == "hydrocortisone");
}

TEST_CASE("a cream adds nothing to the DBI while tablets of its ingredient dispensed before it still count") {
  // Hilmer et al. 2007 (DBI = D / (D + delta)); product specification section 5 (the DBI
  // counts systemic routes only). delta 10 mg is a test value.
  Fixture f;
  f.products["doxepin capsules"] = Product({"doxepin"});
  f.products["doxepin cream"] = Product({"doxepin"}, Route::kSkin);
  f.tables.dbi["doxepin"] = {10.0, "both"};
  std::vector<DispensingRecord> records(2);
  records[0].product = "doxepin capsules";
  records[0].dispensed_on = D(2024, 1, 1);
  records[1].product = "doxepin cream";
  records[1].dispensed_on = D(2024, 1, 5);
  for (DispensingRecord& record : records) {
    record.quantity = 28;
    record.days_supply = 28;
  }
  const auto resolve = [&f](const DispensingRecord& r) -> const ResolvedProduct& { return f.products.at(r.product); };
  const Timeline both = BuildTimeline(records, resolve, f.options);
  const Burden with_tablets = EvaluateBurden(both, D(2024, 1, 10), f.tables, f.options, 80);
  REQUIRE(with_tablets.dbi_contributions.size() == 1);
  // 10 mg x 28 / 28 days = 10 mg/day from the capsules alone: 10 / (10 + 10).
  CHECK(with_tablets.dbi == doctest::Approx(0.5));
  CHECK(with_tablets.dbi_incomplete.empty());
  const Timeline cream_only = BuildTimeline(std::vector<DispensingRecord>{records[1]}, resolve, f.options);
  const Burden cream = EvaluateBurden(cream_only, D(2024, 1, 10), f.tables, f.options, 80);
  CHECK(cream.dbi == 0);
  CHECK(cream.dbi_contributions.empty());
  CHECK(cream.dbi_incomplete.empty());
  const std::vector<RouteNote> notes = RouteNotes(cream_only, cream, f.tables, 80);
  REQUIRE(notes.size() == 1);
  CHECK(notes[0].text == "skin: not a systemic route for the Drug Burden Index");
}

TEST_CASE("a rule that only a route kept from firing is reported with the medicine's note") {
  Fixture f;
  f.tables.rules = {MakeRule("aki-triple", {Needs({"ace-inhibitor"}), Needs({"loop-diuretic"}), Needs({"nsaid"})})};
  const Timeline timeline = f.Build({"ramipril", "furosemide", "ibuprofen gel"});
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  CHECK(burden.rules.empty());
  const std::vector<FiredRule> left_out = RulesLeftOutByRoute(timeline, burden, f.tables, 80);
  REQUIRE(left_out.size() == 1);
  CHECK(left_out[0].rule->id == "aki-triple");
  const std::vector<RouteNote> notes = RouteNotes(timeline, burden, f.tables, 80);
  REQUIRE(notes.size() == 1);
  CHECK(timeline.medicines[burden.active[notes[0].active].medicine].key == "ibuprofen");
  CHECK(notes[0].text == "skin: not a systemic route for rule aki-triple");
  // Too young for the rule: nothing is reported as left out by the route.
  f.tables.rules[0].age_min = 65;
  CHECK(RulesLeftOutByRoute(timeline, burden, f.tables, 40).empty());
}

}  // TEST_SUITE

}  // namespace medload
