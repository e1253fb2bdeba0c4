#include "medload/burden/burden.h"

#include <doctest/doctest.h>

#include <cmath>
#include <map>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

ResolvedProduct Product(std::vector<ResolvedIngredient> ingredients, Route route = Route::kOral) {
  ResolvedProduct product;
  product.ingredients = std::move(ingredients);
  product.route = route;
  product.form = "tablet";
  product.dose_unit = "tablet";
  product.match = MatchKind::kIngredient;
  return product;
}

// A small formulary by hand: product text -> resolution.
struct Fixture {
  std::map<std::string, ResolvedProduct> products;
  ResolvedProduct unmatched;
  BurdenTables tables;
  MeasureOptions options;

  Fixture() {
    products["amitriptyline 10mg tablets"] = Product({{"amitriptyline", 10.0, {}}});
    products["amitriptyline 25mg tablets"] = Product({{"amitriptyline", 25.0, {}}});
    products["oxybutynin 5mg tablets"] = Product({{"oxybutynin", 5.0, {}}});
    products["codeine 30mg tablets"] = Product({{"codeine", 30.0, {}}});
    products["co-codamol 30mg/500mg tablets"] =
        Product({{"codeine", 30.0, {}}, {"paracetamol", 500.0, {}}});
    products["diazepam 5mg tablets"] = Product({{"diazepam", 5.0, {}}});
    products["diazepam tablets"] = Product({{"diazepam", std::nullopt, {}}});
    products["ramipril 5mg capsules"] = Product({{"ramipril", 5.0, {}}});
    products["furosemide 40mg tablets"] = Product({{"furosemide", 40.0, {}}});
    products["ibuprofen 400mg tablets"] = Product({{"ibuprofen", 400.0, {}}});
    products["naproxen 500mg tablets"] = Product({{"naproxen", 500.0, {}}});
    products["ibuprofen 5% gel"] = Product({{"ibuprofen", std::nullopt, {}}}, Route::kSkin);
    ResolvedProduct dressing;
    dressing.match = MatchKind::kNonMedicine;
    dressing.non_medicine = true;
    products["foam dressing 10cm"] = dressing;

    // Source: Boustani et al. 2008 (ACB scale, 2012 update): amitriptyline 3,
    // oxybutynin 3, codeine 1, furosemide 1, diazepam 1.
    tables.scales["acb"] = {{"amitriptyline", 3}, {"oxybutynin", 3}, {"codeine", 1},
                            {"furosemide", 1}, {"diazepam", 1}};
    // Source: Hilmer et al. 2007 (DBI method); diazepam delta 5 mg/day (Australian
    // minimum daily dose, per Hilmer et al. 2007); amitriptyline delta 10 mg from memory.
    tables.dbi["diazepam"] = {5.0, "sedative"};
    tables.dbi["amitriptyline"] = {10.0, "both"};
    tables.classes["ramipril"] = {"ace-inhibitor"};
    tables.classes["furosemide"] = {"loop-diuretic"};
    tables.classes["ibuprofen"] = {"nsaid"};
    tables.classes["naproxen"] = {"nsaid"};
    tables.classes["codeine"] = {"opioid"};
    tables.classes["diazepam"] = {"benzodiazepine"};
    Rule triple{"aki-triple", "ACE inhibitor or ARB, diuretic and NSAID", "", "Lapi et al. 2013",
                std::nullopt, {}, {}};
    triple.require = {{{"ace-inhibitor", "arb"}, {}, std::nullopt, "acb", 1},
                      {{"loop-diuretic", "thiazide-diuretic"}, {}, std::nullopt, "acb", 1},
                      {{"nsaid"}, {}, std::nullopt, "acb", 1}};
    Rule two_nsaids{"two-nsaids", "Two NSAIDs", "", "common practice", std::nullopt, {}, {}};
    two_nsaids.require = {{{"nsaid"}, {}, std::nullopt, "acb", 2}};
    Rule opioid_benzo{"opioid-benzo", "Opioid with a benzodiazepine", "", "Beers 2023", 65, {}, {}};
    opioid_benzo.require = {{{"opioid"}, {}, std::nullopt, "acb", 1},
                            {{"benzodiazepine"}, {}, std::nullopt, "acb", 1}};
    Rule two_definite{"two-definite", "Two definite anticholinergics", "", "Boustani 2008",
                      std::nullopt, {}, {}};
    two_definite.require = {{{}, {}, 3, "acb", 2}};
    tables.rules = {triple, two_nsaids, opioid_benzo, two_definite};
  }

