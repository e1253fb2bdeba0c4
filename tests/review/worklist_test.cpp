#include "medload/review/worklist.h"

#include <doctest/doctest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>

#include <nlohmann/json.hpp>

#include "medload/store/importer.h"
#include "medload/store/store.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

void Import(Store& store, InputKind kind, const std::string& csv) {
  std::istringstream in(csv);
  auto summary = ImportStream(store, kind, in, "test.csv", ImportOptions{});
  REQUIRE(summary.ok());
  REQUIRE(summary->rejected == 0);
}

// Four invented patients at two invented practices, with 28-day supplies on 2024-01-01.
struct Population {
  Store store = std::move(Store::Open(":memory:").value());
  RunContext analysis = std::move(RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, nullptr).value());

  Population() {
    Import(store, InputKind::kPatients,
           "patient_id,birth_date,sex,practice,registered_from,registered_to\n"
           "A,1940-05-01,female,PA,,\n"
           "B,1950,male,PA,,\n"
           "C,1938-02-02,female,PB,,\n"
           "E,1930-01-01,male,PB,,2023-12-31\n");
    std::string rows = "patient_id,dispensed_on,product,quantity,days_supply\n";
    for (const char* product : {"Amitriptyline 10mg tablets", "Oxybutynin 5mg tablets", "Codeine 30mg tablets"}) {
      rows += std::string("A,2024-01-01,") + product + ",28,28\n";
    }
    for (const char* product : {"Ramipril 5mg capsules", "Furosemide 40mg tablets", "Ibuprofen 400mg tablets"}) {
      rows += std::string("B,2024-01-01,") + product + ",28,28\n";
    }
    rows += "C,2024-01-01,Amlodipine 5mg tablets,28,28\n";
    rows += "E,2024-01-01,Oxybutynin 5mg tablets,28,28\n";
    Import(store, InputKind::kDispensing, rows);
  }

  Worklist Build(WorklistOptions options) {
    options.remember_run = false;
    auto worklist = BuildWorklist(store, analysis, options);
    REQUIRE(worklist.ok());
    return std::move(worklist).value();
  }
};

WorklistOptions On(Date on, std::vector<Criterion> criteria) {
  WorklistOptions options;
  options.on = on;
  options.criteria = std::move(criteria);
  return options;
}

Criterion AtLeast(const char* text) { return ParseCriterion(text).value(); }

}  // namespace

