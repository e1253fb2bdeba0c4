// libFuzzer target: the dosage-text reader (dose/dosage_text.h) and, when the input is a
// JSON document, the FHIR structured Dosage reader (dose/fhir_dosage.h) on it as one
// Dosage element and as a dosageInstruction list.
//
// Invariants:
// - a reading's units per day, when present, is finite and above zero (text) or not
//   negative (structured), and is present exactly when the understanding is full or
//   partial (text) / absent when it is unknown or empty (both);
// - reading is pure: the same text gives the same reading;
// - stages, when present, number two or more, begin with the units per day, are finite
//   and not negative, last at least a day each but the last, which is open-ended; the
//   dose in force on any day is one of them;
// - the text read as a product description gives finite pack contents above zero, and a
//   supply computed from the text, that description and a quantity lasts from 1 to the
//   cap of days, with finite units per day above zero when it has them;
// - the structured readers never throw (an exception reaches libFuzzer as a crash).
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

#include "fuzz/fuzz_check.h"
#include "medload/dose/dosage_text.h"
#include "medload/dose/fhir_dosage.h"
#include "medload/dose/pack_content.h"
#include "medload/dose/supply.h"

namespace medload {
namespace {

bool FiniteNotNegative(const std::optional<double>& value) {
  return !value || (std::isfinite(*value) && *value >= 0);
}

bool SameStages(const std::vector<DoseStage>& a, const std::vector<DoseStage>& b) {
  if (a.size() != b.size()) return false;
  for (size_t k = 0; k < a.size(); ++k) {
    if (a[k].units_per_day != b[k].units_per_day || a[k].days != b[k].days) return false;
  }
  return true;
}

void CheckStages(const DosageReading& reading, const char* what) {
  const auto& stages = reading.stages;
  if (stages.empty()) return;
  FuzzCheck(stages.size() >= 2 && reading.units_per_day &&
                stages.front().units_per_day == *reading.units_per_day,
            what);
  for (size_t k = 0; k < stages.size(); ++k) {
    const DoseStage& stage = stages[k];
    FuzzCheck(std::isfinite(stage.units_per_day) && stage.units_per_day >= 0, what);
    FuzzCheck(k + 1 == stages.size() ? !stage.days : stage.days && *stage.days >= 1, what);
  }
  for (int day : {0, 1, 6, 7, 30, 100000}) {
    const auto units = UnitsPerDayOnDay(reading, day);
    bool found = false;
    for (const DoseStage& stage : stages) found = found || (units && *units == stage.units_per_day);
    FuzzCheck(found, what);
  }
}

bool FinitePositive(const std::optional<double>& value) {
  return !value || (std::isfinite(*value) && *value > 0);
}

void CheckPackAndSupply(std::string_view text, const DosageReading& reading) {
  const PackContent content = ReadPackContent(text);
  FuzzCheck(FinitePositive(content.doses) && FinitePositive(content.ml) &&
                FinitePositive(content.units_per_ml),
            "pack: contents are finite and above zero");
  QuantityUnit unit;
  unit.description = std::string(text);
  unit.form = "inhaler";
  unit.from_product = true;
  const std::pair<const char*, double> cases[] = {
      {"puff", 1}, {"ml", 15}, {"inhaler", 1e9}};
  for (const auto& [dose_unit, quantity] : cases) {
    unit.unit = dose_unit;
    const Supply supply = ComputeSupply(quantity, std::nullopt, reading, std::nullopt,
                                        SupplyOptions{}, unit);
    FuzzCheck(supply.days >= 1 && supply.days <= SupplyOptions{}.max_supply_days,
              "supply: days from 1 to the cap");
    FuzzCheck(FinitePositive(supply.units_per_day), "supply: units per day finite, above 0");
    for (const DoseStage& stage : supply.stages) {
      FuzzCheck(std::isfinite(stage.units_per_day) && stage.units_per_day >= 0,
                "supply: stages finite, not negative");
    }
  }
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
                again.note == reading.note && SameStages(again.stages, reading.stages),
            "text: reading is pure");
  CheckStages(reading, "text: stages are well formed");
  CheckPackAndSupply(text, reading);
}

void CheckStructured(const DosageReading& reading, const char* what) {
  FuzzCheck(FiniteNotNegative(reading.units_per_day), what);
  FuzzCheck(!reading.units_per_day || (reading.understanding != Understanding::kUnknown &&
                                       reading.understanding != Understanding::kEmpty),
            "structured: an unknown or empty reading has no units per day");
  CheckStages(reading, "structured: stages are well formed");
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
