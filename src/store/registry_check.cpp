#include "store/registry_check.h"

#include <algorithm>
#include <iterator>

#include "medload/input/csv_records.h"

namespace medload {

Status RegistryCheck::Prepare(sqlite3* db, bool registry_may_grow) {
  registry_may_grow_ = registry_may_grow;
  Result<Statement> select = Statement::Prepare(db, "SELECT 1 FROM patients WHERE patient_id = ?1");
  if (!select.ok()) return select.status();
  select_ = std::move(select.value());
  return Status::Ok();
}

Result<bool> RegistryCheck::Registered(std::string_view patient_id) {
  select_.BindText(1, patient_id);
  Result<bool> found = select_.Step();
  select_.Reset();
  return found;
}

void RegistryCheck::AddExample(size_t line, std::string_view patient_id) {
  if (examples_.size() == kExamples && line > std::prev(examples_.end())->first) return;
  examples_.emplace(line, std::string(patient_id));
  if (examples_.size() > kExamples) examples_.erase(std::prev(examples_.end()));
}

Status RegistryCheck::Note(std::string_view patient_id, size_t line) {
  if (patient_id != last_id_) {
    // Rows of one patient come together in sorted batches, but a large load goes in file
    // order, where nearly every row names another patient than the row before: patients
    // found registered are remembered (the registry does not shrink during an import).
    if (registered_.find(patient_id) != registered_.end()) {
      last_registered_ = true;
    } else {
      Result<bool> registered = Registered(patient_id);
      if (!registered.ok()) return registered.status();
      last_registered_ = *registered;
      if (last_registered_ && registered_.size() < kMaxHeld) registered_.emplace(patient_id);
    }
    last_id_.assign(patient_id);
  }
  if (last_registered_) return Status::Ok();
  if (const auto held = held_.find(patient_id); held != held_.end()) {
    ++held->second.dispensings;
    held->second.first_line = std::min(held->second.first_line, line);
    return Status::Ok();
  }
  if (held_.size() < kMaxHeld) {
    held_.emplace(std::string(patient_id), Held{1, line});
    return Status::Ok();
  }
  ++dispensings_;  // beyond the held patients: counted now, not looked up again
  AddExample(line, patient_id);
  return Status::Ok();
}

Status RegistryCheck::Finish(ImportSummary& summary) {
  for (const auto& [patient_id, held] : held_) {
    // A Patient line later in the same file may have registered the patient meanwhile.
    Result<bool> registered = registry_may_grow_ ? Registered(patient_id) : Result<bool>(false);
    if (!registered.ok()) return registered.status();
    if (*registered) continue;
    dispensings_ += held.dispensings;
    ++patients_;
    AddExample(held.first_line, patient_id);
  }
  summary.not_in_registry = dispensings_;
  summary.not_in_registry_patients = patients_;
  summary.not_in_registry_examples.clear();
  for (const auto& [line, patient_id] : examples_) {
    summary.not_in_registry_examples.push_back(summary.file + ":" + std::to_string(line) +
                                               ": patient " + QuoteForMessage(patient_id));
  }
  return Status::Ok();
}

}  // namespace medload