  Timeline Build(const std::vector<DispensingRecord>& records) const {
    return BuildTimeline(records, [this](const DispensingRecord& r) -> const ResolvedProduct& {
      auto it = products.find(r.product);
      return it == products.end() ? unmatched : it->second;
    }, options);
  }

  // Evaluates with and without the per-timeline rule matches; both must fire the same
  // rules with the same medicines.
  Burden On(const std::vector<DispensingRecord>& records, Date on, std::optional<int> age = 80) const {
    const Timeline timeline = Build(records);
    Burden plain = EvaluateBurden(timeline, on, tables, options, age);
    const std::vector<bool> matches = MatchRuleRequirements(timeline, tables);
    const Burden prepared = EvaluateBurden(timeline, on, tables, options, age, &matches);
    REQUIRE(plain.rules.size() == prepared.rules.size());
    for (size_t i = 0; i < plain.rules.size(); ++i) {
      CHECK(plain.rules[i].rule == prepared.rules[i].rule);
      CHECK(plain.rules[i].medicines == prepared.rules[i].medicines);
    }
    return plain;
  }
};

DispensingRecord Rx(const std::string& product, Date on, double quantity, std::optional<int> days,
                    const std::string& dosage = "") {
  DispensingRecord record;
  record.patient_id = "T1";
  record.product = product;
  record.dispensed_on = on;
  record.quantity = quantity;
  record.days_supply = days;
  record.dosage = dosage;
  return record;
}

}  // namespace

TEST_SUITE("burden/burden") {

TEST_CASE("items counts distinct active medicines; two strengths of one ingredient are one medicine") {
  Fixture f;
  auto b = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
                 Rx("amitriptyline 25mg tablets", D(2024, 1, 20), 28, 28),
                 Rx("oxybutynin 5mg tablets", D(2024, 1, 5), 56, 28)},
                D(2024, 1, 25));
  CHECK(b.items == 2);
}

TEST_CASE("a combination product is one medicine, or one per ingredient with count-by ingredient") {
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("co-codamol 30mg/500mg tablets", D(2024, 1, 1), 100, 25)};
  CHECK(f.On(records, D(2024, 1, 10)).items == 1);
  f.options.count_by = CountBy::kIngredient;
  CHECK(f.On(records, D(2024, 1, 10)).items == 2);
}

TEST_CASE("the anticholinergic score sums each active ingredient once") {
  // Source: Boustani et al. 2008 ACB scale: amitriptyline 3 + oxybutynin 3 + codeine 1 = 7.
  // Codeine arrives through two products (codeine and co-codamol) and counts once.
  Fixture f;
  auto b = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
                 Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28),
                 Rx("codeine 30mg tablets", D(2024, 1, 1), 28, 28),
                 Rx("co-codamol 30mg/500mg tablets", D(2024, 1, 1), 100, 25)},
                D(2024, 1, 15));
  CHECK(b.items == 4);
  CHECK(b.acb == 7);
  REQUIRE(b.score_contributions.size() == 3);
  CHECK(b.score_contributions[2].ingredient == "codeine");
}

TEST_CASE("the Drug Burden Index is dose over dose plus the minimum daily dose") {
  // Source: Hilmer et al. 2007: D = delta gives 0.5; D = 10 x delta gives 10/11 = 0.9091.
  Fixture f;
  // Diazepam 5 mg tablets, 28 over 28 days: 5 mg/day = delta -> 0.5.
  auto half = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 28, 28)}, D(2024, 1, 10));
  CHECK(half.dbi == doctest::Approx(0.5));
  REQUIRE(half.dbi_contributions.size() == 1);
  CHECK(half.dbi_contributions[0].basis == DoseBasis::kQuantity);
  // 10 x delta: amitriptyline 25 mg x 4 a day = 100 mg, delta 10 -> 0.9091.
  auto high = f.On({Rx("amitriptyline 25mg tablets", D(2024, 1, 1), 112, 28, "four tablets daily")},
                   D(2024, 1, 10));
  CHECK(high.dbi == doctest::Approx(100.0 / 110.0).epsilon(1e-6));
  CHECK(high.dbi_contributions[0].basis == DoseBasis::kDosage);
}

