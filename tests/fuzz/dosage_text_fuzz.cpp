// libFuzzer target: the dosage-text reader (dose/dosage_text.h) and, when the input is a
// JSON document, the FHIR structured Dosage reader (dose/fhir_dosage.h) on it as one
// Dosage element and as a dosageInstruction list.
//
// Invariants:
// - a reading's units per day, when present, is finite and above zero (text) or not
//   negative (structured), and is present exactly when the understanding is full or
//   partial (text) / absent when it is unknown or empty (both);
// - reading is pure: the same text gives the same reading;
// - the structured readers never throw (an exception reaches libFuzzer as a crash).
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

#include "fuzz/fuzz_check.h"
#include "medload/dose/dosage_text.h"
#include "medload/dose/fhir_dosage.h"

namespace medload {
namespace {

bool FiniteNotNegative(const std::optional<double>& value) {
  return !value || (std::isfinite(*value) && *value >= 0);
}

void CheckTextReading(std::string_view text) {
  const DosageReading reading = ReadDosageText(text);
  FuzzCheck(!reading.units_per_day || (std::isfinite(*reading.units_per_day) &&
                                       *reading.units_per_day > 0),
            "text: units per day is finite and above zero");
  const bool understood = reading.understanding == Understanding::kFull ||
                          reading.understanding == Understanding::kPartial;
  FuzzCheck(understood == reading.units_per_day.has_value(),
            "text: units per day exactly when understood fully or in part");
  FuzzCheck(!text.empty() || reading.understanding == Understanding::kEmpty,
            "text: no text reads as empty");
  const DosageReading again = ReadDosageText(text);
  FuzzCheck(again.units_per_day == reading.units_per_day && again.as_needed == reading.as_needed &&
                again.unit == reading.unit && again.understanding == reading.understanding &&
                again.note == reading.note,
            "text: reading is pure");
}

void CheckStructured(const DosageReading& reading, const char* what) {
  FuzzCheck(FiniteNotNegative(reading.units_per_day), what);
  FuzzCheck(!reading.units_per_day || (reading.understanding != Understanding::kUnknown &&
                                       reading.understanding != Understanding::kEmpty),
            "structured: an unknown or empty reading has no units per day");
}

}  // namespace
}  // namespace medload

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace medload;
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  CheckTextReading(input);
  const nlohmann::json document = nlohmann::json::parse(input, nullptr, false);
  if (document.is_discarded()) return 0;
  CheckStructured(ReadFhirDosage(document), "structured: one Dosage gives a finite dose, not negative");
  CheckStructured(ReadFhirDosageList(document),
                  "structured: a Dosage list gives a finite dose, not negative");
  if (document.is_object() && size < 4096) {  // the copy below recurses: keep it shallow
    CheckStructured(ReadFhirDosageList(nlohmann::json::array({document, document})),
                    "structured: two concurrent Dosages give a finite dose, not negative");
  }
  return 0;
}
