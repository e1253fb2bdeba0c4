#include "store/packed_history.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

namespace medload {
namespace {

DispensingRecord Record(std::string record_id, int days, std::string product, std::string dosage) {
  DispensingRecord record;
  record.record_id = std::move(record_id);
  record.patient_id = "P1";
  record.practice = "XA1";
  record.dispensed_on = Date::FromDays(days);
  record.product = std::move(product);
  record.quantity = 28;
  record.unit = "tablet";
  record.dosage = std::move(dosage);
  return record;
}

// Every field, compared one by one (the record type has no comparison of its own).
void CheckSame(const DispensingRecord& a, const DispensingRecord& b) {
  CHECK(a.record_id == b.record_id);
  CHECK(a.patient_id == b.patient_id);
  CHECK(a.practice == b.practice);
  CHECK(a.dispensed_on == b.dispensed_on);
  CHECK(a.product == b.product);
  CHECK(a.code == b.code);
  CHECK(a.code_system == b.code_system);
  CHECK(a.quantity == b.quantity);
  CHECK(a.unit == b.unit);
  CHECK(a.days_supply == b.days_supply);
  CHECK(a.dosage == b.dosage);
  CHECK(a.structured_units_per_day == b.structured_units_per_day);
  CHECK(a.structured_as_needed == b.structured_as_needed);
  CHECK(a.structured_unit == b.structured_unit);
  CHECK(a.status == b.status);
}

std::vector<DispensingRecord> Varied() {
  std::vector<DispensingRecord> records;
  records.push_back(Record("d1", 19000, "Amlodipine 5mg tablets", "one daily"));
  records.push_back(Record("d2", 19028, "Amlodipine 5mg tablets", "one daily"));
  DispensingRecord coded = Record("", -400, "", "");
  coded.code = "C08CA01";
  coded.code_system = "ATC";
  coded.quantity = 0.5;
  coded.unit = "";
  coded.days_supply = 90;
  coded.status = "completed";
  records.push_back(coded);
  DispensingRecord structured = Record("d4", 19100, "Morfina 10 mg/5 ml solución oral", "");
  structured.structured_units_per_day = 7.5;
  structured.structured_unit = "mg";
  structured.structured_as_needed = true;
  structured.quantity = 300;
  structured.unit = "ml";
  records.push_back(structured);
  DispensingRecord as_needed = Record("d5", 19101, "Paracetamol 500mg tablets", "");
  as_needed.structured_as_needed = true;  // a PRN flag without a dose
  records.push_back(as_needed);
  records.push_back(Record(std::string(300, 'r'), 19200, std::string(5000, 'p'), "x"));
  return records;
}

}  // namespace

TEST_SUITE("store/packed_history") {

TEST_CASE("a packed history unpacks to the same records, each with the patient's id") {
  const std::vector<DispensingRecord> records = Varied();
  const std::string packed = PackHistory(records);
  std::vector<DispensingRecord> out;
  std::vector<DispensingRecord> spare;
  REQUIRE(UnpackHistory(packed, "P1", out, spare).ok());
  REQUIRE(out.size() == records.size());
  for (size_t i = 0; i < records.size(); ++i) {
    CAPTURE(i);
    CheckSame(out[i], records[i]);
  }
  CHECK(spare.empty());
}

TEST_CASE("strings a history repeats are packed once") {
  std::vector<DispensingRecord> records;
  const std::string product = "Sertraline 50mg tablets, film-coated, a long description";
  for (int i = 0; i < 40; ++i) records.push_back(Record("r" + std::to_string(i), 19000 + 28 * i, product, "one daily"));
  const std::string packed = PackHistory(records);
  size_t copies = 0;
  for (size_t at = packed.find(product); at != std::string::npos; at = packed.find(product, at + 1)) ++copies;
  CHECK(copies == 1);
  CHECK(packed.size() < 40 * product.size());
}

TEST_CASE("unpacking reuses records: a shorter history moves the rest aside, a longer takes them back") {
  const std::vector<DispensingRecord> records = Varied();
  std::vector<DispensingRecord> out;
  std::vector<DispensingRecord> spare;
  REQUIRE(UnpackHistory(PackHistory(records), "P1", out, spare).ok());
  const std::vector<DispensingRecord> two(records.begin(), records.begin() + 2);
  REQUIRE(UnpackHistory(PackHistory(two), "P2", out, spare).ok());
  REQUIRE(out.size() == 2);
  CHECK(spare.size() == records.size() - 2);
  CHECK(out[1].patient_id == "P2");
  CHECK(out[1].record_id == "d2");
  REQUIRE(UnpackHistory(PackHistory(records), "P1", out, spare).ok());
  CHECK(out.size() == records.size());
  CHECK(spare.empty());
  for (size_t i = 0; i < records.size(); ++i) CheckSame(out[i], records[i]);
  REQUIRE(UnpackHistory(PackHistory(std::span<const DispensingRecord>()), "P3", out, spare).ok());
  CHECK(out.empty());
  CHECK(spare.size() == records.size());
}

TEST_CASE("a damaged packed history is an error naming the patient, never a crash") {
  const std::string packed = PackHistory(Varied());
  const std::string message =
      "store: the packed history of patient \"P9\" is damaged; delete the store's"
      " packed_histories_state row to have every history packed again from the dispensings";
  std::vector<DispensingRecord> out;
  std::vector<DispensingRecord> spare;
  // Every cut short of the whole fails, as do a trailing byte and another layout.
  for (size_t length = 0; length < packed.size(); ++length) {
    CAPTURE(length);
    Status status = UnpackHistory(std::string_view(packed).substr(0, length), "P9", out, spare);
    REQUIRE_FALSE(status.ok());
    CHECK(status.message() == message);
  }
  CHECK(UnpackHistory(packed + '\0', "P9", out, spare).message() == message);
  std::string other_layout = packed;
  other_layout[0] = 1;  // the layout before the structured dose's unit was kept
  CHECK(UnpackHistory(other_layout, "P9", out, spare).message() == message);
  other_layout[0] = 3;
  CHECK(UnpackHistory(other_layout, "P9", out, spare).message() == message);
  // A string index past the table of four ("XA1", "A", "", "tablet"): the last byte is
  // the structured unit's index (2, the empty string).
  const std::vector<DispensingRecord> one = {Record("d", 1, "A", "A")};
  std::string bad_index = PackHistory(one);
  const size_t last = bad_index.size() - 1;
  REQUIRE(bad_index[last] == 2);
  bad_index[last] = 5;
  CHECK(UnpackHistory(bad_index, "P9", out, spare).message() == message);
}

}  // TEST_SUITE
}  // namespace medload