TEST_CASE("the dose comes from the latest dispensing in the active episode") {
  Fixture f;
  auto b = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
                 Rx("amitriptyline 25mg tablets", D(2024, 1, 29), 28, 28)},
                D(2024, 2, 5));
  // 25 mg/day, delta 10: 25/35.
  CHECK(b.dbi == doctest::Approx(25.0 / 35.0));
  // Before the second dispensing the first one counts: 10/20.
  CHECK(f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
              Rx("amitriptyline 25mg tablets", D(2024, 1, 29), 28, 28)},
             D(2024, 1, 20)).dbi == doctest::Approx(0.5));
}

TEST_CASE("a refill due but not collected keeps the medicine active through its tail") {
  // Product specification: active on D while d' <= D <= e + t, t = min(grace, s).
  // 28 days from 1 Jan: supplied to 28 Jan, tail to 25 Feb (grace 30).
  Fixture f;
  const std::vector<DispensingRecord> records = {Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28)};
  const Burden late = f.On(records, D(2024, 2, 10));
  REQUIRE(late.items == 1);
  CHECK(late.active[0].in_tail);
  CHECK(late.active[0].supply_end == D(2024, 1, 28));
  CHECK(late.active[0].until == D(2024, 2, 25));
  CHECK(late.acb == 3);
  CHECK_FALSE(f.On(records, D(2024, 1, 28)).active[0].in_tail);
  CHECK(f.On(records, D(2024, 2, 26)).items == 0);
}

TEST_CASE("figures on a date do not change when later dispensings are loaded") {
  // Product specification, point in time: a figure for D depends only on records
  // dispensed on or before D.
  Fixture f;
  const std::vector<DispensingRecord> known = {
      Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28), Rx("codeine 30mg tablets", D(2024, 1, 3), 28, 28),
      Rx("diazepam 5mg tablets", D(2024, 1, 10), 28, 28)};
  std::vector<DispensingRecord> later = known;
  later.push_back(Rx("amitriptyline 25mg tablets", D(2024, 2, 8), 28, 28));
  later.push_back(Rx("codeine 30mg tablets", D(2024, 2, 2), 28, 28));
  later.push_back(Rx("oxybutynin 5mg tablets", D(2024, 2, 3), 28, 28));
  for (const bool carryover : {false, true}) {
    f.options.episodes.carryover = carryover;
    for (Date on = D(2023, 12, 30); on <= D(2024, 2, 1); on = on + 1) {
      CAPTURE(on.ToIso());
      const Burden a = f.On(known, on);
      const Burden b = f.On(later, on);
      CHECK(a.items == b.items);
      CHECK(a.acb == b.acb);
      CHECK(a.dbi == doctest::Approx(b.dbi));
      CHECK(a.rules.size() == b.rules.size());
      REQUIRE(a.active.size() == b.active.size());
      for (size_t i = 0; i < a.active.size(); ++i) {
        CHECK(a.active[i].since == b.active[i].since);
        CHECK(a.active[i].until == b.active[i].until);
        CHECK(a.active[i].in_tail == b.active[i].in_tail);
      }
    }
  }
}

TEST_CASE("doses of one ingredient taken together are summed for the Drug Burden Index") {
  // Amitriptyline 10 mg and 25 mg, both at night, both collected every month: 35 mg/day.
  // Hilmer et al. 2007: DBI = D / (D + delta); delta 10 mg (from memory): 35/45.
  Fixture f;
  auto b = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28, "one at night"),
                 Rx("amitriptyline 25mg tablets", D(2024, 1, 1), 28, 28, "one at night"),
                 Rx("amitriptyline 10mg tablets", D(2024, 1, 29), 28, 28, "one at night"),
                 Rx("amitriptyline 25mg tablets", D(2024, 1, 30), 28, 28, "one at night")},
                D(2024, 2, 10));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(35));
  CHECK(b.dbi_contributions[0].sources.size() == 2);
  CHECK(b.dbi == doctest::Approx(35.0 / 45.0));
  CHECK(DoseBasisMark(b.dbi_contributions[0]) == " (2 products summed)");
}

