#include "medload/review/worklist_writer.h"

#include <doctest/doctest.h>

#include <sstream>

#include "medload/core/caution.h"

namespace medload {
namespace {

// An invented list: three patients meet the criterion, two are shown (a limit of two).
Worklist Sample() {
  Worklist worklist;
  worklist.on = Date::FromCivil(2026, 12, 31);
  worklist.criteria = {ParseCriterion("items=10").value()};
  worklist.scale = "acb";
  worklist.patients_considered = 40;
  worklist.patients_meeting = 3;
  for (const char* id : {"P1", "P2"}) {
    WorklistEntry entry;
    entry.rank = static_cast<int>(worklist.patients.size() + 1);
    entry.patient = id;
    entry.practice = "ZZ01";
    entry.items = 11;
    entry.reasons = {"11 medicines"};
    worklist.patients.push_back(entry);
  }
  return worklist;
}

bool Has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

std::string Text(const Worklist& w) {
  std::ostringstream out;
  WriteWorklistText(out, w);
  return out.str();
}
std::string Csv(const Worklist& w) {
  std::ostringstream out;
  WriteWorklistCsv(out, w);
  return out.str();
}
std::string Html(const Worklist& w) {
  std::ostringstream out;
  WriteWorklistHtml(out, w, "Review worklist");
  return out.str();
}

}  // namespace

TEST_SUITE("review/worklist_writer") {

TEST_CASE("every format says the rank is a sorting order and how many meeting patients are not shown") {
  const Worklist w = Sample();
  const std::string hidden = "1 more patient(s) who meet the criteria are not shown: the list stops at the first 2";
  CHECK(Has(Text(w), "Note: " + std::string(kRankIsSortingOrder)));
  CHECK(Has(Text(w), hidden));
  CHECK(Has(Csv(w), "\"# note: " + std::string(kRankIsSortingOrder) + "\"\n"));
  CHECK(Has(Csv(w), "\"# note: " + hidden + "\"\n"));
  CHECK(Has(Html(w), "not a clinical priority"));
  CHECK(Has(Html(w), hidden));
  const nlohmann::json json = WorklistJson(w);
  CHECK(json["patients_not_shown"] == 1);
  CHECK(json["notes"].size() == 2);
  CHECK(json["notes"][0] == kRankIsSortingOrder);
  // Nothing cut: no such note.
  Worklist whole = Sample();
  whole.patients_meeting = 2;
  CHECK_FALSE(Has(Text(whole), "not shown"));
  CHECK(WorklistJson(whole)["patients_not_shown"] == 0);
}

TEST_CASE("the worklist CSV gives the census date in a comment line after the caution") {
  const std::string csv = Csv(Sample());
  const size_t first_end = csv.find('\n');
  REQUIRE(first_end != std::string::npos);
  CHECK(csv.rfind("\"# CAUTION", 0) == 0);
  CHECK(csv.compare(first_end + 1, 28, "\"# census date: 2026-12-31\"\n") == 0);
  // Comment lines come before the header; the longitudinal columns follow the earlier ones.
  CHECK(Has(csv, "\nrank,patient,practice,age,items,acb,scale,dbi,rules,criteria_met,new,last_reviewed,reasons,"
                 "warnings,falls,tsdd,pdc_below_80,before_on,before_items,before_acb,before_dbi,before_falls,"
                 "before_tsdd,started,stopped\n"));
  CHECK(csv.find("\"# note:") < csv.find("\nrank,"));
}

TEST_CASE("the caller's warnings go into every format and the JSON warnings array") {
  Worklist w = Sample();
  w.notes = {"the census date 2026-12-31 is 61 days after the latest dispensing loaded (2026-10-31)"};
  CHECK(Has(Text(w), "Note: the census date 2026-12-31 is 61 days after"));
  CHECK(Has(Csv(w), "\"# note: the census date 2026-12-31 is 61 days after"));
  CHECK(Has(Html(w), "the census date 2026-12-31 is 61 days after"));
  const nlohmann::json json = WorklistJson(w);
  REQUIRE(json["warnings"].size() == 1);
  CHECK(json["warnings"][0] == w.notes[0]);
  CHECK(json["notes"][0] == w.notes[0]);
  // The fixed keys stay.
  for (const char* key : {"on", "criteria", "patients", "caution"}) CHECK(json.contains(key));
}

TEST_CASE("the summary counts patients of unknown age left out by the minimum age in every format") {
  Worklist w = Sample();
  w.excluded_age_unknown = 4;
  w.excluded_age_unknown_meeting = 1;
  const std::string part = "4 left out by --age-min because their age is unknown (1 of them meet a criterion)";
  CHECK(Has(Text(w), part));
  CHECK(Has(Csv(w), "\"# summary: 3 of 40 registered patients meet items>=10 on 2026-12-31"));
  CHECK(Has(Csv(w), part));
  CHECK(Has(Html(w), part));
  CHECK(WorklistJson(w)["excluded_age_unknown"] == 4);
  CHECK(WorklistJson(w)["excluded_age_unknown_meeting"] == 1);
  CHECK(Has(WorklistJson(w)["summary"].get<std::string>(), part));
}

TEST_CASE("every format gives each patient's last completed review, blank when there is none") {
  Worklist w = Sample();
  w.patients[0].last_reviewed = Date::FromCivil(2026, 8, 14);
  const std::string text = Text(w);
  CHECK(Has(text, "TSDD  last review\n"));
  CHECK(Has(text, "   0  2026-08-14\n"));
  CHECK(Has(text, "   0  -\n"));
  CHECK(Has(Csv(w), "\n1,P1,ZZ01,,11,0,acb,0,,,no,2026-08-14,11 medicines,,0,0,"));
  CHECK(Has(Csv(w), "\n2,P2,ZZ01,,11,0,acb,0,,,no,,11 medicines,,0,0,"));
  const nlohmann::json json = WorklistJson(w);
  CHECK(json["patients"][0]["last_reviewed"] == "2026-08-14");
  CHECK(json["patients"][1]["last_reviewed"].is_null());
  CHECK(Has(Html(w), "<th scope=\"col\">last review</th>"));
  CHECK(Has(Html(w), "<td>2026-08-14</td>"));
}

TEST_CASE("the report names its minimum age setting as the config key in the summary") {
  Worklist w = Sample();
  w.excluded_age_unknown = 2;
  w.age_min_setting = "age_min";
  CHECK(Has(Text(w), "2 left out by age_min because their age is unknown (0 of them meet a criterion)"));
}

TEST_CASE("a meeting count below the report's threshold is withheld from the summary and notes") {
  Worklist w = Sample();
  w.suppress_below = 5;  // 3 meet: withheld
  const std::string text = Text(w);
  CHECK(Has(text, "fewer than 5 of 40 registered patients meet"));
  CHECK_FALSE(Has(text, "3 of 40"));
  CHECK_FALSE(Has(text, "1 more patient"));
  CHECK(Has(text, "more patients meet the criteria than are shown"));
  CHECK(Has(text, "(below 5) are withheld"));
  w.suppress_below = 3;  // 3 is not below 3: shown
  CHECK(Has(Text(w), "3 of 40 registered patients meet"));
}

TEST_CASE("the score is labelled with the chosen scale; JSON and CSV keep the acb key and name the scale") {
  Worklist w = Sample();
  w.scale = "ars";
  w.patients[0].acb = 4;
  // Text and HTML label the column with the scale's name.
  CHECK(Has(Text(w), "rank  patient  practice  age  items  ARS  DBI  rules"));
  CHECK_FALSE(Has(Text(w), " acb "));
  CHECK(Has(Html(w), "<th scope=\"col\">ARS</th>"));
  // JSON: the spec's required "acb" key, and the scale's name beside it.
  const nlohmann::json json = WorklistJson(w);
  CHECK(json["scale"] == "ars");
  CHECK(json["patients"][0]["acb"] == 4);
  // CSV: the acb column keeps its key, the scale column says which scale it holds.
  CHECK(Has(Csv(w), "\n1,P1,ZZ01,,11,4,ars,0,"));
}

TEST_CASE("every worklist format carries the caution") {
  const Worklist w = Sample();
  CHECK(Has(Text(w), "CAUTION: this output supports clinical judgement"));
  CHECK(Csv(w).rfind("\"# " + std::string(kCaution) + "\"\n", 0) == 0);
  CHECK(WorklistJson(w).at("caution") == std::string(kCaution));
  const std::string html = Html(w);
  CHECK(Has(html, "class=\"caution\""));
  CHECK(html.find("class=\"caution\"") < html.find("<table"));
}

}  // TEST_SUITE

}  // namespace medload
