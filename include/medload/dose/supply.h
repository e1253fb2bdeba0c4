// Days of supply of one dispensing, by the first rule that applies (docs/dosage-text.md):
// the record's days supply, the dosage's units per day, the product default, the
// default; then the cap. It does not build coverages or episodes from the result.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "medload/core/records.h"
#include "medload/dose/dosage_cache.h"
#include "medload/dose/dosage_text.h"

namespace medload {

enum class SupplyRule { kRecordDaysSupply, kDosageText, kProductDefault, kDefaultDays };

// "days_supply", "dosage", "product_default", "default".
std::string_view SupplyRuleName(SupplyRule rule);

struct SupplyOptions {
  int default_supply_days = 28;  // --default-supply-days: days when nothing else says
  int max_supply_days = 180;     // --max-supply-days: no dispensing covers more days
};

// What one unit of the dispensed quantity is, so that a dosage in another unit can be
// divided into it. Both fields are optional: an empty unit means "the dosage's unit".
struct QuantityUnit {
  std::string unit;                   // "tablet", "tablets", "mL", "5ml spoonful", ...
  std::optional<double> mg_per_unit;  // strength per unit, for a dosage written in mg
};

struct Supply {
  int days = 1;                          // >= 1 and <= max(1, max_supply_days)
  SupplyRule rule = SupplyRule::kDefaultDays;
  bool capped = false;                   // the rule gave more than max_supply_days
  // The dosage's daily amount in units of the dispensed quantity, whenever it can be
  // worked out, whichever rule set `days` (the burden measures use it for mg per day).
  std::optional<double> units_per_day;
  std::string note;                      // why the dosage could not be used, or empty
};

// The dosage's units per day in units of the quantity: the same unit (or one side not
// stated): as is; units that convert (5ml spoonful -> ml, g -> mg, tablet ~ capsule):
// converted; a dosage in mg (or g, micrograms) with mg_per_unit: mg per day /
// mg_per_unit; administrations a day (kAdministrationUnit, a frequency without a dose):
// one unit each when the quantity's unit is a single-unit form (IsSingleUnitForm).
// Otherwise, or when the dosage has no units per day > 0, nullopt, with the reason in
// `*why` if given.
std::optional<double> UnitsPerDayOfQuantity(const DosageReading& dosage,
                                            const QuantityUnit& quantity_unit,
                                            std::string* why = nullptr);

// docs/dosage-text.md, first rule that applies: the record's days supply (> 0);
// ceil(quantity / units per day) where the dosage gives units per day > 0 in a unit
// that relates to the quantity's (see UnitsPerDayOfQuantity) and quantity > 0; the
// product default (> 0); options.default_supply_days. Then min(days, max_supply_days).
// Days are at least 1 always (options below 1 are read as 1). Pure; never fails.
Supply ComputeSupply(double quantity, std::optional<int> record_days_supply,
                     const DosageReading& dosage, std::optional<int> product_default_days,
                     const SupplyOptions& options, const QuantityUnit& quantity_unit = {});

// The dosage of a dispensing record: its structured FHIR amount a day when the reader
// kept one (unit: structured_unit, empty meaning the record's own unit), else
// ReadDosageText of its text (through `cache` when given); as-needed when either says so.
DosageReading ReadRecordDosage(const DispensingRecord& record, DosageTextCache* cache = nullptr);

}  // namespace medload