TEST_CASE("a switch of strength is not a combination: the old strength's tail adds no dose") {
  // 10 mg collected in January, then 25 mg from 26 February: on 5 March the 10 mg supply
  // is still in its tail, but it was not dispensed again since the 25 mg run began.
  Fixture f;
  auto b = f.On({Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28, "one at night"),
                 Rx("amitriptyline 10mg tablets", D(2024, 1, 29), 28, 28, "one at night"),
                 Rx("amitriptyline 25mg tablets", D(2024, 2, 26), 28, 28, "one at night")},
                D(2024, 3, 5));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(25));
  CHECK(b.dbi_contributions[0].sources.size() == 1);
}

TEST_CASE("a dose from an as-needed maximum is marked as such") {
  // "one or two four times a day when required": the stated maximum, 8 a day, is used
  // (product specification, units per day) and the DBI says so.
  Fixture f;
  auto b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 28, std::nullopt, "one or two four times a day when required")},
                D(2024, 1, 2));
  REQUIRE(b.dbi_contributions.size() == 1);
  CHECK(b.dbi_contributions[0].as_needed_max);
  CHECK(b.dbi_contributions[0].dose_mg_per_day == doctest::Approx(40));
  // "one or two": the 8 a day counts two at a time, the upper value of the range.
  CHECK(b.dbi_contributions[0].range_upper);
  CHECK(DoseBasisMark(b.dbi_contributions[0]) == " (as-needed maximum; upper value of a range)");
}

TEST_CASE("a sedative class member without a minimum dose is listed as incomplete, never a silent 0") {
  // Hilmer et al. 2007: the DBI counts drugs with sedative effects, opioids among them.
  Fixture f;
  f.tables.dbi.erase("diazepam");
  f.tables.dbi_classes = {"benzodiazepine"};
  const Burden b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 28, 28)}, D(2024, 1, 10));
  CHECK(b.dbi == 0);
  CHECK(b.dbi_incomplete == std::vector<std::string>{"diazepam"});
  CHECK(b.dbi_no_minimum == std::vector<std::string>{"diazepam"});
  // Outside the listed classes nothing is expected: oxybutynin is not a benzodiazepine.
  CHECK(f.On({Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28)}, D(2024, 1, 10)).dbi_incomplete.empty());
}

TEST_CASE("an ingredient with a minimum dose but no known strength is listed as incomplete") {
  Fixture f;
  auto b = f.On({Rx("diazepam tablets", D(2024, 1, 1), 28, 28)}, D(2024, 1, 10));
  CHECK(b.dbi == 0);
  REQUIRE(b.dbi_incomplete.size() == 1);
  CHECK(b.dbi_incomplete[0] == "diazepam");
}

TEST_CASE("a dose too large for a number is unknown: the ingredient is listed as incomplete") {
  // A quantity stored before the import's plausible bound (or any product of strength and
  // quantity past the largest double) gives an infinite daily dose: never a blank DBI.
  Fixture f;
  auto b = f.On({Rx("diazepam 5mg tablets", D(2024, 1, 1), 1e308, 28)}, D(2024, 1, 10));
  CHECK(b.dbi == 0);
  CHECK(std::isfinite(b.dbi));
  REQUIRE(b.dbi_incomplete.size() == 1);
  CHECK(b.dbi_incomplete[0] == "diazepam");
  CHECK(b.dbi_contributions.empty());
}

