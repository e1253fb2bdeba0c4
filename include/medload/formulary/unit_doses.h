// Rows of unit_doses.csv: what one patch releases a day, and how long one unit of a patch
// or a depot injection is used (its labelled interval), so that the Drug Burden Index
// takes a patch's release rate rather than its content and a depot's strength per dose
// over its interval. Plain data read by the formulary loader; the doses live in burden/.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace medload {

enum class UnitDoseForm {
  kPatch,  // a transdermal patch: the daily dose is its labelled release rate
  kDepot,  // a depot injection: the dose is the strength per ampoule or syringe / interval
};

// "patch", "depot".
std::string_view UnitDoseFormName(UnitDoseForm form);

// One row: `ingredient` as a `form` of labelled strength `strength_mg` (the mg one patch
// holds, or the mg in one ampoule or syringe; empty: any strength not listed on its own).
struct UnitDoseRow {
  std::string ingredient;                    // canonical after loading
  UnitDoseForm form = UnitDoseForm::kPatch;
  std::optional<double> strength_mg;         // > 0 when given
  std::optional<double> release_mg_per_day;  // > 0; patches only (required for them)
  int interval_days = 1;                     // 1..3650: how long one unit is used
  std::string source;
  int line = 0;
};

}  // namespace medload