TEST_SUITE("review/worklist") {

TEST_CASE("the review order is rules, then acb, items, dbi, older age, then identifier") {
  auto entry = [](std::string id, int rules, int acb, int items, double dbi, std::optional<int> age) {
    WorklistEntry e;
    e.patient = std::move(id);
    e.rule_ids.assign(static_cast<size_t>(rules), "r");
    e.acb = acb;
    e.items = items;
    e.dbi = dbi;
    e.age = age;
    return e;
  };
  std::vector<WorklistEntry> list = {entry("z", 0, 9, 20, 3, 99), entry("y", 1, 0, 1, 0, 20),
                                     entry("x", 0, 9, 21, 0, 50), entry("w", 0, 9, 20, 3, 100),
                                     entry("v", 0, 9, 20, 3, std::nullopt), entry("u", 0, 9, 20, 3, 99)};
  std::sort(list.begin(), list.end(), RanksBefore);
  std::vector<std::string> order;
  for (const auto& e : list) order.push_back(e.patient);
  CHECK(order == std::vector<std::string>{"y", "x", "w", "u", "z", "v"});
}

TEST_CASE("a patient meeting any criterion is listed with readable reasons") {
  Population p;
  auto list = p.Build(On(D(2024, 1, 10), {AtLeast("acb=3"), RuleCriterion("aki-triple")}));
  REQUIRE(list.patients.size() == 2);
  // Each fires one rule (A: two definite anticholinergics; B: ACE inhibitor, diuretic and
  // NSAID), so A's higher score ranks first.
  CHECK(list.patients[0].patient == "A");
  CHECK(list.patients[0].rank == 1);
  CHECK(list.patients[0].criteria_met == std::vector<std::string>{"acb>=3"});
  // Source: Boustani et al. 2008 (ACB): amitriptyline 3, oxybutynin 3, codeine 1.
  CHECK(list.patients[0].acb == 7);
  REQUIRE(list.patients[0].reasons.size() >= 2);
  CHECK(list.patients[0].reasons[0] == "3 medicines");
  CHECK(list.patients[0].reasons[1] == "ACB 7: amitriptyline 3, oxybutynin 3, codeine 1");
  CHECK(list.patients[1].patient == "B");
  CHECK(list.patients[1].criteria_met == std::vector<std::string>{"rule:aki-triple"});
  CHECK(list.patients[1].rule_ids == std::vector<std::string>{"aki-triple"});
  // E left the register before the date and is not considered.
  CHECK(list.patients_considered == 3);
}

TEST_CASE("practice, age and limit filters narrow the list") {
  Population p;
  auto options = On(D(2024, 1, 10), {AtLeast("items=1")});
  CHECK(p.Build(options).patients.size() == 3);
  options.practices = {"PB"};
  CHECK(p.Build(options).patients.size() == 1);
  options.practices.clear();
  options.age_min = 80;  // A is 83, B 73 (born 1950: 1 July), C 85
  CHECK(p.Build(options).patients.size() == 2);
  options.limit = 1;
  auto limited = p.Build(options);
  CHECK(limited.patients.size() == 1);
  CHECK(limited.patients_meeting == 2);
}

TEST_CASE("patients reviewed within the given days are left out") {
  Population p;
  Import(p.store, InputKind::kReviews, "patient_id,reviewed_on\nA,2023-12-20\n");
  auto options = On(D(2024, 1, 10), {AtLeast("acb=3")});
  options.reviewed_within_days = 21;  // 2023-12-21 .. 2024-01-10: the review is outside
  CHECK(p.Build(options).patients.size() == 1);
  options.reviewed_within_days = 22;  // 2023-12-20 .. 2024-01-10: inside
  auto list = p.Build(options);
  CHECK(list.patients.empty());
  CHECK(list.excluded_recent_review == 1);
}

TEST_CASE("patients are marked new against the previous run with the same criteria") {
  Population p;
  // The first run has nothing to compare with: nobody is new.
  auto first = BuildWorklist(p.store, p.analysis, On(D(2024, 1, 2), {AtLeast("items=3")}));
  REQUIRE(first.ok());
  CHECK_FALSE(first->has_previous_run);
  REQUIRE(first->patients.size() == 2);
  CHECK_FALSE(first->patients[0].is_new);
  // A later run with the same criteria: the same two patients, not new.
  auto second = BuildWorklist(p.store, p.analysis, On(D(2024, 1, 5), {AtLeast("items=3")}));
  REQUIRE(second.ok());
  CHECK(second->has_previous_run);
  for (const auto& e : second->patients) CHECK_FALSE(e.is_new);
  // Other criteria are another series; widening to items>=1 after an earlier run of
  // items>=1 on an empty day marks everyone new.
  auto empty = BuildWorklist(p.store, p.analysis, On(D(2023, 12, 1), {AtLeast("items=1")}));
  REQUIRE(empty.ok());
  CHECK(empty->patients.empty());
  auto wide = BuildWorklist(p.store, p.analysis, On(D(2024, 1, 5), {AtLeast("items=1")}));
  REQUIRE(wide.ok());
  REQUIRE(wide->patients.size() == 3);
  for (const auto& e : wide->patients) CHECK(e.is_new);
}

TEST_CASE("a row warns of recent unmatched products, unknown doses and an unknown age") {
  Population p;
  Import(p.store, InputKind::kPatients, "patient_id,birth_date,sex,practice,registered_from,registered_to\nF,,female,PA,,\n");
  Import(p.store, InputKind::kDispensing,
         "patient_id,dispensed_on,product,quantity,days_supply\n"
         "F,2024-01-02,Mystery tonic 200ml,1,28\n"
         "F,2024-01-03,Diazepam tablets,28,28\n"
         "F,2024-01-03,Codeine 30mg tablets,28,28\n");
  // F's two medicines fire no bundled rule with an age limit: a copy of the formulary
  // adds one that they would fire, so that a patient of unknown age has a rule that
  // cannot be judged.
  TempFolder temp;
  const std::filesystem::path formulary = temp.File("formulary");
  std::filesystem::copy(MEDLOAD_SOURCE_FORMULARY, formulary, std::filesystem::copy_options::recursive);
  std::ifstream rules_in(formulary / "rules.json");
  nlohmann::json rules = nlohmann::json::parse(rules_in);
  rules_in.close();
  rules["rules"].push_back({{"id", "test-older-opioid"}, {"title", "Opioid at 65 or over"},
                            {"explanation", "A test rule."}, {"source", "test"}, {"age_min", 65},
                            {"require", {{{"classes", {"opioid"}}, {"at_least", 1}}}}});
  std::ofstream(formulary / "rules.json") << rules.dump();
  auto aged = RunContext::Open(formulary.string(), MeasureOptions{}, nullptr);
  REQUIRE(aged.ok());
  WorklistOptions options = On(D(2024, 1, 10), {AtLeast("items=2")});
  options.remember_run = false;
  auto list = BuildWorklist(p.store, *aged, options);
  REQUIRE(list.ok());
  const auto f = std::find_if(list->patients.begin(), list->patients.end(), [](const auto& e) { return e.patient == "F"; });
  REQUIRE(f != list->patients.end());
  // 2024-01-10 is within the first days of the practices' data (from 2024-01-01): every
  // row says so.
  CHECK(f->warnings == std::vector<std::string>{"1 recent product(s) not recognised", "dose unknown: diazepam",
                                                "age unknown: age-limited rules not checked",
                                                "practice data short-history"});
  // A has only recognised products with strengths, and a known age: only the data note.
  REQUIRE(list->patients.front().patient == "A");
  CHECK(list->patients.front().warnings == std::vector<std::string>{"practice data short-history"});
  // With the bundled rules F's age leaves no rule unjudged that could have fired.
  auto bundled = p.Build(On(D(2024, 1, 10), {AtLeast("items=2")}));
  for (const auto& e : bundled.patients) {
    if (e.patient == "F") CHECK(e.warnings.size() == 3);
  }
  // An unmatched product dispensed longer ago than the longest supply is not recent.
  Import(p.store, InputKind::kDispensing,
         "patient_id,dispensed_on,product,quantity,days_supply\nF,2024-09-01,Ramipril 5mg capsules,28,28\n");
  auto later = p.Build(On(D(2024, 9, 10), {AtLeast("items=1")}));
  REQUIRE(later.patients.size() == 1);
  CHECK(later.patients[0].patient == "F");
  // Nothing unrecognised is recent; the census date is after the latest dispensing.
  CHECK(later.patients[0].warnings == std::vector<std::string>{"practice data beyond-data"});
  CHECK(later.practice_data.at("PA") == DataState::kBeyondData);
}

TEST_CASE("a row warns of recent products recognised only in part or read from a close spelling") {
  Population p;
  Import(p.store, InputKind::kDispensing,
         "patient_id,dispensed_on,product,quantity,days_supply\n"
         "G,2024-01-02,Frobazine 10mg and paracetamol 500mg tablets,28,28\n"
         "G,2024-01-03,Oxybutinin 5mg tabs,28,28\n"
         "G,2024-01-03,Mirtazepine 15mg tabs,28,28\n");
  const Worklist list = p.Build(On(D(2024, 1, 10), {AtLeast("items=3")}));
  const auto g = std::find_if(list.patients.begin(), list.patients.end(), [](const auto& e) { return e.patient == "G"; });
  REQUIRE(g != list.patients.end());
  CHECK(g->items == 3);
  // 2024-01-10 is within the first days of the practice's data: the row says that too.
  CHECK(g->warnings == std::vector<std::string>{"1 recent product(s) recognised only in part",
                                                "2 recent product(s) read from a close spelling",
                                                "practice data short-history"});
}

TEST_CASE("a rule for older people applies from 65 in completed years, a birth year alone read as 1 July") {
  // Source: product specification section 5 ("Age on D"; Beers and STOPP apply from 65).
  // Y was born in 1959 (year only: 1 July 1959), Z on 2 July 1959.
  Population p;
  Import(p.store, InputKind::kPatients,
         "patient_id,birth_date,sex,practice,registered_from,registered_to\nY,1959,female,PA,,\n"
         "Z,1959-07-02,male,PA,,\n");
  std::string rows = "patient_id,dispensed_on,product,quantity,days_supply\n";
  for (const char* patient : {"Y", "Z"}) {
    for (const char* product : {"Codeine phosphate 30mg tablets", "Sertraline 50mg tablets", "Pregabalin 75mg capsules"}) {
      rows += std::string(patient) + ",2024-06-20," + product + ",28,28\n";
    }
  }
  Import(p.store, InputKind::kDispensing, rows);
  auto met = [&](Date on) {
    std::vector<std::string> patients;
    for (const WorklistEntry& e : p.Build(On(on, {AtLeast("rule:cns-active-3")})).patients) {
      if (e.patient == "Y" || e.patient == "Z") patients.push_back(e.patient + " " + std::to_string(*e.age));
    }
    return patients;
  };
  CHECK(met(D(2024, 6, 30)).empty());
  CHECK(met(D(2024, 7, 1)) == std::vector<std::string>{"Y 65"});
  CHECK(met(D(2024, 7, 2)) == std::vector<std::string>{"Y 65", "Z 65"});
}

TEST_CASE("patients of unknown age left out by the minimum age are counted") {
  Population p;
  Import(p.store, InputKind::kPatients,
         "patient_id,birth_date,sex,practice,registered_from,registered_to\nF,,female,PA,,\nG,,male,PB,,\n");
  Import(p.store, InputKind::kDispensing,
         "patient_id,dispensed_on,product,quantity,days_supply\nF,2024-01-03,Ramipril 5mg capsules,28,28\n");
  auto options = On(D(2024, 1, 10), {AtLeast("items=1")});
  auto all_ages = p.Build(options);
  CHECK(all_ages.excluded_age_unknown == 0);
  CHECK(all_ages.patients_considered == 5);
  options.age_min = 80;
  auto list = p.Build(options);
  CHECK(list.excluded_age_unknown == 2);          // F and G
  CHECK(list.excluded_age_unknown_meeting == 1);  // only F has a medicine
  CHECK(list.patients_considered == 2);           // A and C; B is too young
  options.practices = {"PB"};
  CHECK(p.Build(options).excluded_age_unknown == 1);
}

TEST_CASE("a worklist without criteria or with an unknown rule is refused") {
  Population p;
  auto none = BuildWorklist(p.store, p.analysis, On(D(2024, 1, 10), {}));
  REQUIRE_FALSE(none.ok());
  CHECK(none.status().code() == StatusCode::kUsage);
  CHECK(none.status().message() == "a worklist needs at least one criterion (items>=N, acb>=N, dbi>=X or rule:ID)");
  auto unknown = BuildWorklist(p.store, p.analysis, On(D(2024, 1, 10), {RuleCriterion("no-such-rule")}));
  REQUIRE_FALSE(unknown.ok());
  CHECK(unknown.status().message() ==
        "rule \"no-such-rule\" is not in the formulary's rules.json; 'medload formulary rules' lists them");
}

}  // TEST_SUITE

}  // namespace medload