TEST_CASE("non-medicines never count and unmatched products are reported") {
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("foam dressing 10cm", D(2024, 1, 1), 10, 28),
                                           Rx("mystery tonic", D(2024, 1, 1), 1, 28),
                                           Rx("mystery tonic", D(2024, 1, 5), 1, 28)};
  const Timeline timeline = f.Build(records);
  CHECK(timeline.non_medicine_items == 1);
  REQUIRE(timeline.unmatched.size() == 1);
  CHECK(timeline.unmatched[0].ItemsBy(D(2024, 1, 10)) == 2);
  CHECK(timeline.unmatched[0].LastBy(D(2024, 1, 10)) == D(2024, 1, 5));
  // As known on Jan 3, one of them had been dispensed; before Jan 1, none.
  CHECK(timeline.unmatched[0].ItemsBy(D(2024, 1, 3)) == 1);
  CHECK(timeline.unmatched[0].LastBy(D(2024, 1, 3)) == D(2024, 1, 1));
  CHECK_FALSE(timeline.unmatched[0].LastBy(D(2023, 12, 31)).has_value());
  CHECK(EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80).items == 0);
}

TEST_CASE("a product recognised in part or from a close spelling counts its known ingredients and is listed") {
  Fixture f;
  ResolvedProduct partial = Product({{"codeine", 30.0, {}}});
  partial.match = MatchKind::kPartial;
  partial.unknown = {"frobazine"};
  f.products["frobazine and codeine 10mg/30mg tablets"] = partial;
  ResolvedProduct approximate = Product({{"oxybutynin", 5.0, {}}});
  approximate.match = MatchKind::kApproximate;
  approximate.spellings = {{"oxybutinin", "oxybutynin"}};
  f.products["oxybutinin 5mg tabs"] = approximate;
  const Timeline timeline = f.Build({Rx("frobazine and codeine 10mg/30mg tablets", D(2024, 1, 1), 28, 28),
                                     Rx("oxybutinin 5mg tabs", D(2024, 1, 2), 28, 28)});
  CHECK(timeline.unmatched.empty());
  REQUIRE(timeline.flagged.size() == 2);
  CHECK(timeline.flagged[0].product == "frobazine and codeine 10mg/30mg tablets");
  CHECK(timeline.flagged[0].match == MatchKind::kPartial);
  CHECK(timeline.flagged[0].detail == "not in the formulary: frobazine");
  CHECK(timeline.flagged[1].match == MatchKind::kApproximate);
  CHECK(timeline.flagged[1].detail == "\"oxybutinin\" read as oxybutynin");
  // Both count: codeine (ACB 1) and oxybutynin (ACB 3; Boustani et al. 2008).
  const Burden burden = EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80);
  CHECK(burden.items == 2);
  CHECK(burden.acb == 4);
}

TEST_CASE("dispenses whose status does not count are kept out") {
  Fixture f;
  auto record = Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28);
  record.status = "entered-in-error";
  const Timeline timeline = f.Build({record});
  CHECK(timeline.not_dispensed_items == 1);
  CHECK(timeline.medicines.empty());
}

TEST_CASE("with the lookback measure a medicine is active if dispensed in the window ending on D") {
  Fixture f;
  f.options.measure = Measure::kLookback;
  f.options.window_days = 84;
  std::vector<DispensingRecord> records = {Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28)};
  // Window of 84 days ending 2024-03-24 starts on 2024-01-01 (inclusive).
  CHECK(f.On(records, D(2024, 3, 24)).items == 1);
  CHECK(f.On(records, D(2024, 3, 25)).items == 0);
  CHECK(f.On(records, D(2023, 12, 31)).items == 0);
}

TEST_CASE("excluded routes and as-needed dispensings leave the count when asked") {
  Fixture f;
  std::vector<DispensingRecord> records = {
      Rx("ibuprofen 5% gel", D(2024, 1, 1), 100, 28),
      // 28 tablets at up to 8 a day (the stated maximum) last 4 days: 1 to 4 January.
      Rx("codeine 30mg tablets", D(2024, 1, 1), 28, std::nullopt, "one or two four times a day when required")};
  CHECK(f.On(records, D(2024, 1, 3)).items == 2);
  f.options.exclude_routes = {Route::kSkin};
  CHECK(f.On(records, D(2024, 1, 3)).items == 1);
  f.options.exclude_prn = true;
  CHECK(f.On(records, D(2024, 1, 3)).items == 0);
}

