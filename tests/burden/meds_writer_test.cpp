// `meds` output about FHIR readings: dispensings whose status does not count, and an
// amount a day read in another unit than the quantity's.
#include "medload/burden/meds_writer.h"

#include <doctest/doctest.h>

#include <sstream>

#include "medload/burden/run_context.h"

namespace medload {
namespace {

DispensingRecord Record(const char* product, double quantity, const char* unit) {
  DispensingRecord record;
  record.record_id = product;
  record.patient_id = "pt-1";
  record.dispensed_on = *ParseDate("2024-03-01");
  record.product = product;
  record.quantity = quantity;
  record.unit = unit;
  record.status = "completed";
  return record;
}

struct Fixture {
  Fixture() {
    Result<RunContext> opened = RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions(), nullptr);
    REQUIRE(opened.ok());
    analysis.emplace(std::move(opened.value()));
    DispensingRecord gabapentin = Record("Gabapentin 600mg tablets", 90, "tablet");
    gabapentin.structured_units_per_day = 1800;  // 600 mg every 8 hours, from FHIR
    gabapentin.structured_unit = "mg";
    DispensingRecord morphine = Record("Morphine sulfate 10mg/5ml oral solution", 100, "mL");
    morphine.structured_units_per_day = 2;  // twice a day, no dose stated
    morphine.structured_unit = "administration";
    records = {gabapentin, morphine};
    timeline = analysis->BuildTimeline(records);
    burden = analysis->Evaluate(timeline, *ParseDate("2024-03-10"), 80);
    model.patient = "pt-1";
    model.registered = true;
    model.timeline = &timeline;
    model.burden = &burden;
    model.tables = &analysis->tables();
    model.records = records;
    model.not_counted = {{"stopped", 1}, {"unknown", 2}};
  }
  std::optional<RunContext> analysis;
  std::vector<DispensingRecord> records;
  Timeline timeline;
  Burden burden;
  MedsModel model;
};

const char* const kNotCounted =
    "3 dispensing(s) up to 2024-03-10 are stored but not counted here because of their status (stopped 1, "
    "unknown 2); only completed dispensings count: check them with the dispensing record";

}  // namespace

TEST_SUITE("burden/meds_writer") {

TEST_CASE("meds says in every format how many dispensings do not count and with which statuses") {
  Fixture f;
  CHECK(NotCountedNote(f.model) == kNotCounted);
  const nlohmann::json json = MedsJson(f.model);
  CHECK(json.at("not_counted") == nlohmann::json({{"stopped", 1}, {"unknown", 2}}));
  const std::string sentence = std::string("3") + (kNotCounted + 1) + ".";
  CHECK(json.at("warnings").back() == sentence);
  std::ostringstream text, csv, html;
  WriteMedsText(text, f.model);
  WriteMedsCsv(csv, f.model);
  WriteMedsHtml(html, f.model);
  CHECK(text.str().find("- " + sentence + "\n") != std::string::npos);
  CHECK(csv.str().find(std::string("\n\"# note: ") + kNotCounted + "\"\n") != std::string::npos);
  CHECK(html.str().find("<li>" + sentence + "</li>") != std::string::npos);
  f.model.not_counted.clear();
  CHECK(NotCountedNote(f.model).empty());
  CHECK(MedsJson(f.model).at("not_counted").empty());
}

TEST_CASE("a dose read in mg is shown with its unit and in tablets, and an unusable frequency says why") {
  Fixture f;
  const nlohmann::json json = MedsJson(f.model);
  const nlohmann::json& medicines = json.at("medicines");
  REQUIRE(medicines.size() == 2);
  const nlohmann::json& gabapentin = medicines.at(0);
  CHECK(gabapentin.at("name") == "gabapentin");
  CHECK(gabapentin.at("units_per_day") == 3);
  CHECK(gabapentin.at("supply_days") == 30);
  CHECK(gabapentin.at("dosage_read") == "full, 1800 mg per day = 3 tablet per day");
  const nlohmann::json& morphine = medicines.at(1);
  CHECK(morphine.at("units_per_day").is_null());
  CHECK(morphine.at("supply_rule") == "default");
  CHECK(morphine.at("dosage_read") ==
        "partial, 2 times a day, no dose stated (not used: the dosage gives a frequency without a dose, and the "
        "quantity is not counted in tablets, capsules or other single units (it is in \"mL\"))");
  bool warned = false;
  for (const auto& warning : json.at("warnings")) {
    warned = warned || warning.get<std::string>().rfind("The days of supply of morphine were assumed (28 days): the "
                                                        "record gave no days supply and the dosage gave no amount a "
                                                        "day in the quantity's unit (",
                                                        0) == 0;
  }
  CHECK(warned);
}

TEST_CASE("meds text and HTML show each medicine's product, quantity and dosage as dispensed, warnings first") {
  Fixture f;
  f.records[0].dosage = "one tablet three times a day";
  f.timeline = f.analysis->BuildTimeline(f.records);
  f.burden = f.analysis->Evaluate(f.timeline, *ParseDate("2024-03-10"), 80);
  f.model.records = f.records;
  std::ostringstream text, html;
  WriteMedsText(text, f.model);
  WriteMedsHtml(html, f.model);
  const std::string t = text.str();
  CHECK(t.find("\nAs dispensed (the latest dispensing of each):\n"
               "- gabapentin: Gabapentin 600mg tablets, 90 tablet; \"one tablet three times a day\"\n"
               "- morphine: Morphine sulfate 10mg/5ml oral solution, 100 mL; no dosage text\n") != std::string::npos);
  // The warnings come before the table, so that they are read before the figures.
  const size_t check_first = t.find("\nCheck first:\n");
  REQUIRE(check_first != std::string::npos);
  CHECK(check_first < t.find("medicine "));
  const std::string h = html.str();
  CHECK(h.find("<th scope=\"col\">product as dispensed</th><th scope=\"col\">dosage as written</th>") !=
        std::string::npos);
  CHECK(h.find("<td>Gabapentin 600mg tablets (90 tablet)</td><td>one tablet three times a day</td>") !=
        std::string::npos);
  CHECK(h.find("<h2>Check first</h2>") < h.find("<table>"));
}

}  // TEST_SUITE

}  // namespace medload
