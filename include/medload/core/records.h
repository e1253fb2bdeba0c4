// The input records as the readers produce them and the store keeps them: one
// dispensing line, one registry row, one practice, one completed review. Plain values;
// validation happens in the readers, meaning in the later pipeline stages.
#pragma once

#include <optional>
#include <string>

#include "medload/core/date.h"

namespace medload {

// One dispensed item, exactly as the source described it.
struct DispensingRecord {
  std::string record_id;     // the source's unique id of the line; empty if none
  std::string patient_id;    // required, non-empty
  std::string practice;      // may be empty
  Date dispensed_on;
  std::string product;       // the description as written; may be empty when code is set
  std::string code;          // a product code (any system) or empty
  std::string code_system;   // e.g. "ATC", a FHIR system URI, or empty
  double quantity = 0;       // > 0, in `unit`
  std::string unit;          // e.g. "tablet", "ml"; may be empty
  std::optional<int> days_supply;  // whole days > 0 when the source gives it
  std::string dosage;        // instruction text as written; may be empty
  // From a FHIR structured Dosage, when present (text readers leave these empty): the
  // amount a day in `structured_unit`, which is a canonical dose unit ("tablet", "ml",
  // "mg", ...; see dose/dose_unit.h), "administration" when the instruction gave a
  // frequency but no dose, a unit as written when it is not known, or empty when the
  // dose stated no unit (then it is in the unit of the quantity).
  std::optional<double> structured_units_per_day;
  std::string structured_unit;
  bool structured_as_needed = false;
  // FHIR status; empty for CSV. Only "completed" (or empty) dispenses count in measures.
  std::string status;
};

// One row of the patient registry.
struct PatientRecord {
  std::string patient_id;
  std::optional<Date> birth_date;  // from a year alone: 1 July of that year (docs/input-formats.md)
  bool birth_year_only = false;
  std::string sex;                 // "female", "male", "other", "unknown" or empty
  std::string practice;
  std::optional<Date> registered_from;  // absent = open
  std::optional<Date> registered_to;    // absent = open
};

struct PracticeRecord {
  std::string practice;  // the practice code
  std::string name;
  std::string network;
  std::optional<long> list_size;
};

struct ReviewRecord {
  std::string patient_id;
  Date reviewed_on;
};

// One distinct product as dispensed, with how often and to how many patients.
struct ProductCount {
  std::string product;
  std::string code;
  std::string code_system;
  long items = 0;     // counting dispensings
  long patients = 0;  // distinct patients among them
};

}  // namespace medload
