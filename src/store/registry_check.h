// Counts, during one dispensing import, the imported dispensings whose patient has no
// row in the registry (the patients table), and names the first few, for a warning in
// the import summary. Private to src/store. It stores nothing and rejects nothing: such
// dispensings are kept (the registry may be loaded later).
#pragma once

#include <functional>
#include <map>
#include <string>
#include <string_view>
#include <unordered_set>

#include "medload/core/status.h"
#include "medload/store/import_summary.h"
#include "store/sqlite.h"

namespace medload {

class RegistryCheck {
 public:
  // How many named dispensings the summary keeps.
  static constexpr size_t kExamples = 5;
  // How many distinct patients are held (and counted as patients); the dispensings of
  // further patients are counted without them. As many registered patients are
  // remembered; further ones are looked up again when they come back.
  static constexpr size_t kMaxHeld = 1 << 20;

  // REQUIRES: `db` outlives the check. With `registry_may_grow` (FHIR, whose Patient
  // lines may follow the dispensings), the patients not found are looked up again by
  // Finish.
  Status Prepare(sqlite3* db, bool registry_may_grow);
  // One dispensing stored (imported or updated) for `patient_id` from line `line`.
  Status Note(std::string_view patient_id, size_t line);
  // Looks the held patients up again and writes the counts and examples into `summary`
  // (not_in_registry, not_in_registry_patients, not_in_registry_examples).
  Status Finish(ImportSummary& summary);

 private:
  struct Held {
    long dispensings = 0;
    size_t first_line = 0;
  };
  Result<bool> Registered(std::string_view patient_id);
  void AddExample(size_t line, std::string_view patient_id);

  Statement select_;
  bool registry_may_grow_ = false;
  std::string last_id_;
  bool last_registered_ = true;
  struct Hash {
    using is_transparent = void;
    size_t operator()(std::string_view text) const { return std::hash<std::string_view>{}(text); }
  };
  std::unordered_set<std::string, Hash, std::equal_to<>> registered_;  // up to kMaxHeld
  std::map<std::string, Held, std::less<>> held_;
  std::map<size_t, std::string> examples_;  // line -> patient, the first kExamples
  long dispensings_ = 0;
  long patients_ = 0;
};

}  // namespace medload
