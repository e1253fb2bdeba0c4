#include "medload/burden/patient_facts.h"

#include <doctest/doctest.h>

namespace medload {
namespace {

Date D(int y, int m, int d) { return Date::FromCivil(y, m, d); }

PatientHistory Registered(std::optional<Date> from, std::optional<Date> to) {
  PatientHistory history;
  history.patient_id = "P1";
  PatientRecord row;
  row.patient_id = "P1";
  row.practice = "A01";
  row.registered_from = from;
  row.registered_to = to;
  history.registry = row;
  return history;
}

PatientHistory Unregistered(std::vector<std::pair<Date, std::string>> dispensed) {
  PatientHistory history;
  history.patient_id = "P2";
  for (const auto& [date, practice] : dispensed) {
    DispensingRecord record;
    record.patient_id = "P2";
    record.dispensed_on = date;
    record.practice = practice;
    history.dispensings.push_back(record);
  }
  return history;
}

TEST_SUITE("burden/patient_facts") {

TEST_CASE("a patient counts on the day registration starts and on the day it ends") {
  const Date from = D(2024, 3, 1);
  const Date to = D(2024, 6, 30);
  const PatientHistory history = Registered(from, to);
  CHECK_FALSE(RegisteredPractice(history, from - 1).has_value());
  CHECK(RegisteredPractice(history, from) == std::optional<std::string>("A01"));
  CHECK(RegisteredPractice(history, to) == std::optional<std::string>("A01"));
  CHECK_FALSE(RegisteredPractice(history, to + 1).has_value());
}

TEST_CASE("absent registration dates are open") {
  const PatientHistory history = Registered(std::nullopt, std::nullopt);
  CHECK(RegisteredPractice(history, D(1900, 1, 1)).has_value());
  CHECK(RegisteredPractice(history, D(2100, 1, 1)).has_value());
}

TEST_CASE("a registered patient counts at the registry practice, not where they were dispensed") {
  PatientHistory history = Registered(D(2020, 1, 1), std::nullopt);
  DispensingRecord record;
  record.dispensed_on = D(2024, 1, 5);
  record.practice = "B02";
  history.dispensings.push_back(record);
  CHECK(RegisteredPractice(history, D(2024, 1, 31)) == std::optional<std::string>("A01"));
}

TEST_CASE("a registered patient whose registration ended is not counted even if dispensed to") {
  PatientHistory history = Registered(D(2020, 1, 1), D(2023, 12, 31));
  DispensingRecord record;
  record.dispensed_on = D(2024, 1, 5);
  record.practice = "A01";
  history.dispensings.push_back(record);
  CHECK_FALSE(RegisteredPractice(history, D(2024, 1, 31)).has_value());
}

TEST_CASE("without a registry row a dispensing in the 365 days ending on the date counts") {
  // The 365 days ending on 2024-12-31 run from 2024-01-01 (D-364) to 2024-12-31.
  const Date on = D(2024, 12, 31);
  CHECK(RegisteredPractice(Unregistered({{on, "A01"}}), on).has_value());
  CHECK(RegisteredPractice(Unregistered({{on - 364, "A01"}}), on) ==
        std::optional<std::string>("A01"));
  CHECK_FALSE(RegisteredPractice(Unregistered({{on - 365, "A01"}}), on).has_value());
  CHECK_FALSE(RegisteredPractice(Unregistered({{on - 366, "A01"}}), on).has_value());
}

TEST_CASE("without a registry row a dispensing after the date does not count") {
  const Date on = D(2024, 6, 30);
  CHECK_FALSE(RegisteredPractice(Unregistered({{on + 1, "A01"}}), on).has_value());
}

TEST_CASE("without a registry row the practice is that of the latest dispensing on or before") {
  const Date on = D(2024, 6, 30);
  const PatientHistory history =
      Unregistered({{D(2024, 1, 10), "A01"}, {D(2024, 5, 1), "B02"}, {D(2024, 7, 1), "C03"}});
  CHECK(RegisteredPractice(history, on) == std::optional<std::string>("B02"));
  CHECK(RegisteredPractice(history, D(2024, 3, 31)) == std::optional<std::string>("A01"));
  CHECK(RegisteredPractice(history, D(2024, 7, 31)) == std::optional<std::string>("C03"));
}

TEST_CASE("age on a date is in completed years, and unknown without a birth date") {
  PatientRecord row;
  row.patient_id = "P1";
  row.birth_date = D(1950, 7, 1);
  CHECK(AgeOn(row, D(2024, 6, 30)) == std::optional<int>(73));
  CHECK(AgeOn(row, D(2024, 7, 1)) == std::optional<int>(74));
  row.birth_date.reset();
  CHECK_FALSE(AgeOn(row, D(2024, 7, 1)).has_value());
  CHECK_FALSE(AgeOn(std::nullopt, D(2024, 7, 1)).has_value());
}

TEST_CASE("a patient with neither registry row nor dispensing is never registered") {
  CHECK_FALSE(RegisteredPractice(Unregistered({}), D(2024, 1, 1)).has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