TEST_CASE("the ACE inhibitor, diuretic and NSAID rule fires only with all three active") {
  // Source: Lapi et al. BMJ 2013;346:e8525 (the triple combination and acute kidney injury).
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("ramipril 5mg capsules", D(2024, 1, 1), 28, 28),
                                           Rx("furosemide 40mg tablets", D(2024, 1, 1), 28, 28)};
  CHECK(f.On(records, D(2024, 1, 10)).rules.empty());
  records.push_back(Rx("ibuprofen 400mg tablets", D(2024, 1, 5), 21, 7));
  auto b = f.On(records, D(2024, 1, 10));
  REQUIRE(b.rules.size() == 1);
  CHECK(b.rules[0].rule->id == "aki-triple");
  CHECK(b.rules[0].medicines.size() == 3);
  // The 7-day NSAID course ends on 11 Jan; its tail is 7 days (min(grace, days)), so it
  // counts to 18 Jan and no longer on 19 Jan.
  CHECK(f.On(records, D(2024, 1, 18)).rules.size() == 1);
  CHECK(f.On(records, D(2024, 1, 19)).rules.empty());
}

TEST_CASE("rule matches worked out once serve every date, firing only with the medicines active then") {
  Fixture f;
  const std::vector<DispensingRecord> records = {
      Rx("ramipril 5mg capsules", D(2024, 1, 1), 28, 28), Rx("furosemide 40mg tablets", D(2024, 1, 1), 28, 28),
      Rx("ibuprofen 400mg tablets", D(2024, 1, 20), 28, 28)};
  const Timeline timeline = f.Build(records);
  const std::vector<bool> matches = MatchRuleRequirements(timeline, f.tables);
  size_t requirements = 0;
  for (const Rule& rule : f.tables.rules) requirements += rule.require.size();
  CHECK(matches.size() == timeline.medicines.size() * requirements);
  // 10 January: ibuprofen not yet dispensed; 25 January: all three are active.
  CHECK(EvaluateBurden(timeline, D(2024, 1, 10), f.tables, f.options, 80, &matches).rules.empty());
  const Burden later = EvaluateBurden(timeline, D(2024, 1, 25), f.tables, f.options, 80, &matches);
  REQUIRE(later.rules.size() == 1);
  CHECK(later.rules[0].rule->id == "aki-triple");
  CHECK(later.rules[0].medicines.size() == 3);
}

TEST_CASE("a requirement counts distinct medicines, so two NSAIDs fire the duplication rule") {
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("ibuprofen 400mg tablets", D(2024, 1, 1), 84, 28)};
  CHECK(f.On(records, D(2024, 1, 10)).rules.empty());
  records.push_back(Rx("naproxen 500mg tablets", D(2024, 1, 2), 56, 28));
  auto b = f.On(records, D(2024, 1, 10));
  REQUIRE(b.rules.size() == 1);
  CHECK(b.rules[0].rule->id == "two-nsaids");
}

TEST_CASE("a rule with an age limit fires only at that age and says when the age is unknown") {
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("codeine 30mg tablets", D(2024, 1, 1), 28, 28),
                                           Rx("diazepam 5mg tablets", D(2024, 1, 1), 28, 28)};
  CHECK(f.On(records, D(2024, 1, 10), 64).rules.empty());
  CHECK(f.On(records, D(2024, 1, 10), 65).rules.size() == 1);
  auto unknown = f.On(records, D(2024, 1, 10), std::nullopt);
  CHECK(unknown.rules.empty());
  CHECK(unknown.age_unknown_for_rules);
}

TEST_CASE("a scale-score requirement counts medicines with definite anticholinergic activity") {
  // Source: Boustani et al. 2008: a score of 3 is definite anticholinergic activity.
  Fixture f;
  std::vector<DispensingRecord> records = {Rx("amitriptyline 10mg tablets", D(2024, 1, 1), 28, 28),
                                           Rx("codeine 30mg tablets", D(2024, 1, 1), 28, 28)};
  CHECK(f.On(records, D(2024, 1, 10)).rules.empty());
  records.push_back(Rx("oxybutynin 5mg tablets", D(2024, 1, 1), 28, 28));
  auto b = f.On(records, D(2024, 1, 10));
  REQUIRE(b.rules.size() == 1);
  CHECK(b.rules[0].rule->id == "two-definite");
  CHECK(b.rules[0].medicines.size() == 2);
}

}  // TEST_SUITE

}  // namespace medload
