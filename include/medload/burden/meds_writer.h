// `medload meds`: one patient's medicines active on a date, with totals, contributions,
// rules fired and the cautions that apply, in text, CSV, JSON and HTML. Writers take a
// finished model and a stream; they run no queries.
#pragma once

#include <iosfwd>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/burden/burden.h"
#include "medload/core/data_coverage.h"

namespace medload {

struct MedsModel {
  std::string patient;
  std::string practice;
  std::optional<int> age;
  bool registered = false;            // the patient has a registry row
  const Timeline* timeline = nullptr; // REQUIRES: non-null, outlives the writer call
  const Burden* burden = nullptr;     // REQUIRES: non-null, evaluated on `timeline`
  const BurdenTables* tables = nullptr;
  std::span<const DispensingRecord> records;  // the records the timeline was built from
  MeasureOptions options;
  // The data coverage of the patient's practice on the date, and its note when it is not
  // full (DataStateNote): the first warning, and a `# note:` line after the caution in CSV.
  DataState data = DataState::kFull;
  std::optional<std::string> data_note;
  // The patient's dispensings up to the census date whose status does not count (FHIR
  // statuses other than "completed"), by status (Store::NotCountingOf): a warning, a
  // `# note:` line in CSV, and "not_counted" in JSON.
  std::map<std::string, long> not_counted;
};

// The sentence saying how many dispensings do not count and why, or "" when none.
std::string NotCountedNote(const MedsModel& model);

// Warnings a clinician must see with this patient's figures (unmatched products, doses
// not known, supplies assumed, age unknown...), in plain sentences.
std::vector<std::string> MedsWarnings(const MedsModel& model);

nlohmann::json MedsJson(const MedsModel& model);
void WriteMedsText(std::ostream& out, const MedsModel& model);
void WriteMedsCsv(std::ostream& out, const MedsModel& model);
void WriteMedsHtml(std::ostream& out, const MedsModel& model);

}  // namespace medload
